// Small helpers of the security suite (tests/api/security-*.test.ts).
import type { Response } from 'supertest';
import type { Caller, TestApp } from './app';

export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

/** Calls a route the way the route table does: unsafe methods with an empty JSON body (and the caller's CSRF token). */
export function call(c: Caller, method: string, url: string, body: unknown = {}): Promise<Response> {
  const m = method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
  if (m === 'get') return c.get(url) as unknown as Promise<Response>;
  if (m === 'delete') return c.delete(url);
  return c[m](url, body);
}

/** Tables that change on any request, allowed or not (rolling sessions, sign-in failures, public rate limits). */
const VOLATILE = new Set(['sessions', 'login_failures']);

/**
 * Every row of every table, as sorted JSON per table: compared before and after a sweep of refused calls,
 * it shows that none of them changed anything (no record, no queued mail).
 */
export async function snapshot(sw: TestApp, skip: string[] = []): Promise<Record<string, string[]>> {
  // Mail queued earlier is delivered first, so only mail caused by the calls in between shows as a change.
  await sw.jobs.deliverMail();
  const isPg = String(sw.db.client.config.client).includes('pg');
  const names: string[] = isPg
    ? (await sw.db.raw("select tablename as name from pg_tables where schemaname = current_schema()")).rows.map((r: { name: string }) => r.name)
    : (await sw.db('sqlite_master').where({ type: 'table' }).select('name')).map((r: { name: string }) => r.name);
  const out: Record<string, string[]> = {};
  for (const name of names.sort()) {
    if (VOLATILE.has(name) || skip.includes(name) || name.startsWith('sqlite_') || name.startsWith('knex_')) continue;
    out[name] = (await sw.db(name).select('*')).map((r: unknown) => JSON.stringify(r)).sort();
  }
  return out;
}

/** The tables whose rows differ between two snapshots, with the rows that appeared or went. */
export function changes(before: Record<string, string[]>, after: Record<string, string[]>) {
  const out: Record<string, { added: string[]; removed: string[] }> = {};
  for (const t of new Set([...Object.keys(before), ...Object.keys(after)])) {
    const b = new Set(before[t] ?? []);
    const a = new Set(after[t] ?? []);
    const added = [...a].filter((r) => !b.has(r));
    const removed = [...b].filter((r) => !a.has(r));
    if (added.length || removed.length) out[t] = { added: added.slice(0, 3), removed: removed.slice(0, 3) };
  }
  return out;
}

export const is2xx = (status: number) => status >= 200 && status < 300;
