import { useId, type ComponentProps, type ReactNode } from 'react';
import { CircleAlert } from 'lucide-react';
import { cn } from '../../lib/cn';

type FieldProps = {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  /** Adds "(optional)" to the label; fields are required unless said otherwise. */
  optional?: boolean;
  className?: string;
};

const controlBase =
  'w-full rounded-control border border-sable-600 bg-white px-3 text-base text-sable-900 placeholder:text-sable-600 ' +
  'disabled:bg-primer-100 aria-invalid:border-oxide-600 aria-invalid:border-2';

function useFieldIds(given: string | undefined, hint: boolean, error: boolean) {
  const auto = useId();
  const id = given ?? `f${auto}`;
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [errorId, hintId].filter(Boolean).join(' ') || undefined;
  return { id, hintId, errorId, describedBy };
}

function FieldFrame({
  id,
  label,
  optional,
  hint,
  hintId,
  error,
  errorId,
  className,
  children,
}: FieldProps & { id: string; hintId?: string; errorId?: string; children: ReactNode }) {
  return (
    <div className={cn('flex flex-col gap-1', className)}>
      <label htmlFor={id} className="text-sm font-medium text-sable-900">
        {label}
        {optional && <span className="font-normal text-sable-600"> (optional)</span>}
      </label>
      {children}
      {error && (
        <p id={errorId} className="flex items-start gap-1 text-sm text-oxide-600">
          <CircleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0" />
          <span>{error}</span>
        </p>
      )}
      {hint && (
        <p id={hintId} className="text-xs text-sable-600">
          {hint}
        </p>
      )}
    </div>
  );
}

export function TextField({ label, hint, error, optional, className, id: givenId, ...input }: FieldProps & ComponentProps<'input'>) {
  const { id, hintId, errorId, describedBy } = useFieldIds(givenId, !!hint, !!error);
  return (
    <FieldFrame {...{ id, label, optional, hint, hintId, error, errorId, className }}>
      <input
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={cn(controlBase, 'min-h-10')}
        {...input}
      />
    </FieldFrame>
  );
}

export function SelectField({
  label,
  hint,
  error,
  optional,
  className,
  id: givenId,
  children,
  ...select
}: FieldProps & ComponentProps<'select'>) {
  const { id, hintId, errorId, describedBy } = useFieldIds(givenId, !!hint, !!error);
  return (
    <FieldFrame {...{ id, label, optional, hint, hintId, error, errorId, className }}>
      <select
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={cn(controlBase, 'min-h-10 pr-8')}
        {...select}
      >
        {children}
      </select>
    </FieldFrame>
  );
}

export function TextArea({ label, hint, error, optional, className, id: givenId, rows = 4, ...area }: FieldProps & ComponentProps<'textarea'>) {
  const { id, hintId, errorId, describedBy } = useFieldIds(givenId, !!hint, !!error);
  return (
    <FieldFrame {...{ id, label, optional, hint, hintId, error, errorId, className }}>
      <textarea
        id={id}
        rows={rows}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={cn(controlBase, 'py-2')}
        {...area}
      />
    </FieldFrame>
  );
}
