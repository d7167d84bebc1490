import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import Database from 'better-sqlite3';
import knexFactory, { type Knex } from 'knex';

export type Db = Knex;

const migrationsDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../migrations');

/** Fails start-up with a plain message when DATA_DIR cannot be written. */
export function ensureWritableDir(dir: string) {
  try {
    fs.mkdirSync(dir, { recursive: true });
    fs.accessSync(dir, fs.constants.W_OK);
  } catch (err) {
    const reason = err instanceof Error ? err.message : String(err);
    throw new Error(`Sablework cannot start: DATA_DIR "${dir}" is not writable (${reason}). Set DATA_DIR to a folder this user can write.`, { cause: err });
  }
}

type TypeParser = (value: string) => unknown;
const pgTypes = (createRequire(import.meta.url)('pg') as { types: { getTypeParser(oid: number, format?: string): TypeParser } }).types;

/** PostgreSQL type ids whose text we read as JavaScript numbers. */
const INT8 = 20; // bigint: count(*), sum(integer), bigInteger columns
const NUMERIC = 1700; // numeric: sum(bigint), avg()

/**
 * node-postgres hands bigint and numeric back as strings (they may not fit a double); SQLite hands back
 * numbers. Counts, sums of minor units and ids are far below 2^53, so read them as numbers on PostgreSQL
 * too, and the code sees one type whatever the database. A value that would lose precision stays a string.
 */
function parseNumber(text: string): number | string {
  const v = Number(text);
  return Number.isFinite(v) && (!Number.isInteger(v) || Number.isSafeInteger(v)) ? v : text;
}
const pgTypeParsers = {
  getTypeParser(oid: number, format?: string): TypeParser {
    if ((oid === INT8 || oid === NUMERIC) && format !== 'binary') return parseNumber;
    return pgTypes.getTypeParser(oid, format);
  },
};

/**
 * Knex prepares every query's statement afresh; on a busy server that is a good part of each query's
 * cost. The same SQL text gets the same prepared statement back (better-sqlite3 statements are reusable,
 * re-prepare themselves after a schema change, and Knex runs each to completion at once), the least
 * recently used of at most `size` dropped.
 */
function cachePreparedStatements<S>(conn: { prepare: (sql: string) => S }, size = 500) {
  const prepare = conn.prepare.bind(conn);
  const cache = new Map<string, S>();
  conn.prepare = (sql: string) => {
    // Knex begins every transaction with a plain BEGIN, which takes the write lock only at the first write; with
    // several processes on one file (WORKERS > 1) a transaction that read first then fails at once with
    // SQLITE_BUSY if another wrote meanwhile. BEGIN IMMEDIATE takes the lock at the start and waits its turn
    // (busy_timeout), as SQLite advises for transactions that write. One process, one connection: no change.
    if (sql === 'BEGIN;') sql = 'BEGIN IMMEDIATE;';
    let statement = cache.get(sql);
    if (statement) cache.delete(sql);
    else statement = prepare(sql);
    cache.set(sql, statement);
    if (cache.size > size) cache.delete(cache.keys().next().value!);
    return statement;
  };
}

/** The read-only connection of a SQLite database opened by openDb, opened on first use (see readFirst). */
const readers = new WeakMap<Db, () => Database.Database>();

/**
 * Runs a one-row read outside Knex's pool and runner: on a SQLite database opened by openDb, the query
 * Knex built is run on a read-only connection of its own, with its statement prepared once; anywhere else
 * (PostgreSQL, another Knex) it simply runs through Knex.
 *
 * For the few reads every signed-in request makes before its own work (its session, its person, its
 * membership, its studio's version). Through Knex each costs two to three times as much CPU as the statement
 * alone (about 0.06 against 0.02-0.04 ms, measured in-process on the bench database), and a cached list
 * answer is little more than these reads. The read-only connection sees what is committed, as another
 * instance would: never pass a transaction's rows through it (it takes `db`, not a transaction). Knex's
 * 'query' event is still emitted, so query counts and plans see the statement.
 */
export function readFirst<T>(db: Db, query: Knex.QueryBuilder): Promise<T | undefined> {
  const reader = readers.get(db);
  if (!reader) return query.first() as Promise<T | undefined>;
  return onReader(db, reader, query.first(), 'first', (statement, bindings) => statement.get(...bindings) as T | undefined);
}

/** readFirst for a few rows (a person's memberships): all the rows the query gives. */
export function readAll<T>(db: Db, query: Knex.QueryBuilder): Promise<T[]> {
  const reader = readers.get(db);
  if (!reader) return query as unknown as Promise<T[]>;
  return onReader(db, reader, query, 'select', (statement, bindings) => statement.all(...bindings) as T[]);
}

function onReader<R>(db: Db, reader: () => Database.Database, query: Knex.QueryBuilder, method: string, run: (statement: Database.Statement, bindings: unknown[]) => R): Promise<R> {
  try {
    const { sql, bindings } = query.toSQL();
    if (db.listenerCount('query')) db.emit('query', { sql, bindings, method });
    const formatted = (db.client as unknown as { _formatBindings(b: readonly unknown[]): unknown[] })._formatBindings(bindings);
    return Promise.resolve(run(reader().prepare(sql), formatted));
  } catch (err) {
    return Promise.reject(err);
  }
}

export function openDb(opts: { dataDir: string; databaseUrl?: string }): Db {
  if (opts.databaseUrl) {
    return knexFactory({
      client: 'pg',
      connection: { connectionString: opts.databaseUrl, types: pgTypeParsers },
      pool: { min: 0, max: 10 },
    });
  }
  ensureWritableDir(opts.dataDir);
  const filename = path.join(opts.dataDir, 'sablework.sqlite');
  const db = knexFactory({
    client: 'better-sqlite3',
    connection: { filename },
    useNullAsDefault: true,
    pool: {
      // One connection: better-sqlite3 is synchronous, and a single writer avoids SQLITE_BUSY between our own connections.
      min: 1,
      max: 1,
      afterCreate(conn: { pragma: (s: string) => unknown; prepare: (sql: string) => unknown }, done: (err: Error | null, conn: unknown) => void) {
        cachePreparedStatements(conn);
        conn.pragma('journal_mode = WAL');
        conn.pragma('foreign_keys = ON');
        conn.pragma('busy_timeout = 5000');
        conn.pragma('synchronous = NORMAL');
        // Table statistics for the query planner (SQLite's advice for long-lived connections): without them it
        // picks an index by the ORDER BY and walks every stage of a studio to read one commission's. Bounded
        // by analysis_limit, so it stays well under a second on a million stages.
        conn.pragma('analysis_limit = 400');
        conn.pragma('optimize = 0x10002');
        done(null, conn);
      },
    },
  });
  // The read-only connection for readFirst: opened on first use (after the migrations made the file and set
  // WAL, so it reads beside the writer), and closed with the pool.
  let reader: Database.Database | undefined;
  readers.set(db, () => {
    if (reader?.open) return reader;
    reader = new Database(filename, { readonly: true, fileMustExist: true });
    reader.pragma('busy_timeout = 5000');
    cachePreparedStatements(reader);
    return reader;
  });
  // (db.destroy itself is read-only; it ends in the client's destroy)
  const client = db.client as { destroy(callback?: unknown): Promise<void> };
  const destroy = client.destroy.bind(client);
  client.destroy = (callback) => {
    reader?.close();
    reader = undefined;
    return destroy(callback);
  };
  return db;
}

/**
 * Migrations are imported by our own code rather than Knex's loader, so the same files run under tsx
 * (the server) and under vitest's transform (the tests).
 */
const migrationSource: Knex.MigrationSource<string> = {
  async getMigrations() {
    return fs
      .readdirSync(migrationsDir)
      .filter((f) => /^\d{14}-[a-z0-9-]+\.ts$/.test(f))
      .sort();
  },
  getMigrationName: (name) => name,
  getMigration: (name) => import(pathToFileURL(path.join(migrationsDir, name)).href),
};

/** Key of the PostgreSQL advisory lock that lets one instance at a time run the migrations. */
const MIGRATION_LOCK_KEY = 7_325_160_411;

/**
 * Runs the migrations not yet run. On PostgreSQL, instances that start together take turns: an open
 * transaction holds an advisory lock while Knex migrates on other connections, and the next instance
 * finds nothing left to do. (Knex's own lock row does not cover a fresh database, where both would race
 * to create Knex's tables.)
 */
export async function migrate(db: Db) {
  if (db.client.config.client !== 'pg') {
    await db.migrate.latest({ migrationSource });
    return;
  }
  await db.transaction(async (trx) => {
    await trx.raw('select pg_advisory_xact_lock(?)', [MIGRATION_LOCK_KEY]);
    await db.migrate.latest({ migrationSource });
  });
}

export async function rollbackAll(db: Db) {
  await db.migrate.rollback({ migrationSource }, true);
}

/**
 * True when a write broke a unique index or primary key: better-sqlite3 reports SQLITE_CONSTRAINT_UNIQUE
 * (or _PRIMARYKEY), PostgreSQL SQLSTATE 23505. On PostgreSQL the failed statement also ends the
 * transaction it ran in, so handle it outside the transaction, never carry on inside it.
 */
export function isUniqueViolation(err: unknown): boolean {
  const code = (err as { code?: unknown } | null)?.code;
  return code === '23505' || code === 'SQLITE_CONSTRAINT_UNIQUE' || code === 'SQLITE_CONSTRAINT_PRIMARYKEY';
}

/** Runs fn in a transaction; on SQLite this is one connection, so keep bodies short and free of network I/O. */
export function tx<T>(db: Db, fn: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  return db.transaction(fn);
}
