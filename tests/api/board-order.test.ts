import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, twoStudios, type TestApp } from '../support/app';

/**
 * The bench board pages its figures in one order: the commission's due date (undated last), then its
 * priority (high, normal, low), then the commission, then the figure (server/features/board/board.repository.ts
 * sorts the commissions first and reads their figures in id order). Here the expected order is worked out
 * from what the test made, and every page and filter of the board must follow it, with the right total.
 */

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let A: string;
let painter: number;
let owner: number;

type Card = { figureId: number; commission: { id: number; dueDate: string | null } };
type Board = { columns: { cards: Card[] }[]; total: number; limit: number; offset: number };
type Made = { id: number; dueDate: string | null; priority: 'high' | 'normal' | 'low'; figures: { id: number; painterId: number | null }[]; onBoard: boolean };

const made: Made[] = [];

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  A = `/api/studios/${s.a.studioId}`;
  painter = (await s.a.painter.get('/api/auth/me')).body.user.id;
  owner = (await s.a.owner.get('/api/auth/me')).body.user.id;
  // Ties on purpose: three on one date (high, normal, low), two undated, and figures of several painters.
  const plan: [string | null, Made['priority'], number, string[]][] = [
    ['2026-05-01', 'normal', 3, ['quoted', 'booked']],
    [null, 'normal', 2, ['quoted', 'booked', 'on_bench']],
    ['2026-04-01', 'low', 1, ['quoted', 'booked']],
    ['2026-05-01', 'high', 4, ['quoted', 'booked', 'on_bench']],
    ['2026-05-01', 'low', 2, ['quoted', 'booked']],
    [null, 'high', 3, ['quoted', 'booked']],
    ['2026-04-01', 'normal', 2, ['quoted', 'booked', 'on_bench']],
    ['2026-03-15', 'high', 2, []], // an enquiry: not on the board
    ['2026-03-15', 'normal', 2, ['quoted']], // quoted: not on the board
  ];
  for (const [i, [dueDate, priority, n, moves]] of plan.entries()) {
    const painterOf = (k: number) => [painter, null, owner][(i + k) % 3];
    const res = await s.a.owner.post(`${A}/commissions`, {
      clientId: s.a.clientId,
      title: `Order ${i}`,
      ...(dueDate ? { dueDate } : {}),
      priority,
      figures: Array.from({ length: n }, (_, k) => ({ name: `Figure ${i}.${k}`, quantity: 1, sizeClass: '28', tier: 'tabletop', painterId: painterOf(k) })),
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    for (const to of moves) expect((await s.a.owner.post(`${A}/commissions/${res.body.id}/transitions`, { to })).status).toBe(200);
    made.push({
      id: res.body.id,
      dueDate,
      priority,
      figures: (res.body.figures as { id: number }[]).map((f, k) => ({ id: f.id, painterId: painterOf(k) })),
      onBoard: moves.includes('booked'),
    });
  }
  // another studio's board commission must not show
  const other = await s.b.owner.post(`/api/studios/${s.b.studioId}/commissions`, { clientId: s.b.clientId, title: 'Elsewhere', figures: [{ name: 'Not ours', quantity: 1, sizeClass: '28', tier: 'tabletop' }] });
  for (const to of ['quoted', 'booked']) await s.b.owner.post(`/api/studios/${s.b.studioId}/commissions/${other.body.id}/transitions`, { to });
  // one figure with every stage done: its card sits in the done column, in the same order
  const lastOf = made[3].figures[1].id;
  for (let i = 0; i < 20; i++) if ((await s.a.owner.post(`${A}/figures/${lastOf}/advance`)).status === 409) break;
});
afterAll(() => sw?.stop());

const rank = { high: 0, normal: 1, low: 2 };

/** The figure ids in board order, worked out from what was made. */
function expected(filter: { painterId?: number; dueBefore?: string; commissionId?: number } = {}) {
  return made
    .filter((c) => c.onBoard && (!filter.commissionId || c.id === filter.commissionId) && (!filter.dueBefore || (c.dueDate !== null && c.dueDate <= filter.dueBefore)))
    .sort((x, y) => Number(x.dueDate === null) - Number(y.dueDate === null) || (x.dueDate ?? '').localeCompare(y.dueDate ?? '') || rank[x.priority] - rank[y.priority] || x.id - y.id)
    .flatMap((c) => c.figures.filter((f) => !filter.painterId || f.painterId === filter.painterId).map((f) => f.id));
}

/** The board's cards in its order: the columns hold them in page order each, so sort the page back by place. */
async function page(query: string): Promise<{ ids: number[]; total: number }> {
  const res = await s.a.owner.get(`${A}/board${query}`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  const b = res.body as Board;
  const cards = b.columns.flatMap((c) => c.cards.map((k) => k.figureId));
  return { ids: cards, total: b.total };
}

describe('the bench board order and its pages', () => {
  it('shows every board figure once, in the order of due date (undated last), priority, commission and figure', async () => {
    const want = expected();
    expect(want).toHaveLength(3 + 2 + 1 + 4 + 2 + 3 + 2);
    const { ids, total } = await page('?limit=200');
    expect(total).toBe(want.length);
    // the columns group cards by stage; within the whole board every figure appears once
    expect([...ids].sort((x, y) => x - y)).toEqual([...want].sort((x, y) => x - y));
  });

  it('pages of every size, cut anywhere (inside a commission too), join up to the whole order', async () => {
    const want = expected();
    for (const limit of [1, 2, 3, 5, 7]) {
      const seen: number[] = [];
      for (let offset = 0; offset < want.length + limit; offset += limit) {
        const p = await page(`?limit=${limit}&offset=${offset}`);
        expect(p.total).toBe(want.length);
        // a page's cards are exactly the figures at these places, whatever column each is in
        expect([...p.ids].sort((x, y) => x - y), `limit ${limit} offset ${offset}`).toEqual(want.slice(offset, offset + limit).sort((x, y) => x - y));
        seen.push(...want.slice(offset, offset + limit));
      }
      expect(seen).toEqual(want);
    }
  });

  it('one card a page gives the order itself', async () => {
    const want = expected();
    const one: number[] = [];
    for (let offset = 0; offset < want.length; offset++) one.push(...(await page(`?limit=1&offset=${offset}`)).ids);
    expect(one).toEqual(want);
  });

  it('filters: a painter (the count of their figures, not of the commissions), a due date, a commission, and together', async () => {
    for (const filter of [{ painterId: painter }, { painterId: owner }, { dueBefore: '2026-04-30' }, { dueBefore: '2026-05-01' }, { commissionId: made[3].id }, { painterId: painter, dueBefore: '2026-05-01' }, { commissionId: made[7].id }]) {
      const want = expected(filter);
      const q = new URLSearchParams(Object.entries(filter).map(([k, v]) => [k, String(v)])).toString();
      const whole = await page(`?limit=200&${q}`);
      expect(whole.total, q).toBe(want.length);
      const one: number[] = [];
      for (let offset = 0; offset < want.length; offset++) one.push(...(await page(`?limit=1&offset=${offset}&${q}`)).ids);
      expect(one, q).toEqual(want);
    }
    expect(expected({ painterId: painter }).length).toBeGreaterThan(0);
    expect(expected({ commissionId: made[7].id })).toEqual([]); // an enquiry's figures are never on the board
  });
});
