import { describe, expect, it } from 'vitest';
import { deepFreeze } from '../../server/lib/deep-freeze';
import { keptJson } from '../../server/lib/routes';

// keptJson (server/lib/routes.ts): the JSON of a kept (frozen) answer, or of an answer holding kept values at its
// top level, written out once per value. Whatever it writes must be the bytes JSON.stringify gives for the body.

const sample = () => ({
  items: [
    { id: 1, title: 'Reed skiff — crew of five', due: null, tags: ['a', 'ü', '🎨'], when: new Date('2026-12-02T10:00:00Z') },
    { id: 2, title: 'Quote "marks" and \\ slashes\n', due: '2027-01-05', gone: undefined, fn: () => 1, nested: { deeper: [1, undefined, 2.5] } },
  ],
  total: 2,
});

describe('keptJson', () => {
  it('gives nothing for bodies with nothing frozen in them (those go through res.json as before)', () => {
    expect(keptJson(sample())).toBeUndefined();
    expect(keptJson([deepFreeze(sample())])).toBeUndefined(); // a bare array is not looked into
    expect(keptJson('text')).toBeUndefined();
    expect(keptJson(null)).toBeUndefined();
    expect(keptJson({ toJSON: () => 'x', part: deepFreeze({ a: 1 }) })).toBeUndefined();
  });

  it('writes a frozen body as JSON.stringify does, once', () => {
    const body = deepFreeze(sample());
    const bytes = keptJson(body)!;
    expect(bytes.toString('utf8')).toBe(JSON.stringify(body));
    expect(keptJson(body)).toBe(bytes);
  });

  it('writes a body around kept parts as JSON.stringify does: key order, left-out values, other values as they are', () => {
    const items = deepFreeze(sample().items);
    const cases: Record<string, unknown>[] = [
      { items, total: 2, limit: 50, offset: 0 },
      { total: 2, items, note: undefined, limit: 50 },
      { skipped: undefined, items },
      { items, fn: () => 1, when: new Date('2026-12-02T10:00:00Z'), nested: { x: [undefined, 1] }, label: 'ä "q"' },
      { first: deepFreeze({ a: 1 }), second: items, n: Number.NaN },
    ];
    for (const body of cases) expect(keptJson(body)!.toString('utf8')).toBe(JSON.stringify(body));
  });

  it('writes each kept part once, whatever body it is sent in', () => {
    const items = deepFreeze([{ id: 1 }]) as { id: number }[];
    const a = keptJson({ items, total: 1 })!;
    expect(Object.isFrozen(items)).toBe(true);
    // had the part been serialised again, a getter on it would run again; a frozen value's JSON cannot change
    let reads = 0;
    const counted = Object.freeze(Object.defineProperty({}, 'id', { enumerable: true, get: () => ++reads }));
    keptJson({ counted });
    keptJson({ counted, other: 1 });
    expect(reads).toBe(1);
    expect(a.toString()).toBe('{"items":[{"id":1}],"total":1}');
  });
});
