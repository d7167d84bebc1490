import type { ComponentProps, ReactNode } from 'react';
import { cn } from '../../lib/cn';

/** A list with several columns. Scrolls sideways inside its frame on a narrow screen. */
export function Table({ caption, captionHidden = false, children, className }: { caption: ReactNode; captionHidden?: boolean; children: ReactNode; className?: string }) {
  return (
    <div className={cn('overflow-x-auto rounded-card border border-primer-300 bg-bone-50', className)}>
      <table className="w-full border-collapse text-left text-sm">
        <caption className={cn('px-4 pt-3 text-left text-sm text-sable-600', captionHidden && 'sr-only')}>{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function THead({ children }: { children: ReactNode }) {
  return <thead className="border-b border-primer-300 text-xs font-semibold uppercase tracking-wide text-sable-600">{children}</thead>;
}

export function TBody({ children }: { children: ReactNode }) {
  return <tbody className="divide-y divide-primer-300">{children}</tbody>;
}

export function Tr({ className, ...rest }: ComponentProps<'tr'>) {
  return <tr className={cn('align-middle', className)} {...rest} />;
}

export function Th({ className, scope = 'col', ...rest }: ComponentProps<'th'>) {
  return <th scope={scope} className={cn('px-3 py-2 font-semibold sm:px-4', className)} {...rest} />;
}

export function Td({ className, ...rest }: ComponentProps<'td'>) {
  return <td className={cn('px-3 py-3 sm:px-4', className)} {...rest} />;
}
