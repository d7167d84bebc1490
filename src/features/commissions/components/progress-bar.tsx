import type { Progress } from '../../../../shared/commission-lifecycle';
import { cn } from '../../../lib/cn';

const hours = (h: number) => `${new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 }).format(h)} h`;

/** "6 of 11 stages · 14.5 h of 22 h" */
export function progressText(p: Progress, withHours = true): string {
  const stages = `${p.stagesDone} of ${p.stagesTotal} ${p.stagesTotal === 1 ? 'stage' : 'stages'}`;
  return withHours && p.hoursTotal > 0 ? `${stages} · ${hours(p.hoursDone)} of ${hours(p.hoursTotal)}` : stages;
}

/** A thin bar plus the words; the bar is a meter for assistive technology, labelled by `label`. */
/** `hours` off for clients: the studio's estimates are its own business. */
export function ProgressBar({ progress, label, className, compact = false, hours: withHours = true }: { progress: Progress; label: string; className?: string; compact?: boolean; hours?: boolean }) {
  const pct = Math.round(Math.min(1, Math.max(0, progress.share)) * 100);
  const text = progressText(progress, withHours);
  return (
    <div className={cn('flex flex-col gap-1', className)}>
      <div
        role="meter"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
        aria-valuetext={`${pct} % done: ${text}`}
        className="h-1.5 w-full overflow-hidden rounded-full bg-primer-300"
      >
        <div className="h-full rounded-full bg-verdigris-600" style={{ width: `${pct}%` }} />
      </div>
      <span className={cn('figures text-sable-600', compact ? 'text-xs' : 'text-sm')}>{text}</span>
    </div>
  );
}
