import type { AcceptInvitationInput } from '../../../shared/schemas/auth';
import type { PageParams, Role } from '../../../shared/schemas/common';
import { addMs, DAY, iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { AppError, errors } from '../../lib/errors';
import { pageOf } from '../../lib/page';
import type { Mailer } from '../../lib/mail/mailer';
import { templates } from '../../lib/mail/templates';
import { hashToken, newToken } from '../../lib/tokens';
import type { AuthRepository } from '../auth/auth.repository';
import type { AuthService } from '../auth/auth.service';
import type { ClientsRepository } from '../clients/clients.repository';
import type { StudiosRepository } from '../studios/studios.repository';
import { toInvitation, type InvitationRow, type InvitationsRepository } from './invitations.repository';

const INVITATION_TTL_MS = 7 * DAY;

export function invitationsService(deps: {
  db: Db;
  repo: InvitationsRepository;
  users: AuthRepository;
  auth: AuthService;
  studios: StudiosRepository;
  clients: ClientsRepository;
  mailer: Mailer;
  clock: Clock;
  publicUrl: string;
}) {
  const { db, repo, clock, mailer } = deps;
  const now = () => iso(clock.now());

  async function issue(studioId: number, inviterId: number, email: string, role: Role, clientId: number | null) {
    const studio = await deps.studios.getStudio(studioId);
    const inviter = await deps.users.findUserById(inviterId);
    if (!studio || !inviter) throw errors.notFound();
    const existing = await deps.users.findUserByEmail(email);
    if (existing && (await deps.studios.findMember(studioId, existing.id))) {
      throw errors.conflict(`${email} is already a member of this studio.`, 'already_member');
    }
    const token = newToken();
    const expiresAt = iso(addMs(clock.now(), INVITATION_TTL_MS));
    const id = await db.transaction(async (trx) => {
      await repo.revokePending(studioId, email, role, now(), trx);
      const newId = await repo.create(
        { studio_id: studioId, email, role, client_id: clientId, token_hash: hashToken(token), invited_by: inviterId, expires_at: expiresAt, created_at: now() },
        trx,
      );
      const expiresOn = new Intl.DateTimeFormat('en-GB', { timeZone: studio.timezone, weekday: 'long', day: 'numeric', month: 'long', year: 'numeric' }).format(new Date(expiresAt));
      await mailer.enqueue(
        {
          to: email,
          studioId,
          template: 'invitation',
          ...templates.invitation({ studioName: studio.name, inviterName: inviter.name, role, url: `${deps.publicUrl}/invite/${token}`, expiresOn }),
        },
        trx,
      );
      return newId;
    });
    mailer.kick();
    const row = await repo.get(studioId, id);
    return toInvitation(row!);
  }

  /** Finds a usable invitation or explains, with 404 for unknown links and 410 for spent ones. */
  async function usable(token: string, trx: Db = db): Promise<InvitationRow> {
    const inv = await repo.findByHash(hashToken(token), trx);
    if (!inv) throw errors.notFound('That invitation');
    if (inv.accepted_at) throw errors.gone('This invitation has already been used. Sign in, or ask the studio for a new one.');
    if (inv.revoked_at) throw errors.gone('This invitation was withdrawn by the studio. Ask them for a new one.');
    if (inv.expires_at <= now()) throw errors.gone('This invitation has expired (they last 7 days). Ask the studio for a new one.');
    return inv;
  }

  return {
    inviteMember: (studioId: number, inviterId: number, input: { email: string; role: 'painter' | 'owner' }) =>
      issue(studioId, inviterId, input.email, input.role, null),

    async inviteClient(studioId: number, inviterId: number, clientId: number) {
      const c = await deps.clients.get(studioId, clientId);
      if (!c) throw errors.notFound('That client');
      if (!c.email) throw errors.conflict('Add an e-mail address to this client first.', 'no_email');
      if (c.user_id) throw errors.conflict('This client already has an account with the studio.', 'already_member');
      return issue(studioId, inviterId, c.email, 'client', c.id);
    },

    async listPending(studioId: number, q: PageParams) {
      const { rows, total } = await repo.listPending(studioId, now(), q);
      return pageOf(rows.map(toInvitation), total, q);
    },

    async revoke(studioId: number, id: number) {
      if (!(await repo.get(studioId, id))) throw errors.notFound('That invitation');
      await repo.revoke(studioId, id, now());
    },

    async preview(token: string) {
      const inv = await usable(token);
      const studio = await deps.studios.getStudio(inv.studio_id);
      const existing = await deps.users.findUserByEmail(inv.email);
      return { studioName: studio!.name, email: inv.email, role: inv.role, accountExists: Boolean(existing), expiresAt: inv.expires_at };
    },

    /**
     * A new person sets name and password; an existing account proves itself with its password
     * (or by already being signed in as that address). Returns the user id to sign in.
     */
    async accept(token: string, input: AcceptInvitationInput, signedInUserId?: number, ip = 'unknown') {
      const inv = await usable(token);
      const existing = await deps.users.findUserByEmail(inv.email);
      let newHash: string | null = null;
      if (existing) {
        const isSelf = signedInUserId === existing.id;
        // the account's password, under the same throttle as signing in (it is the same secret, guessed the same way)
        if (!isSelf) {
          await deps.auth.verifyLogin({ email: existing.email, password: input.password }, ip).catch((e: unknown) => {
            if (e instanceof AppError && e.code === 'invalid_credentials') throw errors.field('password', 'That is not the password of this account.');
            throw e;
          });
        }
      } else {
        if (!input.name) throw errors.field('name', 'Enter your name.');
        if (input.password.length < 12) throw errors.field('password', 'Use at least 12 characters.');
        newHash = await deps.auth.hash(input.password);
      }
      const result = await db.transaction(async (trx) => {
        const fresh = await usable(token, trx);
        let userId = existing?.id;
        if (!userId) {
          if (await deps.users.findUserByEmail(fresh.email, trx)) throw errors.conflict('An account was just created for this address; sign in instead.');
          userId = await deps.users.createUser({ email: fresh.email, name: input.name!, passwordHash: newHash!, now: now() }, trx);
        }
        const current = await deps.studios.findMember(fresh.studio_id, userId, trx);
        if (current) throw errors.conflict(`You are already a member of this studio (as ${current.role}).`, 'already_member');
        if ((await repo.markAccepted(fresh.id, now(), trx)) !== 1) throw errors.gone('This invitation has already been used.');
        await deps.studios.addMember(fresh.studio_id, userId, fresh.role, now(), trx);
        if (fresh.role === 'client' && fresh.client_id) {
          const c = await deps.clients.get(fresh.studio_id, fresh.client_id, trx);
          if (c?.user_id && c.user_id !== userId) throw errors.conflict('This client record is already linked to another account.');
          await deps.clients.linkUser(fresh.studio_id, fresh.client_id, userId, now(), trx);
        }
        return { userId, studioId: fresh.studio_id };
      });
      return result;
    },
  };
}

export type InvitationsService = ReturnType<typeof invitationsService>;
