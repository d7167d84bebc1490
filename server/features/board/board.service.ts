import type { Board, BoardCard, BoardQuery, Figure } from '../../../shared/schemas/commissions';
import type { Clock } from '../../lib/clock';
import type { FiguresService } from '../figures/figures.service';
import type { StudioSetupService } from '../studio-setup/studio-setup.service';
import type { BoardFigureRow, BoardRepository } from './board.repository';

/** The end of a wait from an earlier stage that still runs: the figure should not go on before it. */
function waitingUntil(f: Figure, position: number, now: Date): string | null {
  let until: string | null = null;
  for (const s of f.stages) {
    if (s.position >= position || !s.waitUntil || new Date(s.waitUntil) <= now) continue;
    if (!until || s.waitUntil > until) until = s.waitUntil;
  }
  return until;
}

export function boardService(deps: { repo: BoardRepository; figures: FiguresService; setup: StudioSetupService; clock: Clock }) {
  const { repo, figures, setup, clock } = deps;
  return {
    /** Columns are the template's stages in order, then any stage no longer in the template, then "done". */
    async get(studioId: number, q: BoardQuery): Promise<Board> {
      const { rows, total } = await repo.figures(studioId, q);
      const byFigure = new Map<number, BoardFigureRow>(rows.map((r) => [r.figure_id, r]));
      const place = new Map(rows.map((r, i) => [r.figure_id, i]));
      // The page is read in the board's order; the figures' stages come back for the page's figures only.
      const views = rows.length ? (await figures.views(studioId, { figureIds: rows.map((r) => r.figure_id) }, false)).figures : [];
      views.sort((a, b) => place.get(a.id)! - place.get(b.id)!);

      const columns = new Map<string, { key: string; name: string; cards: BoardCard[] }>();
      for (const s of await setup.template(studioId)) columns.set(s.key, { key: s.key, name: s.name, cards: [] });
      const done: BoardCard[] = [];
      const now = clock.now();
      for (const f of views) {
        const r = byFigure.get(f.id)!;
        const current = f.stages.find((s) => s.id === f.currentStageId) ?? null;
        const card: BoardCard = {
          figureId: f.id,
          figureName: f.name,
          quantity: f.quantity,
          commission: { id: r.commission_id, title: r.title, dueDate: r.due_date },
          painter: f.painter,
          stage: current && { id: current.id, name: current.name, status: current.status, hazards: current.hazards, waitUntil: waitingUntil(f, current.position, now) },
          progress: f.progress,
        };
        if (!current) {
          done.push(card);
          continue;
        }
        if (!columns.has(current.key)) columns.set(current.key, { key: current.key, name: current.name, cards: [] });
        columns.get(current.key)!.cards.push(card);
      }
      return { columns: [...columns.values(), { key: 'done', name: 'Done', cards: done }], total, limit: q.limit, offset: q.offset };
    },
  };
}

export type BoardService = ReturnType<typeof boardService>;
