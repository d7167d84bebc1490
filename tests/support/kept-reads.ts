import { expect } from 'vitest';

/**
 * For the tests of a kept read (forecast, board, commission list, books): two app instances on one database,
 * `cached` with the cache on and `fresh` with it off. The function returned reads everything on the cached
 * instance (so its cache holds it), makes the write, then expects the cached instance to answer what the fresh
 * one answers, and not what it answered before the write (so the write was one the answers read).
 * `beforeWrite` runs between the first read and the write (e.g. to move both clocks on).
 */
export function afterEachWrite<T>(read: (on: 'cached' | 'fresh') => Promise<T>, beforeWrite: () => void = () => undefined) {
  return async (write: () => Promise<unknown>) => {
    const before = await read('cached');
    beforeWrite();
    await write();
    const after = await read('cached');
    expect(after).toEqual(await read('fresh'));
    expect(after).not.toEqual(before);
    return { before, after };
  };
}

type Clocked = { clock: { set(time: Date | string): void; advance(ms: number): void } };

/** The instances' clocks moved together: they stand for two machines whose clocks agree. */
export function bothClocks(apps: () => Clocked[]) {
  return {
    at: (time: string) => apps().forEach((a) => a.clock.set(time)),
    advance: (ms: number) => apps().forEach((a) => a.clock.advance(ms)),
  };
}

/** An identifier as SQLite (`x`) or PostgreSQL ("x") quotes it. */
const q = '[`"]';
/**
 * The reads every signed-in studio request makes before its own (server/lib/db.ts readFirst): its session, its
 * person and its membership. What a kept read's test counts beyond these (and the version) is the list itself.
 */
const floorPatterns = [`${q}sessions${q}`, `^select [^()]* from ${q}users${q} where ${q}id${q} = `, `from ${q}memberships${q} as ${q}m${q}`].map((p) => new RegExp(p));
export const isFloorRead = (sql: string) => floorPatterns.some((p) => p.test(sql));

/** The answer, or an error naming its status and body when it is not `status` (200 unless told). */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- answers compared whole
export const ok = async <R extends { status: number; body: any }>(res: Promise<R>, status = 200) => {
  const r = await res;
  if (r.status !== status) throw new Error(`${r.status}: ${JSON.stringify(r.body)}`);
  return r;
};
