import { readFirst, type Db } from '../../lib/db';
import type { PageParams } from '../../../shared/schemas/common';
import { pageRows } from '../../lib/page';

export type ActivityRow = {
  id: number;
  at: string;
  user_id: number | null;
  user_name: string | null;
  action: string;
  detail: string;
};

export function activityRepository(db: Db) {
  return {
    insert: (trx: Db, e: { studioId: number; commissionId: number | null; userId: number | null; action: string; detail: Record<string, unknown>; at: string }) =>
      trx('activity').insert({ studio_id: e.studioId, commission_id: e.commissionId, user_id: e.userId, action: e.action, detail: JSON.stringify(e.detail), at: e.at }),
    /**
     * The commission's client and thread version (migrations/20270209120000-thread-version.ts), in one read on
     * the read-only connection: the access check (the commission with its client in this studio, as the
     * commissions' own read joins them) and the kept log's key. Undefined when there is no such commission.
     */
    thread: (studioId: number, commissionId: number) =>
      readFirst<{ client_id: number; thread_version: number | string }>(
        db,
        db('commissions as c').join('clients as cl', 'cl.id', 'c.client_id').where({ 'c.studio_id': studioId, 'c.id': commissionId }).select('c.client_id', 'c.thread_version'),
      ),
    /** Newest first. */
    list: (studioId: number, commissionId: number, q: PageParams) =>
      pageRows<ActivityRow>(
        db('activity as a')
          .leftJoin('users as u', 'u.id', 'a.user_id')
          .where({ 'a.studio_id': studioId, 'a.commission_id': commissionId })
          .orderBy([{ column: 'a.at', order: 'desc' }, { column: 'a.id', order: 'desc' }])
          .select('a.id', 'a.at', 'a.user_id', 'u.name as user_name', 'a.action', 'a.detail'),
        q,
      ),
  };
}

export type ActivityRepository = ReturnType<typeof activityRepository>;
