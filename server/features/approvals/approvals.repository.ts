import type { Approval, ApprovalStatus, ApprovalSubject } from '../../../shared/schemas/approvals';
import type { Db } from '../../lib/db';
import type { PageParams } from '../../../shared/schemas/common';
import { pageRows } from '../../lib/page';

type ApprovalRow = {
  id: number;
  studio_id: number;
  commission_id: number;
  subject: ApprovalSubject;
  status: ApprovalStatus;
  request_note: string | null;
  requested_by: number | null;
  requested_by_name: string | null;
  requested_at: string;
  decided_by: number | null;
  decided_by_name: string | null;
  decided_at: string | null;
  comment: string | null;
};

const person = (id: number | null, name: string | null) => (id !== null && name ? { id, name } : null);

export const toApproval = (r: ApprovalRow): Approval => ({
  id: r.id,
  commissionId: r.commission_id,
  subject: r.subject,
  status: r.status,
  requestNote: r.request_note,
  requestedBy: person(r.requested_by, r.requested_by_name),
  requestedAt: r.requested_at,
  decidedBy: person(r.decided_by, r.decided_by_name),
  decidedAt: r.decided_at,
  comment: r.comment,
});

export type CommissionRef = { id: number; client_id: number; title: string; status: string; status_before_hold: string | null };

export function approvalsRepository(db: Db) {
  const base = (studioId: number, trx: Db = db) =>
    trx('approvals as a')
      .leftJoin('users as rq', 'rq.id', 'a.requested_by')
      .leftJoin('users as dc', 'dc.id', 'a.decided_by')
      .where('a.studio_id', studioId)
      .select('a.*', 'rq.name as requested_by_name', 'dc.name as decided_by_name');
  return {
    commission: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('commissions').where({ studio_id: studioId, id: commissionId }).first('id', 'client_id', 'title', 'status', 'status_before_hold') as Promise<CommissionRef | undefined>,
    /** One page of the requests, oldest first. */
    list: (studioId: number, commissionId: number, q: PageParams) =>
      pageRows<ApprovalRow>(base(studioId).where('a.commission_id', commissionId).orderBy([{ column: 'a.requested_at' }, { column: 'a.id' }]), q).then((p) => ({ rows: p.rows.map(toApproval), total: p.total })),
    get: (studioId: number, id: number, trx: Db = db) =>
      base(studioId, trx)
        .where('a.id', id)
        .first()
        .then((r) => (r ? toApproval(r as ApprovalRow) : undefined)),
    openFor: (studioId: number, commissionId: number, subject: ApprovalSubject, trx: Db) =>
      trx('approvals').where({ studio_id: studioId, commission_id: commissionId, subject, status: 'requested' }).first('id'),
    async insert(row: { studio_id: number; commission_id: number; subject: ApprovalSubject; request_note: string | null; requested_by: number; requested_at: string }, trx: Db) {
      const [r] = await trx('approvals').insert({ ...row, status: 'requested' }).returning('id');
      return typeof r === 'object' ? (r.id as number) : (r as number);
    },
    /** Decides only a request still open; returns how many rows changed (0: someone decided first). */
    decide: (studioId: number, id: number, d: { status: ApprovalStatus; decided_by: number; decided_at: string; comment: string | null }, trx: Db) =>
      trx('approvals').where({ studio_id: studioId, id, status: 'requested' }).update(d),
    logActivity: (trx: Db, a: { studioId: number; commissionId: number; userId: number; action: string; detail: object; at: string }) =>
      trx('activity').insert({ studio_id: a.studioId, commission_id: a.commissionId, user_id: a.userId, action: a.action, detail: JSON.stringify(a.detail), at: a.at }),
  };
}

export type ApprovalsRepository = ReturnType<typeof approvalsRepository>;
