import type { Knex } from 'knex';
import type { Db } from '../../lib/db';
import { booksVersion } from '../../lib/version-cache';

const n = (v: unknown) => Number(v ?? 0);

export type DoneStageDbRow = {
  stage_id: number;
  template_key: string;
  stage_name: string;
  estimate_minutes: number;
  done_at: string | null;
  figure_id: number;
  figure_name: string;
  quantity: number;
  size_class: string;
  tier: string;
  extras: string;
  commission_id: number;
  commission_title: string;
  logged_minutes: number;
};

export type MoneyMove = {
  /** payment amount received, or a refund as a negative amount */
  amount: number;
  at: string;
  method: string;
  commission_id: number;
  invoice_tax: number;
  invoice_total: number;
};

/** Read-only sums for the books; every query takes the studio id first. */
export function reportsRepository(db: Db) {
  return {
    /** The version the books are kept under (schedule_version + books_version) and the studio's zone. */
    version: (studioId: number) => booksVersion(db, studioId),

    studio: (studioId: number) => db('studios').where({ id: studioId }).first('timezone', 'currency') as Promise<{ timezone: string; currency: string } | undefined>,

    /**
     * Done stages with closed time logged on them, of commissions that were not cancelled (newest first),
     * and how many done stages have none: the report reads only the stages it learns from, and counts the rest.
     */
    async doneStages(studioId: number): Promise<{ rows: DoneStageDbRow[]; withoutTime: number }> {
      const logged = db('time_entries').where('studio_id', studioId).whereNotNull('ended_at').groupBy('stage_id').select('stage_id').sum({ minutes: 'minutes' }).as('t');
      const done = () =>
        db('stages as s')
          .join('commissions as c', 'c.id', 's.commission_id')
          .where({ 's.studio_id': studioId, 's.status': 'done' })
          .whereNot('c.status', 'cancelled');
      const [all, rows] = await Promise.all([
        done().count({ n: '*' }).first(),
        done()
          .join('figures as f', 'f.id', 's.figure_id')
          .join(logged, 't.stage_id', 's.id')
          .where('t.minutes', '>', 0)
          .orderBy([{ column: 's.done_at', order: 'desc' }, { column: 's.id', order: 'desc' }])
          .select(
            's.id as stage_id',
            's.template_key',
            's.name as stage_name',
            's.estimate_minutes',
            's.done_at',
            'f.id as figure_id',
            'f.name as figure_name',
            'f.quantity',
            'f.size_class',
            'f.tier',
            'f.extras',
            'c.id as commission_id',
            'c.title as commission_title',
            't.minutes as logged_minutes',
        ),
      ]);
      return { rows: rows.map((r) => ({ ...r, logged_minutes: n(r.logged_minutes) })) as DoneStageDbRow[], withoutTime: n(all?.n) - rows.length };
    },

    settings: (studioId: number) =>
      db('books_settings').where({ studio_id: studioId }).first('card_fee_bp', 'card_fee_fixed') as Promise<{ card_fee_bp: number; card_fee_fixed: number } | undefined>,
    async saveSettings(studioId: number, s: { card_fee_bp: number; card_fee_fixed: number }, now: string) {
      await db('books_settings').insert({ studio_id: studioId, ...s, updated_at: now }).onConflict('studio_id').merge();
    },

    /** Payments received and refunds made on invoices in one currency, between two instants and/or for some commissions. */
    async moneyMoves(studioId: number, currency: string, by: { from?: string; to?: string; commissionIds?: number[] }): Promise<MoneyMove[]> {
      if (by.commissionIds && by.commissionIds.length === 0) return [];
      const scope = (q: Knex.QueryBuilder, at: string) => {
        if (by.from) q.where(at, '>=', by.from);
        if (by.to) q.where(at, '<', by.to);
        if (by.commissionIds) q.whereIn('i.commission_id', by.commissionIds);
        return q;
      };
      const [payments, refunds] = await Promise.all([
        scope(db('invoice_payments as p').join('invoices as i', 'i.id', 'p.invoice_id').where({ 'p.studio_id': studioId, 'i.currency': currency }), 'p.received_at').select(
          'p.amount',
          'p.received_at as at',
          'p.method',
          'i.commission_id',
          'i.tax as invoice_tax',
          'i.total as invoice_total',
        ),
        scope(
          db('invoice_refunds as r').join('invoices as i', 'i.id', 'r.invoice_id').join('invoice_payments as p', 'p.id', 'r.payment_id').where({ 'r.studio_id': studioId, 'i.currency': currency }),
          'r.created_at',
        ).select('r.amount', 'r.created_at as at', 'p.method', 'i.commission_id', 'i.tax as invoice_tax', 'i.total as invoice_total'),
      ]);
      const move = (r: Record<string, unknown>, sign: number): MoneyMove => ({
        amount: sign * n(r.amount),
        at: String(r.at),
        method: String(r.method),
        commission_id: Number(r.commission_id),
        invoice_tax: n(r.invoice_tax),
        invoice_total: n(r.invoice_total),
      });
      return [...(payments as Record<string, unknown>[]).map((r) => move(r, 1)), ...(refunds as Record<string, unknown>[]).map((r) => move(r, -1))];
    },

    /** The latest accepted quote of each commission: its result (lines, tax) and total. */
    async acceptedQuotes(studioId: number, commissionIds: number[]) {
      if (!commissionIds.length) return new Map<number, { result: unknown; total: number }>();
      const rows = await db('quotes')
        .where({ studio_id: studioId, status: 'accepted' })
        .whereIn('commission_id', commissionIds)
        .orderBy([{ column: 'commission_id' }, { column: 'version' }])
        .select('commission_id', 'result_json', 'total');
      const out = new Map<number, { result: unknown; total: number }>();
      for (const r of rows) {
        let result: unknown;
        try {
          result = JSON.parse(String(r.result_json));
        } catch {
          result = null;
        }
        out.set(Number(r.commission_id), { result, total: n(r.total) }); // later versions overwrite earlier ones
      }
      return out;
    },

    commissions: (studioId: number, ids: number[]) =>
      ids.length
        ? (db('commissions as c')
            .join('clients as cl', 'cl.id', 'c.client_id')
            .where('c.studio_id', studioId)
            .whereIn('c.id', ids)
            .select('c.id', 'c.title', 'c.status', 'c.client_id', 'cl.name as client_name') as Promise<{ id: number; title: string; status: string; client_id: number; client_name: string }[]>)
        : Promise.resolve([]),

    async loggedMinutes(studioId: number, commissionIds: number[]) {
      if (!commissionIds.length) return new Map<number, number>();
      const rows = (await db('time_entries').where('studio_id', studioId).whereIn('commission_id', commissionIds).whereNotNull('ended_at').groupBy('commission_id').select('commission_id').sum({ m: 'minutes' })) as {
        commission_id: number;
        m: number | string | null;
      }[];
      return new Map(rows.map((r) => [Number(r.commission_id), n(r.m)]));
    },

    /** Issued invoices not yet paid in full (credit notes aside), with client and commission. */
    async unpaidInvoices(studioId: number) {
      const rows = await db('invoices as i')
        .join('clients as cl', 'cl.id', 'i.client_id')
        .join('commissions as c', 'c.id', 'i.commission_id')
        .where('i.studio_id', studioId)
        .whereIn('i.status', ['open', 'partly_paid'])
        .whereNot('i.kind', 'credit_note')
        .orderBy([{ column: 'i.due_date' }, { column: 'i.id' }])
        .select('i.id', 'i.number', 'i.kind', 'i.currency', 'i.total', 'i.paid', 'i.credited', 'i.due_date', 'cl.name as client_name', 'c.id as commission_id', 'c.title as commission_title');
      return rows.map((r) => ({
        id: Number(r.id),
        number: r.number as string | null,
        kind: String(r.kind),
        currency: String(r.currency),
        due: Math.max(0, n(r.total) - n(r.paid) - n(r.credited)),
        dueDate: r.due_date as string | null,
        clientName: String(r.client_name),
        commission: { id: Number(r.commission_id), title: String(r.commission_title) },
      }));
    },
  };
}

export type ReportsRepository = ReturnType<typeof reportsRepository>;
