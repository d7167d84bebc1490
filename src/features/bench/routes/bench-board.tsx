import { useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { useSearchParams } from 'react-router-dom';
import {
  DndContext,
  KeyboardSensor,
  PointerSensor,
  pointerWithin,
  rectIntersection,
  useSensor,
  useSensors,
  type Announcements,
  type CollisionDetection,
  type DragEndEvent,
  type DragStartEvent,
  type KeyboardCoordinateGetter,
} from '@dnd-kit/core';
import { Brush } from 'lucide-react';
import type { BoardCard, BoardFilter } from '../../../../shared/schemas/commissions';
import { Button } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock, Spinner } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { useStudioScope } from '../../../lib/studio-scope';
import { useAdvanceFigure } from '../api/advance-figure';
import { useBoard } from '../api/get-board';
import { BoardCardView, type CardData } from '../components/board-card';
import { BoardColumn } from '../components/board-column';

type Person = { id: number; name: string };

const colId = (key: string) => `col:${key}`;

/** Pointer first (what is under the finger), then overlap, so a drop lands where it looks like it does. */
const collision: CollisionDetection = (args) => {
  const hits = pointerWithin(args);
  return hits.length ? hits : rectIntersection(args);
};

export function BenchBoardRoute({ painters = [], cardTools }: { painters?: Person[]; cardTools?: (card: BoardCard) => ReactNode }) {
  const { studioId, timezone, role, userId } = useStudioScope();
  const [params, setParams] = useSearchParams();
  const filter: BoardFilter = {
    painterId: Number(params.get('painter')) || undefined,
    commissionId: Number(params.get('commission')) || undefined,
    dueBefore: params.get('due') || undefined,
  };
  const board = useBoard(studioId, filter);
  const advance = useAdvanceFigure(studioId);
  const toast = useToast();
  const [active, setActive] = useState<CardData | null>(null);

  // Filter choices remember everyone and everything seen on the board, so narrowing keeps the way back.
  const [seen, setSeen] = useState<{ data: unknown; painters: Map<number, string>; commissions: Map<number, string> }>({ data: null, painters: new Map(), commissions: new Map() });
  if (board.data && seen.data !== board.data) {
    const p = new Map(seen.painters);
    const c = new Map(seen.commissions);
    for (const col of board.data.columns)
      for (const card of col.cards) {
        if (card.painter) p.set(card.painter.id, card.painter.name);
        c.set(card.commission.id, card.commission.title);
      }
    setSeen({ data: board.data, painters: p, commissions: c });
  }
  const allPainters = new Map(seen.painters);
  for (const p of painters) allPainters.set(p.id, p.name);
  const painterOptions = [...allPainters].sort((a, b) => a[1].localeCompare(b[1]));
  const commissionOptions = [...seen.commissions].sort((a, b) => a[1].localeCompare(b[1]));

  const columns = useMemo(() => board.data?.columns ?? [], [board.data]);
  const names = columns.map((c) => c.name);

  // Arrow keys jump a picked-up card from column to column (their centres), instead of 25 px at a time.
  const coordinateGetter: KeyboardCoordinateGetter = (event, { context, currentCoordinates }) => {
    const from = (context.active?.data.current as CardData | undefined)?.columnIndex;
    if (from === undefined || !context.collisionRect) return undefined;
    const overIndex = context.over ? columns.findIndex((c) => colId(c.key) === context.over!.id) : from;
    let target: number;
    if (event.code === 'ArrowRight' || event.code === 'ArrowDown') target = Math.min(from + 1, (overIndex < 0 ? from : overIndex) + 1);
    else if (event.code === 'ArrowLeft' || event.code === 'ArrowUp') target = from;
    else return undefined;
    event.preventDefault();
    const rect = context.droppableRects.get(colId(columns[target]?.key ?? ''));
    if (!rect) return currentCoordinates;
    return { x: rect.left + 8, y: rect.top + 32 };
  };

  const sensors = useSensors(
    useSensor(PointerSensor, { activationConstraint: { distance: 6 } }),
    useSensor(KeyboardSensor, { coordinateGetter }),
  );

  // A moved card is drawn anew in its next column, so the control that had focus is gone. Focus follows the
  // card: its handle after a drag, its "done" button after a press (once it is enabled again), else its link.
  const follow = useRef<{ figureId: number; control: 'handle' | 'done' } | null>(null);
  useEffect(() => {
    const f = follow.current;
    if (!f) return;
    const lost = !document.activeElement || document.activeElement === document.body;
    if (lost) {
      const order = f.control === 'handle' ? ['handle', 'done', 'link'] : ['done', 'handle', 'link'];
      for (const control of order) {
        const el = document.querySelector<HTMLElement>(`[data-focus-key="${control}-${f.figureId}"]`);
        if (!el) continue;
        if (el.matches(':disabled')) return; // still saving: try again on the next render
        el.focus();
        break;
      }
    }
    if (!advance.isPending) follow.current = null;
  });

  async function moveOn(card: BoardCard, nextName: string | null, control: 'handle' | 'done') {
    follow.current = { figureId: card.figureId, control };
    try {
      await advance.mutateAsync(card.figureId);
      toast.show(nextName ? `${card.figureName}: ${card.stage?.name} done, now ${nextName}.` : `${card.figureName}: all stages done.`);
    } catch (err) {
      toast.show(err instanceof Error ? err.message : 'The card did not move. Try again.', 'error');
    }
  }

  function onDragStart(e: DragStartEvent) {
    setActive((e.active.data.current as CardData) ?? null);
  }

  function onDragEnd(e: DragEndEvent) {
    const data = e.active.data.current as CardData | undefined;
    setActive(null);
    if (!data || !e.over) return;
    const to = columns.findIndex((c) => colId(c.key) === e.over!.id);
    if (to === data.columnIndex + 1) void moveOn(data.card, data.nextName, 'handle');
  }

  const announcements: Announcements = {
    onDragStart: ({ active: a }) => {
      const d = a.data.current as CardData;
      return `Picked up ${d.card.figureName}, at ${names[d.columnIndex]}. Press the right arrow to put it over ${d.nextName}, then Space to drop it there. Escape puts it back.`;
    },
    onDragOver: ({ active: a, over }) => {
      const d = a.data.current as CardData;
      if (!over) return `${d.card.figureName} is not over a stage it can move to.`;
      return over.id === colId(columns[d.columnIndex].key) ? `${d.card.figureName} is back over ${names[d.columnIndex]}.` : `${d.card.figureName} is over ${over.data.current?.name}. Space drops it there and marks ${d.card.stage?.name} done.`;
    },
    onDragEnd: ({ active: a, over }) => {
      const d = a.data.current as CardData;
      return over && over.id !== colId(columns[d.columnIndex].key) ? `${d.card.figureName} moved to ${over.data.current?.name}.` : `${d.card.figureName} stays at ${names[d.columnIndex]}.`;
    },
    onDragCancel: ({ active: a }) => `Moving ${(a.data.current as CardData).card.figureName} was cancelled; it stays where it was.`,
  };

  // The date is typed part by part ("0002", "0020", "0203", "2030" on the way to a year): the field keeps
  // what is typed and the filter only takes a whole, plausible date (or an empty field), so typing is not undone.
  const [dueDraft, setDueDraft] = useState({ url: filter.dueBefore, value: filter.dueBefore ?? '' });
  if (dueDraft.url !== filter.dueBefore) setDueDraft({ url: filter.dueBefore, value: filter.dueBefore ?? '' });
  function typeDue(value: string) {
    setDueDraft((d) => ({ ...d, value }));
    if (value === '' || Number(value.slice(0, 4)) >= 2000) setFilter('due', value);
  }

  function setFilter(key: string, value: string) {
    setParams((p) => {
      const next = new URLSearchParams(p);
      if (value) next.set(key, value);
      else next.delete(key);
      return next;
    }, { replace: true });
  }

  const total = columns.reduce((n, c) => n + (c.key === 'done' ? 0 : c.cards.length), 0);
  const filtered = !!(filter.painterId || filter.commissionId || filter.dueBefore);

  return (
    <>
      <PageTitle
        title="Bench"
        description="Booked figures by the stage they are at. Mark a stage done, or drag a card on to the next stage."
        actions={
          role === 'painter' ? (
            // A toggle that stays in place, so keyboard focus is not lost when it is pressed.
            <Button variant="secondary" aria-pressed={filter.painterId === userId} className="aria-pressed:border-verdigris-600 aria-pressed:bg-verdigris-100" onClick={() => setFilter('painter', filter.painterId === userId ? '' : String(userId))}>
              Only my figures
            </Button>
          ) : undefined
        }
      />
      <form aria-label="Filter the bench" className="mb-4 grid gap-3 sm:grid-cols-3" onSubmit={(e) => e.preventDefault()}>
        <div>
          <label htmlFor="bench-painter" className="mb-1 block text-sm font-medium">
            Painter
          </label>
          <select id="bench-painter" value={filter.painterId ?? ''} onChange={(e) => setFilter('painter', e.target.value)} className="min-h-10 w-full rounded-control border border-sable-600 bg-white px-3 text-base">
            <option value="">Everyone</option>
            {painterOptions.map(([id, name]) => (
              <option key={id} value={id}>
                {id === userId ? `${name} (you)` : name}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="bench-commission" className="mb-1 block text-sm font-medium">
            Commission
          </label>
          <select id="bench-commission" value={filter.commissionId ?? ''} onChange={(e) => setFilter('commission', e.target.value)} className="min-h-10 w-full rounded-control border border-sable-600 bg-white px-3 text-base">
            <option value="">All booked commissions</option>
            {commissionOptions.map(([id, title]) => (
              <option key={id} value={id}>
                {title}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="bench-due" className="mb-1 block text-sm font-medium">
            Due on or before
          </label>
          <input id="bench-due" type="date" value={dueDraft.value} onChange={(e) => typeDue(e.target.value)} className="min-h-10 w-full rounded-control border border-sable-600 bg-white px-3 text-base" />
        </div>
        <p className="text-xs text-sable-600 sm:col-span-3" aria-live="polite">
          {board.data ? `${total} ${total === 1 ? 'figure' : 'figures'} on the bench${filtered ? ' with these filters' : ''}.` : ''}
          {board.isFetching && !board.isPending && <Spinner label="Updating…" className="ml-2" />}
        </p>
      </form>

      {board.isPending ? (
        <LoadingBlock label="Loading the bench…" />
      ) : board.error ? (
        <ErrorNote
          title="The bench did not load"
          action={
            <Button variant="secondary" size="sm" onClick={() => board.refetch()}>
              Try again
            </Button>
          }
        >
          {board.error.message}
        </ErrorNote>
      ) : total === 0 && !columns.some((c) => c.cards.length) ? (
        <EmptyState icon={<Brush className="size-8" />} title={filtered ? 'Nothing on the bench with these filters' : 'The bench is clear'}>
          {filtered ? 'Loosen a filter to see more.' : 'Figures show here once their commission is booked.'}
        </EmptyState>
      ) : (
        <DndContext sensors={sensors} collisionDetection={collision} onDragStart={onDragStart} onDragEnd={onDragEnd} onDragCancel={() => setActive(null)} accessibility={{ announcements, screenReaderInstructions: { draggable: 'To move this card to the next stage: press Space, then the right arrow, then Space again. Escape puts it back. The “done” button beside it does the same in one press.' } }}>
          <div role="region" aria-label="Bench board" className="grid items-start gap-3 sm:grid-cols-2 lg:grid-cols-3 xl:grid-cols-4">
            {columns.map((col, i) => {
              const next = columns[i + 1]?.name ?? null;
              const isTarget = active !== null && (i === active.columnIndex + 1 || i === active.columnIndex);
              return (
                <BoardColumn key={col.key} id={colId(col.key)} name={col.name} count={col.cards.length} enabled={isTarget} highlight={active !== null && i === active.columnIndex + 1}>
                  {col.cards.map((card) => (
                    <BoardCardView
                      key={card.figureId}
                      card={card}
                      columnIndex={i}
                      nextName={col.key === 'done' ? null : next}
                      timezone={timezone}
                      advancing={advance.isPending && advance.variables === card.figureId}
                      onAdvance={() => void moveOn(card, next, 'done')}
                      tools={card.stage ? cardTools?.(card) : undefined}
                    />
                  ))}
                </BoardColumn>
              );
            })}
          </div>
        </DndContext>
      )}
    </>
  );
}
