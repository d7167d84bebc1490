import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { Express } from 'express';
import knexFactory from 'knex';
import { inject } from 'vitest';
import { createApp, type SableworkApp } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import { manualClock } from '../../server/lib/clock';

export type TestApp = SableworkApp & { clock: ReturnType<typeof manualClock>; dataDir: string; stop(): Promise<void> };

type OwnDatabase = { url: string; drop(): Promise<void> };

/**
 * Two queries sent at once on one PostgreSQL connection (a Promise.all inside a transaction) are queued by
 * node-postgres, which is deprecated and ends with pg 9 (its warning: "Calling client.query() when the
 * client is already executing a query"). On a PostgreSQL run that warning fails the run instead of
 * scrolling by. Once per worker process: vitest evaluates this module again for every test file.
 */
const WATCHING_PG_QUEUE = Symbol.for('sablework.tests.watchPgQueue');
if (process.env.DATABASE_URL && !(globalThis as Record<symbol, unknown>)[WATCHING_PG_QUEUE]) {
  (globalThis as Record<symbol, unknown>)[WATCHING_PG_QUEUE] = true;
  process.on('warning', (w) => {
    if (/already executing a query/.test(w.message)) throw w;
  });
}

/**
 * With DATABASE_URL set (a PostgreSQL server), each test app gets a database of its own on that URL's
 * server; without it, SQLite in the temporary DATA_DIR. The databases are copies of one template
 * migrated once per run (tests/support/pg-template.ts), so an app starts without running every migration
 * again, and their names carry the run's id, so the run's teardown drops any a test left behind.
 * Commits skip the wait for the disk (synchronous_commit off, on these throwaway databases only).
 */
async function ownPostgresDatabase(): Promise<OwnDatabase | null> {
  const base = process.env.DATABASE_URL;
  if (!base) return null;
  const pg = inject('pg');
  const name = `${pg?.prefix ?? 'sablework_test_'}${crypto.randomBytes(4).toString('hex')}`;
  const admin = knexFactory({ client: 'pg', connection: base, pool: { min: 0, max: 1 } });
  await admin.raw(pg ? `create database ${name} template ${pg.template}` : `create database ${name}`);
  await admin.raw(`alter database ${name} set synchronous_commit = off`);
  const url = new URL(base);
  url.pathname = `/${name}`;
  return {
    url: url.toString(),
    async drop() {
      await admin.raw(`drop database if exists ${name} with (force)`);
      await admin.destroy();
    },
  };
}

/**
 * The PostgreSQL database of a DATA_DIR, standing in for the SQLite file in it: an app started again on
 * the same DATA_DIR (after close(), or after stop() when the test made the folder) finds the data the
 * first one left.
 */
const databaseOfDataDir = new Map<string, OwnDatabase>();

/**
 * A real app on a fresh temporary DATA_DIR with a clock the test moves. `sqlite: true` keeps the app on
 * the SQLite file in DATA_DIR even when DATABASE_URL is set (for tests of that file itself, like backups).
 * stop() removes the temporary DATA_DIR and its database; a DATA_DIR the test passed in stays, and so
 * does its database (until the run ends).
 */
export async function startTestApp(options: Partial<Config> & { dataDir?: string; sqlite?: boolean } = {}): Promise<TestApp> {
  const { sqlite, ...overrides } = options;
  const ownDir = !overrides.dataDir;
  const dataDir = overrides.dataDir ?? fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-test-'));
  const clock = manualClock();
  const pg = overrides.databaseUrl || sqlite ? null : (databaseOfDataDir.get(dataDir) ?? (await ownPostgresDatabase()));
  if (pg) databaseOfDataDir.set(dataDir, pg);
  const forget = async () => {
    if (!pg || !ownDir) return;
    databaseOfDataDir.delete(dataDir);
    await pg.drop();
  };
  const config = loadConfig(
    { DATA_DIR: dataDir },
    { clock, databaseUrl: pg?.url, logLevel: 'silent', runJobs: false, serveClient: false, demo: false, bcryptRounds: 4, publicUrl: 'http://sablework.test', ...overrides },
  );
  const sw = await createApp(config).catch(async (err: unknown) => {
    await forget();
    throw err;
  });
  return Object.assign(sw, {
    clock,
    dataDir,
    async stop() {
      await sw.close();
      await forget();
      if (ownDir) fs.rmSync(dataDir, { recursive: true, force: true });
    },
  });
}

/** A browser-like caller: keeps cookies, fetches the CSRF token and sends it on unsafe methods. */
export class Caller {
  agent: ReturnType<typeof request.agent>;
  private token: string | null = null;
  constructor(app: Express) {
    this.agent = request.agent(app);
  }
  async csrf() {
    const res = await this.agent.get('/api/auth/csrf').expect(200);
    this.token = res.body.token;
    return this.token!;
  }
  get(url: string) {
    return this.agent.get(url);
  }
  private async unsafe(method: 'post' | 'put' | 'patch' | 'delete', url: string, body?: unknown) {
    const token = this.token ?? (await this.csrf());
    const req = this.agent[method](url).set('x-csrf-token', token);
    const res = await (body === undefined ? req : req.send(body as object));
    // The session id changes at sign-in and sign-out; the next unsafe call needs the new session's token.
    if (/\/auth\/(login|logout|signup|password)$|\/accept$|password-reset\/confirm/.test(url)) this.token = null;
    return res;
  }
  post = (url: string, body?: unknown) => this.unsafe('post', url, body);
  put = (url: string, body?: unknown) => this.unsafe('put', url, body);
  patch = (url: string, body?: unknown) => this.unsafe('patch', url, body);
  delete = (url: string) => this.unsafe('delete', url);
}

export const PASSWORD = 'correct horse battery';

export async function signUp(sw: TestApp, who: { email: string; name?: string; studioName?: string; currency?: string }) {
  const c = new Caller(sw.app);
  const res = await c.post('/api/auth/signup', {
    name: who.name ?? 'Test Person',
    email: who.email,
    password: PASSWORD,
    studioName: who.studioName ?? 'Test Studio',
    currency: who.currency ?? 'EUR',
    timezone: 'Europe/Berlin',
  });
  if (res.status !== 201) throw new Error(`signup failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { caller: c, user: res.body.user, studioId: res.body.memberships[0].studioId as number };
}

export async function signInAs(sw: TestApp, email: string, password = PASSWORD) {
  const c = new Caller(sw.app);
  const res = await c.post('/api/auth/login', { email, password });
  if (res.status !== 200) throw new Error(`login failed: ${res.status} ${JSON.stringify(res.body)}`);
  return c;
}

/** Delivers the outbox and returns the captured messages to an address, newest last. */
export async function mailTo(sw: TestApp, to: string) {
  await sw.jobs.deliverMail();
  return sw.db('captured_mail').whereLike('to', `%${to}%`).orderBy('id');
}

export const linkIn = (text: string, pathPrefix: string) => {
  const m = text.match(new RegExp(`https?://[^\\s]+${pathPrefix}([A-Za-z0-9_-]+)`));
  if (!m) throw new Error(`no ${pathPrefix} link in: ${text}`);
  return m[1];
};

/**
 * Two studios with an owner, a painter and a client each (clients accept real invitations),
 * for role and isolation tests.
 */
export async function twoStudios(sw: TestApp) {
  const make = async (tag: string) => {
    const owner = await signUp(sw, { email: `owner-${tag}@studio.test`, studioName: `Studio ${tag}` });
    const s = owner.studioId;
    const inv = await owner.caller.post(`/api/studios/${s}/invitations`, { email: `painter-${tag}@studio.test`, role: 'painter' });
    if (inv.status !== 201) throw new Error(JSON.stringify(inv.body));
    const [pm] = await mailTo(sw, `painter-${tag}@studio.test`);
    const painter = new Caller(sw.app);
    await painter.post(`/api/invitations/${linkIn(pm.text, '/invite/')}/accept`, { name: `Painter ${tag}`, password: PASSWORD }).then((r) => {
      if (r.status !== 200) throw new Error(JSON.stringify(r.body));
    });
    const cr = await owner.caller.post(`/api/studios/${s}/clients`, { name: `Client ${tag}`, email: `client-${tag}@studio.test` });
    const clientId = cr.body.id as number;
    await owner.caller.post(`/api/studios/${s}/clients/${clientId}/invite`);
    const [cm] = await mailTo(sw, `client-${tag}@studio.test`);
    const client = new Caller(sw.app);
    await client.post(`/api/invitations/${linkIn(cm.text, '/invite/')}/accept`, { name: `Client ${tag}`, password: PASSWORD }).then((r) => {
      if (r.status !== 200) throw new Error(JSON.stringify(r.body));
    });
    return { studioId: s, owner: owner.caller, painter, client, clientId };
  };
  return { a: await make('a'), b: await make('b') };
}

/** Runs `fn` and gives back its value with the SQL of every query `db` made meanwhile, in order. */
export async function withQueries<T>(db: SableworkApp['db'], fn: () => Promise<T>): Promise<{ value: T; sql: string[] }> {
  const sql: string[] = [];
  const onQuery = (q: { sql: string }) => sql.push(q.sql);
  db.on('query', onQuery);
  try {
    return { value: await fn(), sql };
  } finally {
    db.off('query', onQuery);
  }
}

/** The id of a row just inserted: Knex answers `[{ id }]` with `returning('id')` on PostgreSQL and `[id]` on SQLite. */
export const idOf = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));
