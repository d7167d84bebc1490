import type { PageParams, Role } from '../../../shared/schemas/common';
import type { Db } from '../../lib/db';
import { pageRows } from '../../lib/page';

export type InvitationRow = {
  id: number;
  studio_id: number;
  email: string;
  role: Role;
  client_id: number | null;
  token_hash: string;
  invited_by: number | null;
  expires_at: string;
  accepted_at: string | null;
  revoked_at: string | null;
  created_at: string;
};

export const toInvitation = (r: InvitationRow) => ({
  id: r.id,
  email: r.email,
  role: r.role,
  clientId: r.client_id,
  expiresAt: r.expires_at,
  createdAt: r.created_at,
});

export function invitationsRepository(db: Db) {
  return {
    async create(r: Omit<InvitationRow, 'id' | 'accepted_at' | 'revoked_at'>, trx: Db = db) {
      const [row] = await trx('invitations').insert(r).returning('id');
      return typeof row === 'object' ? (row.id as number) : (row as number);
    },
    /** Revokes earlier pending invitations for the same person and role, so only the newest link works. */
    revokePending: (studioId: number, email: string, role: Role, now: string, trx: Db = db) =>
      trx('invitations').where({ studio_id: studioId, email, role }).whereNull('accepted_at').whereNull('revoked_at').update({ revoked_at: now }),
    /** One page of the invitations still open, newest first. */
    listPending: (studioId: number, now: string, q: PageParams) =>
      pageRows<InvitationRow>(
        db('invitations')
          .where({ studio_id: studioId })
          .whereNull('accepted_at')
          .whereNull('revoked_at')
          .andWhere('expires_at', '>', now)
          .select('*')
          .orderBy([{ column: 'created_at', order: 'desc' }, { column: 'id', order: 'desc' }]),
        q,
      ),
    get: (studioId: number, id: number) => db<InvitationRow>('invitations').where({ studio_id: studioId, id }).first(),
    revoke: (studioId: number, id: number, now: string) =>
      db('invitations').where({ studio_id: studioId, id }).whereNull('accepted_at').whereNull('revoked_at').update({ revoked_at: now }),
    findByHash: (tokenHash: string, trx: Db = db) => trx<InvitationRow>('invitations').where({ token_hash: tokenHash }).first(),
    /** Single use: only the caller whose update changes a row has accepted it. */
    markAccepted: (id: number, now: string, trx: Db) =>
      trx('invitations').where({ id }).whereNull('accepted_at').whereNull('revoked_at').update({ accepted_at: now }),
  };
}

export type InvitationsRepository = ReturnType<typeof invitationsRepository>;
