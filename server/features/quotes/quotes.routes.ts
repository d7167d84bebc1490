import type { Request } from 'express';
import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import {
  acceptQuoteInput,
  createQuoteInput,
  declineQuoteInput,
  quoteListQuery,
  quotePreviewInput,
  requestQuoteChangesInput,
  updateQuoteInput,
  type QuoteListQuery,
} from '../../../shared/schemas/quotes';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { QuotesService } from './quotes.service';

const quoteParams = z.object({ studioId: id, quoteId: id });
const commissionParams = z.object({ studioId: id, commissionId: id });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function quotesRoutes(r: RouteTable, deps: { allow: Allow; quotes: QuotesService }) {
  const { allow, quotes } = deps;
  r.get('/studios/:studioId/quotes', allow('owner', 'client'), validate({ query: quoteListQuery }), json((req, res) => quotes.list(member(req), query<QuoteListQuery>(res))));
  r.post('/studios/:studioId/commissions/:commissionId/quotes', allow('owner'), validate({ params: commissionParams, body: createQuoteInput }), json((req, res) => quotes.create(actor(req), params(res).commissionId, req.body), 201));
  r.post('/studios/:studioId/quotes/preview', allow('owner'), validate({ body: quotePreviewInput }), json((req) => quotes.preview(member(req), req.body)));
  r.get('/studios/:studioId/quotes/:quoteId', allow('owner', 'client'), validate({ params: quoteParams }), json((req, res) => quotes.get(member(req), params(res).quoteId)));
  r.patch('/studios/:studioId/quotes/:quoteId', allow('owner'), validate({ params: quoteParams, body: updateQuoteInput }), json((req, res) => quotes.update(actor(req), params(res).quoteId, req.body)));
  r.post('/studios/:studioId/quotes/:quoteId/send', allow('owner'), validate({ params: quoteParams }), json((req, res) => quotes.send(actor(req), params(res).quoteId)));
  r.post('/studios/:studioId/quotes/:quoteId/accept', allow('client'), validate({ params: quoteParams, body: acceptQuoteInput }), json((req, res) => quotes.accept(actor(req), user(req), params(res).quoteId, req.body, req.ip ?? null)));
  r.post('/studios/:studioId/quotes/:quoteId/request-changes', allow('client'), validate({ params: quoteParams, body: requestQuoteChangesInput }), json((req, res) => quotes.requestChanges(actor(req), user(req), params(res).quoteId, req.body)));
  r.post('/studios/:studioId/quotes/:quoteId/decline', allow('client'), validate({ params: quoteParams, body: declineQuoteInput }), json((req, res) => quotes.decline(actor(req), user(req), params(res).quoteId, req.body)));
}
