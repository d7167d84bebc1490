/**
 * The two bare servers `npm run bench` compares the app with, run in a process of their own (as the app's
 * server is), so neither shares an event loop with autocannon: a bare Express "hello", and a bare Express
 * with the app's own session store (server/lib/session-store.ts) on a SQLite file opened as the app opens its own.
 * Started as `tsx tests/bench/support/bare-servers.ts <dir>`; prints one JSON line with both ports.
 */
import path from 'node:path';
import type net from 'node:net';
import express from 'express';
import session from 'express-session';
import { openDb } from '../../../server/lib/db';
import { createSessionStore } from '../../../server/lib/session-store';

const dir = process.argv[2];
if (!dir) throw new Error('usage: bare-servers.ts <dir>');

const hello = express();
hello.get('/', (_req, res) => res.json({ hello: 'world' }));

// The app's own SQLite connection (server/lib/db.ts: its settings, its prepared statements and its read-only
// connection for the session read), on a file of its own, so the comparison is of the stacks, not of the database.
const knex = openDb({ dataDir: path.join(dir, 'bare') });
await knex.schema.dropTableIfExists('sessions');
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
  new Promise<number>((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve((s.address() as net.AddressInfo).port));
  });
console.log(JSON.stringify({ hello: await listen(hello), withSession: await listen(withSession) }));
process.on('SIGTERM', () => void knex.destroy().then(() => process.exit(0)));
