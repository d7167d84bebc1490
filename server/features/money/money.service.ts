import { civilDate, dayNumber, localDateOf, localDayOf, zonedInstant } from '../../../shared/dates';
import type { MoneyView } from '../../../shared/schemas/invoices';
import { currency as currencySchema, defaultPriceTable } from '../../../shared/schemas/price-table';
import type { PriceTableService } from '../price-table/price-table.service';
import type { Clock } from '../../lib/clock';
import { errors } from '../../lib/errors';
import { keptReads, type VersionInZone } from '../../lib/version-cache';
import type { MoneyRepository } from './money.repository';

/** Rows (clients owed and payment issues) the kept money views may hold across studios and days. */
export const MONEY_CACHE_ROWS = 20_000;

/**
 * The currency of the studio's price table, as the price table service gives it (its get() validates the
 * whole table, which the money view does not need): the saved table's currency as the schema reads it
 * (trimmed, upper case), the saved text if that does not pass, or the default table's (the studio's currency).
 * A saved table is validated when it is saved, so its currency passes as it is.
 */
function tableCurrency(s: { currency: string; table_json: string | null }): string {
  if (s.table_json === null) return defaultPriceTable(s.currency).currency;
  const saved = (JSON.parse(s.table_json) as { currency?: unknown }).currency;
  const parsed = currencySchema.safeParse(saved);
  return parsed.success ? parsed.data : (saved as string);
}

/** The owner's money view: what is owed by whom, what came in this month, deposits held for work not begun. */
/**
 * `priceTables` is no longer read (the currency comes with the studio's row); app.ts still passes it.
 *
 * The view is kept per studio, money version (server/lib/version-cache.ts moneyVersion) and the studio's day
 * in its zone (what is overdue, which month's payments): reading the same sums again was nearly all of its
 * cost. `cacheRows` (default MONEY_CACHE_ROWS; 0 turns the keeping off) bounds the rows kept.
 */
export function moneyService(deps: { repo: MoneyRepository; priceTables?: Pick<PriceTableService, 'get'>; clock: Clock; cacheRows?: number }) {
  const { repo, clock } = deps;
  const kept = keptReads<MoneyView, VersionInZone>({
    version: (studioId) => repo.version(studioId),
    maxWeight: deps.cacheRows ?? MONEY_CACHE_ROWS,
    weigh: (v) => v.outstandingByClient.length + v.paymentIssues.length + 1,
  });
  return {
    view(studioId: number): Promise<MoneyView> {
      // The instant the key's day was worked out at is the one the view is worked out for.
      let at: number | undefined;
      const key = (v: VersionInZone) => {
        at = clock.now().getTime();
        return JSON.stringify([v.timeZone, localDateOf(at, v.timeZone)]);
      };
      return kept(studioId, key, () => read(studioId, at ?? clock.now().getTime()));
    },
  };

  async function read(studioId: number, nowMs: number): Promise<MoneyView> {
    const s = await repo.studio(studioId);
    if (!s) throw errors.notFound('That studio');
    const currency = tableCurrency(s);
    const today = localDateOf(nowMs, s.timezone);
    // The calendar month in the studio's timezone, as UTC instants (stored times are UTC ISO strings).
    const d = civilDate(localDayOf(nowMs, s.timezone));
    const from = new Date(zonedInstant(dayNumber(d.year, d.month, 1), 0, s.timezone)).toISOString();
    const to = new Date(zonedInstant(dayNumber(d.month === 12 ? d.year + 1 : d.year, d.month === 12 ? 1 : d.month + 1, 1), 0, s.timezone)).toISOString();

    const byClient = new Map<string, MoneyView['outstandingByClient'][number]>();
    const unpaid = await repo.unpaid(studioId);
    for (const u of unpaid) {
      const key = `${u.clientId}:${u.currency}`;
      const e = byClient.get(key) ?? { client: { id: u.clientId, name: u.clientName }, currency: u.currency, outstandingMinor: 0, invoices: 0, overdue: 0 };
      e.outstandingMinor += u.due;
      e.invoices++;
      if (u.dueDate && u.dueDate < today && u.due > 0) e.overdue++;
      byClient.set(key, e);
    }
    const [paid, refunded, held, issues] = await Promise.all([
      repo.paymentsBetween(studioId, currency, from, to),
      repo.refundsBetween(studioId, currency, from, to),
      repo.depositsHeld(studioId, currency, ['quoted', 'booked']),
      repo.issues(studioId),
    ]);
    return {
      currency,
      outstandingByClient: [...byClient.values()].sort((a, b) => b.outstandingMinor - a.outstandingMinor || a.client.name.localeCompare(b.client.name)),
      paidThisMonthMinor: paid - refunded,
      depositsHeldMinor: held,
      openInvoices: unpaid.length,
      overdueInvoices: unpaid.filter((u) => u.dueDate && u.dueDate < today && u.due > 0).length,
      paymentIssues: issues.map((i) => ({ eventId: i.id, at: i.received_at, sessionId: i.session_id, reason: i.reason ?? '', invoiceId: i.invoice_id, invoiceNumber: i.invoice_number })),
    };
  }
}

export type MoneyService = ReturnType<typeof moneyService>;
