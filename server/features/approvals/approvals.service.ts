import { canTransition, lockedStatuses, type CommissionStatus } from '../../../shared/commission-lifecycle';
import { approvalSubjectLabels, type ApproveInput, type RequestApprovalInput, type RequestChangesInput } from '../../../shared/schemas/approvals';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import type { PageParams } from '../../../shared/schemas/common';
import { pageOf } from '../../lib/page';
import { AppError, errors } from '../../lib/errors';
import type { Member } from '../../lib/policy';
import { quote, type NoticesService } from '../notices/notices.service';
import type { ApprovalsRepository } from './approvals.repository';

type Person = { id: number; name: string };
/** Moves a commission through the lifecycle (the commissions feature's rules, its own transaction and log). */
export type FinishCommission = (actor: Member & { userId: number }, commissionId: number) => Promise<unknown>;

/**
 * Approvals the studio asks of the client: the colour scheme, a test figure, the finished work. The
 * client approves or asks for changes with a comment; each decision is kept with its time and person.
 * An approved "finished" moves the commission on to ready to ship.
 */
export function approvalsService(deps: { db: Db; repo: ApprovalsRepository; notices: NoticesService; clock: Clock; finishCommission: FinishCommission }) {
  const { db, repo, notices, clock } = deps;
  const now = () => iso(clock.now());

  async function commissionFor(m: Member, commissionId: number, trx: Db = db) {
    const c = await repo.commission(m.studioId, commissionId, trx);
    if (!c || (m.role === 'client' && c.client_id !== m.clientId)) throw errors.notFound('That commission');
    return c;
  }

  async function decide(m: Member, user: Person, approvalId: number, status: 'approved' | 'changes', comment: string | null) {
    const at = now();
    let finish = false;
    const commissionId = await db.transaction(async (trx) => {
      const a = await repo.get(m.studioId, approvalId, trx);
      if (!a) throw errors.notFound('That approval request');
      const c = await commissionFor(m, a.commissionId, trx);
      if (a.status !== 'requested' || !(await repo.decide(m.studioId, approvalId, { status, decided_by: user.id, decided_at: at, comment }, trx))) {
        throw errors.conflict('This request has been answered already.', 'approval_decided');
      }
      const label = approvalSubjectLabels[a.subject].toLowerCase();
      await repo.logActivity(trx, {
        studioId: m.studioId,
        commissionId: c.id,
        userId: user.id,
        action: status === 'approved' ? 'approval.approved' : 'approval.changes_requested',
        detail: { approvalId, subject: a.subject, summary: status === 'approved' ? `approved the ${label}.` : `asked for changes to the ${label}.`, ...(comment ? { comment } : {}) },
        at,
      });
      await notices.notify(trx, {
        studioId: m.studioId,
        commissionId: c.id,
        to: 'studio',
        actorId: user.id,
        template: status === 'approved' ? 'notice.approved' : 'notice.changes-requested',
        subject: (x) => (status === 'approved' ? `${approvalSubjectLabels[a.subject]} approved: "${x.title}"` : `Changes asked to the ${label}: "${x.title}"`),
        lines: [
          status === 'approved' ? `${user.name} approved the ${label} of "${c.title}".` : `${user.name} asked for changes to the ${label} of "${c.title}".`,
          ...(comment ? [quote(comment)] : []),
        ],
      });
      const current = c.status as CommissionStatus;
      finish = status === 'approved' && a.subject === 'finished' && canTransition(current, 'ready_to_ship', c.status_before_hold as CommissionStatus | null);
      return c.id;
    });
    notices.kick();
    // The lifecycle service runs its own transaction (one SQLite connection: it cannot nest in ours), so the
    // move follows the recorded approval; should it be refused, the approval stands and the owner moves it by hand.
    if (finish) {
      await deps.finishCommission({ ...m, userId: user.id }, commissionId).catch((err) => {
        if (!(err instanceof AppError && err.status === 409)) throw err; // moved meanwhile: nothing to do
      });
    }
    return (await repo.get(m.studioId, approvalId))!;
  }

  return {
    async list(m: Member, commissionId: number, q: PageParams) {
      await commissionFor(m, commissionId);
      const { rows, total } = await repo.list(m.studioId, commissionId, q);
      return pageOf(rows, total, q);
    },

    async request(m: Member, user: Person, commissionId: number, input: RequestApprovalInput) {
      const at = now();
      const id = await db.transaction(async (trx) => {
        const c = await commissionFor(m, commissionId, trx);
        if (lockedStatuses.includes(c.status as CommissionStatus)) throw errors.conflict('This commission is closed; it takes no more approval requests.', 'commission_locked');
        if (await repo.openFor(m.studioId, commissionId, input.subject, trx)) {
          throw errors.conflict(`The client has not answered the last request about the ${approvalSubjectLabels[input.subject].toLowerCase()} yet.`, 'approval_open');
        }
        const id = await repo.insert({ studio_id: m.studioId, commission_id: commissionId, subject: input.subject, request_note: input.note ?? null, requested_by: user.id, requested_at: at }, trx);
        const label = approvalSubjectLabels[input.subject].toLowerCase();
        await repo.logActivity(trx, { studioId: m.studioId, commissionId, userId: user.id, action: 'approval.requested', detail: { approvalId: id, subject: input.subject, summary: `asked the client to approve the ${label}.` }, at });
        await notices.notify(trx, {
          studioId: m.studioId,
          commissionId,
          to: 'client',
          actorId: user.id,
          template: 'notice.approval-requested',
          subject: (x) => `${x.studioName} asks for your approval: ${label} of "${x.title}"`,
          lines: [`${user.name} asks you to look at the ${label} of "${c.title}" and approve it or ask for changes.`, ...(input.note ? [quote(input.note)] : [])],
        });
        return id;
      });
      notices.kick();
      return (await repo.get(m.studioId, id))!;
    },

    approve: (m: Member, user: Person, approvalId: number, input: ApproveInput) => decide(m, user, approvalId, 'approved', input.comment ?? null),
    requestChanges: (m: Member, user: Person, approvalId: number, input: RequestChangesInput) => decide(m, user, approvalId, 'changes', input.comment),
  };
}

export type ApprovalsService = ReturnType<typeof approvalsService>;
