import type { Request, Response } from 'express';
import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import {
  createInvoiceInput,
  invoiceExportQuery,
  invoiceListQuery,
  manualPaymentInput,
  refundInput,
  type InvoiceExportQuery,
  type InvoiceListQuery,
} from '../../../shared/schemas/invoices';
import { cancelCommissionInput } from '../../../shared/schemas/quotes';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import { invoicePdf } from './invoice-pdf';
import type { InvoicesService } from './invoices.service';

const invoiceParams = z.object({ studioId: id, invoiceId: id });
const commissionParams = z.object({ studioId: id, commissionId: id });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

/** Writes the chunks as they come, waiting for the socket to drain between them; stops if the client went away. */
async function writeChunks(res: Response, head: string[], rest: AsyncIterable<string>) {
  const write = async (chunk: string) => {
    if (res.destroyed || res.write(chunk)) return;
    await new Promise<void>((resolve) => {
      const done = () => {
        res.off('drain', done);
        res.off('close', done);
        resolve();
      };
      res.on('drain', done);
      res.on('close', done);
    });
  };
  for (const chunk of head) await write(chunk);
  for await (const chunk of rest) {
    if (res.destroyed) return;
    await write(chunk);
  }
  res.end();
}

export function invoicesRoutes(r: RouteTable, deps: { allow: Allow; invoices: InvoicesService }) {
  const { allow, invoices } = deps;
  r.get('/studios/:studioId/invoices', allow('owner', 'client'), validate({ query: invoiceListQuery }), json((req, res) => invoices.list(member(req), query<InvoiceListQuery>(res))));
  r.post('/studios/:studioId/invoices', allow('owner'), validate({ body: createInvoiceInput }), json((req) => invoices.create(actor(req), req.body), 201));
  // Before /invoices/:invoiceId, which would take "export.csv" for an id.
  r.get('/studios/:studioId/invoices/export.csv', allow('owner'), validate({ query: invoiceExportQuery }), async (req, res) => {
    const q = query<InvoiceExportQuery>(res);
    const chunks = await invoices.exportCsv(member(req), q.from ?? null, q.to ?? null);
    const name = `invoices${q.from ? `-from-${q.from}` : ''}${q.to ? `-to-${q.to}` : ''}.csv`;
    // The first page is read before anything is sent, so a failure there is still an error answer.
    const next = await chunks.next();
    res.type('text/csv; charset=utf-8').attachment(name);
    await writeChunks(res, next.done ? [] : [next.value], chunks);
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
