// Quotes: requests (zod) and responses. A quote is priced by shared/pricing.ts quoteFigures from the
// studio's price table and an input of figures, extra lines and a due date; the server stores the result.
import { z } from 'zod';
import type { ClientBreakdown, QuoteResult } from '../pricing';
import { id, pageQuery } from './common';
import { hours, quoteExtraLine, quoteFigure, tableKey, type QuoteExtraLine, type QuoteFigure } from './price-table';

export const quoteStatuses = ['draft', 'sent', 'accepted', 'changes_requested', 'declined', 'expired', 'superseded'] as const;
export type QuoteStatus = (typeof quoteStatuses)[number];
export const quoteStatusLabels: Record<QuoteStatus, string> = {
  draft: 'Draft',
  sent: 'Sent',
  accepted: 'Accepted',
  changes_requested: 'Changes asked',
  declined: 'Declined',
  expired: 'Expired',
  superseded: 'Replaced',
};

const dateOnly = z.iso.date({ error: 'Use a date such as 2026-05-31.' });

/** Per-figure adjustments when a quote is built from the commission's figures. */
export const figureOverride = z.object({
  figureId: id,
  /** per-unit hours replacing the table's for these stages */
  stageHours: z.record(z.string(), hours).optional(),
  /** stages this figure does not need */
  omitStages: z.array(tableKey).max(30).optional(),
});
export type FigureOverride = z.infer<typeof figureOverride>;

/** POST /commissions/:id/quotes: a draft from the commission's figures and the studio's price table. */
export const createQuoteInput = z.object({
  extraLines: z.array(quoteExtraLine).max(100, 'At most 100 extra lines.').optional(),
  /** defaults to the commission's due date (none when it has passed) */
  dueDate: dateOnly.nullable().optional(),
  figureOverrides: z.array(figureOverride).max(500).optional(),
});
export type CreateQuoteInput = z.infer<typeof createQuoteInput>;

/** PATCH /quotes/:id (drafts only): any part of the input, replaced whole. */
export const updateQuoteInput = z.object({
  figures: z.array(quoteFigure).max(500, 'At most 500 figure lines.').optional(),
  extraLines: z.array(quoteExtraLine).max(100, 'At most 100 extra lines.').optional(),
  dueDate: dateOnly.nullable().optional(),
});
export type UpdateQuoteInput = z.infer<typeof updateQuoteInput>;

/** POST /quotes/preview: the same engine on the server, with the studio's table and today's date. */
export const quotePreviewInput = z.object({
  commissionId: id.optional(),
  figures: z.array(quoteFigure).max(500, 'At most 500 figure lines.').default([]),
  extraLines: z.array(quoteExtraLine).max(100, 'At most 100 extra lines.').default([]),
  dueDate: dateOnly.nullable().default(null),
});
export type QuotePreviewInput = z.input<typeof quotePreviewInput>;
export type ParsedQuotePreviewInput = z.infer<typeof quotePreviewInput>;

export const acceptQuoteInput = z.object({
  name: z.string({ error: 'Type your name to accept.' }).trim().min(1, 'Type your name to accept.').max(120, 'Use at most 120 characters.'),
  acceptTerms: z.literal(true, { error: 'Tick the box to accept the terms.' }),
});
export type AcceptQuoteInput = z.infer<typeof acceptQuoteInput>;

export const requestQuoteChangesInput = z.object({
  comment: z.string({ error: 'Say what you would like changed.' }).trim().min(1, 'Say what you would like changed.').max(4000, 'Use at most 4000 characters.'),
});
export type RequestQuoteChangesInput = z.infer<typeof requestQuoteChangesInput>;

export const declineQuoteInput = z.object({
  comment: z
    .string()
    .trim()
    .max(4000, 'Use at most 4000 characters.')
    .optional()
    .transform((v) => (v ? v : undefined)),
});
export type DeclineQuoteInput = z.infer<typeof declineQuoteInput>;

export const quoteListQuery = pageQuery.extend({
  commissionId: id.optional(),
  status: z.enum(quoteStatuses, { error: 'Unknown status.' }).optional(),
});
export type QuoteListQuery = z.infer<typeof quoteListQuery>;

/** POST /commissions/:id/cancellation: confirms the preview (GET) and cancels. */
export const cancelCommissionInput = z.object({
  reason: z.string({ error: 'Give a reason for cancelling.' }).trim().min(1, 'Give a reason for cancelling.').max(1000, 'Use at most 1000 characters.'),
});
export type CancelCommissionInput = z.infer<typeof cancelCommissionInput>;

// --- responses ------------------------------------------------------------------------------

export type QuoteInput = { figures: QuoteFigure[]; extraLines: QuoteExtraLine[]; dueDate: string | null };

/**
 * What a client sees of the result when the studio hides hours: amounts only. Figure lines lose their
 * minutes, labour and stage split; totalMinutes and stageMinutes are gone; clientBreakdown stays.
 */
export type ClientQuoteResult = Omit<QuoteResult, 'lines' | 'totalMinutes' | 'stageMinutes'> & {
  lines: (
    | { type: 'figure'; id: string | number | null; name: string; quantity: number; sizeClass: string; tier: string; tierLabel: string; extras: { key: string; label: string; kind: 'flat' | 'hours'; unitAmount: number }[]; extrasAmount: number; materials: number; amount: number }
    | Extract<QuoteResult['lines'][number], { type: 'extra' }>
  )[];
  clientBreakdown: ClientBreakdown;
};

export type Quote = {
  id: number;
  commissionId: number;
  commissionTitle: string;
  client: { id: number; name: string };
  version: number;
  status: QuoteStatus;
  /** null for clients when the studio hides hours (the input carries per-stage hours) */
  input: QuoteInput | null;
  result: QuoteResult | ClientQuoteResult;
  currency: string;
  total: number;
  deposit: number;
  balance: number;
  quoteDate: string;
  validUntil: string;
  showHoursToClient: boolean;
  sentAt: string | null;
  decidedAt: string | null;
  decidedBy: { id: number; name: string } | null;
  acceptedName: string | null;
  decisionComment: string | null;
  /** the studio's terms as they were when the quote was priced */
  terms: string;
  /** what the owner may do next (empty for clients) / what the client may do (for clients) */
  allowedActions: ('edit' | 'send' | 'accept' | 'request-changes' | 'decline')[];
  createdAt: string;
  updatedAt: string;
};

export type QuoteSummary = Pick<
  Quote,
  'id' | 'commissionId' | 'commissionTitle' | 'client' | 'version' | 'status' | 'currency' | 'total' | 'deposit' | 'balance' | 'validUntil' | 'sentAt' | 'decidedAt' | 'createdAt'
>;

export type CancellationPreview = {
  currency: string;
  /** deposits received for this commission, net of refunds */
  depositPaid: number;
  /** done stages' estimated minutes × the hourly rate of the accepted quote's table */
  workDoneMinutes: number;
  workDoneMinor: number;
  /** what goes back to the client: the deposit less the work done, never below 0 */
  refundMinor: number;
  /** what the studio keeps: the work done, capped at the deposit */
  keptMinor: number;
  /** the part of the refund that goes back to a card through the payment service */
  cardRefundMinor: number;
  /** unpaid invoices that cancelling voids */
  voidsInvoiceIds: number[];
  explanation: string;
};
