import { progressFromTotals, waitUntil } from '../../../shared/commission-lifecycle';
import { sortHazards } from '../../../shared/hazards';
import type { Board, BoardCard, BoardQuery } from '../../../shared/schemas/commissions';
import type { Clock } from '../../lib/clock';
import type { StudioSetupService } from '../studio-setup/studio-setup.service';
import { parseKeys } from '../studio-setup/studio-setup.repository';
import type { BoardRepository, BoardWaitRow } from './board.repository';

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
 * The bench board reads what its cards show and no more: a page of figures with their commission,
 * painter, stage totals and current stage (the figure row keeps the totals and which stage is current, by
 * triggers: migrations/20270202120000-figure-totals.ts) and how many there are, the page's waits, the
 * studio's stage template. It does not build whole figure views (every stage with who did
 * it and its logged time), which the commission page needs and a card does not; the card's progress is the
 * same sum over the same stages.
 */
export function boardService(deps: { repo: BoardRepository; setup: StudioSetupService; clock: Clock }) {
  const { repo, setup, clock } = deps;
  return {
    /** Columns are the template's stages in order, then any stage no longer in the template, then "done". */
    async get(studioId: number, q: BoardQuery): Promise<Board> {
      const [rows, total] = await Promise.all([repo.page(studioId, q), repo.count(studioId, q)]);
      const waits = rows.length ? await repo.waits(studioId, rows.map((r) => r.figure_id)) : [];
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
        const card: BoardCard = {
          figureId: r.figure_id,
          figureName: r.name,
          quantity: r.quantity,
          commission: { id: r.commission_id, title: r.title, dueDate: r.due_date },
          painter: r.painter_id !== null && r.painter_name !== null ? { id: r.painter_id, name: r.painter_name } : null,
          stage:
            r.stage_id === null
              ? null
              : {
                  id: r.stage_id,
                  name: r.stage_name!,
                  status: r.stage_status!,
                  hazards: sortHazards(parseKeys(r.stage_hazards)),
                  waitUntil: waitingUntil(waitsOf.get(r.figure_id) ?? [], r.stage_position!, now),
                },
          progress: progressFromTotals({ stages: r.stage_count, skipped: r.stages_skipped, done: r.stages_done, minutesTotal: r.minutes_total, minutesDone: r.minutes_done }),
        };
        if (r.stage_id === null) {
          done.push(card);
          continue;
        }
        const key = r.template_key!;
        if (!columns.has(key)) columns.set(key, { key, name: r.stage_name!, cards: [] });
        columns.get(key)!.cards.push(card);
      }
      return { columns: [...columns.values(), { key: 'done', name: 'Done', cards: done }], total, limit: q.limit, offset: q.offset };
    },
  };
}

export type BoardService = ReturnType<typeof boardService>;
