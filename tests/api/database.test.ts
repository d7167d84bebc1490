// The same code on SQLite and PostgreSQL: what the database hands back, how a broken key is recognised, and
// (PostgreSQL only, where instances share one database) migrations run by several instances starting at once.
import fs from 'node:fs';
import crypto from 'node:crypto';
import path from 'node:path';
import knexFactory from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isUniqueViolation, migrate, openDb } from '../../server/lib/db';
import { signUp, startTestApp, type TestApp } from '../support/app';

let sw: TestApp;
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
      const files = fs.readdirSync(path.resolve(import.meta.dirname, '../../migrations')).filter((f) => /^\d{14}-[a-z0-9-]+\.ts$/.test(f));
      const ran = await instances[0]('knex_migrations').orderBy('id').pluck('name');
      expect(ran).toEqual([...files].sort());
    } finally {
      for (const db of instances) await db.destroy();
      await admin.raw(`drop database if exists ${name} with (force)`);
      await admin.destroy();
    }
  });
});
