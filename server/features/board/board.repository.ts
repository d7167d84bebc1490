import { boardStatuses, type Priority, type StageStatus } from '../../../shared/commission-lifecycle';
import type { BoardQuery } from '../../../shared/schemas/commissions';
import type { Db } from '../../lib/db';
import { pageRows } from '../../lib/page';

export type BoardFigureRow = {
  figure_id: number;
  name: string;
  quantity: number;
  painter_id: number | null;
  painter_name: string | null;
  commission_id: number;
  title: string;
  due_date: string | null;
  priority: Priority;
};

/** What a card needs of each stage: no one's name, no logged time (the card shows neither). */
export type BoardStageRow = {
  id: number;
  figure_id: number;
  template_key: string;
  name: string;
  position: number;
  status: StageStatus;
  estimate_minutes: number;
  wait_minutes: number;
  done_at: string | null;
  hazards: string | null;
};

export function boardRepository(db: Db) {
  return {
    /**
     * One page of the figures of the studio's booked and on-the-bench commissions, filtered, in the board's
     * order (due date with undated last, then priority, commission and figure), with their painters, and how
     * many there are.
     */
    figures(studioId: number, q: BoardQuery): Promise<{ rows: BoardFigureRow[]; total: number }> {
      const qb = db('figures as f')
        .join('commissions as c', 'c.id', 'f.commission_id')
        .leftJoin('users as p', 'p.id', 'f.painter_id')
        .where('f.studio_id', studioId)
        .whereIn('c.status', boardStatuses)
        .select('f.id as figure_id', 'f.name', 'f.quantity', 'f.painter_id', 'p.name as painter_name', 'c.id as commission_id', 'c.title', 'c.due_date', 'c.priority')
        .orderByRaw("case when c.due_date is null then 1 else 0 end, c.due_date, case c.priority when 'high' then 0 when 'normal' then 1 else 2 end, c.id, f.id");
      if (q.painterId) qb.where('f.painter_id', q.painterId);
      if (q.commissionId) qb.where('c.id', q.commissionId);
      if (q.dueBefore) qb.whereNotNull('c.due_date').where('c.due_date', '<=', q.dueBefore);
      return pageRows<BoardFigureRow>(qb, q);
    },
    /** The stages of some figures of the studio, by figure and position: one query. */
    stages: (studioId: number, figureIds: number[]) =>
      db('stages')
        .where('studio_id', studioId)
        .whereIn('figure_id', figureIds)
        .select('id', 'figure_id', 'template_key', 'name', 'position', 'status', 'estimate_minutes', 'wait_minutes', 'done_at', 'hazards')
        .orderBy([{ column: 'figure_id' }, { column: 'position' }]) as Promise<BoardStageRow[]>,
  };
}

export type BoardRepository = ReturnType<typeof boardRepository>;
