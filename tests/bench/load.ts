/**
 * `npm run bench`: one table of throughput and latency for the app's busiest reads against a bare Express
 * "hello" and a bare Express with the same session store, measured in the same run on 127.0.0.1; every list
 * endpoint at 50 connections on a generated database (50 studios, 10,000 commissions, 100,000 figures,
 * 1,000,000 stages); and the gzip size of the client's initial JavaScript.
 * Bounded: each measurement runs a few seconds; all traffic goes to 127.0.0.1.
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import autocannon from 'autocannon';
import express from 'express';
import session from 'express-session';
import knexFactory from 'knex';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createSessionStore } from '../../server/lib/session-store';
import { generate } from './support/generate';

const root = path.resolve(import.meta.dirname, '../..');
const SECONDS = Number(process.env.BENCH_SECONDS ?? 4);
const LEVELS = [10, 50, 200];

async function freePort() {
  const srv = net.createServer();
  await new Promise<void>((r) => srv.listen(0, '127.0.0.1', () => r()));
  const port = (srv.address() as net.AddressInfo).port;
  await new Promise<void>((r) => srv.close(() => r()));
  return port;
}

type Result = { name: string; connections: number; rps: number; p50: number; p99: number; errors: number; non2xx: number };

async function measure(name: string, url: string, connections: number, headers: Record<string, string> = {}): Promise<Result> {
  const r = await autocannon({ url, connections, duration: SECONDS, headers, pipelining: 1 });
  return { name, connections, rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99, errors: r.errors + r.timeouts, non2xx: r.non2xx };
}

async function login(base: string, email: string) {
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const cookie = csrf.headers.get('set-cookie')!.split(';')[0];
  const { token } = (await csrf.json()) as { token: string };
  const res = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie, 'x-csrf-token': token },
    body: JSON.stringify({ email, password: 'bench password' }),
  });
  if (!res.ok) throw new Error(`login ${email}: ${res.status} ${await res.text()}`);
  return res.headers.get('set-cookie')!.split(';')[0];
}

async function bareServers(dir: string) {
  const hello = express();
  hello.get('/', (_req, res) => res.json({ hello: 'world' }));
  const knex = knexFactory({ client: 'better-sqlite3', connection: { filename: path.join(dir, 'bare.sqlite') }, useNullAsDefault: true, pool: { min: 1, max: 1 } });
  await knex.schema.createTable('sessions', (t) => {
    t.string('sid', 255).primary();
    t.json('sess').notNullable();
    t.timestamp('expired', { useTz: true }).notNullable().index();
  });
  const withSession = express();
  withSession.use(session({ secret: 'bench-secret-bench-secret', store: createSessionStore(knex, { cleanupInterval: 0 }), resave: false, saveUninitialized: false, rolling: true }));
  withSession.get('/login', (req, res) => {
    (req.session as unknown as { who: string }).who = 'bench';
    res.json({ ok: true });
  });
  withSession.get('/', (_req, res) => res.json({ hello: 'world' }));
  const listen = (app: express.Express) =>
    new Promise<{ port: number; close: () => void }>((resolve) => {
      const s = app.listen(0, '127.0.0.1', () => resolve({ port: (s.address() as net.AddressInfo).port, close: () => s.close() }));
    });
  return { hello: await listen(hello), withSession: await listen(withSession), knex };
}

function initialJsGzip() {
  const dist = path.join(root, 'dist');
  const html = fs.readFileSync(path.join(dist, 'index.html'), 'utf8');
  const files = [...html.matchAll(/(?:src|href)="(\/assets\/[^"]+\.js)"/g)].map((m) => m[1]);
  let total = 0;
  for (const f of new Set(files)) total += zlib.gzipSync(fs.readFileSync(path.join(dist, f)), { level: 9 }).length;
  return { files: new Set(files).size, kb: total / 1024 };
}

const table = (rows: Result[]) => {
  const lines = ['| endpoint | conn | req/s | p50 ms | p99 ms | errors | non-2xx |', '|---|---:|---:|---:|---:|---:|---:|'];
  for (const r of rows) lines.push(`| ${r.name} | ${r.connections} | ${r.rps.toFixed(0)} | ${r.p50} | ${r.p99} | ${r.errors} | ${r.non2xx} |`);
  return lines.join('\n');
};

async function main() {
  if (!fs.existsSync(path.join(root, 'dist/index.html'))) throw new Error('Run `npm run build` first (the bench measures the built client).');
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-bench-'));
  console.log(`Generating the data set in ${dataDir} …`);
  const migrated = await createApp(loadConfig({ DATA_DIR: dataDir }, { logLevel: 'silent', runJobs: false, serveClient: false, demo: false }));
  await migrated.close();
  const t0 = performance.now();
  generate(dataDir);
  console.log(`  generated in ${((performance.now() - t0) / 1000).toFixed(1)} s`);

  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: root,
    detached: true,
    stdio: ['ignore', 'inherit', 'inherit'],
    env: { ...process.env, PORT: String(port), DATA_DIR: dataDir, DEMO: 'false', LOG_LEVEL: 'warn', SMTP_URL: '', NODE_ENV: 'production' },
  });
  try {
    for (let i = 0; ; i++) {
      try {
        if ((await fetch(`${base}/api/health`)).ok) break;
      } catch {
        /* starting */
      }
      if (i > 300) throw new Error('server did not start');
      await new Promise((r) => setTimeout(r, 100));
    }
    const owner = await login(base, 'bench-owner-1@bench.test');
    const client = await login(base, 'bench-client-1-1@bench.test');
    const bare = await bareServers(dataDir);
    const bareCookie = (await fetch(`http://127.0.0.1:${bare.withSession.port}/login`)).headers.get('set-cookie')!.split(';')[0];

    const rows: Result[] = [];
    for (const c of LEVELS) {
      rows.push(await measure('bare Express hello', `http://127.0.0.1:${bare.hello.port}/`, c));
      rows.push(await measure('bare Express + session store', `http://127.0.0.1:${bare.withSession.port}/`, c, { cookie: bareCookie }));
      rows.push(await measure('commission list (owner)', `${base}/api/studios/1/commissions?limit=50`, c, { cookie: owner }));
      rows.push(await measure('bench board (owner)', `${base}/api/studios/1/board`, c, { cookie: owner }));
      rows.push(await measure('client portal: my commissions', `${base}/api/studios/1/commissions?limit=50`, c, { cookie: client }));
    }
    console.log('\n## Read endpoints against bare Express\n');
    console.log(table(rows));
    const at50 = (name: string) => rows.find((r) => r.name === name && r.connections === 50)!.rps;
    for (const name of ['commission list (owner)', 'bench board (owner)', 'client portal: my commissions']) {
      console.log(
        `- ${name} at 50 connections: ${((100 * at50(name)) / at50('bare Express hello')).toFixed(0)} % of bare Express hello, ` +
          `${((100 * at50(name)) / at50('bare Express + session store')).toFixed(0)} % of bare Express with the session store (aim ≥ 30 % of bare Express)`,
      );
    }

    // Every list endpoint of studio 1 at 50 connections; those that this build does not have (404) are skipped.
    const lists = ['commissions?limit=50', 'clients?limit=50', 'board', 'members', 'invitations', 'quotes?limit=50', 'invoices?limit=50', 'paints?limit=50', 'recipes?limit=50', 'enquiries?limit=50', 'schedule'];
    const listRows: Result[] = [];
    for (const l of lists) {
      const url = `${base}/api/studios/1/${l}`;
      const probe = await fetch(url, { headers: { cookie: owner } });
      if (probe.status === 404) continue;
      listRows.push(await measure(`GET /studios/1/${l}`, url, 50, { cookie: owner }));
    }
    console.log('\n## Every list endpoint, 50 connections, 1,000,000 stage rows (aim p99 ≤ 50 ms)\n');
    console.log(table(listRows));
    const slow = listRows.filter((r) => r.p99 > 50);
    console.log(slow.length ? `- over the aim: ${slow.map((r) => r.name).join(', ')}` : '- all within the aim');

    const js = initialJsGzip();
    console.log(`\n## Client\n\n- initial JavaScript: ${js.files} file(s), ${js.kb.toFixed(1)} KB gzip (aim ≤ 200 KB)`);
    bare.hello.close();
    bare.withSession.close();
    await bare.knex.destroy();
  } finally {
    try {
      process.kill(-server.pid!, 'SIGTERM');
    } catch {
      /* gone */
    }
    await new Promise((r) => setTimeout(r, 300));
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
}

await main();
