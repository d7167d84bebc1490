import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DAY } from '../../server/lib/clock';
import { mailTo, startTestApp, type TestApp } from '../support/app';
import { acceptedQuote, commission, invoicesOf, moneyStudios, type Side } from './money-flow';

let sw: TestApp;
let a: Side;
let b: Side;
const url = (s: Side, path: string) => `/api/studios/${s.studioId}${path}`;

beforeAll(async () => {
  sw = await startTestApp();
  ({ a, b } = await moneyStudios(sw));
});
afterAll(() => sw.stop());

async function customDraft(commissionId: number, lines = [{ description: 'Models bought for you', quantity: 2, unitMinor: 1250 }], extra: object = {}) {
  const res = await a.owner.post(url(a, '/invoices'), { commissionId, kind: 'custom', lines, ...extra });
  if (res.status !== 201) throw new Error(`${res.status} ${JSON.stringify(res.body)}`);
  return res.body;
}
const numberSeq = (n: string) => Number(n.split('-')[1]);

describe('invoice numbers', () => {
  it('20 invoices issued at once get 20 distinct, consecutive numbers; drafts have none', async () => {
    const c = await commission(a, 'Numbers');
    const drafts = [];
    for (let i = 0; i < 20; i++) drafts.push(await customDraft(c.id));
    expect(drafts.every((d) => d.number === null && d.status === 'draft')).toBe(true);
    const issued = await Promise.all(drafts.map((d) => a.owner.post(url(a, `/invoices/${d.id}/issue`))));
    expect(issued.map((r) => r.status)).toEqual(Array(20).fill(200));
    const numbers = issued.map((r) => r.body.number as string);
    expect(new Set(numbers).size).toBe(20);
    const seqs = numbers.map(numberSeq).sort((x, y) => x - y);
    expect(seqs[19] - seqs[0]).toBe(19);
    expect(numbers.every((n) => n.startsWith('2026-'))).toBe(true);
    // issuing again is refused and takes no number
    expect((await a.owner.post(url(a, `/invoices/${drafts[0].id}/issue`))).status).toBe(409);
    const next = await a.owner.post(url(a, `/invoices/${(await customDraft(c.id)).id}/issue`));
    expect(numberSeq(next.body.number)).toBe(seqs[19] + 1);
  });

  it('each studio counts on its own', async () => {
    const cb = await b.owner.post(`/api/studios/${b.studioId}/commissions`, { clientId: b.clientId, title: 'B', figures: [] });
    const d = await b.owner.post(`/api/studios/${b.studioId}/invoices`, { commissionId: cb.body.id, kind: 'custom', lines: [{ description: 'Thing', quantity: 1, unitMinor: 100 }] });
    const issued = await b.owner.post(`/api/studios/${b.studioId}/invoices/${d.body.id}/issue`);
    expect(issued.body.number).toBe('2026-0001');
  });
});

describe('lines, tax and payments', () => {
  it('custom lines take the table’s tax rate unless given one, and the tax is worked once per rate', async () => {
    const c = await commission(a);
    const d = await customDraft(c.id, [
      { description: 'Resin kit', quantity: 3, unitMinor: 1999 },
      { description: 'Postage', quantity: 1, unitMinor: 495, taxBp: 0 },
    ] as never);
    // prices include 20 % VAT: 5997 · 2000 / 12 000 = 999.5 → 1000 (half away from zero); postage untaxed
    expect(d.lines.map((l: { amountMinor: number; taxBp: number }) => [l.amountMinor, l.taxBp])).toEqual([
      [5997, 2000],
      [495, 0],
    ]);
    expect([d.subtotal, d.tax, d.total, d.taxInclusive, d.taxLabel, d.taxId]).toEqual([6492, 1000, 6492, true, 'VAT', 'VAT-TEST-0001']);
  });

  it('manual payments part-pay and then pay an invoice; overpaying and paying a draft are refused', async () => {
    const c = await commission(a);
    const d = await customDraft(c.id); // 2 × €12.50 = €25.00
    expect((await a.owner.post(url(a, `/invoices/${d.id}/payments`), { method: 'bank', amountMinor: 100 })).status).toBe(409);
    await a.owner.post(url(a, `/invoices/${d.id}/issue`));
    const part = await a.owner.post(url(a, `/invoices/${d.id}/payments`), { method: 'bank', amountMinor: 1000, reference: 'Transfer 7731', receivedAt: '2026-03-01' });
    expect(part.body).toMatchObject({ status: 'partly_paid', paid: 1000, balanceDue: 1500 });
    expect(part.body.payments[0]).toMatchObject({ method: 'bank', amountMinor: 1000, reference: 'Transfer 7731', receivedAt: '2026-03-01T12:00:00.000Z' });
    const over = await a.owner.post(url(a, `/invoices/${d.id}/payments`), { method: 'cash', amountMinor: 1501 });
    expect(over.status).toBe(400);
    expect(over.body.error.fields.amountMinor).toMatch(/€15\.00/);
    expect((await a.owner.post(url(a, `/invoices/${d.id}/payments`), { method: 'card', amountMinor: 1500 })).status).toBe(400);
    const rest = await a.owner.post(url(a, `/invoices/${d.id}/payments`), { method: 'cash', amountMinor: 1500 });
    expect(rest.body).toMatchObject({ status: 'paid', paid: 2500, balanceDue: 0 });
    const receipts = (await mailTo(sw, 'client-a@studio.test')).filter((m) => m.subject.startsWith('Receipt') && m.subject.includes(rest.body.number));
    expect(receipts).toHaveLength(2);
  });

  it('a paid deposit recorded by hand books the commission; an unpaid invoice can be voided and keeps its number', async () => {
    const c = await commission(a, 'Bank deposit');
    await acceptedQuote(a, c.id);
    const [deposit] = await invoicesOf(a.owner, a.studioId, c.id);
    await a.owner.post(url(a, `/invoices/${deposit.id}/payments`), { method: 'bank', amountMinor: 5000 });
    expect((await a.owner.get(url(a, `/commissions/${c.id}`))).body.status).toBe('quoted');
    expect((await a.owner.post(url(a, `/invoices/${deposit.id}/void`))).status).toBe(409); // has a payment
    await a.owner.post(url(a, `/invoices/${deposit.id}/payments`), { method: 'bank', amountMinor: 4500 });
    expect((await a.owner.get(url(a, `/commissions/${c.id}`))).body.status).toBe('booked');

    const d = await customDraft(c.id);
    const issued = (await a.owner.post(url(a, `/invoices/${d.id}/issue`))).body;
    const voided = await a.owner.post(url(a, `/invoices/${d.id}/void`));
    expect(voided.body).toMatchObject({ status: 'void', number: issued.number, balanceDue: 0 });
    expect((await a.owner.post(url(a, `/invoices/${d.id}/payments`), { method: 'bank', amountMinor: 1 })).status).toBe(409);
  });

  it('a refund of a payment made by hand issues a credit note without calling the payment service', async () => {
    const c = await commission(a);
    const d = await customDraft(c.id);
    await a.owner.post(url(a, `/invoices/${d.id}/issue`));
    await a.owner.post(url(a, `/invoices/${d.id}/payments`), { method: 'cash', amountMinor: 2500 });
    const events = sw.paymentsFake!.events().length;
    const r = await a.owner.post(url(a, `/invoices/${d.id}/refunds`), { amountMinor: 500, reason: 'One kit arrived broken' });
    expect(r.status).toBe(200);
    expect(r.body.creditNote).toMatchObject({ kind: 'credit_note', total: 500, status: 'refunded' });
    // VAT inside the credit: 500 · 2000 / 12 000 = 83.3 → 83
    expect(r.body.creditNote.tax).toBe(83);
    expect(r.body.invoice).toMatchObject({ status: 'paid', paid: 2000, refunded: 500 });
    expect(sw.paymentsFake!.events().length).toBe(events);
  });
});

describe('the balance invoice', () => {
  it('is issued when the client approves the finished work (ready to ship), once', async () => {
    const c = await commission(a, 'Finished work');
    await acceptedQuote(a, c.id); // €190.00, deposit €95.00
    const [deposit] = await invoicesOf(a.owner, a.studioId, c.id);
    await a.owner.post(url(a, `/invoices/${deposit.id}/payments`), { method: 'bank', amountMinor: 9500 });
    await a.owner.post(url(a, `/commissions/${c.id}/transitions`), { to: 'on_bench' });
    const approval = await a.owner.post(url(a, `/commissions/${c.id}/approvals`), { subject: 'finished' });
    expect(approval.status).toBe(201);
    expect((await invoicesOf(a.owner, a.studioId, c.id)).map((i) => i.kind)).toEqual(['deposit']);
    const ok = await a.client.post(url(a, `/approvals/${approval.body.id}/approve`), {});
    expect(ok.status).toBe(200);
    expect((await a.owner.get(url(a, `/commissions/${c.id}`))).body.status).toBe('ready_to_ship');
    const invoices = await invoicesOf(a.client, a.studioId, c.id);
    const balance = invoices.find((i) => i.kind === 'balance');
    expect(balance).toMatchObject({ status: 'open', total: 9500, balanceDue: 9500 });
    expect(balance!.number).toMatch(/^2026-/);
    const mail = (await mailTo(sw, 'client-a@studio.test')).find((m) => m.subject.includes(balance!.number!));
    expect(mail?.subject).toMatch(/^Balance invoice/);
    // back to the bench and ready again: no second balance invoice
    await a.owner.post(url(a, `/commissions/${c.id}/transitions`), { to: 'on_bench' });
    await a.owner.post(url(a, `/commissions/${c.id}/transitions`), { to: 'ready_to_ship' });
    expect((await invoicesOf(a.owner, a.studioId, c.id)).filter((i) => i.kind === 'balance')).toHaveLength(1);
  });
});

describe('who sees invoices', () => {
  it('a client sees only their own issued invoices; others get 404, painters 403', async () => {
    const c = await commission(a);
    const draft = await customDraft(c.id);
    const open = await customDraft(c.id);
    await a.owner.post(url(a, `/invoices/${open.id}/issue`));
    expect((await a.client.get(url(a, `/invoices/${draft.id}`))).status).toBe(404);
    expect((await a.client.get(url(a, `/invoices/${open.id}`))).status).toBe(200);
    expect((await a.client.get(url(a, `/invoices/${draft.id}/pdf`))).status).toBe(404);
    const list = (await a.client.get(url(a, '/invoices?limit=200'))).body.items as { id: number; status: string; client: { id: number } }[];
    expect(list.some((i) => i.id === draft.id)).toBe(false);
    expect(list.every((i) => i.client.id === a.clientId && i.status !== 'draft')).toBe(true);
    expect((await b.client.get(url(a, `/invoices/${open.id}`))).status).toBe(404);
    expect((await b.owner.get(url(a, `/invoices/${open.id}`))).status).toBe(404);
    expect((await b.owner.get(`/api/studios/${b.studioId}/invoices/${open.id}`)).status).toBe(404);
    expect((await a.painter.get(url(a, `/invoices/${open.id}`))).status).toBe(403);
    expect((await a.painter.get(url(a, '/money'))).status).toBe(403);
  });
});

describe('documents', () => {
  it('the PDF is set in Inter and is served to the owner and the client', async () => {
    await a.owner.patch(url(a, `/clients/${a.clientId}`), { address: { line1: 'Łąkowa 7', city: 'Gdańsk', country: 'PL' } });
    const c = await commission(a);
    const d = await customDraft(c.id, [{ description: 'Żółw na podstawce — conversion', quantity: 1, unitMinor: 4200 }]);
    const issued = (await a.owner.post(url(a, `/invoices/${d.id}/issue`))).body;
    for (const who of [a.owner, a.client]) {
      const res = await who.get(url(a, `/invoices/${d.id}/pdf`)).buffer(true).parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (x: Buffer) => chunks.push(x));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toBe('application/pdf');
      expect(res.headers['content-disposition']).toContain(`invoice-${issued.number}.pdf`);
      const pdf = res.body as Buffer;
      expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
      const text = pdf.toString('latin1');
      // embedded subsets of the Latin and Latin Extended files, regular and bold
      expect(text).toMatch(/\/BaseFont \/[A-Z]{6}\+Inter/);
      expect((text.match(/\/FontFile[23]/g) ?? []).length).toBeGreaterThanOrEqual(3);
      expect(pdf.length).toBeGreaterThan(5000);
    }
  });

  it('the CSV export lists issued invoices of the period with decimal amounts', async () => {
    const c = await commission(a);
    const d = await customDraft(c.id);
    const issued = (await a.owner.post(url(a, `/invoices/${d.id}/issue`))).body;
    const draft = await customDraft(c.id);
    const res = await a.owner.get(url(a, '/invoices/export.csv?from=2026-03-01&to=2026-03-31'));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    const rows = parse(res.text, { columns: true }) as Record<string, string>[];
    const row = rows.find((r) => r.Number === issued.number);
    expect(row).toMatchObject({ Kind: 'Invoice', Status: 'Open', Currency: 'EUR', Total: '25.00', 'Tax amount': '4.17', Net: '20.83', Tax: 'VAT', 'Tax ID': 'VAT-TEST-0001', Client: 'Client a' });
    expect(rows.some((r) => r.Number === '')).toBe(false);
    expect(rows.length).toBeGreaterThan(1);
    expect(draft.number).toBeNull();
    const none = await a.owner.get(url(a, '/invoices/export.csv?from=2026-04-01'));
    expect(parse(none.text, { columns: true })).toEqual([]);
    expect((await a.owner.get(url(a, '/invoices/export.csv?from=2026-04-01&to=2026-03-01'))).status).toBe(400);
    expect((await a.client.get(url(a, '/invoices/export.csv'))).status).toBe(403);
  });
});

describe('reminders', () => {
  it('an overdue invoice gets one reminder per run window, however often the job runs; paid ones none', async () => {
    const c = await commission(a, 'Late payer');
    const d = await customDraft(c.id);
    const issued = (await a.owner.post(url(a, `/invoices/${d.id}/issue`))).body;
    expect(issued.dueDate).toBe('2026-03-16'); // 14 days after 2026-03-02
    const paid = await customDraft(c.id);
    await a.owner.post(url(a, `/invoices/${paid.id}/issue`));
    await a.owner.post(url(a, `/invoices/${paid.id}/payments`), { method: 'bank', amountMinor: 2500 });
    const reminders = async () => (await mailTo(sw, 'client-a@studio.test')).filter((m) => m.subject.startsWith('Reminder'));
    const ofInvoice = async (n: string) => (await reminders()).filter((m) => m.subject.includes(n));

    sw.clock.advance(14 * DAY); // due today: not overdue yet
    await sw.jobs.sendInvoiceReminders();
    expect(await ofInvoice(issued.number)).toHaveLength(0);
    sw.clock.advance(DAY);
    const [first, second] = await Promise.all([sw.jobs.sendInvoiceReminders(), sw.jobs.sendInvoiceReminders()]);
    await sw.jobs.sendInvoiceReminders();
    expect(first + second).toBeGreaterThanOrEqual(1);
    const one = await ofInvoice(issued.number);
    expect(one).toHaveLength(1);
    expect(one[0].text).toContain('1 day ago');
    expect(one[0].text).toContain('€25.00');
    expect((await a.owner.get(url(a, `/invoices/${d.id}`))).body.overdue).toBe(true);
    sw.clock.advance(6 * DAY);
    await sw.jobs.sendInvoiceReminders();
    expect(await ofInvoice(issued.number)).toHaveLength(1);
    sw.clock.advance(DAY);
    await sw.jobs.sendInvoiceReminders();
    await sw.jobs.sendInvoiceReminders();
    expect(await ofInvoice(issued.number)).toHaveLength(2);
    const paidNumber = (await a.owner.get(url(a, `/invoices/${paid.id}`))).body.number;
    expect(await ofInvoice(paidNumber)).toHaveLength(0);
  });
});
