import { canTransition, type CommissionStatus } from '../../../shared/commission-lifecycle';
import { addDays, localDateOf, parseLocalDate } from '../../../shared/dates';
import { allocate, chargeAmount, chargeRule, formatMoney, fromChargeAmount, mulDiv, percentOf } from '../../../shared/money';
import type { QuoteResult } from '../../../shared/pricing';
import type { Page } from '../../../shared/schemas/common';
import {
  invoiceKindLabels,
  invoiceTotals,
  type CreateInvoiceInput,
  type Invoice,
  type InvoiceKind,
  type InvoiceLine,
  type InvoiceListQuery,
  type InvoiceStatus,
  type ManualPaymentInput,
  type RefundInput,
} from '../../../shared/schemas/invoices';
import type { PriceTable } from '../../../shared/schemas/price-table';
import type { CancellationPreview } from '../../../shared/schemas/quotes';
import type { CheckoutInfo, Payments } from '../../lib/payments/index';
import { PaymentsError } from '../../lib/payments/index';
import { DAY, iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { AppError, errors } from '../../lib/errors';
import type { Mailer } from '../../lib/mail/mailer';
import { templates } from '../../lib/mail/templates';
import type { Member } from '../../lib/policy';
import { csvChunks, EXPORT_PAGE_ROWS, invoiceCsvPage, type CsvPage } from './invoices.csv';
import type { CheckoutRow, InvoiceRow, InvoicesRepository, IssueRow, PaymentRow } from './invoices.repository';
import { groupBy } from '../../lib/group-by';
import { keptReads, type VersionInZone } from '../../lib/version-cache';

/** Rows (invoices, or invoices of the CSV) the kept list pages and CSV pages may hold across studios and queries, per store. */
export const INVOICE_LIST_CACHE_ROWS = 20_000;

export type Actor = Member & { userId: number };
/** Who causes a change: a person, or the payment service (userId null). */
export type By = { studioId: number; userId: number | null };

/** What invoicing needs of a priced quote (the quotes feature's stored row). */
export type PricedQuote = { id: number; version: number; commission_id: number; client_id: number; total: number; currency: string; result: QuoteResult; price_table: PriceTable };

export type InvoiceDeps = {
  db: Db;
  repo: InvoicesRepository;
  payments: Payments;
  mailer: Pick<Mailer, 'enqueue' | 'kick'>;
  clock: Clock;
  publicUrl: string;
  /** the studio's current price table (tax settings for hand-made invoices, hourly rate without a quote) */
  priceTable: (studioId: number, trx?: Db) => Promise<PriceTable>;
  /** the commission's accepted quote, if any */
  acceptedQuote: (studioId: number, commissionId: number, trx?: Db) => Promise<PricedQuote | undefined>;
  /** quoted → booked, joining the end of the queue, inside the caller's transaction */
  bookCommission: (trx: Db, by: By, commissionId: number) => Promise<void>;
  /** cancels through the lifecycle (its own transaction) */
  cancelCommission: (actor: Actor, commissionId: number, reason: string) => Promise<unknown>;
  /** Rows the kept list and CSV pages may hold per store (default INVOICE_LIST_CACHE_ROWS); 0 turns them off. */
  cacheRows?: number;
};

const DEPOSIT_DUE_DAYS = 7;
const INVOICE_DUE_DAYS = 14;
/** reminders after the due date: the first on the day after, then a week apart, three at most */
const MAX_REMINDERS = 3;
const REMINDER_GAP_MS = 7 * DAY;

const stepOf = (currency: string) => {
  try {
    return chargeRule(currency).minorStep;
  } catch {
    return 1;
  }
};

/** The stored status follows the money: paid when nothing is left to pay, refunded when everything went back. */
function settledStatus(inv: Pick<InvoiceRow, 'status' | 'kind' | 'total' | 'paid' | 'refunded' | 'credited' | 'currency'>): InvoiceStatus {
  if (inv.status === 'draft' || inv.status === 'void' || inv.kind === 'credit_note') return inv.status;
  if (inv.refunded > 0 && inv.paid <= 0) return 'refunded';
  const due = inv.total - inv.paid - inv.credited;
  // A remainder the payment service cannot charge (less than its step, e.g. 4 fils of KWD) counts as settled.
  if (due <= 0 || (inv.paid > 0 && due < stepOf(inv.currency))) return 'paid';
  return inv.paid > 0 ? 'partly_paid' : 'open';
}

const balanceDueOf = (inv: InvoiceRow) =>
  inv.status === 'open' || inv.status === 'partly_paid' ? Math.max(0, inv.total - inv.paid - inv.credited) : inv.status === 'draft' ? inv.total : 0;

/** An amount of a quote as invoice lines: its taxable and untaxed parts in the quote's proportion, tax included. */
function quoteShareLines(q: PricedQuote, amount: number, description: string): InvoiceLine[] {
  const r = q.result;
  const rate = r.tax.rateBp;
  if (rate === 0 || r.total === 0) return [{ description, quantity: 1, unitMinor: amount, amountMinor: amount, taxBp: rate }];
  const taxableGross = r.tax.inclusive ? r.tax.taxableBase : r.tax.taxableBase + r.tax.amount;
  const taxable = mulDiv(amount, taxableGross, r.total);
  const lines: InvoiceLine[] = [{ description, quantity: 1, unitMinor: taxable, amountMinor: taxable, taxBp: rate }];
  if (amount - taxable !== 0) lines.push({ description: `${description}: items without ${r.tax.label}`, quantity: 1, unitMinor: amount - taxable, amountMinor: amount - taxable, taxBp: 0 });
  return lines;
}

/** `amount` of an invoice as credit-note lines, split over its tax rates in proportion to their gross amounts. */
function creditLines(inv: InvoiceRow, amount: number, description: string): InvoiceLine[] {
  const byRate = new Map<number, number>();
  for (const l of inv.lines) byRate.set(l.taxBp, (byRate.get(l.taxBp) ?? 0) + l.amountMinor);
  const rates = [...byRate.keys()];
  const gross = rates.map((bp) => {
    const base = byRate.get(bp)!;
    return Math.max(0, inv.tax_inclusive ? base : base + percentOf(base, bp));
  });
  const parts = allocate(amount, gross);
  return rates
    .map((bp, i) => ({ description: rates.length > 1 ? `${description} (${bp / 100} % rate)` : description, quantity: 1, unitMinor: parts[i], amountMinor: parts[i], taxBp: bp }))
    .filter((l, _i, all) => l.amountMinor !== 0 || all.length === 1);
}

export function invoicesService(deps: InvoiceDeps) {
  const { db, repo, payments, mailer, clock, publicUrl } = deps;
  const now = () => iso(clock.now());
  const invoiceUrl = (studioId: number, id: number) => `${publicUrl}/studio/${studioId}/invoices/${id}`;

  async function studioOf(studioId: number, trx: Db = db) {
    const s = await repo.studio(studioId, trx);
    if (!s) throw errors.notFound('That studio');
    return s;
  }
  const todayIn = (timezone: string) => localDateOf(clock.now().getTime(), timezone);

  /**
   * The invoice list and the CSV's pages are kept per studio, lists version and query: reading and building
   * the same invoices was nearly all of their cost, on every request. A list page's key names the studio's day
   * (an invoice is overdue from the day after its due date), and a CSV page's the studio's zone.
   */
  const maxWeight = deps.cacheRows ?? INVOICE_LIST_CACHE_ROWS;
  const version = (studioId: number) => repo.listsVersion(studioId);
  const keptLists = keptReads<Page<Invoice>, VersionInZone>({ version, maxWeight, weigh: (p) => p.items.length + 1 });
  const keptCsvPages = keptReads<CsvPage, VersionInZone>({ version, maxWeight, weigh: (p) => p.rows + 1 });

  function view(r: InvoiceRow, pays: ReadonlyMap<number | null, PaymentRow[]>, issues: ReadonlyMap<number | null, IssueRow[]>, forClient: boolean, today: string): Invoice {
    const balanceDue = balanceDueOf(r);
    return {
      id: r.id,
      number: r.number,
      kind: r.kind,
      status: r.status,
      commissionId: r.commission_id,
      commissionTitle: r.commission_title,
      quoteId: r.quote_id,
      client: { id: r.client_id, name: r.client_name },
      currency: r.currency,
      lines: r.lines,
      subtotal: r.subtotal,
      tax: r.tax,
      total: r.total,
      taxLabel: r.tax_label,
      taxId: r.tax_id,
      taxInclusive: r.tax_inclusive,
      paid: r.paid,
      refunded: r.refunded,
      credited: r.credited,
      balanceDue,
      issuedAt: r.issued_at,
      dueDate: r.due_date,
      overdue: balanceDue > 0 && r.due_date !== null && r.due_date < today,
      creditFor: r.credit_for,
      note: r.note,
      payments: (pays.get(r.id) ?? [])
        .map((p) => ({ id: p.id, method: p.method, amountMinor: p.amount, receivedAt: p.received_at, reference: forClient && p.method === 'card' ? null : p.reference, refundedMinor: p.refunded })),
      paymentIssues: forClient
        ? []
        : (issues.get(r.id) ?? []).map((i) => ({ eventId: i.id, at: i.received_at, sessionId: i.session_id, reason: i.reason ?? '' })),
      createdAt: r.created_at,
    };
  }

  /** `day`: the studio's day the views are for, when the caller worked it out already (else from the studio's zone now). */
  async function views(studioId: number, rows: InvoiceRow[], forClient: boolean, trx: Db = db, day?: string): Promise<Invoice[]> {
    const ids = rows.map((r) => r.id);
    const [pays, issues, s] = await Promise.all([repo.payments(studioId, ids, trx), forClient ? Promise.resolve([]) : repo.issues(studioId, ids), studioOf(studioId, trx)]);
    const today = day ?? todayIn(s.timezone);
    const paysBy = groupBy(pays, (p) => p.invoice_id);
    const issuesBy = groupBy(issues, (i) => i.invoice_id);
    return rows.map((r) => view(r, paysBy, issuesBy, forClient, today));
  }
  const viewOne = async (studioId: number, id: number, forClient = false) => (await views(studioId, [(await repo.get(studioId, id))!], forClient))[0];

  /** The invoice if the actor may see it: the owner all, a client only their own issued ones (else 404). */
  async function visible(actor: Member, id: number, trx: Db = db) {
    const r = await repo.get(actor.studioId, id, trx);
    if (!r || (actor.role === 'client' && (r.client_id !== actor.clientId || r.status === 'draft'))) throw errors.notFound('That invoice');
    return r;
  }

  // --- mail -----------------------------------------------------------------------------------

  async function mailClient(trx: Db, studioId: number, inv: { id: number; client_id: number }, template: string, subject: string, lines: string[], actionLabel: string) {
    const c = await repo.clientContact(studioId, inv.client_id, trx);
    if (!c?.email) return;
    const mail = templates.notice({ subject, lines: [`Hello ${c.name},`, ...lines], action: { label: actionLabel, url: invoiceUrl(studioId, inv.id) } });
    await mailer.enqueue({ ...mail, to: c.email, template, studioId }, trx);
  }
  async function mailOwners(trx: Db, studioId: number, invoiceId: number, template: string, subject: string, lines: string[], exceptUserId: number | null = null) {
    for (const o of await repo.owners(studioId, trx)) {
      if (o.id === exceptUserId) continue;
      const mail = templates.notice({ subject, lines: [`Hello ${o.name},`, ...lines], action: { label: 'Open the invoice', url: invoiceUrl(studioId, invoiceId) } });
      await mailer.enqueue({ ...mail, to: o.email, template, studioId }, trx);
    }
  }

  // --- issuing --------------------------------------------------------------------------------

  /** Numbers run per studio and year ("2026-0007"): the counter row is bumped in the transaction that issues. */
  async function assignNumber(trx: Db, studioId: number) {
    const s = await studioOf(studioId, trx);
    const year = Number(todayIn(s.timezone).slice(0, 4));
    const seq = await repo.nextNumber(trx, studioId, year);
    return `${year}-${String(seq).padStart(4, '0')}`;
  }

  async function mailIssued(trx: Db, studioId: number, id: number) {
    const inv = (await repo.get(studioId, id, trx))!;
    const s = await studioOf(studioId, trx);
    const amount = formatMoney(inv.total, inv.currency);
    if (inv.kind === 'credit_note') {
      await mailClient(trx, studioId, inv, 'invoice.credit-note', `Credit note ${inv.number} from ${s.name}`, [`${s.name} has issued credit note ${inv.number} for ${amount} (“${inv.commission_title}”).`], 'Open the credit note');
      return;
    }
    const due = inv.due_date ? ` It is due by ${inv.due_date}.` : '';
    await mailClient(
      trx,
      studioId,
      inv,
      'invoice.issued',
      `${invoiceKindLabels[inv.kind]} ${inv.number} from ${s.name}: ${amount}`,
      [`${s.name} has sent you ${invoiceKindLabels[inv.kind].toLowerCase()} ${inv.number} for ${amount} (“${inv.commission_title}”).${due}`, 'You can pay it by card from the invoice page.'],
      'Open the invoice',
    );
  }

  type NewInvoice = {
    commissionId: number;
    clientId: number;
    kind: InvoiceKind;
    currency: string;
    lines: InvoiceLine[];
    inclusive: boolean;
    table: PriceTable;
    quoteId?: number | null;
    creditFor?: number | null;
    note?: string | null;
    dueDate?: string | null;
    dueInDays?: number;
    status?: InvoiceStatus;
    issue: boolean;
  };
  async function insertInvoice(trx: Db, by: By, n: NewInvoice) {
    const totals = invoiceTotals(n.lines, n.inclusive);
    const t = now();
    const s = await studioOf(by.studioId, trx);
    const number = n.issue ? await assignNumber(trx, by.studioId) : null;
    const dueDate = n.dueDate ?? (n.issue && n.dueInDays !== undefined ? addDays(todayIn(s.timezone), n.dueInDays) : null);
    const id = await repo.insert(trx, {
      studio_id: by.studioId,
      commission_id: n.commissionId,
      client_id: n.clientId,
      quote_id: n.quoteId ?? null,
      credit_for: n.creditFor ?? null,
      kind: n.kind,
      status: n.status ?? (n.issue ? 'open' : 'draft'),
      number,
      currency: n.currency,
      lines_json: JSON.stringify(n.lines),
      tax_inclusive: n.inclusive,
      tax_label: n.table.tax.label,
      tax_id: n.table.tax.taxId ?? '',
      subtotal: totals.subtotal,
      tax: totals.tax,
      total: totals.total,
      note: n.note ?? null,
      issued_at: n.issue ? t : null,
      due_date: dueDate,
      created_by: by.userId,
      created_at: t,
      updated_at: t,
    });
    if (n.issue) await mailIssued(trx, by.studioId, id);
    return id;
  }

  /** Money set against a quote so far: deposit, progress and balance invoices less the credit notes of revisions. */
  function billedForQuotes(rows: InvoiceRow[]) {
    let billed = 0;
    for (const r of rows) {
      if (r.quote_id === null || r.status === 'void' || r.status === 'draft') continue;
      if (r.kind === 'credit_note') billed -= r.total;
      else if (r.kind === 'deposit' || r.kind === 'progress' || r.kind === 'balance') billed += r.total;
    }
    return billed;
  }

  /** Recomputes the stored status after a money change; books the commission when its deposit is settled. */
  async function settle(trx: Db, by: By, id: number) {
    const inv = (await repo.get(by.studioId, id, trx))!;
    const status = settledStatus(inv);
    if (status !== inv.status) await repo.update(trx, by.studioId, id, { status, updated_at: now() });
    if (inv.kind === 'deposit' && status === 'paid' && inv.status !== 'paid') await deps.bookCommission(trx, by, inv.commission_id);
    return { before: inv.status, after: status };
  }

  async function recordPayment(trx: Db, by: By, inv: InvoiceRow, p: { method: string; amount: number; receivedAt: string; reference: string | null; checkoutId?: number; paymentIntentId?: string | null }) {
    const paymentId = await repo.insertPayment(trx, {
      studio_id: by.studioId,
      invoice_id: inv.id,
      method: p.method,
      amount: p.amount,
      received_at: p.receivedAt,
      reference: p.reference,
      checkout_id: p.checkoutId ?? null,
      payment_intent_id: p.paymentIntentId ?? null,
      recorded_by: by.userId,
      created_at: now(),
    });
    await repo.addPaid(trx, by.studioId, inv.id, p.amount, now());
    await settle(trx, by, inv.id);
    const s = await studioOf(by.studioId, trx);
    const after = (await repo.get(by.studioId, inv.id, trx))!;
    const amount = formatMoney(p.amount, inv.currency);
    const left = balanceDueOf(after);
    await mailClient(
      trx,
      by.studioId,
      inv,
      'invoice.receipt',
      `Receipt from ${s.name}: ${amount} for invoice ${inv.number}`,
      [`${s.name} has received ${amount} for invoice ${inv.number} (“${inv.commission_title}”). Thank you.`, left > 0 ? `Still to pay on this invoice: ${formatMoney(left, inv.currency)}.` : 'This invoice is now paid in full.'],
      'Open the invoice',
    );
    return paymentId;
  }

  /** Refunds `amount` of an invoice's payments, newest first: card payments through the payment service. */
  async function refundPayments(inv: InvoiceRow, amount: number, reason: string, methods?: 'card'): Promise<{ payment: PaymentRow; amount: number; providerRefundId: string | null }[]> {
    const pays = (await repo.payments(inv.studio_id, [inv.id])).filter((p) => p.amount - p.refunded > 0 && (!methods || p.method === methods)).reverse();
    const plan: { payment: PaymentRow; amount: number }[] = [];
    let left = amount;
    for (const p of pays) {
      if (left <= 0) break;
      const part = Math.min(left, p.amount - p.refunded);
      plan.push({ payment: p, amount: part });
      left -= part;
    }
    if (left > 0) throw errors.field('amountMinor', `At most ${formatMoney(amount - left, inv.currency)} can be refunded.`);
    const done: { payment: PaymentRow; amount: number; providerRefundId: string | null }[] = [];
    for (const { payment, amount: part } of plan) {
      if (payment.method !== 'card' || !payment.payment_intent_id) {
        done.push({ payment, amount: part, providerRefundId: null }); // money returned by hand
        continue;
      }
      try {
        const r = await payments.refund({
          paymentIntentId: payment.payment_intent_id,
          amountMinor: part,
          currency: inv.currency,
          reason: 'requested_by_customer',
          metadata: { invoiceId: String(inv.id), studioId: String(inv.studio_id), reason: reason.slice(0, 450) },
          // the same refund of the same payment state gets the same key: a retried request never refunds twice
          idempotencyKey: `refund-${payment.id}-${payment.refunded}-${part}`,
        });
        done.push({ payment, amount: r.amountMinor, providerRefundId: r.id });
      } catch (err) {
        if (err instanceof PaymentsError) throw errors.unprocessable(`The payment service refused the refund: ${err.message}`);
        if (err instanceof Error && /multiple of/.test(err.message)) throw errors.field('amountMinor', err.message);
        throw err;
      }
    }
    return done;
  }

  /** After refunds went out: a credit note per refund request, the payments and the invoice updated. */
  async function bookRefund(trx: Db, by: By, inv: InvoiceRow, done: Awaited<ReturnType<typeof refundPayments>>, reason: string, table: PriceTable) {
    const amount = done.reduce((s, d) => s + d.amount, 0);
    const creditId = await insertInvoice(trx, by, {
      commissionId: inv.commission_id,
      clientId: inv.client_id,
      kind: 'credit_note',
      currency: inv.currency,
      lines: creditLines(inv, amount, `Refund for invoice ${inv.number}: ${reason}`),
      inclusive: true,
      table: { ...table, tax: { ...table.tax, label: inv.tax_label, taxId: inv.tax_id } },
      creditFor: inv.id,
      status: 'refunded',
      issue: true,
    });
    for (const d of done) {
      await repo.addPaymentRefund(trx, by.studioId, d.payment.id, d.amount);
      await repo.insertRefund(trx, { studio_id: by.studioId, invoice_id: inv.id, payment_id: d.payment.id, credit_note_id: creditId, amount: d.amount, provider_refund_id: d.providerRefundId, reason, created_by: by.userId, created_at: now() });
    }
    const cur = (await repo.get(by.studioId, inv.id, trx))!;
    await repo.update(trx, by.studioId, inv.id, { paid: cur.paid - amount, refunded: cur.refunded + amount, credited: cur.credited + amount, updated_at: now() });
    await settle(trx, by, inv.id);
    return creditId;
  }

  /** What is left of the accepted quote, invoiced once the finished work is approved (ready to ship). */
  async function issueBalance(trx: Db, by: By, commissionId: number) {
    const rows = await repo.ofCommission(by.studioId, commissionId, trx);
    if (rows.some((r) => r.kind === 'balance' && r.status !== 'void')) return null;
    const q = await deps.acceptedQuote(by.studioId, commissionId, trx);
    if (!q) return null;
    const remaining = q.total - billedForQuotes(rows);
    if (remaining <= 0) return null;
    const c = (await repo.commission(by.studioId, commissionId, trx))!;
    return insertInvoice(trx, by, {
      commissionId,
      clientId: q.client_id,
      kind: 'balance',
      currency: q.currency,
      lines: quoteShareLines(q, remaining, `Balance for “${c.title}” (quote version ${q.version})`),
      inclusive: true,
      table: q.price_table,
      quoteId: q.id,
      dueInDays: INVOICE_DUE_DAYS,
      issue: true,
    });
  }

  // --- cancellation ---------------------------------------------------------------------------

  async function cancellationPreview(studioId: number, commissionId: number, trx: Db = db): Promise<CancellationPreview> {
    const c = await repo.commission(studioId, commissionId, trx);
    if (!c) throw errors.notFound('That commission');
    const rows = await repo.ofCommission(studioId, commissionId, trx);
    const accepted = await deps.acceptedQuote(studioId, commissionId, trx);
    const table = accepted?.price_table ?? (await deps.priceTable(studioId, trx));
    const currency = accepted?.currency ?? table.currency;
    const deposits = rows.filter((r) => r.kind === 'deposit' && r.status !== 'void' && r.status !== 'draft');
    const depositPaid = deposits.reduce((s, r) => s + Math.max(0, r.paid), 0);
    const pays = await repo.payments(studioId, deposits.map((d) => d.id), trx);
    const cardPaid = pays.filter((p) => p.method === 'card').reduce((s, p) => s + p.amount - p.refunded, 0);
    const minutes = await repo.doneStageMinutes(studioId, commissionId, trx);
    const workDone = mulDiv(table.hourlyRate, minutes, 60);
    // Kept in whole payment steps (KWD in 10 fils), rounded up, so the refund can be sent exactly.
    const step = stepOf(currency);
    const kept = Math.min(depositPaid, Math.ceil(workDone / step) * step);
    const refund = depositPaid - kept;
    const money = (m: number) => formatMoney(m, currency);
    const hoursText = `${Math.round((minutes / 60) * 100) / 100} h`;
    let explanation: string;
    if (depositPaid === 0) explanation = 'No deposit has been received, so there is nothing to refund. Unpaid invoices of this commission are voided.';
    else if (minutes === 0) explanation = `No stage has been done yet, so the whole deposit of ${money(depositPaid)} goes back to the client.`;
    else
      explanation = `The client paid a deposit of ${money(depositPaid)}. Work done so far: ${hoursText} of estimated stage time at ${money(table.hourlyRate)} per hour = ${money(workDone)}. The studio keeps ${money(kept)}${workDone > depositPaid ? ' (the whole deposit: the work done exceeds it)' : ''} and refunds ${money(refund)}.`;
    return {
      currency,
      depositPaid,
      workDoneMinutes: minutes,
      workDoneMinor: workDone,
      refundMinor: refund,
      keptMinor: kept,
      cardRefundMinor: Math.min(refund, cardPaid),
      voidsInvoiceIds: rows.filter((r) => (r.status === 'open' || r.status === 'draft') && r.paid === 0 && r.kind !== 'credit_note').map((r) => r.id),
      explanation,
    };
  }

  // --- the service ----------------------------------------------------------------------------

  return {
    kick: () => mailer.kick(),

    list(actor: Member, q: InvoiceListQuery): Promise<Page<Invoice>> {
      const forClient = actor.role === 'client';
      const onlyClientId = forClient ? (actor.clientId ?? -1) : undefined;
      let day: string | undefined;
      const key = (at: { timeZone: string }) => {
        day = todayIn(at.timeZone);
        return JSON.stringify([day, onlyClientId ?? null, q.status ?? null, q.kind ?? null, q.clientId ?? null, q.commissionId ?? null, q.q ?? null, q.limit, q.offset]);
      };
      return keptLists(actor.studioId, key, async () => {
        const { rows, total } = await repo.list(actor.studioId, { ...q, onlyClientId, hideDrafts: forClient });
        return { items: await views(actor.studioId, rows, forClient, db, day), total, limit: q.limit, offset: q.offset };
      });
    },

    async get(actor: Member, id: number) {
      const r = await visible(actor, id);
      return (await views(actor.studioId, [r], actor.role === 'client'))[0];
    },

    /** A progress or custom invoice as a draft; lines without a rate take the price table's. */
    async create(actor: Actor, input: CreateInvoiceInput) {
      const c = await repo.commission(actor.studioId, input.commissionId);
      if (!c) throw errors.field('commissionId', 'Choose a commission of this studio.');
      const table = await deps.priceTable(actor.studioId);
      const lines: InvoiceLine[] = input.lines.map((l) => ({ description: l.description, quantity: l.quantity, unitMinor: l.unitMinor, amountMinor: l.quantity * l.unitMinor, taxBp: l.taxBp ?? table.tax.rateBp }));
      if (lines.some((l) => !Number.isSafeInteger(l.amountMinor) || l.amountMinor > 1e12)) throw errors.field('lines', 'A line is too large.');
      const id = await db.transaction((trx) =>
        insertInvoice(trx, actor, {
          commissionId: c.id,
          clientId: c.client_id,
          kind: input.kind,
          currency: table.currency,
          lines,
          inclusive: table.tax.pricesIncludeTax,
          table,
          note: input.note ?? null,
          dueDate: input.dueDate ?? null,
          issue: false,
        }),
      );
      return viewOne(actor.studioId, id);
    },

    /** Draft → open: the number is taken from the studio's counter in the same transaction. */
    async issue(actor: Actor, id: number) {
      await db.transaction(async (trx) => {
        const inv = await visible(actor, id, trx);
        if (inv.status !== 'draft') throw errors.conflict('This invoice has been issued already.', 'invoice_issued');
        if (inv.total <= 0) throw errors.conflict('An invoice of nothing cannot be issued.', 'invoice_empty');
        const s = await studioOf(actor.studioId, trx);
        const number = await assignNumber(trx, actor.studioId);
        const today = todayIn(s.timezone);
        await repo.update(trx, actor.studioId, id, { status: 'open', number, issued_at: now(), due_date: inv.due_date && inv.due_date >= today ? inv.due_date : addDays(today, INVOICE_DUE_DAYS), updated_at: now() });
        await mailIssued(trx, actor.studioId, id);
      });
      mailer.kick();
      return viewOne(actor.studioId, id);
    },

    async recordManualPayment(actor: Actor, id: number, input: ManualPaymentInput) {
      await db.transaction(async (trx) => {
        const inv = await visible(actor, id, trx);
        if (inv.status !== 'open' && inv.status !== 'partly_paid') throw errors.conflict('Only an open invoice takes payments.', 'invoice_not_open');
        const due = balanceDueOf(inv);
        if (input.amountMinor > due) throw errors.field('amountMinor', `That is more than is left to pay (${formatMoney(due, inv.currency)}).`);
        const receivedAt = input.receivedAt ? (input.receivedAt.length === 10 ? `${input.receivedAt}T12:00:00.000Z` : new Date(input.receivedAt).toISOString()) : now();
        await recordPayment(trx, actor, inv, { method: input.method, amount: input.amountMinor, receivedAt, reference: input.reference ?? null });
      });
      mailer.kick();
      return viewOne(actor.studioId, id);
    },

    async void(actor: Actor, id: number) {
      await db.transaction(async (trx) => {
        const inv = await visible(actor, id, trx);
        if (inv.status === 'void') return;
        if (inv.paid > 0 || inv.refunded > 0) throw errors.conflict('This invoice has payments; refund them instead of voiding it.', 'invoice_has_payments');
        if (inv.status !== 'draft' && inv.status !== 'open') throw errors.conflict('Only a draft or an unpaid invoice can be voided.', 'invoice_not_open');
        // An issued number stays taken (numbers have no gaps); the invoice keeps it, marked void.
        await repo.update(trx, actor.studioId, id, { status: 'void', voided_at: now(), updated_at: now() });
      });
      return viewOne(actor.studioId, id);
    },

    /** Refunds in full or in part; card payments go back through the payment service; a credit note records it. */
    async refund(actor: Actor, id: number, input: RefundInput) {
      const inv = await visible(actor, id);
      const table = await deps.priceTable(actor.studioId);
      if (inv.kind === 'credit_note') {
        // An open credit note (a quote revised below what was paid) is paid out from the invoice it credits.
        if (inv.status !== 'open' || inv.credit_for === null) throw errors.conflict('This credit note has been settled.', 'credit_settled');
        const target = (await repo.get(actor.studioId, inv.credit_for))!;
        const done = await refundPayments(target, inv.total, input.reason);
        await db.transaction(async (trx) => {
          for (const d of done) {
            await repo.addPaymentRefund(trx, actor.studioId, d.payment.id, d.amount);
            await repo.insertRefund(trx, { studio_id: actor.studioId, invoice_id: target.id, payment_id: d.payment.id, credit_note_id: inv.id, amount: d.amount, provider_refund_id: d.providerRefundId, reason: input.reason, created_by: actor.userId, created_at: now() });
          }
          const cur = (await repo.get(actor.studioId, target.id, trx))!;
          await repo.update(trx, actor.studioId, target.id, { paid: cur.paid - inv.total, refunded: cur.refunded + inv.total, updated_at: now() });
          await settle(trx, actor, target.id);
          await repo.update(trx, actor.studioId, inv.id, { status: 'refunded', updated_at: now() });
        });
        return { invoice: await viewOne(actor.studioId, target.id), creditNote: await viewOne(actor.studioId, inv.id) };
      }
      if (inv.paid <= 0) throw errors.conflict('Nothing has been paid on this invoice.', 'nothing_to_refund');
      const amount = input.amountMinor ?? inv.paid;
      if (amount > inv.paid) throw errors.field('amountMinor', `At most ${formatMoney(inv.paid, inv.currency)} can be refunded.`);
      const done = await refundPayments(inv, amount, input.reason);
      const creditId = await db.transaction((trx) => bookRefund(trx, actor, inv, done, input.reason, table));
      mailer.kick();
      return { invoice: await viewOne(actor.studioId, id), creditNote: await viewOne(actor.studioId, creditId) };
    },

    /** A checkout on the payment service for what is left to pay; an open one for the same amount is reused. */
    async checkout(actor: Actor, id: number) {
      const inv = await visible(actor, id);
      if (inv.kind === 'credit_note' || (inv.status !== 'open' && inv.status !== 'partly_paid')) throw errors.conflict('This invoice has nothing to pay.', 'invoice_not_open');
      const due = balanceDueOf(inv);
      let charged: number;
      try {
        charged = fromChargeAmount(chargeAmount(due, inv.currency), inv.currency);
      } catch (err) {
        throw errors.unprocessable(err instanceof Error ? `${inv.currency} cannot be paid by card here: ${err.message}` : 'This currency cannot be paid by card.');
      }
      if (charged <= 0) throw errors.conflict('What is left is too small to pay by card.', 'amount_too_small');
      const previous = await repo.checkoutsOf(actor.studioId, id);
      const reusable = previous.find((c) => c.status === 'open' && c.amount === charged && clock.now().getTime() - new Date(c.created_at).getTime() < 23 * 3600_000);
      if (reusable) return { url: reusable.url, sessionId: reusable.session_id, amountMinor: reusable.amount, currency: reusable.currency };
      const client = await repo.clientContact(actor.studioId, inv.client_id);
      const s = await studioOf(actor.studioId);
      let created;
      try {
        created = await payments.createCheckout({
          invoiceId: inv.id,
          studioId: actor.studioId,
          amountMinor: due,
          currency: inv.currency,
          description: `${s.name}: ${invoiceKindLabels[inv.kind].toLowerCase()} ${inv.number} (${inv.commission_title})`.slice(0, 500),
          customerEmail: client?.email ?? undefined,
          successUrl: `${invoiceUrl(actor.studioId, id)}/paid?session_id={CHECKOUT_SESSION_ID}`,
          cancelUrl: invoiceUrl(actor.studioId, id),
          idempotencyKey: `checkout-${inv.id}-${previous.length + 1}`,
        });
      } catch (err) {
        if (err instanceof PaymentsError) throw new AppError(502, 'payment_service', `The payment service did not open a checkout: ${err.message}`);
        throw err;
      }
      await db.transaction((trx) =>
        repo.insertCheckout(trx, {
          studio_id: actor.studioId,
          invoice_id: inv.id,
          session_id: created.id,
          url: created.url,
          amount: created.amountMinor,
          currency: created.currency,
          status: 'open',
          created_by: actor.userId,
          created_at: now(),
        }),
      );
      return { url: created.url, sessionId: created.id, amountMinor: created.amountMinor, currency: created.currency };
    },

    /**
     * A verified checkout.session.completed, inside the webhook's transaction. Paid only when the session is
     * one the app created for that invoice, with the same amount and currency; anything else is flagged.
     */
    async settleCheckout(trx: Db, info: CheckoutInfo): Promise<{ outcome: 'paid' | 'flagged' | 'ignored'; reason: string | null; studioId: number | null; invoiceId: number | null }> {
      const row: CheckoutRow | undefined = await repo.checkoutBySession(info.id, trx);
      if (!row) {
        const studioId = Number(info.studioId);
        const invoiceId = Number(info.invoiceId);
        const inv = Number.isSafeInteger(studioId) && Number.isSafeInteger(invoiceId) && studioId > 0 ? await repo.get(studioId, invoiceId, trx) : undefined;
        return {
          outcome: 'flagged',
          reason: `A payment${info.amountMinor !== null && info.currency ? ` of ${formatMoney(info.amountMinor, info.currency)}` : ''} arrived for a checkout Sablework did not create (${info.id}); it was not counted.`,
          studioId: inv ? studioId : null,
          invoiceId: inv ? invoiceId : null,
        };
      }
      const by: By = { studioId: row.studio_id, userId: null };
      if (!info.paid) return { outcome: 'ignored', reason: 'The checkout completed without a payment.', studioId: row.studio_id, invoiceId: row.invoice_id };
      if (row.status === 'paid') return { outcome: 'ignored', reason: 'This checkout was recorded as paid already.', studioId: row.studio_id, invoiceId: row.invoice_id };
      const problems: string[] = [];
      if (info.currency !== row.currency) problems.push(`the currency was ${info.currency ?? 'missing'}, not ${row.currency}`);
      else if (info.amountMinor !== row.amount) problems.push(`the amount was ${info.amountMinor === null ? 'missing' : formatMoney(info.amountMinor, row.currency)}, not ${formatMoney(row.amount, row.currency)}`);
      if (info.invoiceId !== String(row.invoice_id) || info.studioId !== String(row.studio_id)) problems.push('it names another invoice');
      const inv = await repo.get(row.studio_id, row.invoice_id, trx);
      if (inv && inv.status !== 'open' && inv.status !== 'partly_paid') problems.push(`the invoice is ${inv.status.replace('_', ' ')}`);
      if (problems.length || !inv) {
        const reason = `A card payment did not match the checkout created for this invoice: ${problems.join('; ')}. It was not counted as paid.`;
        await repo.updateCheckout(trx, row.id, { status: 'flagged', flag_reason: reason.slice(0, 500), completed_at: now() });
        if (inv) await mailOwners(trx, row.studio_id, inv.id, 'invoice.payment-flagged', `A payment for invoice ${inv.number} needs a look`, [reason]);
        return { outcome: 'flagged', reason, studioId: row.studio_id, invoiceId: row.invoice_id };
      }
      // checked again as it is claimed: another event for this checkout may have paid it meanwhile
      if (!(await repo.claimCheckoutPaid(trx, row.id, now()))) return { outcome: 'ignored', reason: 'This checkout was recorded as paid already.', studioId: row.studio_id, invoiceId: row.invoice_id };
      await recordPayment(trx, by, inv, { method: 'card', amount: row.amount, receivedAt: now(), reference: info.paymentIntentId, checkoutId: row.id, paymentIntentId: info.paymentIntentId });
      const amount = formatMoney(row.amount, row.currency);
      await mailOwners(trx, row.studio_id, inv.id, 'invoice.payment-received', `Payment received: ${amount} for invoice ${inv.number}`, [`${inv.client_name} paid ${amount} by card for invoice ${inv.number} (“${inv.commission_title}”).`]);
      return { outcome: 'paid', reason: null, studioId: row.studio_id, invoiceId: row.invoice_id };
    },

    /** On acceptance of a commission's first quote: the deposit invoice (or, with no deposit, the booking). */
    async issueDeposit(trx: Db, by: By, q: PricedQuote, title: string) {
      const deposit = q.result.deposit.amount;
      if (deposit <= 0) {
        await deps.bookCommission(trx, by, q.commission_id);
        return null;
      }
      return insertInvoice(trx, by, {
        commissionId: q.commission_id,
        clientId: q.client_id,
        kind: 'deposit',
        currency: q.currency,
        lines: quoteShareLines(q, deposit, `Deposit for “${title}” (quote version ${q.version})`),
        inclusive: true,
        table: q.price_table,
        quoteId: q.id,
        dueInDays: DEPOSIT_DUE_DAYS,
        issue: true,
      });
    },

    /**
     * A revised quote accepted after an earlier one: a rise is invoiced at once (progress invoice); a cut lowers
     * the balance still to come, and only what was invoiced beyond the new total is credited (credit note).
     */
    async issueRevisionDifference(trx: Db, by: By, previous: PricedQuote, next: PricedQuote, title: string) {
      const diff = next.total - previous.total;
      const label = `Change to the quote for “${title}”: version ${previous.version} → ${next.version}`;
      if (diff > 0) {
        return insertInvoice(trx, by, { commissionId: next.commission_id, clientId: next.client_id, kind: 'progress', currency: next.currency, lines: quoteShareLines(next, diff, label), inclusive: true, table: next.price_table, quoteId: next.id, dueInDays: INVOICE_DUE_DAYS, issue: true });
      }
      const rows = await repo.ofCommission(by.studioId, next.commission_id, trx);
      const excess = billedForQuotes(rows) - next.total;
      if (diff >= 0 || excess <= 0) return null;
      const target = rows.filter((r) => r.quote_id !== null && r.kind !== 'credit_note' && r.status !== 'void' && r.status !== 'draft').at(-1)!;
      const owedBack = Math.max(0, target.paid - (target.total - target.credited - excess));
      const creditId = await insertInvoice(trx, by, {
        commissionId: next.commission_id,
        clientId: next.client_id,
        kind: 'credit_note',
        currency: next.currency,
        lines: quoteShareLines(next, excess, label),
        inclusive: true,
        table: next.price_table,
        quoteId: next.id,
        creditFor: target.id,
        // applied to what the client has not paid yet, or owed back (refund it from the credit note)
        status: owedBack > 0 ? 'open' : 'paid',
        issue: true,
      });
      await repo.update(trx, by.studioId, target.id, { credited: target.credited + excess, updated_at: now() });
      await settle(trx, by, target.id);
      return creditId;
    },

    issueBalance,

    /** Hook on every commission status change (inside its transaction). */
    async onCommissionStatus(trx: Db, change: { studioId: number; commissionId: number; userId: number | null; from: CommissionStatus; to: CommissionStatus }) {
      const by: By = { studioId: change.studioId, userId: change.userId };
      if (change.to === 'ready_to_ship') await issueBalance(trx, by, change.commissionId);
      if (change.to === 'cancelled') {
        for (const r of await repo.ofCommission(change.studioId, change.commissionId, trx)) {
          if ((r.status === 'open' || r.status === 'draft') && r.paid === 0 && r.kind !== 'credit_note') await repo.update(trx, change.studioId, r.id, { status: 'void', voided_at: now(), updated_at: now() });
        }
      }
    },

    cancellationPreview: (actor: Member, commissionId: number) => cancellationPreview(actor.studioId, commissionId),

    /** Confirms the preview: refunds what the terms give back (cards through the payment service), then cancels. */
    async cancel(actor: Actor, commissionId: number, reason: string) {
      const c = await repo.commission(actor.studioId, commissionId);
      if (!c) throw errors.notFound('That commission');
      if (!canTransition(c.status, 'cancelled', c.status_before_hold)) throw errors.conflict(`A commission that is ${c.status.replace(/_/g, ' ')} cannot be cancelled.`, 'invalid_transition');
      const preview = await cancellationPreview(actor.studioId, commissionId);
      const creditNoteIds: number[] = [];
      if (preview.refundMinor > 0) {
        const table = await deps.priceTable(actor.studioId);
        let left = preview.refundMinor;
        const deposits = (await repo.ofCommission(actor.studioId, commissionId)).filter((r) => r.kind === 'deposit' && r.paid > 0).reverse();
        for (const d of deposits) {
          if (left <= 0) break;
          const part = Math.min(left, d.paid);
          const done = await refundPayments(d, part, `Commission cancelled: ${reason}`);
          creditNoteIds.push(await db.transaction((trx) => bookRefund(trx, actor, d, done, `Commission cancelled: ${reason}`, table)));
          left -= part;
        }
      }
      await deps.cancelCommission(actor, commissionId, reason);
      mailer.kick();
      return { preview, creditNotes: await Promise.all(creditNoteIds.map((id) => viewOne(actor.studioId, id))) };
    },

    /** Scheduled: one reminder per overdue invoice per run, the first the day after the due date, then a week apart, at most three. */
    async sendReminders() {
      const at = clock.now();
      const candidates = await repo.dueForReminder(addDays(at.toISOString().slice(0, 10), 1));
      let sent = 0;
      for (const c of candidates) {
        const today = todayIn(c.timezone);
        if (c.dueDate >= today) continue;
        const number = c.sent + 1;
        if (number > MAX_REMINDERS) continue;
        if (c.lastSentAt && at.getTime() - new Date(c.lastSentAt).getTime() < REMINDER_GAP_MS) continue;
        const daysLate = parseLocalDate(today) - parseLocalDate(c.dueDate);
        const queued = await db.transaction(async (trx) => {
          if (!(await repo.claimReminder(trx, c.id, number, iso(at)))) return false;
          const inv = (await repo.get(c.studioId, c.id, trx))!;
          const s = await studioOf(c.studioId, trx);
          await mailClient(
            trx,
            c.studioId,
            inv,
            'invoice.reminder',
            `Reminder: invoice ${inv.number} from ${s.name} is overdue`,
            [`Invoice ${inv.number} (“${inv.commission_title}”) was due on ${inv.due_date}, ${daysLate} day${daysLate === 1 ? '' : 's'} ago. ${formatMoney(balanceDueOf(inv), inv.currency)} is still to pay.`, 'If you have paid it already, thank you, and please ignore this message.'],
            'Pay the invoice',
          );
          return true;
        });
        if (queued) sent++;
      }
      if (sent) mailer.kick();
      return sent;
    },

    /** For the PDF and the CSV. */
    async document(actor: Member, id: number) {
      const r = await visible(actor, id);
      const [inv] = await views(actor.studioId, [r], actor.role === 'client');
      const s = await studioOf(actor.studioId);
      const client = await repo.clientContact(actor.studioId, r.client_id);
      const creditFor = r.credit_for ? await repo.get(actor.studioId, r.credit_for) : undefined;
      return { invoice: inv, studio: s, client, creditForNumber: creditFor?.number ?? null };
    },

    /** The CSV export's text in chunks, a page of invoices each (invoices.csv.ts); the studio is read first. */
    exportCsv(actor: Member, from: string | null, to: string | null) {
      // Each page of the export is kept on its own (its key names where it starts), so a large export is
      // kept as far as the cache holds it and still read a page at a time. A page is worked out in the zone
      // read with its version (uncached: the studio's, read first; an unknown studio fails the first page).
      return csvChunks((after) => {
        let zone: string | undefined;
        const key = (at: { timeZone: string }) => JSON.stringify([(zone = at.timeZone), from, to, after?.issuedAt ?? null, after?.id ?? null, EXPORT_PAGE_ROWS]);
        return keptCsvPages(actor.studioId, key, async () =>
          invoiceCsvPage(repo, { id: actor.studioId, timezone: zone ?? (await studioOf(actor.studioId)).timezone }, from, to, after, EXPORT_PAGE_ROWS),
        );
      });
    },
  };
}

export type InvoicesService = ReturnType<typeof invoicesService>;
