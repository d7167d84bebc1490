import type { ReactNode } from 'react';
import { cn } from '../../lib/cn';

export function EmptyState({ icon, title, children, action, className }: { icon?: ReactNode; title: ReactNode; children?: ReactNode; action?: ReactNode; className?: string }) {
  return (
    <div className={cn('flex flex-col items-center gap-2 rounded-card border border-dashed border-primer-300 bg-bone-50 px-6 py-10 text-center', className)}>
      {icon && (
        <div aria-hidden="true" className="text-sable-600">
          {icon}
        </div>
      )}
      <p className="text-base font-semibold">{title}</p>
      {children && <div className="max-w-prose text-sm text-sable-600">{children}</div>}
      {action && <div className="mt-2">{action}</div>}
    </div>
  );
}
