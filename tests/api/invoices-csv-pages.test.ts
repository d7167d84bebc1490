import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DAY, HOUR } from '../../server/lib/clock';
import { EXPORT_PAGE_ROWS, invoiceCsvChunks } from '../../server/features/invoices/invoices.csv';
import { invoicesRepository } from '../../server/features/invoices/invoices.repository';
import { startTestApp, type TestApp } from '../support/app';
import { commission, moneyStudios, type Side } from './money-flow';

/**
 * The invoice CSV is read in pages of issued invoices by (issued_at, id): the file must be the same however
 * the pages fall, including invoices issued at the same instant (a tie broken by id on a page boundary) and
 * credit notes whose credited invoice is on another page, or outside the exported days (then its id).
 */

let sw: TestApp;
let a: Side;
const url = (path: string) => `/api/studios/${a.studioId}${path}`;
type Issued = { id: number; number: string; issuedAt: string; kind: string };
const issued: Issued[] = [];
const credited: { note: Issued; of: Issued }[] = [];

async function issueCustom(commissionId: number, unitMinor: number) {
  const d = await a.owner.post(url('/invoices'), { commissionId, kind: 'custom', lines: [{ description: 'Kit', quantity: 1, unitMinor }] });
  if (d.status !== 201) throw new Error(`${d.status} ${JSON.stringify(d.body)}`);
  const r = await a.owner.post(url(`/invoices/${d.body.id}/issue`));
  if (r.status !== 200) throw new Error(`${r.status} ${JSON.stringify(r.body)}`);
  const inv = { id: r.body.id, number: r.body.number, issuedAt: r.body.issuedAt, kind: r.body.kind };
  issued.push(inv);
  return inv;
}

async function refund(of: Issued, amountMinor: number) {
  await a.owner.post(url(`/invoices/${of.id}/payments`), { method: 'bank', amountMinor });
  const r = await a.owner.post(url(`/invoices/${of.id}/refunds`), { amountMinor, reason: 'Broken kit' });
  if (r.status !== 200) throw new Error(`${r.status} ${JSON.stringify(r.body)}`);
  const note = { id: r.body.creditNote.id, number: r.body.creditNote.number, issuedAt: r.body.creditNote.issuedAt, kind: 'credit_note' };
  issued.push(note);
  credited.push({ note, of });
}

beforeAll(async () => {
  sw = await startTestApp();
  ({ a } = await moneyStudios(sw));
  sw.clock.set('2026-03-02T09:00:00.000Z');
  const c = await commission(a);
  // Three days of invoices; on the second, three issued at the same instant (ties for the page order).
  const first = await issueCustom(c.id, 1000);
  await issueCustom(c.id, 1100);
  sw.clock.advance(DAY);
  const tied = [await issueCustom(c.id, 1200), await issueCustom(c.id, 1300), await issueCustom(c.id, 1400)];
  sw.clock.advance(HOUR);
  await refund(tied[0], 1200); // credited invoice issued an hour before its credit note
  sw.clock.advance(DAY);
  await refund(first, 1000); // credited invoice two days before: outside an export of the last day alone
  await issueCustom(c.id, 1500);
  // a draft: never in the export
  await a.owner.post(url('/invoices'), { commissionId: c.id, kind: 'custom', lines: [{ description: 'Draft', quantity: 1, unitMinor: 1 }] });
});
afterAll(() => sw.stop());

async function chunked(from: string | null, to: string | null, pageSize: number) {
  const repo = invoicesRepository(sw.db);
  let pages = 0;
  const counting = { exportPage: (...args: Parameters<typeof repo.exportPage>) => (pages++, repo.exportPage(...args)) };
  const studio = await sw.db('studios').where({ id: a.studioId }).first('id', 'timezone');
  let text = '';
  for await (const chunk of invoiceCsvChunks(counting, studio, from, to, pageSize)) text += chunk;
  return { text, pages };
}

describe('the invoice CSV in pages', () => {
  it('is the same file whatever the page size, and reads one page more than the rows fill', async () => {
    expect(issued.length).toBe(8);
    expect(issued.length).toBeLessThan(EXPORT_PAGE_ROWS); // the HTTP answer below is one page
    const whole = await a.owner.get(url('/invoices/export.csv'));
    expect(whole.status).toBe(200);
    for (const size of [1, 2, 3, 7, 8, 9]) {
      const { text, pages } = await chunked(null, null, size);
      expect(text, `page size ${size}`).toBe(whole.text);
      expect(pages, `page size ${size}`).toBe(Math.floor(issued.length / size) + 1);
    }
  });

  it('lists every issued invoice once, in issue order (ties by id), with the credited invoice’s number', async () => {
    const res = await a.owner.get(url('/invoices/export.csv'));
    const rows = parse(res.text, { columns: true }) as Record<string, string>[];
    const expected = [...issued].sort((x, y) => x.issuedAt.localeCompare(y.issuedAt) || x.id - y.id);
    expect(rows.map((r) => r.Number)).toEqual(expected.map((i) => i.number));
    for (const { note, of } of credited) expect(rows.find((r) => r.Number === note.number)?.['Credits invoice']).toBe(of.number);
    expect(rows.filter((r) => r['Credits invoice'] === '').length).toBe(issued.length - credited.length);
  });

  it('a bounded export: a credit note whose invoice is outside the days names the invoice by id, on any page size', async () => {
    // The last day (Berlin, UTC+1 in March): the second credit note and the last invoice only.
    const day = '2026-03-04';
    const res = await a.owner.get(url(`/invoices/export.csv?from=${day}&to=${day}`));
    const rows = parse(res.text, { columns: true }) as Record<string, string>[];
    const last = credited[1];
    expect(rows.map((r) => r.Number)).toEqual([last.note.number, issued[issued.length - 1].number]);
    expect(rows[0]['Credits invoice']).toBe(String(last.of.id));
    // Two days: the first credit note's invoice is in it (its number), the second's is not (its id).
    const two = await a.owner.get(url('/invoices/export.csv?from=2026-03-03&to=2026-03-04'));
    const twoRows = parse(two.text, { columns: true }) as Record<string, string>[];
    expect(twoRows.find((r) => r.Number === credited[0].note.number)?.['Credits invoice']).toBe(credited[0].of.number);
    expect(twoRows.find((r) => r.Number === credited[1].note.number)?.['Credits invoice']).toBe(String(credited[1].of.id));
    for (const size of [1, 2, 3]) {
      expect((await chunked(day, day, size)).text).toBe(res.text);
      expect((await chunked('2026-03-03', '2026-03-04', size)).text).toBe(two.text);
    }
  });

  it('an export with no invoice in it is the header alone, read in one page', async () => {
    const res = await a.owner.get(url('/invoices/export.csv?from=2027-01-01'));
    expect(res.text.trim().split('\n')).toHaveLength(1);
    const { text, pages } = await chunked('2027-01-01', null, 2);
    expect(text).toBe(res.text);
    expect(pages).toBe(1);
  });
});
