import crypto from 'node:crypto';
import knexFactory from 'knex';
import type { TestProject } from 'vitest/node';
import { migrate, openDb } from '../../server/lib/db';

declare module 'vitest' {
  export interface ProvidedContext {
    /**
     * On PostgreSQL: the migrated database each test app's database is copied from, and the name prefix of
     * this run's databases. null on SQLite.
     */
    pg: { template: string; prefix: string } | null;
  }
}

/**
 * Global setup of the API project. With DATABASE_URL set, runs the migrations once into a template
 * database for this run; every test app then starts on a copy of it (CREATE DATABASE … TEMPLATE), which
 * takes a fraction of running the migrations again. When the run ends, the template and every database of
 * this run still there are dropped.
 */
export default async function setup(project: TestProject) {
  const base = process.env.DATABASE_URL;
  if (!base) {
    project.provide('pg', null);
    return;
  }
  const run = crypto.randomBytes(4).toString('hex');
  const prefix = `sablework_test_${run}_`;
  const template = `${prefix}template`;
  const admin = knexFactory({ client: 'pg', connection: base, pool: { min: 0, max: 1 } });
  await admin.raw(`create database ${template}`);
  const url = new URL(base);
  url.pathname = `/${template}`;
  const db = openDb({ dataDir: '', databaseUrl: url.toString() });
  try {
    await migrate(db);
  } catch (err) {
    await db.destroy();
    await admin.raw(`drop database if exists ${template} with (force)`);
    await admin.destroy();
    throw err;
  }
  // A template must have no open connections while it is copied.
  await db.destroy();
  project.provide('pg', { template, prefix });
  return async () => {
    const names: string[] = await admin('pg_database').pluck('datname');
    for (const name of names.filter((n) => n.startsWith(prefix))) await admin.raw(`drop database if exists ${name} with (force)`);
    await admin.destroy();
  };
}
