import { currentStage, progressOf, waitUntil } from '../../../shared/commission-lifecycle';
import { sortHazards } from '../../../shared/hazards';
import type { Board, BoardCard, BoardQuery } from '../../../shared/schemas/commissions';
import type { Clock } from '../../lib/clock';
import type { StudioSetupService } from '../studio-setup/studio-setup.service';
import { parseKeys } from '../studio-setup/studio-setup.repository';
import type { BoardRepository, BoardStageRow } from './board.repository';

/** The end of a wait from an earlier done stage that still runs: the figure should not go on before it. */
function waitingUntil(stages: BoardStageRow[], position: number, now: Date): string | null {
  let until: string | null = null;
  for (const s of stages) {
    if (s.position >= position || s.status !== 'done') continue;
    const end = waitUntil(s.done_at, s.wait_minutes);
    if (!end || new Date(end) <= now) continue;
    if (!until || end > until) until = end;
  }
  return until;
}

/**
 * The bench board reads what its cards show and no more: a page of figures with their commission and
 * painter (one query and its count), the page's stages (one query), the studio's stage template. It does
 * not build whole figure views (every stage with who did it and its logged time), which the commission
 * page needs and a card does not; the card's progress is the same sum over the same stages.
 */
export function boardService(deps: { repo: BoardRepository; setup: StudioSetupService; clock: Clock }) {
  const { repo, setup, clock } = deps;
  return {
    /** Columns are the template's stages in order, then any stage no longer in the template, then "done". */
    async get(studioId: number, q: BoardQuery): Promise<Board> {
      const { rows, total } = await repo.figures(studioId, q);
      const stagesOf = new Map<number, BoardStageRow[]>(rows.map((r) => [r.figure_id, []]));
      for (const s of rows.length ? await repo.stages(studioId, rows.map((r) => r.figure_id)) : []) stagesOf.get(s.figure_id)!.push(s);

      const columns = new Map<string, { key: string; name: string; cards: BoardCard[] }>();
      for (const s of await setup.template(studioId)) columns.set(s.key, { key: s.key, name: s.name, cards: [] });
      const done: BoardCard[] = [];
      const now = clock.now();
      for (const r of rows) {
        const stages = stagesOf.get(r.figure_id)!;
        const current = currentStage(stages);
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
            waitUntil: waitingUntil(stages, current.position, now),
          },
          progress: progressOf(stages.map((s) => ({ status: s.status, estimateMinutes: s.estimate_minutes }))),
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
