import { stringify } from 'csv-stringify/sync';
import { addDays, localDateOf } from '../../../shared/dates';
import { fromMinor } from '../../../shared/money';
import { invoiceKindLabels, invoiceStatusLabels } from '../../../shared/schemas/invoices';
import { csvCell } from '../../lib/csv';
import type { ExportRow, InvoicesRepository } from './invoices.repository';

/** Invoices read per query of the CSV export: memory holds one page, whatever the studio has issued. */
export const EXPORT_PAGE_ROWS = 500;

const columns = [
  { key: 'number', header: 'Number' },
  { key: 'kind', header: 'Kind' },
  { key: 'status', header: 'Status' },
  { key: 'issued', header: 'Issued' },
  { key: 'due', header: 'Due' },
  { key: 'client', header: 'Client' },
  { key: 'commission', header: 'Commission' },
  { key: 'credits', header: 'Credits invoice' },
  { key: 'currency', header: 'Currency' },
  { key: 'net', header: 'Net' },
  { key: 'taxLabel', header: 'Tax' },
  { key: 'taxRates', header: 'Tax rate %' },
  { key: 'tax', header: 'Tax amount' },
  { key: 'total', header: 'Total' },
  { key: 'paid', header: 'Paid' },
  { key: 'refunded', header: 'Refunded' },
  { key: 'balanceDue', header: 'Balance due' },
  { key: 'taxId', header: 'Tax ID' },
];

/** What is left to pay, as the invoice view counts it (open and partly paid: the rest; a draft: all; else nothing). */
const balanceDueOf = (r: ExportRow) => (r.status === 'open' || r.status === 'partly_paid' ? Math.max(0, r.total - r.paid - r.credited) : r.status === 'draft' ? r.total : 0);

/** Where a page of the export starts: after this invoice (the last of the page before), or at the first (null). */
export type CsvCursor = { issuedAt: string; id: number } | null;

/** One page of the export as text (null: a page with no line of the days asked for, after the first), with where the next one starts (null: none). */
export type CsvPage = { text: string | null; rows: number; next: CsvCursor };

/**
 * One page of the accountant's CSV (see invoiceCsvChunks): up to `pageSize` issued invoices after `after`,
 * those of the studio's calendar days `from`..`to` written as lines, with the header on the first page.
 */
export async function invoiceCsvPage(
  repo: Pick<InvoicesRepository, 'exportPage'>,
  studio: { id: number; timezone: string },
  from: string | null,
  to: string | null,
  after: CsvCursor,
  pageSize = EXPORT_PAGE_ROWS,
): Promise<CsvPage> {
  const lo = from ? addDays(from, -1) : null;
  const hi = to ? addDays(to, 2) : null;
  const bounded = from !== null || to !== null;
  const inRange = (issuedAt: string | null) => {
    if (issuedAt === null) return false;
    if (!bounded) return true;
    const day = localDateOf(new Date(issuedAt).getTime(), studio.timezone);
    return (!from || day >= from) && (!to || day <= to);
  };
  const money = (m: number, c: string) => csvCell(fromMinor(m, c));
  const first = after === null;
  const page = await repo.exportPage(studio.id, lo, hi, after, pageSize);
  const records = [];
  for (const i of page) {
    if (!inRange(i.issued_at)) continue;
    const lines = JSON.parse(i.lines_json) as { taxBp: number }[];
    records.push({
      number: csvCell(i.number),
      kind: csvCell(invoiceKindLabels[i.kind]),
      status: csvCell(invoiceStatusLabels[i.status]),
      issued: csvCell(i.issued_at!.slice(0, 10)),
      due: csvCell(i.due_date ?? ''),
      client: csvCell(i.client_name),
      commission: csvCell(i.commission_title),
      credits: csvCell(i.credit_for ? (inRange(i.credit_for_issued_at) ? (i.credit_for_number ?? String(i.credit_for)) : String(i.credit_for)) : ''),
      currency: csvCell(i.currency),
      net: money(i.tax_inclusive ? i.total - i.tax : i.subtotal, i.currency),
      taxLabel: csvCell(i.tax_label),
      taxRates: csvCell([...new Set(lines.map((l) => l.taxBp / 100))].join(' / ')),
      tax: money(i.tax, i.currency),
      total: money(i.total, i.currency),
      paid: money(i.paid, i.currency),
      refunded: money(i.refunded, i.currency),
      balanceDue: money(balanceDueOf(i), i.currency),
      taxId: csvCell(i.tax_id),
    });
  }
  const text = first || records.length ? stringify(records, { header: first, columns }) : null;
  const last = page[page.length - 1];
  return { text, rows: page.length, next: page.length < pageSize ? null : { issuedAt: last.issued_at!, id: last.id } };
}

/**
 * The accountant's CSV of the invoices (credit notes included) issued on the studio's calendar days
 * `from`..`to` (either open), in issue order, as chunks of text: the header with the first page, then one
 * chunk per page of `pageSize` invoices, read by (issued_at, id) after the page before (invoiceCsvPage;
 * the service keeps the pages it read, through csvChunks).
 *
 * The stored times are UTC, so the SQL bounds are the days widened by a day each side and every row of a
 * bounded export is checked against its local day. A credit note names the number of the invoice it
 * credits when that invoice is in the export too, else the invoice's id (read with the row, so it does not
 * matter on which page that invoice is). Every cell goes through csvCell: client names, titles and tax words
 * are typed by people, and a cell starting with = + - @ would run as a formula in a spreadsheet.
 */
export function invoiceCsvChunks(
  repo: Pick<InvoicesRepository, 'exportPage'>,
  studio: { id: number; timezone: string },
  from: string | null,
  to: string | null,
  pageSize = EXPORT_PAGE_ROWS,
): AsyncGenerator<string> {
  return csvChunks((after) => invoiceCsvPage(repo, studio, from, to, after, pageSize));
}

/** The chunks of an export read page by page (invoiceCsvPage, or the service's kept pages of it). */
export async function* csvChunks(readPage: (after: CsvCursor) => Promise<CsvPage>): AsyncGenerator<string> {
  let after: CsvCursor = null;
  for (;;) {
    const page = await readPage(after);
    if (page.text !== null) yield page.text;
    if (!page.next) return;
    after = page.next;
  }
}
