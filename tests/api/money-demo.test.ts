import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/config';
import { quoteStatuses } from '../../shared/schemas/quotes';
import { Caller, startTestApp, type TestApp } from '../support/app';

let sw: TestApp;
let studioId: number;
const signIn = async (email: string) => {
  const c = new Caller(sw.app);
  expect((await c.post('/api/auth/login', { email, password: DEMO_PASSWORD })).status).toBe(200);
  return c;
};

beforeAll(async () => {
  sw = await startTestApp({ demo: true });
  studioId = (await sw.db('studios').where({ slug: 'marrowgate' }).first('id')).id;
});
afterAll(() => sw.stop());

describe('the demo scenario: money', () => {
  it('has a filled price table and quotes in every state', async () => {
    const owner = await signIn('owner@demo.test');
    const table = (await owner.get(`/api/studios/${studioId}/price-table`)).body;
    expect(table).toMatchObject({ currency: 'EUR', hourlyRate: 2800, tax: { rateBp: 1900, label: 'VAT', pricesIncludeTax: true }, depositBp: 4000 });
    const quotes = (await owner.get(`/api/studios/${studioId}/quotes?limit=200`)).body.items as { status: string; commissionTitle: string }[];
    for (const s of quoteStatuses) expect(quotes.map((q) => q.status), s).toContain(s);
  });

  it('has paid, part-paid, open and overdue invoices, and a money view with something in each part', async () => {
    const owner = await signIn('owner@demo.test');
    const invoices = (await owner.get(`/api/studios/${studioId}/invoices?limit=200`)).body.items as { status: string; overdue: boolean; kind: string; number: string | null }[];
    const statuses = new Set(invoices.map((i) => i.status));
    for (const s of ['paid', 'partly_paid', 'open']) expect(statuses, s).toContain(s);
    expect(invoices.some((i) => i.overdue)).toBe(true);
    expect(invoices.some((i) => i.kind === 'balance' && i.status === 'open')).toBe(true);
    const numbers = invoices.map((i) => i.number).filter(Boolean);
    expect(new Set(numbers).size).toBe(numbers.length);
    const money = (await owner.get(`/api/studios/${studioId}/money`)).body;
    expect(money.outstandingByClient.length).toBeGreaterThan(0);
    expect(money.depositsHeldMinor).toBeGreaterThan(0);
  });

  it("each demo client sees only their own quotes and invoices, never the owner's draft", async () => {
    const priya = await signIn('client@demo.test');
    const quotes = (await priya.get(`/api/studios/${studioId}/quotes?limit=200`)).body.items as { status: string; client: { name: string } }[];
    expect(quotes.length).toBeGreaterThan(0);
    expect(quotes.every((q) => q.client.name === 'Priya Castellane' && q.status !== 'draft')).toBe(true);
    const invoices = (await priya.get(`/api/studios/${studioId}/invoices?limit=200`)).body.items as { client: { name: string } }[];
    expect(invoices.length).toBeGreaterThan(0);
    expect(invoices.every((i) => i.client.name === 'Priya Castellane')).toBe(true);
  });
});
