import crypto from 'node:crypto';
import knexFactory from 'knex';
import type { TestProject } from 'vitest/node';
import { migrate, openDb } from '../../server/lib/db';

declare module 'vitest' {
  export interface ProvidedContext {
    /** Name of the migrated PostgreSQL database each test app's database is copied from; null on SQLite. */
    pgTemplate: string | null;
  }
}

/**
 * Global setup of the API project. With DATABASE_URL set, runs the migrations once into a template
 * database for this run; every test app then starts on a copy of it (CREATE DATABASE … TEMPLATE), which
 * takes a fraction of running the migrations again. The template is dropped when the run ends.
 */
export default async function setup(project: TestProject) {
  const base = process.env.DATABASE_URL;
  if (!base) {
    project.provide('pgTemplate', null);
    return;
  }
  const name = `sablework_template_${process.pid}_${crypto.randomBytes(4).toString('hex')}`;
  const admin = knexFactory({ client: 'pg', connection: base, pool: { min: 0, max: 1 } });
  await admin.raw(`create database ${name}`);
  const url = new URL(base);
  url.pathname = `/${name}`;
  const db = openDb({ dataDir: '', databaseUrl: url.toString() });
  try {
    await migrate(db);
  } finally {
    // A template must have no open connections while it is copied.
    await db.destroy();
  }
  project.provide('pgTemplate', name);
  return async () => {
    await admin.raw(`drop database if exists ${name} with (force)`);
    await admin.destroy();
  };
}
