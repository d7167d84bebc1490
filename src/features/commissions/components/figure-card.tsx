import type { ReactNode } from 'react';
import { Trash2 } from 'lucide-react';
import { sizeClassLabels, type Figure, type Hazard, type Stage, type StudioLists } from '../../../../shared/schemas/commissions';
import { Button } from '../../../components/ui/button';
import { ProgressBar } from './progress-bar';
import { StageRow } from './stage-row';

export type StageSlots = { timer?: (stage: Stage, figure: Figure) => ReactNode; timeLog?: (stage: Stage, figure: Figure) => ReactNode };

function labelOf(list: { key: string; label: string }[] | undefined, key: string) {
  return list?.find((x) => x.key === key)?.label ?? key;
}

export function FigureCard({
  studioId,
  figure,
  lists,
  hazards,
  timezone,
  locked,
  canRemove,
  onRemove,
  slots,
}: {
  studioId: number;
  figure: Figure;
  lists: StudioLists | undefined;
  hazards: Hazard[] | undefined;
  timezone: string;
  locked: boolean;
  canRemove: boolean;
  onRemove: () => void;
  slots?: StageSlots;
}) {
  const titleId = `figure-${figure.id}-title`;
  const facts = [
    figure.sizeClass === 'large' ? `Large: ${figure.footprint ?? 'footprint not given'}` : `${sizeClassLabels[figure.sizeClass]} base`,
    labelOf(lists?.tiers, figure.tier),
    ...figure.extras.map((x) => labelOf(lists?.extras, x)),
  ];
  return (
    <article aria-labelledby={titleId} className="rounded-card border border-primer-300 bg-bone-50 p-4 shadow-raised sm:p-5">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <h3 id={titleId} className="text-lg font-semibold">
            {figure.name}
            {figure.quantity > 1 && <span className="figures font-normal text-sable-600"> × {figure.quantity}</span>}
          </h3>
          <p className="text-sm text-sable-600">{facts.join(' · ')}</p>
          <p className="text-sm">
            Painter: <span className="font-medium">{figure.painter?.name ?? 'not assigned yet'}</span>
          </p>
          {figure.subAssemblies.length > 0 && <p className="text-sm">Painted separately: {figure.subAssemblies.join(', ')}</p>}
          {figure.lightSource && <p className="text-sm">Light from: {figure.lightSource}</p>}
        </div>
        {canRemove && !locked && (
          <Button variant="ghost" size="sm" className="text-oxide-600" onClick={onRemove}>
            <Trash2 aria-hidden="true" className="size-4" />
            Remove {figure.name}
          </Button>
        )}
      </div>
      <ProgressBar progress={figure.progress} label={`Progress of ${figure.name}`} className="mt-3" />
      <h4 className="sr-only">Stages of {figure.name}</h4>
      <ol aria-label={`Stages of ${figure.name}`} className="mt-2 divide-y divide-primer-300">
        {figure.stages.map((s) => (
          <StageRow
            key={s.id}
            studioId={studioId}
            stage={s}
            current={s.id === figure.currentStageId}
            locked={locked}
            hazards={hazards}
            timezone={timezone}
            timer={locked || s.status === 'done' || s.status === 'skipped' ? undefined : slots?.timer?.(s, figure)}
            timeLog={slots?.timeLog?.(s, figure)}
          />
        ))}
      </ol>
    </article>
  );
}
