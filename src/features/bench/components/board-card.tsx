import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { useDraggable } from '@dnd-kit/core';
import { CSS } from '@dnd-kit/utilities';
import { Check, GripVertical, Hourglass } from 'lucide-react';
import type { BoardCard as Card } from '../../../../shared/schemas/commissions';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { cn } from '../../../lib/cn';
import { formatDate } from '../../../lib/format';
import { useNow } from '../../../lib/use-now';
import { HazardChips } from './hazard-chips';

export type CardData = { card: Card; columnIndex: number; nextName: string | null };

const day = (d: string) => formatDate(`${d}T12:00:00Z`, 'UTC');

/** "Wed, 2 Dec, 01:05" in the studio's timezone: short enough for a card. */
function shortDateTime(iso: string, timeZone: string): string {
  try {
    return new Intl.DateTimeFormat(undefined, { weekday: 'short', day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', timeZone }).format(new Date(iso));
  } catch {
    return new Date(iso).toLocaleString();
  }
}

export function BoardCardView({
  card,
  columnIndex,
  nextName,
  timezone,
  onAdvance,
  advancing,
  tools,
}: CardData & { timezone: string; onAdvance: () => void; advancing: boolean; tools?: ReactNode }) {
  const stage = card.stage;
  const { attributes, listeners, setNodeRef, setActivatorNodeRef, transform, isDragging } = useDraggable({
    id: `card:${card.figureId}`,
    data: { card, columnIndex, nextName } satisfies CardData,
    disabled: !stage || !nextName,
  });
  const now = useNow();
  const waiting = stage?.waitUntil && Date.parse(stage.waitUntil) > now;
  const titleId = `card-${card.figureId}-title`;
  return (
    <article
      ref={setNodeRef}
      aria-labelledby={titleId}
      style={{ transform: CSS.Translate.toString(transform) }}
      className={cn(
        'relative flex flex-col gap-2 rounded-card border border-primer-300 bg-bone-50 p-3 text-sm shadow-raised',
        isDragging && 'z-20 border-verdigris-600 opacity-90',
      )}
    >
      <div className="flex items-start gap-1">
        <div className="min-w-0 flex-1">
          <h3 id={titleId} className="font-semibold break-words">
            {card.figureName}
            {card.quantity > 1 && <span className="figures font-normal whitespace-nowrap text-sable-600"> × {card.quantity}</span>}
          </h3>
          <p className="text-xs break-words">
            <Link to={`../commissions/${card.commission.id}`} relative="path" data-focus-key={`link-${card.figureId}`}>
              {card.commission.title}
            </Link>
          </p>
        </div>
        {stage && nextName && (
          <button
            ref={setActivatorNodeRef}
            type="button"
            {...attributes}
            {...listeners}
            aria-label={`Drag ${card.figureName} to ${nextName}`}
            data-focus-key={`handle-${card.figureId}`}
            className="-mt-1 -mr-1 cursor-grab touch-none rounded-control p-1.5 text-sable-600 hover:bg-primer-100 active:cursor-grabbing"
          >
            <GripVertical aria-hidden="true" className="size-4" />
          </button>
        )}
      </div>
      <p className="text-xs text-sable-600">
        {card.painter ? card.painter.name : 'No painter yet'}
        {card.commission.dueDate && <> · due {day(card.commission.dueDate)}</>}
      </p>
      {stage && (stage.status === 'working' || waiting) && (
        <div className="flex flex-wrap gap-1">
          {stage.status === 'working' && <Badge tone="success">Working on it</Badge>}
          {waiting && (
            <Badge tone="attention" className="whitespace-normal!">
              <Hourglass aria-hidden="true" className="size-3 shrink-0" />
              Drying until {shortDateTime(stage.waitUntil!, timezone)}
            </Badge>
          )}
        </div>
      )}
      {stage && <HazardChips keys={stage.hazards} />}
      <div
        role="meter"
        aria-label={`Progress of ${card.figureName}`}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(card.progress.share * 100)}
        aria-valuetext={`${card.progress.stagesDone} of ${card.progress.stagesTotal} stages`}
        className="h-1 w-full overflow-hidden rounded-full bg-primer-300"
      >
        <div className="h-full bg-verdigris-600" style={{ width: `${Math.round(card.progress.share * 100)}%` }} />
      </div>
      {stage && (
        <div className="flex flex-col gap-1">
          <Button
            size="sm"
            className="w-full whitespace-normal"
            loading={advancing}
            onClick={onAdvance}
            data-focus-key={`done-${card.figureId}`}
            aria-label={`Mark ${stage.name} done for ${card.figureName}${nextName ? ` and move it to ${nextName}` : ''}`}
          >
            <Check aria-hidden="true" className="size-4" />
            {stage.name} done
          </Button>
          {tools && <div className="flex flex-wrap items-center justify-between gap-1">{tools}</div>}
        </div>
      )}
    </article>
  );
}
