import crypto from 'node:crypto';
import bcrypt from 'bcryptjs';
import type { ChangePasswordInput, LoginInput, ResetConfirmInput, SignupInput, UpdateMeInput } from '../../../shared/schemas/auth';
import { addMs, HOUR, iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { AuthUser } from '../../lib/policy';
import type { Mailer } from '../../lib/mail/mailer';
import { templates } from '../../lib/mail/templates';
import { hashToken, newToken } from '../../lib/tokens';
import type { StudiosService } from '../studios/studios.service';
import { toUser, type AuthRepository } from './auth.repository';

const THROTTLE_WINDOW_MS = 15 * 60_000;
/**
 * Failed sign-ins allowed within the window: for one e-mail from one network address; for one account from any
 * number of addresses (20 per 15 minutes is at most 80 an hour, under ASVS 2.2.1's 100); and for one address over
 * all accounts (one machine trying many accounts).
 */
export const THROTTLE_LIMITS = { pair: 10, account: 20, address: 50 } as const;
const RESET_TTL_MS = HOUR;
/**
 * Reset requests within an hour: mails to one address (more are not sent, and the answer stays the same, so
 * nobody learns whether the address has an account or fills its inbox); requests from one network address (429).
 */
export const RESET_LIMITS = { mailsPerAccount: 5, requestsPerAddress: 30 } as const;

/**
 * bcrypt reads only the first 72 bytes of its input. A longer password (up to 200 characters of any script) is
 * condensed with SHA-256 first, so every character counts; shorter ones go in as they are (their hashes stay valid).
 */
export const bcryptInput = (password: string) =>
  Buffer.byteLength(password, 'utf8') > 72 ? `sha256:${crypto.createHash('sha256').update(password, 'utf8').digest('base64')}` : password;


export function authService(deps: {
  db: Db;
  repo: AuthRepository;
  studios: StudiosService;
  mailer: Mailer;
  clock: Clock;
  bcryptRounds: number;
  publicUrl: string;
}) {
  const { db, repo, clock, mailer } = deps;
  const now = () => iso(clock.now());
  const hash = (password: string) => bcrypt.hash(bcryptInput(password), deps.bcryptRounds);
  // A hash compared against when the address is unknown, at the accounts' own cost, so both paths take the same
  // time and the answer's speed does not tell whether an account exists (made once, when first needed).
  let dummyHash: Promise<string> | null = null;
  const unknownAccountHash = () => (dummyHash ??= bcrypt.hash('not-a-real-password-for-timing', deps.bcryptRounds));

  /** 429 with the wait until the oldest failure in the window runs out, when any of the counts is at its limit. */
  async function refuseWhileThrottled(keys: { key: string; max: number }[]) {
    const since = iso(addMs(clock.now(), -THROTTLE_WINDOW_MS));
    let retryMs = 0;
    for (const k of keys) {
      if ((await repo.countFailures(k.key, since)) < k.max) continue;
      const oldest = await repo.oldestFailure(k.key, since);
      retryMs = Math.max(retryMs, oldest ? new Date(oldest).getTime() + THROTTLE_WINDOW_MS - clock.now().getTime() : THROTTLE_WINDOW_MS);
    }
    if (retryMs > 0) throw errors.throttled(retryMs / 1000);
  }

  /** The e-mail that a password changed (ASVS 2.2.3), queued in the transaction that changed it. */
  const tellPasswordChanged = (u: { email: string; name: string }, how: string, trx: Db) =>
    mailer.enqueue(
      {
        to: u.email,
        template: 'password-changed',
        ...templates.notice({
          subject: 'Your Sablework password was changed',
          lines: [`Hello ${u.name},`, `The password of this account was just changed ${how}.`, 'If it was not you, ask for a new reset link from the sign-in page straight away.'],
        }),
      },
      trx,
    );

  /** The person and their memberships; `signedIn`: the person as this request's session read them just now. */
  async function me(userId: number, signedIn?: AuthUser) {
    const u = signedIn ?? (await repo.findUserById(userId).then((row) => row && toUser(row)));
    if (!u) throw errors.unauthenticated();
    return { user: u, memberships: await repo.memberships(userId) };
  }

  return {
    me,
    hash,
    verifyPassword: (password: string, passwordHash: string) => bcrypt.compare(bcryptInput(password), passwordHash),

    async signup(input: SignupInput) {
      const passwordHash = await hash(input.password);
      const userId = await db.transaction(async (trx) => {
        if (await repo.findUserByEmail(input.email, trx)) {
          throw errors.conflict('An account with this e-mail already exists. Sign in instead, or reset the password.', 'email_taken');
        }
        const id = await repo.createUser({ email: input.email, name: input.name, passwordHash, now: now() }, trx);
        await deps.studios.createStudioFor(id, { name: input.studioName, currency: input.currency, timezone: input.timezone }, trx);
        return id;
      });
      return me(userId);
    },

    /**
     * Checks e-mail + password with throttling (THROTTLE_LIMITS within 15 minutes → 429 with Retry-After): per e-mail
     * and address, per account, per address. Once a limit is reached even the right password waits.
     */
    async verifyLogin(input: LoginInput, ip: string) {
      const email = input.email.toLowerCase();
      const keys = [
        { key: `${email}|${ip}`, max: THROTTLE_LIMITS.pair },
        { key: `account:${email}`, max: THROTTLE_LIMITS.account },
        { key: `address:${ip}`, max: THROTTLE_LIMITS.address },
      ];
      await refuseWhileThrottled(keys);
      const u = await repo.findUserByEmail(input.email);
      const ok = await bcrypt.compare(bcryptInput(input.password), u?.password_hash ?? (await unknownAccountHash()));
      if (!u || !ok) {
        for (const k of keys) await repo.addFailure(k.key, now());
        throw errors.invalidCredentials();
      }
      // The address's count stays: signing in to one's own account must not reset a run of guesses at others.
      await repo.clearFailures(keys[0].key);
      await repo.clearFailures(keys[1].key);
      return toUser(u);
    },

    async updateMe(userId: number, input: UpdateMeInput) {
      const patch: { name?: string; email_notices?: boolean } = {};
      if (input.name !== undefined) patch.name = input.name;
      if (input.emailNotices !== undefined) patch.email_notices = input.emailNotices;
      if (Object.keys(patch).length) await repo.updateUser(userId, patch, now());
      return me(userId);
    },

    /** Same answer whether or not the address has an account, and whether or not a mail goes out (RESET_LIMITS). */
    async requestReset(email: string, ip = 'unknown') {
      const since = iso(addMs(clock.now(), -HOUR));
      const addressKey = `reset-address:${ip}`;
      if ((await repo.countFailures(addressKey, since)) >= RESET_LIMITS.requestsPerAddress) {
        const oldest = await repo.oldestFailure(addressKey, since);
        throw errors.throttled(oldest ? (new Date(oldest).getTime() + HOUR - clock.now().getTime()) / 1000 : HOUR / 1000);
      }
      await repo.addFailure(addressKey, now());
      const u = await repo.findUserByEmail(email);
      if (!u) return;
      const accountKey = `reset:${u.email}`;
      if ((await repo.countFailures(accountKey, since)) >= RESET_LIMITS.mailsPerAccount) return;
      await repo.addFailure(accountKey, now());
      const token = newToken();
      await repo.createReset({ userId: u.id, tokenHash: hashToken(token), expiresAt: iso(addMs(clock.now(), RESET_TTL_MS)), now: now() });
      const url = `${deps.publicUrl}/reset-password/${token}`;
      await mailer.enqueue({ to: u.email, template: 'password-reset', ...templates.passwordReset({ name: u.name, url }) });
      mailer.kick();
    },

    async confirmReset(input: ResetConfirmInput) {
      const passwordHash = await hash(input.password);
      const userId = await db.transaction(async (trx) => {
        const r = await repo.findReset(hashToken(input.token), trx);
        if (!r) throw errors.gone('This reset link is not valid. Ask for a new one.');
        if (r.used_at) throw errors.gone('This reset link has already been used. Ask for a new one.');
        if (r.expires_at <= now()) throw errors.gone('This reset link has expired (links last one hour). Ask for a new one.');
        if ((await repo.useReset(r.id, now(), trx)) !== 1) throw errors.gone('This reset link has already been used. Ask for a new one.');
        await repo.updateUser(r.user_id, { password_hash: passwordHash }, now(), trx);
        // Every session of this person from before the reset ends (the caller is signed in afresh by the route),
        // and so do the other reset links they were sent.
        await repo.endSessions(r.user_id, trx);
        await repo.dropOtherResets(r.user_id, r.id, now(), trx);
        const u = (await repo.findUserById(r.user_id, trx))!;
        await tellPasswordChanged(u, 'through a reset link, and every device that was signed in has been signed out', trx);
        return r.user_id as number;
      });
      mailer.kick();
      return me(userId);
    },

    /**
     * A signed-in person's new password, given the current one (ASVS 2.1.5, 2.1.6). A wrong current password
     * counts against the account like a failed sign-in, so a stolen session cannot guess it at will. Every other
     * session of the person ends (the route signs this one in afresh), and an e-mail says what happened.
     */
    async changePassword(userId: number, input: ChangePasswordInput, ip: string) {
      const u = await repo.findUserById(userId);
      if (!u) throw errors.unauthenticated();
      const key = `account:${u.email.toLowerCase()}`;
      await refuseWhileThrottled([{ key, max: THROTTLE_LIMITS.account }]);
      if (!(await bcrypt.compare(bcryptInput(input.currentPassword), u.password_hash))) {
        await repo.addFailure(key, now());
        await repo.addFailure(`address:${ip}`, now());
        throw errors.field('currentPassword', 'That is not your current password.');
      }
      if (await bcrypt.compare(bcryptInput(input.newPassword), u.password_hash)) throw errors.field('newPassword', 'Choose a password other than the current one.');
      const passwordHash = await hash(input.newPassword);
      await db.transaction(async (trx) => {
        await repo.updateUser(userId, { password_hash: passwordHash }, now(), trx);
        await repo.endSessions(userId, trx);
        await tellPasswordChanged(u, 'from a signed-in session, and every other device that was signed in has been signed out', trx);
      });
      mailer.kick();
      return me(userId);
    },

    // the longest window that counts (reset requests: an hour)
    pruneFailures: () => repo.pruneFailures(iso(addMs(clock.now(), -Math.max(THROTTLE_WINDOW_MS, HOUR)))),
  };
}

export type AuthService = ReturnType<typeof authService>;
