import type { ReactNode } from 'react';
import { Check, Circle, CircleDot, CircleSlash } from 'lucide-react';
import { stageStatusLabels } from '../../../../shared/commission-lifecycle';
import type { Figure } from '../../../../shared/schemas/commissions';
import { cn } from '../../../lib/cn';
import { formatDate } from '../../../lib/format';
import { ProgressBar } from './progress-bar';

const icons = { done: Check, working: CircleDot, todo: Circle, skipped: CircleSlash };

/** One figure's way from primer to varnish, as the client sees it: the stages and the photos shared at each. */
export function ClientTimeline({ figure, timezone, photosFor }: { figure: Figure; timezone: string; photosFor?: (figureId: number, stageId: number | null) => ReactNode }) {
  const titleId = `timeline-${figure.id}`;
  // Stages not reached yet fold into one line, so the timeline shows what has happened.
  const cur = figure.stages.findIndex((s) => s.id === figure.currentStageId);
  const cut = cur < 0 ? figure.stages.length : cur + 1;
  const shown = figure.stages.slice(0, cut);
  const later = figure.stages.slice(cut).filter((s) => s.status !== 'skipped');
  return (
    <article aria-labelledby={titleId} className="rounded-card border border-primer-300 bg-bone-50 p-4 shadow-raised sm:p-5">
      <h3 id={titleId} className="text-lg font-semibold">
        {figure.name}
        {figure.quantity > 1 && <span className="figures font-normal text-sable-600"> × {figure.quantity}</span>}
      </h3>
      <ProgressBar progress={figure.progress} label={`Progress of ${figure.name}`} className="mt-2" hours={false} />
      {photosFor?.(figure.id, null)}
      <ol aria-label={`Stages of ${figure.name}`} className="mt-4 flex flex-col">
        {shown.map((s, i) => {
          const Icon = icons[s.status];
          const current = s.id === figure.currentStageId;
          const last = i === shown.length - 1 && later.length === 0;
          return (
            <li key={s.id} className="relative flex gap-3 pb-4">
              {!last && <span aria-hidden="true" className="absolute top-7 bottom-0 left-3 w-px bg-primer-300" />}
              <span
                aria-hidden="true"
                className={cn(
                  'z-10 flex size-6 shrink-0 items-center justify-center rounded-full border',
                  s.status === 'done' ? 'border-verdigris-600 bg-verdigris-600 text-white' : current ? 'border-verdigris-600 bg-verdigris-100 text-verdigris-600' : 'border-primer-300 bg-bone-50 text-sable-600',
                )}
              >
                <Icon className="size-3.5" />
              </span>
              <div className="min-w-0 flex-1">
                <p className={cn('font-medium', s.status === 'skipped' && 'text-sable-600 line-through')}>
                  {s.name}
                  <span className="sr-only">: {current ? 'being worked on now' : stageStatusLabels[s.status].toLowerCase()}</span>
                </p>
                <p className="text-xs text-sable-600">
                  {s.status === 'done' && s.doneAt ? `Done ${formatDate(s.doneAt, timezone)}` : current ? 'On the bench now' : s.status === 'skipped' ? 'Not needed' : 'Still to come'}
                </p>
                {photosFor?.(figure.id, s.id)}
              </div>
            </li>
          );
        })}
        {later.length > 0 && (
          <li className="flex gap-3">
            <span aria-hidden="true" className="z-10 flex size-6 shrink-0 items-center justify-center rounded-full border border-primer-300 bg-bone-50 text-sable-600">
              <Circle className="size-3.5" />
            </span>
            <p className="text-sm">
              <span className="font-medium">Still to come:</span> <span className="text-sable-600">{later.map((s) => s.name).join(', ')}</span>
            </p>
          </li>
        )}
      </ol>
    </article>
  );
}
