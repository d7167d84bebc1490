import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Board } from '../../shared/schemas/commissions';
import { MAX_PAGE_SIZE } from '../../shared/schemas/common';
import { mergeBoards } from '../../src/features/bench/api/get-board';
import { allOffsets, allPages } from '../../src/lib/all-pages';

/** A server stand-in: `rows` numbers served `limit` at a time from `offset`, the URLs it was asked for kept. */
function serve(rows: number) {
  const asked: URL[] = [];
  vi.stubGlobal('fetch', async (input: string) => {
    const url = new URL(input, 'http://sablework.test');
    asked.push(url);
    const limit = Number(url.searchParams.get('limit'));
    const offset = Number(url.searchParams.get('offset'));
    const page = Array.from({ length: Math.max(0, Math.min(limit, rows - offset)) }, (_, i) => offset + i);
    return new Response(JSON.stringify(page), { status: 200, headers: { 'content-type': 'application/json', 'x-total-count': String(rows) } });
  });
  return asked;
}

afterEach(() => vi.unstubAllGlobals());

describe('reading every page of a list', () => {
  it('asks for pages of the largest size until one comes back short, and keeps every row once, in order', async () => {
    const asked = serve(2 * MAX_PAGE_SIZE + 7);
    const rows = await allPages<number>('/api/studios/1/paints', { query: { q: 'moss' } });
    expect(rows).toEqual(Array.from({ length: 2 * MAX_PAGE_SIZE + 7 }, (_, i) => i));
    expect(asked.map((u) => [u.searchParams.get('offset'), u.searchParams.get('limit'), u.searchParams.get('q')])).toEqual([
      ['0', String(MAX_PAGE_SIZE), 'moss'],
      [String(MAX_PAGE_SIZE), String(MAX_PAGE_SIZE), 'moss'],
      [String(2 * MAX_PAGE_SIZE), String(MAX_PAGE_SIZE), 'moss'],
    ]);
  });

  it('makes one request for a short list, and one more when the list fills its last page exactly', async () => {
    const short = serve(3);
    expect(await allPages<number>('/x')).toEqual([0, 1, 2]);
    expect(short).toHaveLength(1);
    const full = serve(MAX_PAGE_SIZE);
    expect(await allPages<number>('/x')).toHaveLength(MAX_PAGE_SIZE);
    expect(full).toHaveLength(2);
  });

  it('stops at `max` rows (the newest activity is enough)', async () => {
    const asked = serve(5 * MAX_PAGE_SIZE);
    const rows = await allPages<number>('/x', { max: MAX_PAGE_SIZE + 10 });
    expect(rows).toHaveLength(MAX_PAGE_SIZE + 10);
    expect(asked).toHaveLength(2);
  });

  it('folds object pages with a total into the first, from the offsets the first one gives', async () => {
    const offsets: number[] = [];
    const all = await allOffsets(
      async (offset) => {
        offsets.push(offset);
        return { total: 5, limit: 2, items: [offset, offset + 1].filter((n) => n < 5) };
      },
      (into, next) => ({ ...into, items: [...into.items, ...next.items] }),
    );
    expect(offsets).toEqual([0, 2, 4]);
    expect(all.items).toEqual([0, 1, 2, 3, 4]);
  });
});

describe('a board read in pages', () => {
  const card = (figureId: number) => ({ figureId }) as Board['columns'][number]['cards'][number];
  const board = (columns: [string, number[]][], offset: number): Board => ({
    columns: columns.map(([key, ids]) => ({ key, name: key, cards: ids.map(card) })),
    total: 5,
    limit: 3,
    offset,
  });

  it("adds a later page's cards to their columns, and a column only the later page has before Done", () => {
    const first = board([['prime', [1, 2]], ['basecoat', [3]], ['done', []]], 0);
    const second = board([['prime', [4]], ['basecoat', []], ['retired-stage', [5]], ['done', []]], 3);
    const merged = mergeBoards(first, second);
    expect(merged.columns.map((c) => [c.key, c.cards.map((k) => k.figureId)])).toEqual([
      ['prime', [1, 2, 4]],
      ['basecoat', [3]],
      ['retired-stage', [5]],
      ['done', []],
    ]);
    // the first page is left as it was
    expect(first.columns[0].cards.map((k) => k.figureId)).toEqual([1, 2]);
  });
});
