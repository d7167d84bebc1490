import bcrypt from 'bcryptjs';
import type { LoginInput, ResetConfirmInput, SignupInput, UpdateMeInput } from '../../../shared/schemas/auth';
import { addMs, HOUR, iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { Mailer } from '../../lib/mail/mailer';
import { templates } from '../../lib/mail/templates';
import { hashToken, newToken } from '../../lib/tokens';
import type { StudiosService } from '../studios/studios.service';
import { toUser, type AuthRepository } from './auth.repository';

const THROTTLE_WINDOW_MS = 15 * 60_000;
const THROTTLE_MAX_FAILURES = 10;
const RESET_TTL_MS = HOUR;

// A fixed hash compared against when the address is unknown, so both paths take the same time.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password-for-timing', 10);

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
  const hash = (password: string) => bcrypt.hash(password, deps.bcryptRounds);

  async function me(userId: number) {
    const u = await repo.findUserById(userId);
    if (!u) throw errors.unauthenticated();
    return { user: toUser(u), memberships: await repo.memberships(userId) };
  }

  return {
    me,
    hash,
    verifyPassword: (password: string, passwordHash: string) => bcrypt.compare(password, passwordHash),

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

    /** Checks e-mail + password with throttling per e-mail and address: 10 failures in 15 minutes → 429. */
    async verifyLogin(input: LoginInput, ip: string) {
      const key = `${input.email.toLowerCase()}|${ip}`;
      const since = iso(addMs(clock.now(), -THROTTLE_WINDOW_MS));
      if ((await repo.countFailures(key, since)) >= THROTTLE_MAX_FAILURES) {
        const oldest = await repo.oldestFailure(key, since);
        const retryMs = oldest ? new Date(oldest).getTime() + THROTTLE_WINDOW_MS - clock.now().getTime() : THROTTLE_WINDOW_MS;
        throw errors.throttled(retryMs / 1000);
      }
      const u = await repo.findUserByEmail(input.email);
      const ok = await bcrypt.compare(input.password, u?.password_hash ?? DUMMY_HASH);
      if (!u || !ok) {
        await repo.addFailure(key, now());
        throw errors.invalidCredentials();
      }
      await repo.clearFailures(key);
      return toUser(u);
    },

    async updateMe(userId: number, input: UpdateMeInput) {
      const patch: { name?: string; email_notices?: boolean } = {};
      if (input.name !== undefined) patch.name = input.name;
      if (input.emailNotices !== undefined) patch.email_notices = input.emailNotices;
      if (Object.keys(patch).length) await repo.updateUser(userId, patch, now());
      return me(userId);
    },

    /** Same answer whether or not the address has an account. */
    async requestReset(email: string) {
      const u = await repo.findUserByEmail(email);
      if (!u) return;
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
        return r.user_id as number;
      });
      return me(userId);
    },

    pruneFailures: () => repo.pruneFailures(iso(addMs(clock.now(), -THROTTLE_WINDOW_MS))),
  };
}

export type AuthService = ReturnType<typeof authService>;
