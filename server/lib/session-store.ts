import session from 'express-session';
import { ConnectSessionKnexStore } from 'connect-session-knex';
import type { Db } from './db';

/**
 * connect-session-knex calls the callback with an error and then also rejects its promise, which
 * express-session never awaits; these overrides keep the callback and swallow the duplicate rejection,
 * so a database error becomes an ordinary request error instead of an unhandled rejection.
 */
class GuardedStore extends ConnectSessionKnexStore {
  override get(sid: string, cb: (err: unknown, s?: session.SessionData | null) => void) {
    return super.get(sid, cb).catch(() => null);
  }
  override set(sid: string, s: session.SessionData, cb?: (err?: unknown) => void) {
    return super.set(sid, s, cb).catch(() => undefined);
  }
  override touch(sid: string, s: session.SessionData, cb?: (err?: unknown) => void) {
    return super.touch(sid, s, () => cb?.()).catch((err) => cb?.(err));
  }
  override destroy(sid: string, cb?: (err?: unknown) => void) {
    return super.destroy(sid, cb).catch(() => 0);
  }
}

export function createSessionStore(db: Db, opts: { cleanupInterval?: number } = {}) {
  return new GuardedStore({
    knex: db,
    tableName: 'sessions',
    createTable: false,
    cleanupInterval: opts.cleanupInterval ?? 15 * 60_000,
    onDbCleanupError: () => undefined,
  });
}
