import type { ComponentProps } from 'react';
import { Link, type LinkProps } from 'react-router-dom';
import { cn } from '../../lib/cn';
import { Spinner } from './spinner';

export type ButtonVariant = 'primary' | 'secondary' | 'danger' | 'ghost';
export type ButtonSize = 'md' | 'sm';

const base =
  'inline-flex items-center justify-center gap-2 rounded-control font-medium whitespace-nowrap transition-[filter,background-color] ' +
  'disabled:cursor-not-allowed disabled:opacity-60 aria-disabled:cursor-not-allowed aria-disabled:opacity-60';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-verdigris-600 text-white hover:brightness-90 active:brightness-85',
  secondary: 'border border-sable-600 bg-bone-50 text-sable-900 hover:bg-primer-100',
  danger: 'bg-oxide-600 text-white hover:brightness-90 active:brightness-85',
  ghost: 'text-verdigris-600 hover:bg-verdigris-100',
};

const sizes: Record<ButtonSize, string> = {
  md: 'min-h-10 px-4 text-sm',
  sm: 'min-h-8 px-3 text-sm',
};

export function buttonClasses(variant: ButtonVariant = 'primary', size: ButtonSize = 'md', className?: string): string {
  return cn(base, variants[variant], sizes[size], className);
}

type ButtonProps = ComponentProps<'button'> & {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /**
   * Shows a spinner and blocks a second click while the request runs. The button stays focusable
   * (aria-disabled, not disabled), so a keyboard user who pressed it keeps their place on the page.
   */
  loading?: boolean;
};

export function Button({ variant = 'primary', size = 'md', loading = false, disabled, className, children, type = 'button', onClick, ...rest }: ButtonProps) {
  const inactive = loading || rest['aria-disabled'] === true || rest['aria-disabled'] === 'true';
  return (
    <button
      type={type}
      disabled={disabled}
      {...rest}
      aria-disabled={inactive || undefined}
      aria-busy={loading || undefined}
      className={buttonClasses(variant, size, className)}
      onClick={(e) => {
        // Also stops a form's submit, and Enter in a field (which clicks the form's submit button).
        if (inactive) return e.preventDefault();
        onClick?.(e);
      }}
    >
      {loading && <Spinner label="Working…" />}
      {children}
    </button>
  );
}

type ButtonLinkProps = LinkProps & { variant?: ButtonVariant; size?: ButtonSize };

/** A link that looks like a button, for actions that go to another screen. */
export function ButtonLink({ variant = 'primary', size = 'md', className, ...rest }: ButtonLinkProps) {
  return <Link className={buttonClasses(variant, size, cn('no-underline', className as string | undefined))} {...rest} />;
}
