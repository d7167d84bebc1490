import { boardStatuses, type Priority } from '../../../shared/commission-lifecycle';
import type { BoardQuery } from '../../../shared/schemas/commissions';
import type { Db } from '../../lib/db';
import { pageRows } from '../../lib/page';

export type BoardFigureRow = { figure_id: number; commission_id: number; title: string; due_date: string | null; priority: Priority };

export function boardRepository(db: Db) {
  return {
    /**
     * One page of the figures of the studio's booked and on-the-bench commissions, filtered, in the board's
     * order (due date with undated last, then priority, commission and figure), and how many there are.
     */
    figures(studioId: number, q: BoardQuery): Promise<{ rows: BoardFigureRow[]; total: number }> {
      const qb = db('figures as f')
        .join('commissions as c', 'c.id', 'f.commission_id')
        .where('f.studio_id', studioId)
        .whereIn('c.status', boardStatuses)
        .select('f.id as figure_id', 'c.id as commission_id', 'c.title', 'c.due_date', 'c.priority')
        .orderByRaw("case when c.due_date is null then 1 else 0 end, c.due_date, case c.priority when 'high' then 0 when 'normal' then 1 else 2 end, c.id, f.id");
      if (q.painterId) qb.where('f.painter_id', q.painterId);
      if (q.commissionId) qb.where('c.id', q.commissionId);
      if (q.dueBefore) qb.whereNotNull('c.due_date').where('c.due_date', '<=', q.dueBefore);
      return pageRows<BoardFigureRow>(qb, q);
    },
  };
}

export type BoardRepository = ReturnType<typeof boardRepository>;
