import type { ReactNode } from 'react';
import { useDroppable } from '@dnd-kit/core';
import { cn } from '../../../lib/cn';

export function BoardColumn({ id, name, count, enabled, highlight, children }: { id: string; name: string; count: number; enabled: boolean; highlight: boolean; children: ReactNode }) {
  const { setNodeRef, isOver } = useDroppable({ id, disabled: !enabled, data: { name } });
  const headingId = `${id}-title`.replace(':', '-');
  return (
    <section
      ref={setNodeRef}
      aria-labelledby={headingId}
      className={cn(
        'flex min-w-0 flex-col gap-2 rounded-card border p-2',
        isOver ? 'border-verdigris-600 bg-verdigris-100' : highlight ? 'border-dashed border-verdigris-600 bg-primer-100' : 'border-primer-300 bg-primer-100',
        count === 0 && !highlight && 'py-1',
      )}
    >
      <h2 id={headingId} className="flex items-center justify-between px-1 text-sm font-semibold">
        {name}
        <span className="figures rounded-control bg-bone-50 px-1.5 text-xs font-medium text-sable-600">
          {count}
          <span className="sr-only"> {count === 1 ? 'figure' : 'figures'}</span>
        </span>
      </h2>
      {children}
    </section>
  );
}
