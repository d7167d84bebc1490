import session from 'express-session';
import { ConnectSessionKnexStore } from 'connect-session-knex';
import { readFirst, type Db } from './db';

/** How long a session's stored expiry may lag behind its cookie before a request writes it again. */
export const TOUCH_EVERY_MS = 60_000;
/** Sessions whose last write this process remembers; older ones are simply written again on their next request. */
const REMEMBERED = 10_000;

/**
 * connect-session-knex calls the callback with an error and then also rejects its promise, which
 * express-session never awaits; these overrides keep the callback and swallow the duplicate rejection,
 * so a database error becomes an ordinary request error instead of an unhandled rejection.
 *
 * express-session "touches" every unchanged session on every request (a write that moves its expiry on).
 * That write is most of what a signed-in read costs, so a touch is skipped while the stored expiry is less
 * than TOUCH_EVERY_MS behind the new one: a session idle for 14 days still ends then, give or take a minute.
 * Each instance remembers only its own writes (a bounded map), so with several instances a session is written
 * at most once a minute by each, and a session this process has not seen is written on its first request.
 */
class GuardedStore extends ConnectSessionKnexStore {
  private readonly written = new Map<string, number>();

  private remember(sid: string, expires: number) {
    this.written.delete(sid);
    this.written.set(sid, expires);
    if (this.written.size > REMEMBERED) this.written.delete(this.written.keys().next().value!);
  }

  /**
   * Every signed-in request reads its session: on SQLite through readFirst (outside Knex's pool), with the
   * same condition connect-session-knex writes for SQLite; elsewhere connect-session-knex's own read.
   */
  override get(sid: string, cb: (err: unknown, s?: session.SessionData | null) => void) {
    const { knex } = this.options;
    if (knex.client.dialect !== 'sqlite3') return super.get(sid, cb).catch(() => null);
    const read = readFirst<{ sess: string }>(knex, knex('sessions').select('sess').where({ sid }).andWhereRaw('datetime(?) <= datetime(expired)', [new Date().toISOString()]));
    return read
      .then((row) => (row ? (JSON.parse(row.sess) as session.SessionData) : null))
      .then(
        (s) => {
          cb(null, s);
          return s;
        },
        (err) => {
          cb(err);
          return null;
        },
      );
  }
  override set(sid: string, s: session.SessionData, cb?: (err?: unknown) => void) {
    this.written.delete(sid);
    const expires = Date.now() + (s.cookie?.maxAge ?? 86_400_000);
    return super
      .set(sid, s, (err) => {
        if (!err) this.remember(sid, expires);
        cb?.(err);
      })
      .catch(() => undefined);
  }
  override touch(sid: string, s: session.SessionData, cb?: (err?: unknown) => void) {
    const expires = s?.cookie?.expires ? new Date(s.cookie.expires).getTime() : Number.NaN;
    const stored = this.written.get(sid);
    if (stored !== undefined && Number.isFinite(expires) && expires - stored < TOUCH_EVERY_MS) {
      cb?.();
      return Promise.resolve();
    }
    return super
      .touch(sid, s, () => {
        if (Number.isFinite(expires)) this.remember(sid, expires);
        cb?.();
      })
      .catch((err) => cb?.(err));
  }
  override destroy(sid: string, cb?: (err?: unknown) => void) {
    this.written.delete(sid);
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
