import type { CommissionStatus } from '../../../shared/commission-lifecycle';
import type { Db } from '../../lib/db';
import { moneyVersion } from '../../lib/version-cache';

const n = (v: unknown) => Number(v ?? 0);

/** Read-only sums over a studio's invoices and payments for the owner's money view. */
export function moneyRepository(db: Db) {
  return {
    /** The version the kept money view is read under, with the studio's zone (server/lib/version-cache.ts). */
    version: (studioId: number) => moneyVersion(db, studioId),
    /** The studio's zone and currency, with its saved price table's text if it has one (one query). */
    studio: (studioId: number) =>
      db('studios as s')
        .leftJoin('price_tables as pt', 'pt.studio_id', 's.id')
        .where('s.id', studioId)
        .first('s.timezone', 's.currency', 'pt.table_json') as Promise<{ timezone: string; currency: string; table_json: string | null } | undefined>,
    /** Issued invoices still to be paid (credit notes aside), with their client. */
    async unpaid(studioId: number) {
      const rows = await db('invoices as i')
        .join('clients as cl', 'cl.id', 'i.client_id')
        .where('i.studio_id', studioId)
        .whereIn('i.status', ['open', 'partly_paid'])
        .whereNot('i.kind', 'credit_note')
        .select('i.id', 'i.client_id', 'cl.name as client_name', 'i.currency', 'i.total', 'i.paid', 'i.credited', 'i.due_date');
      return rows.map((r) => ({ id: r.id as number, clientId: r.client_id as number, clientName: String(r.client_name), currency: String(r.currency), due: Math.max(0, n(r.total) - n(r.paid) - n(r.credited)), dueDate: r.due_date as string | null }));
    },
    paymentsBetween: (studioId: number, currency: string, from: string, to: string) =>
      db('invoice_payments as p')
        .join('invoices as i', 'i.id', 'p.invoice_id')
        .where({ 'p.studio_id': studioId, 'i.currency': currency })
        .where('p.received_at', '>=', from)
        .where('p.received_at', '<', to)
        .sum({ s: 'p.amount' })
        .first()
        .then((r) => n(r?.s)),
    refundsBetween: (studioId: number, currency: string, from: string, to: string) =>
      db('invoice_refunds as r')
        .join('invoices as i', 'i.id', 'r.invoice_id')
        .where({ 'r.studio_id': studioId, 'i.currency': currency })
        .where('r.created_at', '>=', from)
        .where('r.created_at', '<', to)
        .sum({ s: 'r.amount' })
        .first()
        .then((r) => n(r?.s)),
    /** Deposits received (net of refunds) whose commission is in one of the statuses, or on hold from one of them. */
    depositsHeld: (studioId: number, currency: string, statuses: CommissionStatus[]) =>
      db('invoices as i')
        .join('commissions as c', 'c.id', 'i.commission_id')
        .where({ 'i.studio_id': studioId, 'i.kind': 'deposit', 'i.currency': currency })
        .whereNotIn('i.status', ['draft', 'void'])
        .where((w) => w.whereIn('c.status', statuses).orWhere((h) => h.where('c.status', 'on_hold').whereIn('c.status_before_hold', statuses)))
        .sum({ s: 'i.paid' })
        .first()
        .then((r) => n(r?.s)),
    issues: (studioId: number) =>
      db('payment_events as e')
        .leftJoin('invoices as i', 'i.id', 'e.invoice_id')
        .where({ 'e.studio_id': studioId, 'e.outcome': 'flagged' })
        .orderBy('e.received_at', 'desc')
        .limit(50)
        .select('e.id', 'e.invoice_id', 'i.number as invoice_number', 'e.session_id', 'e.reason', 'e.received_at') as Promise<
        { id: string; invoice_id: number | null; invoice_number: string | null; session_id: string | null; reason: string | null; received_at: string }[]
      >,
  };
}

export type MoneyRepository = ReturnType<typeof moneyRepository>;
