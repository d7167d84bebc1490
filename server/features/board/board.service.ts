import { progressFromTotals, waitUntil } from '../../../shared/commission-lifecycle';
import { sortHazards } from '../../../shared/hazards';
import type { Board, BoardCard, BoardQuery } from '../../../shared/schemas/commissions';
import type { Clock } from '../../lib/clock';
import type { StudioSetupService } from '../studio-setup/studio-setup.service';
import { parseKeys } from '../studio-setup/studio-setup.repository';
import type { BoardRepository, BoardStageRow, BoardWaitRow } from './board.repository';

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

/**
 * The bench board reads what its cards show and no more: a page of figures with their commission and
 * painter (one query and its count), the page's stage totals, current stages and waits (three grouped or
 * filtered queries), the studio's stage template. It does not build whole figure views (every stage with
 * who did it and its logged time), which the commission page needs and a card does not; the card's
 * progress is the same sum over the same stages.
 */
export function boardService(deps: { repo: BoardRepository; setup: StudioSetupService; clock: Clock }) {
  const { repo, setup, clock } = deps;
  return {
    /** Columns are the template's stages in order, then any stage no longer in the template, then "done". */
    async get(studioId: number, q: BoardQuery): Promise<Board> {
      const { rows, total } = await repo.figures(studioId, q);
      const ids = rows.map((r) => r.figure_id);
      const [totals, current, waits] = ids.length ? await Promise.all([repo.totals(studioId, ids), repo.current(studioId, ids), repo.waits(studioId, ids)]) : [[], [], []];
      const totalsOf = new Map(totals.map((t) => [Number(t.figure_id), t]));
      const currentOf = new Map<number, BoardStageRow>();
      for (const s of current) if (!currentOf.has(s.figure_id)) currentOf.set(s.figure_id, s); // the lowest id if two share a place
      const waitsOf = new Map<number, BoardWaitRow[]>();
      for (const w of waits) {
        const list = waitsOf.get(w.figure_id);
        if (list) list.push(w);
        else waitsOf.set(w.figure_id, [w]);
      }

      const columns = new Map<string, { key: string; name: string; cards: BoardCard[] }>();
      for (const s of await setup.template(studioId)) columns.set(s.key, { key: s.key, name: s.name, cards: [] });
      const done: BoardCard[] = [];
      const now = clock.now();
      for (const r of rows) {
        const t = totalsOf.get(r.figure_id);
        const current = currentOf.get(r.figure_id) ?? null;
        const card: BoardCard = {
          figureId: r.figure_id,
          figureName: r.name,
          quantity: r.quantity,
          commission: { id: r.commission_id, title: r.title, dueDate: r.due_date },
          painter: r.painter_id !== null && r.painter_name !== null ? { id: r.painter_id, name: r.painter_name } : null,
          stage: current && {
            id: current.id,
            name: current.name,
            status: current.status,
            hazards: sortHazards(parseKeys(current.hazards)),
            waitUntil: waitingUntil(waitsOf.get(r.figure_id) ?? [], current.position, now),
          },
          progress: progressFromTotals({
            stages: Number(t?.stages ?? 0),
            skipped: Number(t?.skipped ?? 0),
            done: Number(t?.done ?? 0),
            minutesTotal: Number(t?.minutes_total ?? 0),
            minutesDone: Number(t?.minutes_done ?? 0),
          }),
        };
        if (!current) {
          done.push(card);
          continue;
        }
        if (!columns.has(current.template_key)) columns.set(current.template_key, { key: current.template_key, name: current.name, cards: [] });
        columns.get(current.template_key)!.cards.push(card);
      }
      return { columns: [...columns.values(), { key: 'done', name: 'Done', cards: done }], total, limit: q.limit, offset: q.offset };
    },
  };
}

export type BoardService = ReturnType<typeof boardService>;
