import type { Comment } from '../../../shared/schemas/comments';
import type { PageParams, Role } from '../../../shared/schemas/common';
import { readFirst, type Db } from '../../lib/db';
import { pageRows } from '../../lib/page';

type CommentRow = { id: number; user_id: number | null; user_name: string | null; role: Role | null; body: string; created_at: string };

const toComment = (r: CommentRow): Comment => ({
  id: r.id,
  user: r.user_id !== null && r.user_name ? { id: r.user_id, name: r.user_name, role: r.role ?? null } : null,
  body: r.body,
  createdAt: r.created_at,
});

export function commentsRepository(db: Db) {
  const base = (studioId: number, trx: Db = db) =>
    trx('comments as k')
      .leftJoin('users as u', 'u.id', 'k.user_id')
      .leftJoin('memberships as m', function () {
        this.on('m.user_id', '=', 'k.user_id').andOn('m.studio_id', '=', 'k.studio_id');
      })
      .where('k.studio_id', studioId)
      .select('k.id', 'k.user_id', 'u.name as user_name', 'm.role', 'k.body', 'k.created_at');
  return {
    /**
     * The commission's client and thread version (migrations/20270209120000-thread-version.ts), in one read on
     * the read-only connection: the access check and the kept thread's key. Undefined when the studio has no such commission.
     */
    thread: (studioId: number, commissionId: number) =>
      readFirst<{ client_id: number; thread_version: number | string }>(db, db('commissions').where({ studio_id: studioId, id: commissionId }).select('client_id', 'thread_version')),
    commission: (studioId: number, commissionId: number) =>
      db('commissions').where({ studio_id: studioId, id: commissionId }).first('id', 'client_id', 'title') as Promise<{ id: number; client_id: number; title: string } | undefined>,
    /** One page of the thread, oldest first. */
    list: (studioId: number, commissionId: number, q: PageParams) =>
      pageRows<CommentRow>(base(studioId).where('k.commission_id', commissionId).orderBy([{ column: 'k.created_at' }, { column: 'k.id' }]), q).then((p) => ({ rows: p.rows.map(toComment), total: p.total })),
    get: (studioId: number, id: number, trx: Db = db) =>
      base(studioId, trx)
        .where('k.id', id)
        .first()
        .then((r) => (r ? toComment(r as CommentRow) : undefined)),
    async insert(row: { studio_id: number; commission_id: number; user_id: number; body: string; created_at: string }, trx: Db) {
      const [r] = await trx('comments').insert(row).returning('id');
      return typeof r === 'object' ? (r.id as number) : (r as number);
    },
    logActivity: (trx: Db, a: { studioId: number; commissionId: number; userId: number; action: string; detail: object; at: string }) =>
      trx('activity').insert({ studio_id: a.studioId, commission_id: a.commissionId, user_id: a.userId, action: a.action, detail: JSON.stringify(a.detail), at: a.at }),
  };
}

export type CommentsRepository = ReturnType<typeof commentsRepository>;
