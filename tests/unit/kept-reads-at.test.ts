import { describe, expect, it } from 'vitest';
import { keptReads } from '../../server/lib/version-cache';

// keptReads with a version reader that gives more than the version (the books' `booksVersion`: the version
// and the studio's zone), and a key worked out from it (server/lib/version-cache.ts).

type At = { version: number; timeZone: string };

function setup(maxWeight = 100) {
  const row = new Map<number, At>([
    [1, { version: 3, timeZone: 'Europe/Berlin' }],
    [2, { version: 3, timeZone: 'Pacific/Auckland' }],
  ]);
  const versionReads: number[] = [];
  const kept = keptReads<{ n: number }, At>({
    version: async (studioId) => {
      versionReads.push(studioId);
      return row.get(studioId);
    },
    maxWeight,
    weigh: () => 1,
  });
  let reads = 0;
  const read = (n: number) => async () => {
    reads++;
    return { n };
  };
  return { row, kept, read, versionReads, reads: () => reads };
}

describe('kept reads keyed by what the version read gives', () => {
  it('reads once per version and worked-out key, and passes the whole version row to the key', async () => {
    const s = setup();
    const seen: At[] = [];
    const key = (at: At) => {
      seen.push(at);
      return `zone ${at.timeZone}`;
    };
    expect(await s.kept(1, key, s.read(1))).toEqual({ n: 1 });
    expect(await s.kept(1, key, s.read(2))).toEqual({ n: 1 });
    expect(s.reads()).toBe(1);
    expect(seen).toEqual([
      { version: 3, timeZone: 'Europe/Berlin' },
      { version: 3, timeZone: 'Europe/Berlin' },
    ]);
    // The zone changes with the version (as the schedule version moves with it): a new key and a new read.
    s.row.set(1, { version: 4, timeZone: 'Asia/Kolkata' });
    expect(await s.kept(1, key, s.read(3))).toEqual({ n: 3 });
    expect(s.reads()).toBe(2);
    // The same key string in another studio is another entry.
    expect(await s.kept(2, key, s.read(4))).toEqual({ n: 4 });
    expect(s.reads()).toBe(3);
  });

  it('a plain string key still works, and an unknown studio or a cache of 0 reads every time without asking the version of a cache of 0', async () => {
    const s = setup();
    expect(await s.kept(1, 'k', s.read(1))).toEqual({ n: 1 });
    expect(await s.kept(1, 'k', s.read(2))).toEqual({ n: 1 });
    expect(await s.kept(9, 'k', s.read(3))).toEqual({ n: 3 });
    expect(await s.kept(9, 'k', s.read(4))).toEqual({ n: 4 });
    expect(s.reads()).toBe(3);
    const off = setup(0);
    expect(await off.kept(1, () => 'k', off.read(1))).toEqual({ n: 1 });
    expect(await off.kept(1, () => 'k', off.read(2))).toEqual({ n: 2 });
    expect(off.versionReads).toEqual([]);
  });

  it('gives what it keeps frozen, kept or not, so no caller can change the next caller’s answer', async () => {
    for (const maxWeight of [100, 0]) {
      const { kept } = setup(maxWeight);
      const v = (await kept(1, 'nested', async () => ({ n: 1, rows: [{ id: 7 }] }) as { n: number })) as { n: number; rows: { id: number }[] };
      expect(Object.isFrozen(v)).toBe(true);
      expect(Object.isFrozen(v.rows[0])).toBe(true);
      expect(() => {
        v.rows[0].id = 8;
      }).toThrow(TypeError);
    }
  });
});
