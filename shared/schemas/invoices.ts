// Invoices, payments, refunds and the owner's money view: requests (zod), responses and the totals rule.
import { z } from 'zod';
import { percentOf, taxIncluded } from '../money';
import { id, pageQuery } from './common';

export const invoiceKinds = ['deposit', 'progress', 'balance', 'custom', 'credit_note'] as const;
export type InvoiceKind = (typeof invoiceKinds)[number];
export const invoiceKindLabels: Record<InvoiceKind, string> = {
  deposit: 'Deposit invoice',
  progress: 'Progress invoice',
  balance: 'Balance invoice',
  custom: 'Invoice',
  credit_note: 'Credit note',
};

export const invoiceStatuses = ['draft', 'open', 'partly_paid', 'paid', 'void', 'refunded'] as const;
export type InvoiceStatus = (typeof invoiceStatuses)[number];
export const invoiceStatusLabels: Record<InvoiceStatus, string> = {
  draft: 'Draft',
  open: 'Open',
  partly_paid: 'Partly paid',
  paid: 'Paid',
  void: 'Void',
  refunded: 'Refunded',
};

export const paymentMethods = ['card', 'bank', 'cash', 'other'] as const;
export type PaymentMethod = (typeof paymentMethods)[number];
/** Payments the owner records by hand; card payments only come from the payment service. */
export const manualPaymentMethods = ['bank', 'cash', 'other'] as const;

const dateOnly = z.iso.date({ error: 'Use a date such as 2026-05-31.' });
const minor = (what: string) =>
  z
    .number({ error: `Enter the ${what} in minor units (cents).` })
    .int('Amounts are whole minor units (cents, not dollars).')
    .max(1e12, 'That amount is too large.');

export const invoiceLineInput = z.object({
  description: z.string({ error: 'Describe the line.' }).trim().min(1, 'Describe the line.').max(300, 'Use at most 300 characters.'),
  quantity: z.number({ error: 'Enter a quantity.' }).int('Use a whole number.').min(1, 'At least 1.').max(10_000, 'At most 10 000.'),
  unitMinor: minor('unit price').min(0, 'Prices cannot be negative.'),
  /** the tax rate of this line in basis points (1900 = 19 %); omitted: the price table's rate */
  taxBp: z.number().int('Use basis points: 12.5 % = 1250.').min(0, 'Rates cannot be negative.').max(10_000, 'Use at most 100 %.').optional(),
});
export type InvoiceLineInput = z.infer<typeof invoiceLineInput>;

export const createInvoiceInput = z.object({
  commissionId: id,
  kind: z.enum(['progress', 'custom'], { error: 'Choose a progress or a custom invoice.' }),
  lines: z.array(invoiceLineInput).min(1, 'Add at least one line.').max(100, 'At most 100 lines.'),
  dueDate: dateOnly.optional(),
  note: z.string().trim().max(500, 'Use at most 500 characters.').optional(),
});
export type CreateInvoiceInput = z.infer<typeof createInvoiceInput>;

export const manualPaymentInput = z.object({
  method: z.enum(manualPaymentMethods, { error: 'Choose bank transfer, cash or other.' }),
  amountMinor: minor('amount').min(1, 'Enter an amount above zero.'),
  /** when the money arrived; a date or a full time; defaults to now */
  receivedAt: z.union([z.iso.datetime({ offset: true }), dateOnly], { error: 'Use a date such as 2026-05-31.' }).optional(),
  reference: z.string().trim().max(200, 'Use at most 200 characters.').optional(),
});
export type ManualPaymentInput = z.infer<typeof manualPaymentInput>;

export const refundInput = z.object({
  /** omitted: everything still refundable */
  amountMinor: minor('amount').min(1, 'Enter an amount above zero.').optional(),
  reason: z.string({ error: 'Give a reason for the refund.' }).trim().min(1, 'Give a reason for the refund.').max(500, 'Use at most 500 characters.'),
});
export type RefundInput = z.infer<typeof refundInput>;

export const invoiceListQuery = pageQuery.extend({
  status: z.enum(invoiceStatuses, { error: 'Unknown status.' }).optional(),
  clientId: id.optional(),
  commissionId: id.optional(),
  kind: z.enum(invoiceKinds, { error: 'Unknown kind.' }).optional(),
});
export type InvoiceListQuery = z.infer<typeof invoiceListQuery>;

export const invoiceExportQuery = z
  .object({ from: dateOnly.optional(), to: dateOnly.optional() })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { path: ['to'], message: 'The end date is before the start date.' });
export type InvoiceExportQuery = z.infer<typeof invoiceExportQuery>;

// --- the totals rule ---------------------------------------------------------------------------

export type InvoiceLine = { description: string; quantity: number; unitMinor: number; amountMinor: number; taxBp: number };

/**
 * Line amounts are quantity × unit price (exact). Tax is worked once per rate on the sum of that rate's
 * lines, half away from zero (shared/money.ts): inclusive amounts hold their tax (gross · r / (1 + r)),
 * exclusive ones get it added. Inclusive: total = Σ lines; exclusive: total = Σ lines + tax.
 */
export function invoiceTotals(lines: { quantity: number; unitMinor: number; taxBp: number }[], inclusive: boolean) {
  const byRate = new Map<number, number>();
  let subtotal = 0;
  for (const l of lines) {
    const amount = l.quantity * l.unitMinor;
    subtotal += amount;
    byRate.set(l.taxBp, (byRate.get(l.taxBp) ?? 0) + amount);
  }
  let tax = 0;
  for (const [bp, base] of byRate) tax += inclusive ? taxIncluded(base, bp) : percentOf(base, bp);
  return { subtotal, tax, total: inclusive ? subtotal : subtotal + tax };
}

// --- responses ------------------------------------------------------------------------------

export type InvoicePayment = {
  id: number;
  method: PaymentMethod;
  amountMinor: number;
  receivedAt: string;
  reference: string | null;
  refundedMinor: number;
};

/** A payment event that did not match what the app asked for: never counted as paid, shown to the owner. */
export type PaymentIssue = { eventId: string; at: string; sessionId: string | null; reason: string };

export type Invoice = {
  id: number;
  /** e.g. "2026-0007"; null while a draft */
  number: string | null;
  kind: InvoiceKind;
  status: InvoiceStatus;
  commissionId: number;
  commissionTitle: string;
  quoteId: number | null;
  client: { id: number; name: string };
  currency: string;
  lines: InvoiceLine[];
  /** Σ lines: net when tax is added on top, gross when prices include it */
  subtotal: number;
  tax: number;
  total: number;
  taxLabel: string;
  taxId: string;
  taxInclusive: boolean;
  /** received, net of refunds */
  paid: number;
  refunded: number;
  /** credit notes set against this invoice */
  credited: number;
  balanceDue: number;
  issuedAt: string | null;
  dueDate: string | null;
  overdue: boolean;
  /** for a credit note: the invoice it credits */
  creditFor: number | null;
  note: string | null;
  payments: InvoicePayment[];
  /** owners only; empty for clients */
  paymentIssues: PaymentIssue[];
  createdAt: string;
};

export type MoneyView = {
  currency: string;
  outstandingByClient: { client: { id: number; name: string }; currency: string; outstandingMinor: number; invoices: number; overdue: number }[];
  /** payments received this calendar month (studio's timezone), net of refunds made this month */
  paidThisMonthMinor: number;
  /** deposits received for commissions not yet on the bench (quoted, booked, or on hold from those) */
  depositsHeldMinor: number;
  openInvoices: number;
  overdueInvoices: number;
  paymentIssues: (PaymentIssue & { invoiceId: number | null; invoiceNumber: string | null })[];
};
