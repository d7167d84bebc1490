// The same code on SQLite and PostgreSQL: what the database hands back, how a broken key is recognised, and
// (PostgreSQL only, where instances share one database) migrations run by several instances starting at once.
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import knexFactory from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isUniqueViolation, migrate, openDb, readAll, readFirst, rollbackAll, type Db } from '../../server/lib/db';
import { signUp, startTestApp, withQueries, type TestApp } from '../support/app';

let sw: TestApp;

/** A database of its own, empty: a new SQLite file, or a new PostgreSQL database on DATABASE_URL's server. */
async function emptyDatabase(): Promise<{ open(): Db; drop(): Promise<void> }> {
  const base = process.env.DATABASE_URL;
  if (!base) {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-db-'));
    return { open: () => openDb({ dataDir: dir }), drop: async () => fs.rmSync(dir, { recursive: true, force: true }) };
  }
  const name = `sablework_db_${crypto.randomBytes(4).toString('hex')}`;
  const admin = knexFactory({ client: 'pg', connection: base, pool: { min: 0, max: 1 } });
  await admin.raw(`create database ${name}`);
  const url = new URL(base);
  url.pathname = `/${name}`;
  return {
    open: () => openDb({ dataDir: '', databaseUrl: url.toString() }),
    async drop() {
      await admin.raw(`drop database if exists ${name} with (force)`);
      await admin.destroy();
    },
  };
}

const migrationFiles = () => fs.readdirSync(path.resolve(import.meta.dirname, '../../migrations')).filter((f) => /^\d{14}-[a-z0-9-]+\.ts$/.test(f)).sort();

async function tablesOf(db: Db): Promise<string[]> {
  const names: string[] =
    db.client.config.client === 'pg'
      ? await db('pg_tables').where({ schemaname: 'public' }).pluck('tablename')
      : await db('sqlite_master').where({ type: 'table' }).whereNot('name', 'like', 'sqlite_%').pluck('name');
  return names.sort();
}
beforeAll(async () => {
  sw = await startTestApp();
  await signUp(sw, { email: 'numbers-one@example.test', studioName: 'Numbers One' });
  await signUp(sw, { email: 'numbers-two@example.test', studioName: 'Numbers Two' });
});
afterAll(() => sw?.stop());

describe(`the database (${process.env.DATABASE_URL ? 'PostgreSQL' : 'SQLite'})`, () => {
  it('hands back counts, sums and averages as numbers', async () => {
    const row = await sw.db('users')
      .whereIn('email', ['numbers-one@example.test', 'numbers-two@example.test'])
      .first(
        sw.db.raw('count(*) as n'),
        sw.db.raw('sum(length(email)) as total'), // bigint on PostgreSQL
        sw.db.raw('sum(cast(length(email) as bigint)) as big_total'), // numeric on PostgreSQL
        sw.db.raw('avg(length(email)) as mean'), // numeric on PostgreSQL
      );
    const lengths = ['numbers-one@example.test', 'numbers-two@example.test'].map((e) => e.length);
    expect(row).toEqual({ n: 2, total: lengths[0] + lengths[1], big_total: lengths[0] + lengths[1], mean: (lengths[0] + lengths[1]) / 2 });
    const counted = await sw.db('studios').count({ n: '*' }).first();
    expect(counted).toEqual({ n: 2 });
  });

  it('recognises a broken unique key, and only that', async () => {
    const user = await sw.db('users').where({ email: 'numbers-one@example.test' }).first();
    const copy = { ...user, id: undefined };
    const duplicate = await sw.db('users').insert(copy).then(
      () => null,
      (err: unknown) => err,
    );
    expect(duplicate).toBeInstanceOf(Error);
    expect(isUniqueViolation(duplicate)).toBe(true);
    const missing = await sw.db('users').insert({ ...copy, email: 'numbers-three@example.test', name: null }).then(
      () => null,
      (err: unknown) => err,
    );
    expect(missing).toBeInstanceOf(Error);
    expect(isUniqueViolation(missing)).toBe(false);
    expect(isUniqueViolation(new Error('unique in name only'))).toBe(false);
  });
});

describe('the migrations', () => {
  it('each has a working down: all roll back to an empty schema and run again to the same tables', async () => {
    const empty = await emptyDatabase();
    const db = empty.open();
    try {
      await migrate(db);
      const tables = await tablesOf(db);
      expect(tables).toContain('commissions');
      await rollbackAll(db);
      expect(await tablesOf(db)).toEqual(['knex_migrations', 'knex_migrations_lock']);
      await migrate(db);
      expect(await tablesOf(db)).toEqual(tables);
      expect(await db('knex_migrations').orderBy('id').pluck('name')).toEqual(migrationFiles());
    } finally {
      await db.destroy();
      await empty.drop();
    }
  });
});

describe(`readFirst, the reads every signed-in request makes (${process.env.DATABASE_URL ? 'PostgreSQL: through Knex' : 'SQLite: on its read-only connection'})`, () => {
  const byKnex = <T>(query: ReturnType<Db>) => query.first() as Promise<T | undefined>;

  it('answers what Knex answers: a row, no row, a left join without a match, Date and boolean bindings', async () => {
    const db = sw.db;
    const user = await db('users').where({ email: 'numbers-one@example.test' }).first('id');
    const shapes = [
      () => db('users').where({ id: user.id }).select('id', 'email', 'name', 'email_notices', 'session_epoch'),
      () => db('users').where({ id: 987_654 }).select('id'),
      () =>
        db('memberships as m')
          .leftJoin('clients as c', function () {
            this.on('c.studio_id', '=', 'm.studio_id').andOn('c.user_id', '=', 'm.user_id');
          })
          .where({ 'm.user_id': user.id })
          .select('m.role', 'c.id as client_id'),
      () => db('users').where({ email_notices: true }).where('created_at', '<', new Date('2999-01-01T00:00:00Z').toISOString()).orderBy('id').select('id', 'email'),
      () => db('users').where({ email_notices: false }).select('id'),
    ];
    for (const shape of shapes) expect(await readFirst(db, shape())).toEqual(await byKnex(shape()));
    expect(await readFirst(db, shapes[1]())).toBeUndefined();
    expect(await readFirst<{ client_id: unknown }>(db, shapes[2]())).toMatchObject({ role: 'owner', client_id: null });
  });

  it('readAll answers the rows Knex answers, in its order, and none as an empty list', async () => {
    const db = sw.db;
    const shapes = [
      () => db('users').whereIn('email', ['numbers-one@example.test', 'numbers-two@example.test']).orderBy('email', 'desc').select('id', 'email', 'email_notices'),
      () => db('memberships as m').join('studios as s', 's.id', 'm.studio_id').orderBy('s.name').select('m.studio_id as studioId', 's.name as studioName', 'm.role as role'),
      () => db('users').where({ id: 987_654 }).select('id'),
    ];
    for (const shape of shapes) expect(await readAll(db, shape())).toEqual(await shape());
    expect(await readAll(db, shapes[0]())).toHaveLength(2);
    expect(await readAll(db, shapes[2]())).toEqual([]);
  });

  it("is seen by Knex's query listeners, as the query counts and plans need", async () => {
    const { sql } = await withQueries(sw.db, () => readFirst(sw.db, sw.db('studios').where({ id: 1 }).select('schedule_version')));
    expect(sql).toHaveLength(1);
    expect(sql[0]).toMatch(/^select .schedule_version. from .studios. where .id. = /);
  });

  it('reads what is committed: not the rows of a transaction still open, and them once it commits', async () => {
    const db = sw.db;
    const who = () => readFirst<{ name: string }>(db, db('users').where({ email: 'numbers-two@example.test' }).select('name'));
    const before = (await who())!.name;
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    let written!: () => void;
    const wrote = new Promise<void>((r) => (written = r));
    const transaction = db.transaction(async (trx) => {
      await trx('users').where({ email: 'numbers-two@example.test' }).update({ name: 'Renamed inside' });
      written();
      await held;
    });
    await wrote;
    // On SQLite the transaction holds Knex's one connection: through Knex this read would wait for it.
    const during = await Promise.race([who(), new Promise<'waited'>((r) => setTimeout(() => r('waited'), 2_000))]);
    release();
    await transaction;
    expect(during).toEqual({ name: before });
    expect(await who()).toEqual({ name: 'Renamed inside' });
  });

  it.skipIf(!!process.env.DATABASE_URL)('closes its connection with the database', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-reader-'));
    const file = path.join(dir, 'sablework.sqlite');
    const handles = () => fs.readdirSync('/proc/self/fd').filter((fd) => {
      try {
        return fs.readlinkSync(`/proc/self/fd/${fd}`) === file;
      } catch {
        return false; // closed while listed
      }
    }).length;
    const db = openDb({ dataDir: dir });
    try {
      await db.raw('create table t (id integer primary key, v text)');
      await db('t').insert({ id: 1, v: 'one' });
      const withWriter = handles();
      expect(await readFirst(db, db('t').where({ id: 1 }).select('v'))).toEqual({ v: 'one' });
      expect(handles()).toBe(withWriter + 1);
    } finally {
      await db.destroy();
    }
    expect(handles()).toBe(0);
    fs.rmSync(dir, { recursive: true, force: true });
  });
});

describe.runIf(process.env.DATABASE_URL)('PostgreSQL shared by several instances', () => {
  it('migrates a fresh database once when three instances start at the same moment', async () => {
    const base = process.env.DATABASE_URL!;
    const name = `sablework_migrate_${crypto.randomBytes(4).toString('hex')}`;
    const admin = knexFactory({ client: 'pg', connection: base, pool: { min: 0, max: 1 } });
    await admin.raw(`create database ${name}`);
    const url = new URL(base);
    url.pathname = `/${name}`;
    const instances = [1, 2, 3].map(() => openDb({ dataDir: '', databaseUrl: url.toString() }));
    try {
      const outcomes = await Promise.allSettled(instances.map((db) => migrate(db)));
      expect(outcomes.map((o) => (o.status === 'rejected' ? String(o.reason) : o.status))).toEqual(['fulfilled', 'fulfilled', 'fulfilled']);
      expect(await instances[0]('knex_migrations').orderBy('id').pluck('name')).toEqual(migrationFiles());
    } finally {
      for (const db of instances) await db.destroy();
      await admin.raw(`drop database if exists ${name} with (force)`);
      await admin.destroy();
    }
  });
});
