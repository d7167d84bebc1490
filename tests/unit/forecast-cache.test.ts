import { describe, expect, it } from 'vitest';
import { deepFreeze } from '../../server/lib/deep-freeze';
import { forecastCache } from '../../server/features/schedule/forecast-cache';

// The in-memory store behind the studio forecast cache (server/features/schedule/schedule.service.ts run()).

const key = (studioId: number, version = 1, minute = 100) => ({ studioId, version, minute });
const made = (stages: number) => ({ stages });

describe('the forecast cache', () => {
  const cache = () => forecastCache<{ stages: number }>({ maxWeight: 10, weigh: (v) => v.stages });

  it('answers only for the same studio, version and minute', async () => {
    const c = cache();
    await c.set(key(1), Promise.resolve(made(1)));
    expect(await c.get(key(1))).toEqual(made(1));
    expect(c.get(key(2))).toBeUndefined();
    expect(c.get(key(1, 2))).toBeUndefined();
    expect(c.get(key(1, 1, 101))).toBeUndefined();
  });

  it('shares a computation still running', async () => {
    const c = cache();
    let finish!: (v: { stages: number }) => void;
    const running = c.set(key(1), new Promise((r) => (finish = r)));
    const second = c.get(key(1));
    expect(second).toBe(running);
    finish(made(2));
    expect(await second).toEqual(made(2));
  });

  it('keeps the newer of two answers for a studio: a later version or minute is not replaced by an earlier one', async () => {
    const c = cache();
    await c.set(key(1, 5), Promise.resolve(made(1)));
    await c.set(key(1, 4), Promise.resolve(made(2)));
    expect(await c.get(key(1, 5))).toEqual(made(1));
    expect(c.get(key(1, 4))).toBeUndefined();
    await c.set(key(1, 1, 101), Promise.resolve(made(3)));
    expect(await c.get(key(1, 1, 101))).toEqual(made(3));
    expect(c.get(key(1, 5))).toBeUndefined();
  });

  it('lets the least recently used studios go when the stages held pass the bound', async () => {
    const c = cache();
    await c.set(key(1), Promise.resolve(made(4)));
    await c.set(key(2), Promise.resolve(made(4)));
    await c.get(key(1)); // 2 is now the least recently used
    await c.set(key(3), Promise.resolve(made(4)));
    await Promise.resolve();
    expect(c.get(key(2))).toBeUndefined();
    expect(c.get(key(1))).toBeDefined();
    expect(c.get(key(3))).toBeDefined();
    expect(c.size()).toEqual({ studios: 2, weight: 8 });
  });

  it('does not keep a failed computation', async () => {
    const c = cache();
    await expect(c.set(key(1), Promise.reject(new Error('database gone')))).rejects.toThrow('database gone');
    await Promise.resolve();
    expect(c.get(key(1))).toBeUndefined();
  });

  it('keeps nothing when its bound is 0', async () => {
    const c = forecastCache<{ stages: number }>({ maxWeight: 0, weigh: (v) => v.stages });
    await c.set(key(1), Promise.resolve(made(1)));
    expect(c.get(key(1))).toBeUndefined();
  });
});

describe('a kept forecast is read-only', () => {
  it('freezes nested objects and arrays, and Maps refuse changes', () => {
    const v = deepFreeze({ queue: [{ id: 1, figures: [{ id: 2 }] }], names: new Map([[1, { name: 'Ada' }]]) });
    expect(() => {
      (v.queue as { id: number }[]).push({ id: 3 } as never);
    }).toThrow(TypeError);
    expect(() => {
      (v.queue[0].figures[0] as { id: number }).id = 9;
    }).toThrow(TypeError);
    expect(() => v.names.set(2, { name: 'Bo' })).toThrow(TypeError);
    expect(() => v.names.delete(1)).toThrow(TypeError);
    expect(() => {
      (v.names.get(1) as { name: string }).name = 'Cy';
    }).toThrow(TypeError);
    expect(v.names.get(1)).toEqual({ name: 'Ada' });
    expect(v.queue[0].figures[0].id).toBe(2);
  });

  it('freezes a value that refers back to itself, and what two parts share', () => {
    const shared = { id: 7 };
    const v: { self?: unknown; a: { id: number }[]; b: { id: number }[] } = { a: [shared], b: [shared] };
    v.self = v;
    deepFreeze(v);
    expect(Object.isFrozen(v) && Object.isFrozen(v.a) && Object.isFrozen(v.b) && Object.isFrozen(shared)).toBe(true);
  });
});
