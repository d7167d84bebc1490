import type { Role } from '../../../shared/schemas/common';
import { readAll, readFirst, type Db } from '../../lib/db';

export type UserRow = { id: number; email: string; name: string; password_hash: string; email_notices: boolean | number; session_epoch: number };

/** What a request's session needs of its person. */
export type SessionUserRow = Pick<UserRow, 'id' | 'email' | 'name' | 'email_notices' | 'session_epoch'>;

export const toUser = (r: SessionUserRow) => ({ id: r.id, email: r.email, name: r.name, emailNotices: Boolean(r.email_notices) });

export function authRepository(db: Db) {
  return {
    findUserByEmail: (email: string, trx: Db = db) => trx<UserRow>('users').where({ email: email.toLowerCase() }).first(),
    findUserById: (id: number, trx: Db = db) => trx<UserRow>('users').where({ id }).first(),
    /** The signed-in person of a request, read as every signed-in request does (readFirst: outside Knex's pool on SQLite). */
    sessionUser: (id: number) => readFirst<SessionUserRow>(db, db('users').where({ id }).select('id', 'email', 'name', 'email_notices', 'session_epoch')),
    async createUser(u: { email: string; name: string; passwordHash: string; now: string }, trx: Db = db) {
      const [row] = await trx('users')
        .insert({ email: u.email.toLowerCase(), name: u.name, password_hash: u.passwordHash, email_notices: true, created_at: u.now, updated_at: u.now })
        .returning('id');
      return typeof row === 'object' ? (row.id as number) : (row as number);
    },
    updateUser: (id: number, patch: Partial<{ name: string; password_hash: string; email_notices: boolean }>, now: string, trx: Db = db) =>
      trx('users').where({ id }).update({ ...patch, updated_at: now }),
    /** A signed-in person's studios (readAll: outside Knex's pool on SQLite, as the session's reads). */
    memberships: (userId: number) =>
      readAll<{ studioId: number; studioName: string; role: Role }>(
        db,
        db('memberships as m').join('studios as s', 's.id', 'm.studio_id').where('m.user_id', userId).orderBy('s.name').select('m.studio_id as studioId', 's.name as studioName', 'm.role as role'),
      ),

    countFailures: (key: string, since: string) =>
      db('login_failures').where({ key }).andWhere('at', '>', since).count({ n: '*' }).first().then((r) => Number(r?.n ?? 0)),
    oldestFailure: (key: string, since: string) =>
      db('login_failures').where({ key }).andWhere('at', '>', since).min({ at: 'at' }).first().then((r) => (r?.at as string | undefined) ?? null),
    addFailure: (key: string, at: string) => db('login_failures').insert({ key, at }),
    clearFailures: (key: string) => db('login_failures').where({ key }).delete(),
    pruneFailures: (before: string) => db('login_failures').where('at', '<', before).delete(),

    createReset: (r: { userId: number; tokenHash: string; expiresAt: string; now: string }) =>
      db('password_resets').insert({ user_id: r.userId, token_hash: r.tokenHash, expires_at: r.expiresAt, created_at: r.now }),
    findReset: (tokenHash: string, trx: Db = db) => trx('password_resets').where({ token_hash: tokenHash }).first(),
    /** Marks the reset used only if it still was unused: the row count tells whether this caller won. */
    useReset: (id: number, now: string, trx: Db = db) => trx('password_resets').where({ id }).whereNull('used_at').update({ used_at: now }),
    /** The person's other unused reset links stop working. */
    dropOtherResets: (userId: number, keepId: number, now: string, trx: Db = db) =>
      trx('password_resets').where({ user_id: userId }).whereNull('used_at').whereNot({ id: keepId }).update({ used_at: now }),
    /** Ends every session of the person: a session remembers the epoch it was signed in at, and only the current one counts. */
    endSessions: (userId: number, trx: Db = db) => trx('users').where({ id: userId }).increment('session_epoch', 1),
  };
}

export type AuthRepository = ReturnType<typeof authRepository>;
