import type { ReactNode } from 'react';
import { CircleAlert } from 'lucide-react';
import { cn } from '../../lib/cn';

/** A form-level or screen-level problem: what happened and what to do. */
export function ErrorNote({ title, children, action, className }: { title?: ReactNode; children?: ReactNode; action?: ReactNode; className?: string }) {
  return (
    <div role="alert" className={cn('flex gap-3 rounded-control border border-oxide-600 bg-bone-50 p-3 text-sm text-sable-900', className)}>
      <CircleAlert aria-hidden="true" className="mt-0.5 size-5 shrink-0 text-oxide-600" />
      <div className="flex flex-col gap-1">
        {title && <p className="font-semibold">{title}</p>}
        {children && <div>{children}</div>}
        {action && <div className="mt-1">{action}</div>}
      </div>
    </div>
  );
}

/** A calm bordered note for information (and, later, safety cautions). */
export function Note({ children, className }: { children: ReactNode; className?: string }) {
  return <div className={cn('rounded-control border border-primer-300 bg-bone-50 p-3 text-sm text-sable-900', className)}>{children}</div>;
}
