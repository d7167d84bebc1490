import { cn } from '../../lib/cn';

export function Spinner({ label = 'Loading…', className }: { label?: string; className?: string }) {
  return (
    <span role="status" className={cn('inline-flex items-center gap-2', className)}>
      <svg className="size-4 animate-spin text-current" viewBox="0 0 24 24" fill="none" aria-hidden="true">
        <circle cx="12" cy="12" r="9" stroke="currentColor" strokeOpacity="0.25" strokeWidth="3" />
        <path d="M21 12a9 9 0 0 0-9-9" stroke="currentColor" strokeWidth="3" strokeLinecap="round" />
      </svg>
      <span className="sr-only">{label}</span>
    </span>
  );
}

/** A whole area waiting for data. */
export function LoadingBlock({ label = 'Loading…' }: { label?: string }) {
  return (
    <div className="flex min-h-40 items-center justify-center gap-2 text-sable-600">
      <Spinner label={label} />
      <span aria-hidden="true" className="text-sm">
        {label}
      </span>
    </div>
  );
}
