import { useEffect, useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { ArrowDown, ArrowUp, GripVertical } from 'lucide-react';
import { closestCenter, DndContext, KeyboardSensor, PointerSensor, useSensor, useSensors, type Announcements, type DragEndEvent } from '@dnd-kit/core';
import { arrayMove, SortableContext, sortableKeyboardCoordinates, useSortable, verticalListSortingStrategy } from '@dnd-kit/sortable';
import { CSS } from '@dnd-kit/utilities';
import { commissionStatusLabels } from '../../../../shared/commission-lifecycle';
import type { ScheduledCommission } from '../../../../shared/schemas/schedule';
import { unscheduledLabels } from '../../../../shared/schemas/schedule';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { cn } from '../../../lib/cn';
import { useReorderQueue } from '../api/reorder-queue';
import { formatDay, slackWords } from './dates';

type RowProps = {
  c: ScheduledCommission;
  index: number;
  count: number;
  studioId: number;
  canMove: boolean;
  busy: boolean;
  onMove: (from: number, to: number) => void;
};

function Dates({ c }: { c: ScheduledCommission }) {
  const slack = slackWords(c);
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-2 text-sm sm:flex sm:flex-wrap sm:gap-x-4">
      <dt className="text-sable-600">Due</dt>
      <dd className="figures">{c.dueDate ? formatDay(c.dueDate) : 'no date'}</dd>
      <dt className="text-sable-600">Ready to ship</dt>
      <dd className="figures">{c.unscheduled ? unscheduledLabels[c.unscheduled] : c.finishDate ? formatDay(c.finishDate) : '—'}</dd>
      <dt className="text-sable-600">Work left</dt>
      <dd className="figures">{c.remainingHours} h</dd>
      {slack && (
        <>
          <dt className="sr-only">Against its due date</dt>
          <dd>{c.late ? <Badge tone="danger">{slack}</Badge> : <span className="text-sable-600">{slack}</span>}</dd>
        </>
      )}
    </dl>
  );
}

function QueueRow({ c, index, count, studioId, canMove, busy, onMove }: RowProps) {
  const { attributes, listeners, setNodeRef, setActivatorNodeRef, transform, transition, isDragging } = useSortable({ id: c.id, disabled: !canMove || busy });
  return (
    <li
      ref={setNodeRef}
      style={{ transform: CSS.Transform.toString(transform), transition }}
      className={cn('flex items-start gap-2 bg-bone-50 px-3 py-3 sm:px-4', isDragging && 'relative z-10 shadow-raised ring-2 ring-verdigris-600')}
    >
      {canMove && (
        <button
          type="button"
          ref={setActivatorNodeRef}
          {...attributes}
          {...listeners}
          aria-label={`Drag ${c.title} to another place in the queue`}
          data-focus-key={`handle-${c.id}`}
          className="mt-0.5 cursor-grab touch-none rounded-control p-1 text-sable-600 hover:bg-primer-100 active:cursor-grabbing"
        >
          <GripVertical aria-hidden="true" className="size-5" />
        </button>
      )}
      <span className="figures mt-1 w-6 shrink-0 text-right text-sm font-semibold text-sable-600">{index + 1}.</span>
      <div className="min-w-0 flex-1">
        <div className="flex flex-wrap items-baseline gap-x-2">
          <Link to={`/studio/${studioId}/commissions/${c.id}`} className="font-semibold">
            {c.title}
          </Link>
          <span className="text-sm text-sable-600">
            {c.client.name} · {commissionStatusLabels[c.status]}
          </span>
        </div>
        <Dates c={c} />
      </div>
      {canMove && (
        <div className="flex shrink-0 flex-col gap-1 sm:flex-row">
          {/* aria-disabled rather than disabled, so the button that was pressed keeps focus while the move saves. */}
          <Button variant="secondary" size="sm" aria-disabled={busy || index === 0} onClick={() => !busy && index > 0 && onMove(index, index - 1)} aria-label={`Move ${c.title} up the queue`} data-focus-key={`up-${c.id}`}>
            <ArrowUp aria-hidden="true" className="size-4" />
            <span className="hidden sm:inline">Up</span>
          </Button>
          <Button variant="secondary" size="sm" aria-disabled={busy || index === count - 1} onClick={() => !busy && index < count - 1 && onMove(index, index + 1)} aria-label={`Move ${c.title} down the queue`} data-focus-key={`down-${c.id}`}>
            <ArrowDown aria-hidden="true" className="size-4" />
            <span className="hidden sm:inline">Down</span>
          </Button>
        </div>
      )}
    </li>
  );
}

/**
 * The queue of booked and on-the-bench commissions. The owner reorders it by dragging the handle (mouse,
 * touch, or Space and the arrow keys on the handle) or with the Up and Down buttons; each move is saved at
 * once and the forecast follows. Painters see the order.
 */
export function QueueList({ studioId, commissions, canMove }: { studioId: number; commissions: ScheduledCommission[]; canMove: boolean }) {
  // While a move is being saved the list shows it at once; the server's new forecast replaces it after.
  const [pending, setPending] = useState<number[] | null>(null);
  const byId = new Map(commissions.map((c) => [c.id, c]));
  const order = pending ? pending.map((id) => byId.get(id)).filter((c): c is ScheduledCommission => c !== undefined) : commissions;
  const reorder = useReorderQueue(studioId);
  const toast = useToast();

  const sensors = useSensors(useSensor(PointerSensor, { activationConstraint: { distance: 6 } }), useSensor(KeyboardSensor, { coordinateGetter: sortableKeyboardCoordinates }));
  const title = (id: string | number) => order.find((c) => c.id === Number(id))?.title ?? 'The commission';
  const place = (id: string | number) => order.findIndex((c) => c.id === Number(id)) + 1;
  const announcements: Announcements = {
    onDragStart: ({ active }) => `Picked up ${title(active.id)}, place ${place(active.id)} of ${order.length}.`,
    onDragOver: ({ active, over }) => (over ? `${title(active.id)} would go to place ${place(over.id)}.` : `${title(active.id)} is outside the queue.`),
    onDragEnd: ({ active, over }) => (over ? `${title(active.id)} moved to place ${place(over.id)}.` : `${title(active.id)} stays where it was.`),
    onDragCancel: ({ active }) => `Move cancelled; ${title(active.id)} stays where it was.`,
  };

  // A row that moves is taken out of the page and put back, which drops keyboard focus: put it back on the
  // control that was used (or the row's handle), unless the person has moved on.
  const follow = useRef<{ id: number; control: 'up' | 'down' | 'handle' } | null>(null);
  useEffect(() => {
    const f = follow.current;
    if (!f) return;
    if (!document.activeElement || document.activeElement === document.body) {
      const el = document.querySelector<HTMLElement>(`[data-focus-key="${f.control}-${f.id}"]`) ?? document.querySelector<HTMLElement>(`[data-focus-key="handle-${f.id}"]`);
      el?.focus();
    }
    if (!reorder.isPending) follow.current = null;
  });

  function move(from: number, to: number, control: 'up' | 'down' | 'handle' = to < from ? 'up' : 'down') {
    if (to < 0 || to >= order.length || from === to) return;
    follow.current = { id: order[from].id, control };
    const next = arrayMove(order, from, to);
    setPending(next.map((c) => c.id));
    reorder.mutate(
      next.map((c) => c.id),
      {
        onSuccess: () => toast.show(`${next[to].title} is now number ${to + 1} in the queue.`),
        onError: (err) => toast.show(isApiError(err, 409) ? 'The queue changed while you were arranging it. It has been reloaded; try the move again.' : err.message, 'error'),
        onSettled: () => setPending(null),
      },
    );
  }

  function onDragEnd(e: DragEndEvent) {
    if (!e.over || e.active.id === e.over.id) return;
    move(order.findIndex((c) => c.id === e.active.id), order.findIndex((c) => c.id === e.over!.id), 'handle');
  }

  return (
    <DndContext
      sensors={sensors}
      collisionDetection={closestCenter}
      onDragEnd={onDragEnd}
      accessibility={{
        announcements,
        screenReaderInstructions: {
          draggable: 'To move this commission in the queue: press Space, then the up or down arrow, then Space again. Escape puts it back. The Up and Down buttons beside it move it one place.',
        },
      }}
    >
      <SortableContext items={order.map((c) => c.id)} strategy={verticalListSortingStrategy}>
        <ol aria-label="Queue" aria-busy={reorder.isPending || undefined} className="divide-y divide-primer-300 overflow-hidden rounded-card border border-primer-300 bg-bone-50">
          {order.map((c, i) => (
            <QueueRow key={c.id} c={c} index={i} count={order.length} studioId={studioId} canMove={canMove} busy={reorder.isPending} onMove={move} />
          ))}
        </ol>
      </SortableContext>
    </DndContext>
  );
}
