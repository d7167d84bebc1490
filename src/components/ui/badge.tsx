import type { ReactNode } from 'react';
import { cn } from '../../lib/cn';

export type BadgeTone = 'neutral' | 'info' | 'success' | 'attention' | 'danger';

// Each pair clears 4.5:1 (look.md); varnish only ever sits behind sable text.
const tones: Record<BadgeTone, string> = {
  neutral: 'border border-primer-300 bg-primer-100 text-sable-900',
  info: 'bg-glaze-500 text-white',
  success: 'bg-verdigris-100 text-verdigris-600',
  attention: 'bg-varnish-500 text-sable-900',
  danger: 'bg-oxide-600 text-white',
};

export function Badge({ tone = 'neutral', children, className }: { tone?: BadgeTone; children: ReactNode; className?: string }) {
  return (
    <span className={cn('inline-flex items-center gap-1 rounded-control px-2 py-0.5 text-xs font-medium whitespace-nowrap', tones[tone], className)}>
      {children}
    </span>
  );
}
