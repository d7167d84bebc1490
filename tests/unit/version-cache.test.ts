import { describe, expect, it } from 'vitest';
import { versionCache } from '../../server/lib/version-cache';

// The in-memory store behind the bench board and commission list caches (server/lib/version-cache.ts).

const made = (rows: number) => ({ rows });
const cache = (maxWeight = 10) => versionCache<{ rows: number }>({ maxWeight, weigh: (v) => v.rows });
const settle = () => new Promise((r) => setTimeout(r, 0));

describe('the version cache', () => {
  it('answers only for the same studio, version and query', async () => {
    const c = cache();
    await c.set(1, 5, 'a', Promise.resolve(made(1)));
    expect(await c.get(1, 5, 'a')).toEqual(made(1));
    expect(c.get(2, 5, 'a')).toBeUndefined();
    expect(c.get(1, 6, 'a')).toBeUndefined();
    expect(c.get(1, 4, 'a')).toBeUndefined();
    expect(c.get(1, 5, 'b')).toBeUndefined();
  });

  it('keeps several queries of one version side by side', async () => {
    const c = cache();
    await c.set(1, 5, 'a', Promise.resolve(made(1)));
    await c.set(1, 5, 'b', Promise.resolve(made(2)));
    expect(await c.get(1, 5, 'a')).toEqual(made(1));
    expect(await c.get(1, 5, 'b')).toEqual(made(2));
    expect(c.size()).toEqual({ entries: 2, weight: 3 });
  });

  it('shares a read still running', async () => {
    const c = cache();
    let finish!: (v: { rows: number }) => void;
    const running = c.set(1, 5, 'a', new Promise((r) => (finish = r)));
    const second = c.get(1, 5, 'a');
    expect(second).toBe(running);
    finish(made(2));
    expect(await second).toEqual(made(2));
  });

  it("a newer version drops every query of the studio's older one, and an older one does not replace a newer", async () => {
    const c = cache();
    await c.set(1, 5, 'a', Promise.resolve(made(1)));
    await c.set(1, 5, 'b', Promise.resolve(made(1)));
    await c.set(2, 5, 'a', Promise.resolve(made(1)));
    await c.set(1, 6, 'a', Promise.resolve(made(2)));
    await settle();
    expect(c.get(1, 5, 'b')).toBeUndefined();
    expect(c.size()).toEqual({ entries: 2, weight: 3 });
    // A request that read version 5 just before the write finishes late: its read is answered, not kept.
    expect(await c.set(1, 5, 'a', Promise.resolve(made(9)))).toEqual(made(9));
    expect(await c.get(1, 6, 'a')).toEqual(made(2));
    expect(c.get(1, 5, 'a')).toBeUndefined();
    expect(await c.get(2, 5, 'a')).toEqual(made(1));
  });

  it('holds at most its weight, least recently used out first', async () => {
    const c = cache(10);
    await c.set(1, 1, 'a', Promise.resolve(made(4)));
    await c.set(2, 1, 'a', Promise.resolve(made(4)));
    await settle();
    c.get(1, 1, 'a'); // studio 1 is now the more recent
    await c.set(3, 1, 'a', Promise.resolve(made(4)));
    await settle();
    expect(c.get(2, 1, 'a')).toBeUndefined();
    expect(c.get(1, 1, 'a')).toBeDefined();
    expect(c.get(3, 1, 'a')).toBeDefined();
    expect(c.size()).toEqual({ entries: 2, weight: 8 });
  });

  it('keeps no failure, and nothing with a weight of 0', async () => {
    const c = cache();
    await expect(c.set(1, 1, 'a', Promise.reject(new Error('database gone')))).rejects.toThrow('database gone');
    await settle();
    expect(c.get(1, 1, 'a')).toBeUndefined();
    const off = cache(0);
    expect(await off.set(1, 1, 'a', Promise.resolve(made(1)))).toEqual(made(1));
    expect(off.get(1, 1, 'a')).toBeUndefined();
  });
});
