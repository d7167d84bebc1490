import { boardStatuses, type Priority } from '../../../shared/commission-lifecycle';
import type { BoardQuery } from '../../../shared/schemas/commissions';
import type { Db } from '../../lib/db';

export type BoardFigureRow = { figure_id: number; commission_id: number; title: string; due_date: string | null; priority: Priority };

export function boardRepository(db: Db) {
  return {
    /** The figures of the studio's booked and on-the-bench commissions, filtered. */
    figures(studioId: number, q: BoardQuery): Promise<BoardFigureRow[]> {
      const qb = db('figures as f')
        .join('commissions as c', 'c.id', 'f.commission_id')
        .where('f.studio_id', studioId)
        .whereIn('c.status', boardStatuses)
        .select('f.id as figure_id', 'c.id as commission_id', 'c.title', 'c.due_date', 'c.priority');
      if (q.painterId) qb.where('f.painter_id', q.painterId);
      if (q.commissionId) qb.where('c.id', q.commissionId);
      if (q.dueBefore) qb.whereNotNull('c.due_date').where('c.due_date', '<=', q.dueBefore);
      return qb;
    },
  };
}

export type BoardRepository = ReturnType<typeof boardRepository>;
