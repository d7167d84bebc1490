import { localDateOf } from '../../../shared/dates';
import { quoteFigures, type FigureQuoteLine } from '../../../shared/pricing';
import { defaultPriceTable, priceTable, type PriceTable } from '../../../shared/schemas/price-table';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { PriceTableRepository } from './price-table.repository';

export type PublicPriceSummary = { currency: string; tiers: { key: string; label: string; fromMinor: number }[] };

/** The studio's price table: its own, or the defaults in the studio's currency until the owner saves one. */
export function priceTableService(deps: { db: Db; repo: PriceTableRepository; clock: Clock }) {
  const { db, repo, clock } = deps;

  async function studio(studioId: number, trx: Db = db) {
    const s = await repo.studio(studioId, trx);
    if (!s) throw errors.notFound('That studio');
    return s;
  }

  async function get(studioId: number, trx: Db = db): Promise<PriceTable> {
    const saved = await repo.get(studioId, trx);
    if (saved !== undefined) {
      const parsed = priceTable.safeParse(saved);
      // A table saved by an older version that no longer validates falls back to being shown as saved.
      if (parsed.success) return parsed.data;
      return saved as PriceTable;
    }
    return defaultPriceTable((await studio(studioId, trx)).currency);
  }

  return {
    get,
    /** The studio's local date: every quote's "today" (validity, rush) is read here. */
    async today(studioId: number, trx: Db = db) {
      return localDateOf(clock.now().getTime(), (await studio(studioId, trx)).timezone);
    },
    studio,

    /** Validated by the route with the shared schema; saved whole. */
    async put(studioId: number, userId: number, table: PriceTable) {
      await repo.save(studioId, table, userId, iso(clock.now()));
      return get(studioId);
    },

    /** "From" prices: one 28 mm figure of each tier with no extras, before tax, discounts and the minimum order. */
    async publicSummary(studioId: number): Promise<PublicPriceSummary> {
      const t = await get(studioId);
      const today = localDateOf(clock.now().getTime(), (await studio(studioId)).timezone);
      const tiers = t.tiers.map((tier) => {
        const q = quoteFigures({ priceTable: t, figures: [{ name: tier.label, quantity: 1, sizeClass: '28', tier: tier.key }], today });
        return { key: tier.key, label: tier.label, fromMinor: (q.lines[0] as FigureQuoteLine).amount };
      });
      return { currency: t.currency, tiers };
    },
  };
}

export type PriceTableService = ReturnType<typeof priceTableService>;
