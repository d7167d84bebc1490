import { describe, expect, it } from 'vitest';
import { deepFreeze } from '../../server/lib/deep-freeze';
import { holdsKept, keptJson } from '../../server/lib/kept-json';

// keptJson (server/lib/kept-json.ts): the JSON of a kept (frozen) answer, or of an answer holding kept values at its
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

describe('keptJson on an answer marked holdsKept (put together per request around kept values)', () => {
  it('finds kept values at any depth and writes the rest as JSON.stringify does', () => {
    const cards = deepFreeze(sample().items);
    const build = () =>
      holdsKept({
        columns: [
          { key: 'prime', name: 'Prime', cards: [cards[0], { ...cards[1], extra: [undefined, () => 1, Symbol('s'), Number.POSITIVE_INFINITY, null] }] },
          { key: 'empty', name: 'Empty', cards: [] },
          { key: 'done', name: 'Done', cards: [cards[1], cards[0]], note: undefined },
        ],
        total: 3,
        when: new Date('2026-12-02T10:00:00Z'),
        left: { toJSON: () => undefined },
        nested: [[cards[0]], [], [[{ deep: cards[1] }]]],
      });
    const body = build();
    expect(keptJson(body)!.toString('utf8')).toBe(JSON.stringify(body));
    // the mark is not part of the answer
    expect(Object.keys(body)).toEqual(['columns', 'total', 'when', 'left', 'nested']);
  });

  it('writes a kept value found deep inside once', () => {
    let reads = 0;
    const card = Object.freeze(Object.defineProperty({}, 'id', { enumerable: true, get: () => ++reads }));
    const first = keptJson(holdsKept({ columns: [{ cards: [card] }] }))!.toString();
    const second = keptJson(holdsKept({ columns: [{ cards: [card, card] }] }))!.toString();
    expect(reads).toBe(1);
    expect(first).toBe('{"columns":[{"cards":[{"id":1}]}]}');
    expect(second).toBe('{"columns":[{"cards":[{"id":1},{"id":1}]}]}');
  });

  it('without the mark, looks no deeper than the top level', () => {
    let reads = 0;
    const card = Object.freeze(Object.defineProperty({}, 'id', { enumerable: true, get: () => ++reads }));
    expect(keptJson({ columns: [{ cards: [card] }] })).toBeUndefined();
    expect(keptJson({ part: deepFreeze({ a: 1 }), columns: [{ cards: [card] }] })!.toString()).toBe('{"part":{"a":1},"columns":[{"cards":[{"id":1}]}]}');
    keptJson({ part: deepFreeze({ a: 1 }), columns: [{ cards: [card] }] });
    expect(reads).toBe(2); // written by JSON.stringify each time
  });
});
