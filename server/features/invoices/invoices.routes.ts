import type { Request } from 'express';
import { stringify } from 'csv-stringify/sync';
import { z } from 'zod';
import { fromMinor } from '../../../shared/money';
import { id } from '../../../shared/schemas/common';
import {
  createInvoiceInput,
  invoiceExportQuery,
  invoiceKindLabels,
  invoiceListQuery,
  invoiceStatusLabels,
  manualPaymentInput,
  refundInput,
  type InvoiceExportQuery,
  type InvoiceListQuery,
} from '../../../shared/schemas/invoices';
import { cancelCommissionInput } from '../../../shared/schemas/quotes';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import { csvCell } from '../../lib/csv';
import { invoicePdf } from './invoice-pdf';
import type { InvoicesService } from './invoices.service';

const invoiceParams = z.object({ studioId: id, invoiceId: id });
const commissionParams = z.object({ studioId: id, commissionId: id });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });
const guardRow = (row: Record<string, string | number | null | undefined>) => Object.fromEntries(Object.entries(row).map(([k, v]) => [k, csvCell(v)]));

export function invoicesRoutes(r: RouteTable, deps: { allow: Allow; invoices: InvoicesService }) {
  const { allow, invoices } = deps;
  r.get('/studios/:studioId/invoices', allow('owner', 'client'), validate({ query: invoiceListQuery }), json((req, res) => invoices.list(member(req), query<InvoiceListQuery>(res))));
  r.post('/studios/:studioId/invoices', allow('owner'), validate({ body: createInvoiceInput }), json((req) => invoices.create(actor(req), req.body), 201));
  // Before /invoices/:invoiceId, which would take "export.csv" for an id.
  r.get('/studios/:studioId/invoices/export.csv', allow('owner'), validate({ query: invoiceExportQuery }), async (req, res) => {
    const q = query<InvoiceExportQuery>(res);
    const { rows } = await invoices.exportRows(member(req), q.from ?? null, q.to ?? null);
    const money = (m: number, c: string) => fromMinor(m, c);
    // Every cell through csvCell: client names, titles and tax words are typed by people, and a cell
    // starting with = + - @ would run as a formula in a spreadsheet.
    const csv = stringify(
      rows.map((i) => guardRow({
        number: i.number,
        kind: invoiceKindLabels[i.kind],
        status: invoiceStatusLabels[i.status],
        issued: i.issuedAt?.slice(0, 10) ?? '',
        due: i.dueDate ?? '',
        client: i.client.name,
        commission: i.commissionTitle,
        credits: i.creditFor ? (rows.find((x) => x.id === i.creditFor)?.number ?? String(i.creditFor)) : '',
        currency: i.currency,
        net: money(i.taxInclusive ? i.total - i.tax : i.subtotal, i.currency),
        taxLabel: i.taxLabel,
        taxRates: [...new Set(i.lines.map((l) => l.taxBp / 100))].join(' / '),
        tax: money(i.tax, i.currency),
        total: money(i.total, i.currency),
        paid: money(i.paid, i.currency),
        refunded: money(i.refunded, i.currency),
        balanceDue: money(i.balanceDue, i.currency),
        taxId: i.taxId,
      })),
      {
        header: true,
        columns: [
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
        ],
      },
    );
    const name = `invoices${q.from ? `-from-${q.from}` : ''}${q.to ? `-to-${q.to}` : ''}.csv`;
    res.type('text/csv; charset=utf-8').attachment(name).send(csv);
  });
  r.get('/studios/:studioId/invoices/:invoiceId', allow('owner', 'client'), validate({ params: invoiceParams }), json((req, res) => invoices.get(member(req), params(res).invoiceId)));
  r.get('/studios/:studioId/invoices/:invoiceId/pdf', allow('owner', 'client'), validate({ params: invoiceParams }), async (req, res) => {
    const d = await invoices.document(member(req), params(res).invoiceId);
    const pdf = await invoicePdf(d);
    res.type('application/pdf').setHeader('content-disposition', `inline; filename="invoice-${d.invoice.number ?? `draft-${d.invoice.id}`}.pdf"`);
    res.setHeader('cache-control', 'private, no-store');
    res.send(pdf);
  });
  r.post('/studios/:studioId/invoices/:invoiceId/issue', allow('owner'), validate({ params: invoiceParams }), json((req, res) => invoices.issue(actor(req), params(res).invoiceId)));
  r.post('/studios/:studioId/invoices/:invoiceId/payments', allow('owner'), validate({ params: invoiceParams, body: manualPaymentInput }), json((req, res) => invoices.recordManualPayment(actor(req), params(res).invoiceId, req.body)));
  r.post('/studios/:studioId/invoices/:invoiceId/void', allow('owner'), validate({ params: invoiceParams }), json((req, res) => invoices.void(actor(req), params(res).invoiceId)));
  r.post('/studios/:studioId/invoices/:invoiceId/refunds', allow('owner'), validate({ params: invoiceParams, body: refundInput }), json((req, res) => invoices.refund(actor(req), params(res).invoiceId, req.body)));
  r.post('/studios/:studioId/invoices/:invoiceId/checkout', allow('owner', 'client'), validate({ params: invoiceParams }), json((req, res) => invoices.checkout(actor(req), params(res).invoiceId)));
  r.get('/studios/:studioId/commissions/:commissionId/cancellation', allow('owner'), validate({ params: commissionParams }), json((req, res) => invoices.cancellationPreview(member(req), params(res).commissionId)));
  r.post('/studios/:studioId/commissions/:commissionId/cancellation', allow('owner'), validate({ params: commissionParams, body: cancelCommissionInput }), json((req, res) => invoices.cancel(actor(req), params(res).commissionId, req.body.reason)));
}
