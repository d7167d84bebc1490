import { progressFromTotals, waitUntil } from '../../../shared/commission-lifecycle';
import { sortHazards } from '../../../shared/hazards';
import type { Board, BoardCard, BoardQuery } from '../../../shared/schemas/commissions';
import type { Clock } from '../../lib/clock';
import { holdsKept } from '../../lib/kept-json';
import { keptReads } from '../../lib/version-cache';
import type { StudioSetupService } from '../studio-setup/studio-setup.service';
import { parseKeys } from '../studio-setup/studio-setup.repository';
import type { BoardRepository, BoardWaitRow } from './board.repository';
import { groupBy } from '../../lib/group-by';

/** The end of a wait from an earlier done stage that still runs: the figure should not go on before it. */
function waitingUntil(waits: BoardWaitRow[], position: number, now: Date): string | null {
  let until: string | null = null;
  for (const s of waits) {
    if (s.position >= position || s.status !== 'done') continue;
    const end = waitUntil(s.done_at, s.wait_minutes);
    if (!end || new Date(end) <= now) continue;
    if (!until || end > until) until = end;
  }
  return until;
}

/** A card as kept: everything but the wait, with the waits it is worked out from and the card's column. */
type KeptCard = {
  /** The card with `waitUntil` null; answered as it is when no wait can apply. */
  card: BoardCard;
  /** The template key of the card's column; null for the done column. */
  column: string | null;
  columnName: string;
  position: number;
  /** The waits of earlier stages that may still run, or null when there are none. */
  waits: BoardWaitRow[] | null;
};
/** What the board read from the database for one studio, version and query, frozen. */
type Kept = { template: { key: string; name: string }[]; cards: KeptCard[]; total: number };

/** The cache key of a query: every field of it, in a fixed order. */
const keyOf = (q: BoardQuery) => [q.limit, q.offset, q.painterId ?? '', q.commissionId ?? '', q.dueBefore ?? ''].join('|');

/**
 * The bench board reads what its cards show and no more: a page of figures with their commission,
 * painter, stage totals and current stage (the figure row keeps the totals and which stage is current, by
 * triggers: migrations/20270202120000-figure-totals.ts) and how many there are, the page's waits, the
 * studio's stage template. It does not build whole figure views (every stage with who did
 * it and its logged time), which the commission page needs and a card does not; the card's progress is the
 * same sum over the same stages.
 *
 * What it read is kept in memory (`cacheRows`: rows held across studios and queries, default 50,000; 0:
 * no cache) under the studio's schedule version, which database triggers move with every write to a row
 * the board reads (migrations/20270203120000-board-version.ts lists them); while the version stands, a
 * request reads only the version. The cards are put together per request with the clock, since a wait
 * that runs out changes a card without any write.
 */
export function boardService(deps: { repo: BoardRepository; setup: StudioSetupService; clock: Clock; cacheRows?: number }) {
  const { repo, setup, clock } = deps;
  const maxRows = deps.cacheRows ?? 50_000;
  const kept = keptReads<Kept>({ version: repo.version, maxWeight: maxRows, weigh: (k) => k.cards.length + k.template.length + 1 });

  async function read(studioId: number, q: BoardQuery): Promise<Kept> {
    const [rows, total] = await Promise.all([repo.page(studioId, q), repo.count(studioId, q)]);
    const waits = rows.length ? await repo.waits(studioId, rows.map((r) => r.figure_id)) : [];
    const waitsOf = groupBy(waits, (w) => w.figure_id);
    const template = (await setup.template(studioId)).map((s) => ({ key: s.key, name: s.name }));
    const cards = rows.map((r): KeptCard => {
      const card: BoardCard = {
        figureId: r.figure_id,
        figureName: r.name,
        quantity: r.quantity,
        commission: { id: r.commission_id, title: r.title, dueDate: r.due_date },
        painter: r.painter_id !== null && r.painter_name !== null ? { id: r.painter_id, name: r.painter_name } : null,
        stage: r.stage_id === null ? null : { id: r.stage_id, name: r.stage_name!, status: r.stage_status!, hazards: sortHazards(parseKeys(r.stage_hazards)), waitUntil: null },
        progress: progressFromTotals({ stages: r.stage_count, skipped: r.stages_skipped, done: r.stages_done, minutesTotal: r.minutes_total, minutesDone: r.minutes_done }),
      };
      if (r.stage_id === null) return { card, column: null, columnName: 'Done', position: 0, waits: null };
      // Only done stages before the current one can make it wait; the rest never will at this version.
      const before = (waitsOf.get(r.figure_id) ?? []).filter((w) => w.position < r.stage_position! && w.status === 'done');
      return { card, column: r.template_key!, columnName: r.stage_name!, position: r.stage_position!, waits: before.length ? before : null };
    });
    return { template, cards, total };
  }

  return {
    /** Columns are the template's stages in order, then any stage no longer in the template, then "done". */
    async get(studioId: number, q: BoardQuery): Promise<Board> {
      const k = await kept(studioId, keyOf(q), () => read(studioId, q));
      const columns = new Map<string, { key: string; name: string; cards: BoardCard[] }>();
      for (const s of k.template) columns.set(s.key, { key: s.key, name: s.name, cards: [] });
      const done: BoardCard[] = [];
      const now = clock.now();
      for (const c of k.cards) {
        if (c.column === null) {
          done.push(c.card);
          continue;
        }
        const until = c.waits ? waitingUntil(c.waits, c.position, now) : null;
        const card = until === null ? c.card : { ...c.card, stage: { ...c.card.stage!, waitUntil: until } };
        if (!columns.has(c.column)) columns.set(c.column, { key: c.column, name: c.columnName, cards: [] });
        columns.get(c.column)!.cards.push(card);
      }
      // the cards without a wait are the kept ones: their JSON is kept with them (server/lib/kept-json.ts)
      return holdsKept({ columns: [...columns.values(), { key: 'done', name: 'Done', cards: done }], total: k.total, limit: q.limit, offset: q.offset });
    },
  };
}

export type BoardService = ReturnType<typeof boardService>;
