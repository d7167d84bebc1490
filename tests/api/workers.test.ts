// WORKERS=2: the real server as a primary and two worker processes on one port and one SQLite file
// (server/lib/workers.ts). Writes from both workers at once all land (SQLite transactions begin IMMEDIATE and
// wait their turn), invoice numbers stay gap-free, a worker's mail reaches the primary's capture inbox, a
// worker reaches the primary's payment fake, a killed worker is replaced while the others serve, and SIGTERM
// to the primary stops every process.
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Http, ServerRun } from '../support/server-process';

const PASSWORD = 'two workers one file';
const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-workers-'));
let server: ServerRun;
let owner: Http;
let studioId: number;

/** The pid of each process that wrote a line, by the request id it logged (LOG_LEVEL=debug logs every request). */
function logLines(output: string) {
  return output
    .split('\n')
    .filter((l) => l.startsWith('{'))
    .map((l) => JSON.parse(l) as { pid: number; msg: string; reqId?: string });
}
/** Which process answered each request, once its log line arrived (lines may come a moment after the answer). */
const servedBy = (requestIds: string[]) =>
  until('the request log lines', () => {
    const byId = new Map(logLines(server.output).filter((l) => l.reqId && l.msg === 'request completed').map((l) => [l.reqId!, l.pid]));
    const pids = requestIds.map((id) => byId.get(id));
    return pids.every((p) => p !== undefined) ? (pids as number[]) : undefined;
  });
const primaryPid = (output: string) => logLines(output).find((l) => l.msg.startsWith('Sablework is running'))!.pid;

async function until<T>(what: string, check: () => Promise<T | undefined> | T | undefined, ms = 20_000): Promise<T> {
  const deadline = Date.now() + ms;
  for (;;) {
    const v = await check();
    if (v !== undefined) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** A GET on a connection of its own (the primary hands new connections to the workers in turn); its request id. */
function onNewConnection(p: string) {
  return new Promise<string>((resolve, reject) => {
    http
      .get(`${server.base}${p}`, { agent: false }, (res) => {
        res.resume();
        res.on('end', () => resolve(String(res.headers['x-request-id'])));
      })
      .on('error', reject);
  });
}

// The child runs on SQLite, the harder case (several processes on one file); a PostgreSQL run of the API suite
// would only run it again (several instances on PostgreSQL: database.test.ts).
describe.skipIf(Boolean(process.env.DATABASE_URL))('several worker processes on one port', () => {
  beforeAll(async () => {
    server = new ServerRun(dataDir, { WORKERS: '2', LOG_LEVEL: 'debug' });
    await server.start();
    // the first answer came from one worker: wait until both take connections
    await until('both workers serving', async () => {
      const pids = new Set(await servedBy(await Promise.all(Array.from({ length: 6 }, () => onNewConnection('/api/health')))));
      return pids.size === 2 ? true : undefined;
    }, 60_000);
    const signup = new Http(server);
    await signup.csrf();
    await signup.ok('POST', '/api/auth/signup', { name: 'Two Workers', email: 'workers-owner@demo.test', password: PASSWORD, studioName: 'Twin Bench', currency: 'EUR', timezone: 'Europe/Berlin' }, 201);
    owner = new Http(server);
    await owner.csrf();
    studioId = (await owner.ok('POST', '/api/auth/login', { email: 'workers-owner@demo.test', password: PASSWORD })).memberships[0].studioId;
    await owner.csrf();
  }, 90_000);

  afterAll(async () => {
    await server?.stop();
    fs.rmSync(dataDir, { recursive: true, force: true });
  });

  it('takes writes from both workers at once, all of them, with invoice numbers gap-free', async () => {
    const url = (p: string) => `/api/studios/${studioId}${p}`;
    const sent = await Promise.all(
      Array.from({ length: 30 }, (_, i) => owner.send('POST', url('/clients'), { name: `Twin client ${i + 1}`, email: `twin-${i + 1}@demo.test` })),
    );
    expect(sent.map((r) => r.status)).toEqual(sent.map(() => 201));
    // the session cookie is a row: both workers took the same signed-in caller's requests
    const pids = await servedBy(sent.map((r) => r.headers.get('x-request-id')!));
    expect(new Set(pids).size).toBe(2);
    expect(pids).not.toContain(primaryPid(server.output));
    const clients = await owner.ok('GET', url('/clients?limit=100'));
    expect(clients.total).toBe(30);

    const client = clients.items[0];
    const commission = await owner.ok('POST', url('/commissions'), { clientId: client.id, title: 'Twin bench test' }, 201);
    const drafts = await Promise.all(
      Array.from({ length: 8 }, (_, i) => owner.ok('POST', url('/invoices'), { commissionId: commission.id, kind: 'custom', lines: [{ description: `Base set ${i}`, quantity: 1, unitMinor: 1500 }] }, 201)),
    );
    const issued = await Promise.all(drafts.map((d) => owner.ok('POST', url(`/invoices/${d.id}/issue`))));
    const numbers = issued.map((i) => i.number as string).sort();
    const tails = numbers.map((n) => Number(/(\d+)$/.exec(n)![1]));
    expect(tails).toEqual(Array.from({ length: 8 }, (_, i) => tails[0] + i));

    // a worker opens a checkout on the primary's payment fake
    const checkout = await owner.ok('POST', url(`/invoices/${drafts[0].id}/checkout`));
    expect(checkout.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\//);
  });

  it("sends a worker's mail through the primary's capture inbox", async () => {
    const caller = new Http(server);
    await caller.csrf();
    await caller.ok('POST', '/api/auth/password-reset', { email: 'workers-owner@demo.test' }, 202);
    const inbox = await until('the reset mail in /dev/mail', async () => {
      const page = await (await fetch(`${server.base}/dev/mail`)).text();
      return /password/i.test(page) ? page : undefined;
    });
    expect(inbox).toContain('workers-owner@demo.test');
    expect((await owner.ok('GET', '/api/meta')).devMail).toBe(true);
  });

  it('replaces a killed worker while the other serves, and stops every process on SIGTERM', async () => {
    const primary = primaryPid(server.output);
    const [before] = await servedBy([(await owner.send('GET', '/api/auth/me')).headers.get('x-request-id')!]);
    expect(before).not.toBe(primary);
    process.kill(before, 'SIGKILL');
    // answers go on, from the other worker and then the new one too (a kept-alive connection the killed worker
    // held is reset once, as it would be behind any load balancer)
    await until('an answer after the kill', () => owner.send('GET', '/api/auth/me').then((r) => (r.ok ? true : undefined), () => undefined));
    for (let i = 0; i < 10; i++) expect((await owner.send('GET', '/api/auth/me')).status).toBe(200);
    await until('a replacement worker', () => (/starting another/.test(server.output) ? true : undefined));
    const fresh = await until('answers from the new worker', async () => {
      const ids = await Promise.all(Array.from({ length: 12 }, () => onNewConnection('/api/health')));
      const pids = new Set(await servedBy(ids));
      return pids.size === 2 ? [...pids].find((p) => p !== before) : undefined;
    });
    expect(fresh).not.toBe(primary);

    const workers = [...new Set(logLines(server.output).map((l) => l.pid))].filter((p) => p !== primary && p !== before);
    await server.stop();
    for (const pid of [primary, ...workers]) expect(() => process.kill(pid, 0)).toThrow();
  }, 60_000);
});
