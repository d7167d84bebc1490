import type { CommissionStatus } from '../../../shared/commission-lifecycle';
import type { Db } from '../../lib/db';
import { booksVersion } from '../../lib/version-cache';

/** Small read-only queries for the home pages; every query takes the studio id first. */
export function dashboardRepository(db: Db) {
  return {
    /** The version the owner's home is kept under (schedule_version + books_version). */
    version: (studioId: number) => booksVersion(db, studioId),

    byStatus: (studioId: number) =>
      db('commissions').where({ studio_id: studioId }).groupBy('status').orderBy('status').select('status').count({ n: '*' }) as Promise<{ status: CommissionStatus; n: number | string }[]>,

    /** The first `limit` stages not done or skipped, of queued commissions whose due date is before `today`, and how many there are. */
    async overdueStages(studioId: number, today: string, limit: number) {
      const overdue = () =>
        db('stages as s')
          .join('commissions as c', 'c.id', 's.commission_id')
          .where('s.studio_id', studioId)
          .whereIn('s.status', ['todo', 'working'])
          .whereIn('c.status', ['booked', 'on_bench'])
          .whereNotNull('c.due_date')
          .where('c.due_date', '<', today);
      const [count, items] = await Promise.all([
        overdue().count({ n: '*' }).first(),
        overdue()
          .join('figures as f', 'f.id', 's.figure_id')
          .leftJoin('users as u', 'u.id', 'f.painter_id')
          .orderBy([{ column: 'c.due_date' }, { column: 'c.id' }, { column: 'f.position' }, { column: 's.position' }])
          .limit(limit)
          .select('s.id as stage_id', 's.name as stage_name', 'f.id as figure_id', 'f.name as figure_name', 'c.id as commission_id', 'c.title', 'c.due_date', 'u.id as painter_id', 'u.name as painter_name') as Promise<
          { stage_id: number; stage_name: string; figure_id: number; figure_name: string; commission_id: number; title: string; due_date: string; painter_id: number | null; painter_name: string | null }[]
        >,
      ]);
      return { total: Number(count?.n ?? 0), items };
    },

    runningTimer: (studioId: number, userId: number) =>
      db('time_entries as t')
        .join('stages as s', 's.id', 't.stage_id')
        .join('figures as f', 'f.id', 't.figure_id')
        .join('commissions as c', 'c.id', 't.commission_id')
        .where({ 't.studio_id': studioId, 't.user_id': userId })
        .whereNull('t.ended_at')
        .orderBy('t.started_at', 'desc')
        .first('t.id', 't.started_at', 's.id as stage_id', 's.name as stage_name', 'f.id as figure_id', 'f.name as figure_name', 'c.id as commission_id', 'c.title') as Promise<
        { id: number; started_at: string; stage_id: number; stage_name: string; figure_id: number; figure_name: string; commission_id: number; title: string } | undefined
      >,

    /** A client's commissions that are still going (not closed or cancelled), newest first. */
    clientCommissions: (studioId: number, clientId: number) =>
      db('commissions')
        .where({ studio_id: studioId, client_id: clientId })
        .whereNotIn('status', ['closed', 'cancelled'])
        .orderBy([{ column: 'created_at', order: 'desc' }, { column: 'id', order: 'desc' }])
        .select('id', 'title', 'status', 'due_date') as Promise<{ id: number; title: string; status: CommissionStatus; due_date: string | null }[]>,
  };
}

export type DashboardRepository = ReturnType<typeof dashboardRepository>;
