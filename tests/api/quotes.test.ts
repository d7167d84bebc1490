import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DAY } from '../../server/lib/clock';
import { mailTo, startTestApp, type TestApp } from '../support/app';
import { acceptedQuote, commission, draftQuote, invoicesOf, moneyStudios, sentQuote, shipping, type Side } from './money-flow';

let sw: TestApp;
let a: Side;
let b: Side;
const url = (s: Side, path: string) => `/api/studios/${s.studioId}${path}`;

beforeAll(async () => {
  sw = await startTestApp();
  ({ a, b } = await moneyStudios(sw));
});
afterAll(() => sw.stop());

describe('a quote built from the commission', () => {
  it("prices the commission's figures with the studio's table, as a draft of version 1", async () => {
    const c = await commission(a);
    const q = await draftQuote(a, c.id);
    // Scouts ×2 at 2 h (r = 1) = 240 min → €120.00; Captain 120 min → €60.00; shipping €10.00 → €190.00.
    // VAT 20 % is inside: 19 000 · 2000 / 12 000 = 3166.67 → 3167. Deposit 50 % = €95.00.
    expect(q).toMatchObject({ version: 1, status: 'draft', commissionId: c.id, currency: 'EUR', total: 19000, deposit: 9500, balance: 9500 });
    expect(q.result.lines.map((l: { amount: number }) => l.amount)).toEqual([12000, 6000, 1000]);
    expect(q.result.tax).toMatchObject({ label: 'VAT', rateBp: 2000, inclusive: true, amount: 3167 });
    expect(q.input.figures.map((f: { id: number; name: string }) => [f.id, f.name])).toEqual(c.figures.map((f, i) => [f.id, ['Scouts', 'Captain'][i]]));
    expect(q.terms).toBe('Deposit kept for work done; the rest refunded.');
    expect(q.allowedActions).toEqual(['edit', 'send']);
  });

  it('the server preview of the same input gives the stored result, to the unit', async () => {
    const c = await commission(a);
    const q = await draftQuote(a, c.id, { extraLines: shipping, figureOverrides: [{ figureId: c.figures[1].id, stageHours: { details: 0.75 } }] });
    const preview = await a.owner.post(url(a, '/quotes/preview'), { commissionId: c.id, ...q.input });
    expect(preview.status).toBe(200);
    expect(preview.body).toEqual(q.result);
    expect(preview.body.total).toBe(q.total);
    // the override: Captain 2 h + 0.75 h details = 165 min → 3000 · 165 / 60 = €82.50
    expect(q.result.lines[1].amount).toBe(8250);
    // and a different input gives a different answer (the preview really prices)
    const other = await a.owner.post(url(a, '/quotes/preview'), { ...q.input, extraLines: [] });
    expect(other.body.total).toBe(q.total - 1000);
  });

  it('a figure override naming a figure of another commission is refused', async () => {
    const c = await commission(a);
    const other = await commission(a);
    const res = await a.owner.post(url(a, `/commissions/${c.id}/quotes`), { figureOverrides: [{ figureId: other.figures[0].id, stageHours: { prime: 1 } }] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('figureOverrides.0.figureId');
  });

  it('a figure whose tier the price table does not price is a 422 naming it', async () => {
    await a.owner.put(url(a, '/lists'), { tiers: [{ key: 'tabletop', label: 'Tabletop' }, { key: 'heroic', label: 'Heroic' }], extras: [] });
    const res = await a.owner.post(url(a, '/commissions'), { clientId: a.clientId, title: 'Heroic', figures: [{ name: 'Hero', quantity: 1, sizeClass: '28', tier: 'heroic' }] });
    expect(res.status).toBe(201);
    const q = await a.owner.post(url(a, `/commissions/${res.body.id}/quotes`), {});
    expect(q.status).toBe(422);
    expect(q.body.error.fields['figures.0.tier']).toMatch(/heroic/);
  });

  it('a draft can be edited; once sent it is frozen (409)', async () => {
    const c = await commission(a);
    const q = await draftQuote(a, c.id);
    const edited = await a.owner.patch(url(a, `/quotes/${q.id}`), { extraLines: [] });
    expect(edited.status).toBe(200);
    expect(edited.body.total).toBe(18000);
    await a.owner.post(url(a, `/quotes/${q.id}/send`));
    const frozen = await a.owner.patch(url(a, `/quotes/${q.id}`), { extraLines: shipping });
    expect(frozen.status).toBe(409);
    expect(frozen.body.error.code).toBe('quote_frozen');
    expect((await a.owner.post(url(a, `/quotes/${q.id}/send`))).status).toBe(409);
  });
});

describe('sending and deciding', () => {
  it('sending mails the client a link, moves the commission to quoted and keeps drafts from the client', async () => {
    const c = await commission(a, 'Mail me');
    const q = await draftQuote(a, c.id);
    expect((await a.client.get(url(a, `/quotes/${q.id}`))).status).toBe(404);
    expect((await a.client.get(url(a, '/quotes'))).body.items.map((x: { id: number }) => x.id)).not.toContain(q.id);
    const sent = await a.owner.post(url(a, `/quotes/${q.id}/send`));
    expect(sent.body).toMatchObject({ status: 'sent', validUntil: '2026-04-01' }); // 2026-03-02 + 30 days
    const mails = (await mailTo(sw, 'client-a@studio.test')).filter((m) => m.subject.includes('Mail me'));
    expect(mails).toHaveLength(1);
    expect(mails[0].text).toContain(`http://sablework.test/studio/${a.studioId}/quotes/${q.id}`);
    expect(mails[0].text).toContain('€190.00');
    expect((await a.owner.get(url(a, `/commissions/${c.id}`))).body.status).toBe('quoted');
  });

  it('the client sees amounts but no hours unless the studio shows them', async () => {
    const c = await commission(a);
    const q = await sentQuote(a, c.id);
    const seen = await a.client.get(url(a, `/quotes/${q.id}`));
    expect(seen.status).toBe(200);
    expect(seen.body.total).toBe(19000);
    expect(seen.body.input).toBeNull();
    const text = JSON.stringify(seen.body);
    expect(text).not.toMatch(/"(unitMinutes|batchMinutes|unitStageMinutes|batchStageMinutes|stageMinutes|unitMinutes|labour|stageHours)"/);
    expect(seen.body.result.clientBreakdown.totalMinutes).toBeNull();
    expect(seen.body.result.clientBreakdown.lines[0].minutes).toBeNull();
    expect(seen.body.allowedActions).toEqual(['accept', 'request-changes', 'decline']);
    // the owner sees the hours
    expect((await a.owner.get(url(a, `/quotes/${q.id}`))).body.result.lines[0].batchMinutes).toBe(240);
  });

  it('with "show hours" on, the client sees them', async () => {
    const table = (await a.owner.get(url(a, '/price-table'))).body;
    await a.owner.put(url(a, '/price-table'), { ...table, showHoursToClient: true });
    try {
      const c = await commission(a);
      const q = await sentQuote(a, c.id);
      const seen = (await a.client.get(url(a, `/quotes/${q.id}`))).body;
      expect(seen.result.lines[0].batchMinutes).toBe(240);
      expect(seen.result.clientBreakdown.totalMinutes).toBe(360);
    } finally {
      await a.owner.put(url(a, '/price-table'), { ...table, showHoursToClient: false });
    }
  });

  it("another client, a painter and another studio's members cannot see it", async () => {
    const c = await commission(a);
    const q = await sentQuote(a, c.id);
    const otherClient = await b.owner.post(`/api/studios/${b.studioId}/clients`, { name: 'Second', email: 'second-b@studio.test' });
    expect(otherClient.status).toBe(201);
    expect((await b.owner.get(url(a, `/quotes/${q.id}`))).status).toBe(404);
    expect((await b.client.get(url(a, `/quotes/${q.id}`))).status).toBe(404);
    expect((await a.painter.get(url(a, `/quotes/${q.id}`))).status).toBe(403);
    expect((await a.painter.get(url(a, '/quotes'))).status).toBe(403);
    // the same id under studio B is not studio A's quote
    expect((await b.owner.get(`/api/studios/${b.studioId}/quotes/${q.id}`)).status).toBe(404);
    expect((await b.client.post(url(a, `/quotes/${q.id}/accept`), { name: 'X', acceptTerms: true })).status).toBe(404);
  });

  it('accepting needs a typed name and the terms ticked; it stores time, person and address', async () => {
    const c = await commission(a);
    const q = await sentQuote(a, c.id);
    const noName = await a.client.post(url(a, `/quotes/${q.id}/accept`), { name: ' ', acceptTerms: true });
    expect(noName.status).toBe(400);
    expect(noName.body.error.fields).toHaveProperty('name');
    const noTick = await a.client.post(url(a, `/quotes/${q.id}/accept`), { name: 'Client A', acceptTerms: false });
    expect(noTick.status).toBe(400);
    expect(noTick.body.error.fields).toHaveProperty('acceptTerms');
    expect((await a.owner.post(url(a, `/quotes/${q.id}/accept`), { name: 'Owner', acceptTerms: true })).status).toBe(403);
    const ok = await a.client.post(url(a, `/quotes/${q.id}/accept`), { name: 'Client A, for the patrol', acceptTerms: true });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ status: 'accepted', acceptedName: 'Client A, for the patrol', decidedAt: sw.clock.now().toISOString(), decidedBy: { name: 'Client a' } });
    const row = await sw.db('quotes').where({ id: q.id }).first();
    expect(row.accepted_ip).toMatch(/127\.0\.0\.1|::1|::ffff:127\.0\.0\.1/);
    const again = await a.client.post(url(a, `/quotes/${q.id}/accept`), { name: 'Client A', acceptTerms: true });
    expect(again.status).toBe(409);
  });

  it('acceptance issues the deposit invoice, mails the studio and sets the stage estimates from the quote', async () => {
    const c = await commission(a, 'Estimates');
    // Captain: the owner quotes 3 h of details on top
    const q = await acceptedQuote(a, c.id, { extraLines: shipping, figureOverrides: [{ figureId: c.figures[1].id, stageHours: { details: 3 } }] });
    const invoices = await invoicesOf(a.owner, a.studioId, c.id);
    expect(invoices).toHaveLength(1);
    // €60.00 + 3 h × €30.00 = €150.00 for the captain; total 120 + 150 + 10 = €280.00; deposit €140.00
    expect(q.total).toBe(28000);
    expect(invoices[0]).toMatchObject({ kind: 'deposit', status: 'open', total: 14000, balanceDue: 14000, quoteId: q.id });
    expect(invoices[0].number).toMatch(/^2026-\d{4}$/);
    // VAT inside the deposit: 14 000 · 2000 / 12 000 = 2333.33 → 2333
    expect(invoices[0].tax).toBe(2333);
    const mails = await mailTo(sw, 'owner-a@studio.test');
    expect(mails.some((m) => m.subject.includes('accepted quote version 1') && m.subject.includes('Estimates'))).toBe(true);
    const detail = (await a.owner.get(url(a, `/commissions/${c.id}`))).body;
    const est = (fi: number, key: string) => detail.figures[fi].stages.find((s: { key: string }) => s.key === key).estimateHours;
    expect([est(0, 'basecoat'), est(0, 'layer'), est(0, 'basing'), est(0, 'prime')]).toEqual([2, 1, 1, 0]); // ×2 batch
    expect([est(1, 'basecoat'), est(1, 'details')]).toEqual([1, 3]);
    expect(detail.status).toBe('quoted'); // booked only once the deposit is paid
  });

  it('asking for changes keeps the comment; declining closes the quote; both mail the studio', async () => {
    const c = await commission(a, 'Changes');
    const q = await sentQuote(a, c.id);
    expect((await a.client.post(url(a, `/quotes/${q.id}/request-changes`), { comment: '' })).status).toBe(400);
    const asked = await a.client.post(url(a, `/quotes/${q.id}/request-changes`), { comment: 'Could the captain get a cloak?' });
    expect(asked.body).toMatchObject({ status: 'changes_requested', decisionComment: 'Could the captain get a cloak?' });
    expect((await a.client.post(url(a, `/quotes/${q.id}/decline`), {})).status).toBe(409);
    const c2 = await commission(a, 'Declines');
    const q2 = await sentQuote(a, c2.id);
    const declined = await a.client.post(url(a, `/quotes/${q2.id}/decline`), {});
    expect(declined.body.status).toBe('declined');
    const mails = await mailTo(sw, 'owner-a@studio.test');
    expect(mails.some((m) => m.subject.includes('asked for changes') && m.subject.includes('Changes'))).toBe(true);
    expect(mails.some((m) => m.subject.includes('declined') && m.subject.includes('Declines'))).toBe(true);
    expect(await invoicesOf(a.owner, a.studioId, c2.id)).toEqual([]);
  });
});

describe('versions', () => {
  it('revising makes version n + 1, which supersedes the last when it is sent', async () => {
    const c = await commission(a);
    const v1 = await sentQuote(a, c.id);
    await a.client.post(url(a, `/quotes/${v1.id}/request-changes`), { comment: 'No shipping, I collect.' });
    const v2 = await draftQuote(a, c.id, { extraLines: [] });
    expect(v2.version).toBe(2);
    expect((await a.owner.get(url(a, `/quotes/${v1.id}`))).body.status).toBe('changes_requested');
    await a.owner.post(url(a, `/quotes/${v2.id}/send`));
    expect((await a.owner.get(url(a, `/quotes/${v1.id}`))).body.status).toBe('superseded');
    const list = (await a.owner.get(url(a, `/quotes?commissionId=${c.id}`))).body;
    expect(list.items.map((x: { version: number; status: string }) => [x.version, x.status])).toEqual([
      [2, 'sent'],
      [1, 'superseded'],
    ]);
  });

  it('a dearer version accepted after the first is invoiced as the difference', async () => {
    const c = await commission(a);
    await acceptedQuote(a, c.id); // €190.00, deposit €95.00
    const v2 = await acceptedQuote(a, c.id, { extraLines: [...shipping, { kind: 'custom', label: 'Cloak sculpt', unitAmount: 4000 }] }); // €230.00
    expect(v2.version).toBe(2);
    const inv = await invoicesOf(a.owner, a.studioId, c.id);
    expect(inv.map((i) => [i.kind, i.total]).sort()).toEqual([
      ['deposit', 9500],
      ['progress', 4000],
    ]);
    const quotes = (await a.owner.get(url(a, `/quotes?commissionId=${c.id}`))).body.items;
    expect(quotes.map((x: { status: string }) => x.status)).toEqual(['accepted', 'superseded']);
  });

  it('a cheaper version credits only what was invoiced beyond the new total', async () => {
    const c = await commission(a);
    await acceptedQuote(a, c.id); // €190.00, deposit €95.00 invoiced
    await acceptedQuote(a, c.id, { extraLines: [], figureOverrides: [] }); // €180.00: still above the deposit, so no credit
    expect((await invoicesOf(a.owner, a.studioId, c.id)).map((i) => i.kind)).toEqual(['deposit']);
    // Cut to one captain's worth: drop both scouts through overrides (all their stages omitted) → €60.00 < €95.00 invoiced
    const omitAll = ['prep', 'assembly', 'prime', 'basecoat', 'shade', 'layer', 'glaze', 'details', 'basing', 'weathering', 'varnish'];
    await acceptedQuote(a, c.id, { extraLines: [], figureOverrides: [{ figureId: c.figures[0].id, omitStages: omitAll }] });
    const inv = await invoicesOf(a.owner, a.studioId, c.id);
    const credit = inv.find((i) => i.kind === 'credit_note');
    expect(credit).toMatchObject({ total: 3500 }); // 9500 − 6000
    const deposit = inv.find((i) => i.kind === 'deposit')!;
    expect(deposit.balanceDue).toBe(6000); // the credit is set against the unpaid deposit
  });
});

describe('expiry', () => {
  it('a sent quote expires after its validity: accepting is 410 and the job marks it', async () => {
    const c = await commission(a);
    const q = await sentQuote(a, c.id);
    const c2 = await commission(a);
    const q2 = await sentQuote(a, c2.id);
    sw.clock.advance(30 * DAY); // 2026-04-01: still valid on its last day
    expect((await a.owner.get(url(a, `/quotes/${q.id}`))).body.status).toBe('sent');
    sw.clock.advance(DAY);
    const late = await a.client.post(url(a, `/quotes/${q.id}/accept`), { name: 'Client A', acceptTerms: true });
    expect(late.status).toBe(410);
    expect((await a.owner.get(url(a, `/quotes/${q.id}`))).body.status).toBe('expired');
    expect(await sw.jobs.expireQuotes()).toBeGreaterThanOrEqual(1);
    expect((await sw.db('quotes').where({ id: q2.id }).first()).status).toBe('expired');
    expect(await sw.jobs.expireQuotes()).toBe(0);
    expect(await invoicesOf(a.owner, a.studioId, c.id)).toEqual([]);
  });
});
