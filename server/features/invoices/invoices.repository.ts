import type { CommissionStatus } from '../../../shared/commission-lifecycle';
import type { InvoiceKind, InvoiceLine, InvoiceListQuery, InvoiceStatus, PaymentMethod } from '../../../shared/schemas/invoices';
import type { Db } from '../../lib/db';
import { listsVersion } from '../../lib/version-cache';

export type InvoiceRow = {
  id: number;
  studio_id: number;
  commission_id: number;
  commission_title: string;
  client_id: number;
  client_name: string;
  quote_id: number | null;
  credit_for: number | null;
  kind: InvoiceKind;
  status: InvoiceStatus;
  number: string | null;
  currency: string;
  lines: InvoiceLine[];
  tax_inclusive: boolean;
  tax_label: string;
  tax_id: string;
  subtotal: number;
  tax: number;
  total: number;
  paid: number;
  refunded: number;
  credited: number;
  note: string | null;
  issued_at: string | null;
  due_date: string | null;
  created_at: string;
};

export type PaymentRow = {
  id: number;
  invoice_id: number;
  method: PaymentMethod;
  amount: number;
  refunded: number;
  received_at: string;
  reference: string | null;
  checkout_id: number | null;
  payment_intent_id: string | null;
};

export type CheckoutRow = {
  id: number;
  studio_id: number;
  invoice_id: number;
  session_id: string;
  url: string;
  amount: number;
  currency: string;
  status: 'open' | 'paid' | 'flagged';
  created_at: string;
};

/** What one line of the CSV export reads: the invoice's own columns, its names, and the number and issue time of the invoice it credits. */
export type ExportRow = Pick<
  InvoiceRow,
  'id' | 'number' | 'kind' | 'status' | 'issued_at' | 'due_date' | 'client_name' | 'commission_title' | 'credit_for' | 'currency' | 'tax_inclusive' | 'tax_label' | 'tax_id' | 'subtotal' | 'tax' | 'total' | 'paid' | 'refunded' | 'credited'
> & { lines_json: string; credit_for_number: string | null; credit_for_issued_at: string | null };

export type IssueRow = { id: string; invoice_id: number | null; invoice_number: string | null; session_id: string | null; reason: string | null; received_at: string };

const n = (v: unknown) => Number(v ?? 0);
const insertedId = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));

/** What an invoice's amounts are read from, in the list and the CSV alike. */
const amountColumns = ['i.currency', 'i.lines_json', 'i.tax_inclusive', 'i.tax_label', 'i.tax_id', 'i.subtotal', 'i.tax', 'i.total', 'i.paid', 'i.refunded', 'i.credited'];

const invoiceColumns = [
  'i.id',
  'i.studio_id',
  'i.commission_id',
  'c.title as commission_title',
  'i.client_id',
  'cl.name as client_name',
  'i.quote_id',
  'i.credit_for',
  'i.kind',
  'i.status',
  'i.number',
  ...amountColumns,
  'i.note',
  'i.issued_at',
  'i.due_date',
  'i.created_at',
];

/** Built key by key: a rest-spread copy of a driver's row object costs more than the rest of a list page. */
function toRow(r: Record<string, unknown>): InvoiceRow {
  return {
    id: r.id as number,
    studio_id: r.studio_id as number,
    commission_id: r.commission_id as number,
    commission_title: r.commission_title as string,
    client_id: r.client_id as number,
    client_name: r.client_name as string,
    quote_id: r.quote_id as number | null,
    credit_for: r.credit_for as number | null,
    kind: r.kind as InvoiceKind,
    status: r.status as InvoiceStatus,
    number: r.number as string | null,
    currency: r.currency as string,
    lines: JSON.parse(String(r.lines_json)),
    tax_inclusive: Boolean(r.tax_inclusive),
    tax_label: r.tax_label as string,
    tax_id: r.tax_id as string,
    subtotal: n(r.subtotal),
    tax: n(r.tax),
    total: n(r.total),
    paid: n(r.paid),
    refunded: n(r.refunded),
    credited: n(r.credited),
    note: r.note as string | null,
    issued_at: r.issued_at as string | null,
    due_date: r.due_date as string | null,
    created_at: r.created_at as string,
  };
}

const toPayment = (r: Record<string, unknown>): PaymentRow => ({ ...(r as PaymentRow), amount: n(r.amount), refunded: n(r.refunded) });

/** Invoices, their payments, refunds, checkouts and reminders; every studio query takes the studio id first. */
export function invoicesRepository(db: Db) {
  const base = (trx: Db, studioId: number) =>
    trx('invoices as i').join('commissions as c', 'c.id', 'i.commission_id').join('clients as cl', 'cl.id', 'i.client_id').where('i.studio_id', studioId);

  return {
    /** The studio's lists version and zone (server/lib/version-cache.ts). */
    listsVersion: (studioId: number) => listsVersion(db, studioId),
    studio: (studioId: number, trx: Db = db) =>
      trx('studios').where({ id: studioId }).first('id', 'name', 'timezone', 'currency') as Promise<{ id: number; name: string; timezone: string; currency: string } | undefined>,
    commission: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('commissions as c')
        .join('clients as cl', 'cl.id', 'c.client_id')
        .where({ 'c.studio_id': studioId, 'c.id': commissionId })
        .first('c.id', 'c.title', 'c.status', 'c.status_before_hold', 'c.client_id', 'cl.name as client_name') as Promise<
        { id: number; title: string; status: CommissionStatus; status_before_hold: CommissionStatus | null; client_id: number; client_name: string } | undefined
      >,
    /** The client's address for invoices and receipts: the record's e-mail, else their account's. */
    clientContact: (studioId: number, clientId: number, trx: Db = db) =>
      trx('clients as cl')
        .leftJoin('users as u', 'u.id', 'cl.user_id')
        .where({ 'cl.studio_id': studioId, 'cl.id': clientId })
        .first(
          'cl.id',
          'cl.name',
          trx.raw('coalesce(cl.email, u.email) as email'),
          'cl.address_line1',
          'cl.address_line2',
          'cl.address_city',
          'cl.address_region',
          'cl.address_postal_code',
          'cl.address_country',
        ) as Promise<
        | {
            id: number;
            name: string;
            email: string | null;
            address_line1: string | null;
            address_line2: string | null;
            address_city: string | null;
            address_region: string | null;
            address_postal_code: string | null;
            address_country: string | null;
          }
        | undefined
      >,
    /** Owners who take e-mail notices: they hear about payments. */
    owners: (studioId: number, trx: Db = db) =>
      trx('memberships as m')
        .join('users as u', 'u.id', 'm.user_id')
        .where({ 'm.studio_id': studioId, 'm.role': 'owner', 'u.email_notices': true })
        .orderBy('u.id')
        .select('u.id', 'u.email', 'u.name') as Promise<{ id: number; email: string; name: string }[]>,

    /** The next number of the studio's year, inside the caller's transaction (the row stays locked until it commits). */
    async nextNumber(trx: Db, studioId: number, year: number) {
      await trx('invoice_counters').insert({ studio_id: studioId, year, last: 0 }).onConflict(['studio_id', 'year']).ignore();
      await trx('invoice_counters').where({ studio_id: studioId, year }).increment('last', 1);
      const row = await trx('invoice_counters').where({ studio_id: studioId, year }).first('last');
      return n(row?.last);
    },

    async insert(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('invoices').insert(row).returning('id');
      return insertedId(r);
    },
    update: (trx: Db, studioId: number, id: number, patch: Record<string, unknown>) => trx('invoices').where({ studio_id: studioId, id }).update(patch),
    /** Adds to the paid total in the database itself, so two payments committed at once on PostgreSQL both count. */
    addPaid: (trx: Db, studioId: number, id: number, amount: number, at: string) =>
      trx('invoices').where({ studio_id: studioId, id }).update({ paid: trx.raw('paid + ?', [amount]), updated_at: at }),
    async get(studioId: number, id: number, trx: Db = db) {
      const r = await base(trx, studioId).where('i.id', id).first(invoiceColumns);
      return r ? toRow(r) : undefined;
    },
    async ofCommission(studioId: number, commissionId: number, trx: Db = db) {
      return (await base(trx, studioId).where('i.commission_id', commissionId).orderBy('i.id').select(invoiceColumns)).map(toRow);
    },
    async list(studioId: number, q: InvoiceListQuery & { onlyClientId?: number; hideDrafts?: boolean }) {
      const filter = (qb: ReturnType<typeof base>) => {
        if (q.onlyClientId !== undefined) qb.where('i.client_id', q.onlyClientId);
        if (q.hideDrafts) qb.whereNot('i.status', 'draft');
        if (q.status) qb.where('i.status', q.status);
        if (q.kind) qb.where('i.kind', q.kind);
        if (q.clientId) qb.where('i.client_id', q.clientId);
        if (q.commissionId) qb.where('i.commission_id', q.commissionId);
        if (q.q) {
          const like = `%${q.q.toLowerCase().replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
          qb.where((w) =>
            w
              .whereRaw("lower(i.number) like ? escape '\\'", [like])
              .orWhereRaw("lower(cl.name) like ? escape '\\'", [like])
              .orWhereRaw("lower(c.title) like ? escape '\\'", [like]),
          );
        }
        return qb;
      };
      const [rows, count] = await Promise.all([
        filter(base(db, studioId))
          .select(invoiceColumns)
          .orderBy([{ column: 'i.created_at', order: 'desc' }, { column: 'i.id', order: 'desc' }])
          .limit(q.limit)
          .offset(q.offset),
        // Without a search the count needs no names: every invoice has its commission and client (foreign keys, not null).
        (q.q ? filter(base(db, studioId)) : filter(db('invoices as i').where('i.studio_id', studioId) as ReturnType<typeof base>)).count({ n: '*' }).first(),
      ]);
      return { rows: rows.map(toRow), total: n(count?.n) };
    },
    /**
     * One page of issued invoices for the CSV export, in (issued_at, id) order after `after` (the last row of
     * the page before), issued in [from, to) when given; each with the number and issue time of the invoice it credits.
     */
    async exportPage(studioId: number, from: string | null, to: string | null, after: { issuedAt: string; id: number } | null, limit: number): Promise<ExportRow[]> {
      const qb = base(db, studioId)
        .leftJoin('invoices as cf', (j) => j.on('cf.id', 'i.credit_for').andOn('cf.studio_id', 'i.studio_id'))
        .whereNotNull('i.issued_at')
        .select(
          'i.id',
          'i.number',
          'i.kind',
          'i.status',
          'i.issued_at',
          'i.due_date',
          'cl.name as client_name',
          'c.title as commission_title',
          'i.credit_for',
          'cf.number as credit_for_number',
          'cf.issued_at as credit_for_issued_at',
          ...amountColumns,
        )
        .orderBy('i.issued_at')
        .orderBy('i.id')
        .limit(limit);
      if (from) qb.where('i.issued_at', '>=', from);
      if (to) qb.where('i.issued_at', '<', to);
      if (after) qb.where((w) => w.where('i.issued_at', '>', after.issuedAt).orWhere((o) => o.where('i.issued_at', after.issuedAt).where('i.id', '>', after.id)));
      const rows = (await qb) as Record<string, unknown>[];
      return rows.map((r) => ({
        ...(r as ExportRow),
        tax_inclusive: Boolean(r.tax_inclusive),
        subtotal: n(r.subtotal),
        tax: n(r.tax),
        total: n(r.total),
        paid: n(r.paid),
        refunded: n(r.refunded),
        credited: n(r.credited),
      }));
    },

    async payments(studioId: number, invoiceIds: number[], trx: Db = db) {
      if (!invoiceIds.length) return [];
      return (await trx('invoice_payments').where('studio_id', studioId).whereIn('invoice_id', invoiceIds).orderBy('received_at').orderBy('id')).map(toPayment);
    },
    async insertPayment(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('invoice_payments').insert(row).returning('id');
      return insertedId(r);
    },
    addPaymentRefund: (trx: Db, studioId: number, paymentId: number, amount: number) => trx('invoice_payments').where({ studio_id: studioId, id: paymentId }).increment('refunded', amount),
    insertRefund: (trx: Db, row: Record<string, unknown>) => trx('invoice_refunds').insert(row),

    async insertCheckout(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('checkouts').insert(row).returning('id');
      return insertedId(r);
    },
    checkoutsOf: (studioId: number, invoiceId: number, trx: Db = db) =>
      trx('checkouts').where({ studio_id: studioId, invoice_id: invoiceId }).orderBy('id', 'desc').then((rows) => rows.map((r) => ({ ...r, amount: n(r.amount) }) as CheckoutRow)),
    /**
     * The checkout of a payment session. Inside a transaction its row is locked (FOR UPDATE; SQLite runs one
     * transaction at a time and Knex leaves it out there): two events for one checkout at the same moment then
     * take turns, and the second reads the checkout and invoice as the first left them (paid), instead of a
     * paid invoice beside a checkout still open, which would flag a payment that was only a repeat.
     */
    checkoutBySession(sessionId: string, trx: Db = db) {
      const q = trx('checkouts').where({ session_id: sessionId });
      return (trx.isTransaction ? q.forUpdate() : q)
        .first()
        .then((r) => (r ? ({ ...r, amount: n(r.amount) } as CheckoutRow) : undefined));
    },
    updateCheckout: (trx: Db, id: number, patch: Record<string, unknown>) => trx('checkouts').where({ id }).update(patch),
    /**
     * Marks a checkout paid unless it is paid already; false when it was. One conditional update: on PostgreSQL a
     * second event for the same checkout at the same time waits for the first's row, then finds it paid.
     */
    claimCheckoutPaid: (trx: Db, id: number, at: string) =>
      trx('checkouts').where({ id }).whereNot('status', 'paid').update({ status: 'paid', completed_at: at }).then((count) => Number(count) === 1),

    /** Verified events that did not match a checkout, per invoice (for the owner). */
    async issues(studioId: number, invoiceIds?: number[]): Promise<IssueRow[]> {
      const qb = db('payment_events as e')
        .leftJoin('invoices as i', 'i.id', 'e.invoice_id')
        .where({ 'e.studio_id': studioId, 'e.outcome': 'flagged' })
        .orderBy('e.received_at', 'desc')
        .select('e.id', 'e.invoice_id', 'i.number as invoice_number', 'e.session_id', 'e.reason', 'e.received_at');
      if (invoiceIds) qb.whereIn('e.invoice_id', invoiceIds);
      return qb;
    },

    /** Minutes of the commission's done stages (their estimates): the work a cancellation keeps. */
    doneStageMinutes: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('stages').where({ studio_id: studioId, commission_id: commissionId, status: 'done' }).sum({ m: 'estimate_minutes' }).first().then((r) => n(r?.m)),

    /** Open invoices with a due date across all studios, with the studio's zone and how many reminders went out. */
    async dueForReminder(before: string) {
      const rows = await db('invoices as i')
        .join('studios as s', 's.id', 'i.studio_id')
        .whereIn('i.status', ['open', 'partly_paid'])
        .whereNot('i.kind', 'credit_note')
        .whereNotNull('i.due_date')
        .where('i.due_date', '<', before)
        .select('i.id', 'i.studio_id', 'i.due_date', 's.timezone');
      const ids = rows.map((r) => r.id as number);
      const sent = (ids.length ? await db('invoice_reminders').whereIn('invoice_id', ids).groupBy('invoice_id').select('invoice_id').count({ c: '*' }).max({ last: 'sent_at' }) : []) as unknown as {
        invoice_id: number;
        c: number | string;
        last: string;
      }[];
      const byId = new Map(sent.map((s) => [s.invoice_id as number, { count: n(s.c), last: String(s.last) }]));
      return rows.map((r) => ({ id: r.id as number, studioId: r.studio_id as number, dueDate: String(r.due_date), timezone: String(r.timezone), sent: byId.get(r.id)?.count ?? 0, lastSentAt: byId.get(r.id)?.last ?? null }));
    },
    /**
     * Claims reminder `number` of an invoice; false when it was claimed already (by another run). One
     * insert that does nothing on the key (invoice, number): on PostgreSQL a second run at the same time
     * waits for the first's row and then inserts nothing, where a look-then-insert would race.
     */
    async claimReminder(trx: Db, invoiceId: number, number: number, at: string) {
      const rows = await trx('invoice_reminders').insert({ invoice_id: invoiceId, number, sent_at: at }).onConflict(['invoice_id', 'number']).ignore().returning('invoice_id');
      return rows.length === 1;
    },
  };
}

export type InvoicesRepository = ReturnType<typeof invoicesRepository>;
