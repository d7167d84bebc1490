import { hexToLab, matchBand, nearestInRack, prepareRack } from '../../../shared/color';
import {
  colourMissing,
  createPaintInput,
  NEEDS_COLOUR_MESSAGE,
  type CreatePaintInput,
  type ImportReport,
  type Paint,
  type PaintListQuery,
  type PaintMatchView,
  type UpdatePaintInput,
} from '../../../shared/schemas/paints';
import type { Page } from '../../../shared/schemas/common';
import { iso, type Clock } from '../../lib/clock';
import { isUniqueViolation, type Db } from '../../lib/db';
import { pageOf } from '../../lib/page';
import { keptReads, type VersionInZone } from '../../lib/version-cache';
import { errors } from '../../lib/errors';
import { parseOrThrow } from '../../lib/validate';
import { parsePaintsCsv, paintsToCsv } from './paints.csv';
import { matchKey, toPaint, toPaintRef, type PaintRow, type PaintsRepository } from './paints.repository';

const duplicate = () => errors.field('name', 'The rack already has a paint of this name from this maker.');
const round2 = (n: number) => Math.round(n * 100) / 100;

/** Rows (paints, or lines of the CSV) the kept rack answers may hold across studios and queries, per store. */
export const PAINT_LIST_CACHE_ROWS = 20_000;

/**
 * The rack's page and its CSV are kept per studio, lists version and query (`cacheRows` rows at most per
 * store; 0 turns it off): reading and building 200 paints was nearly all of their cost, on every request.
 */
export function paintsService(deps: { db: Db; repo: PaintsRepository; clock: Clock; cacheRows?: number }) {
  const { db, repo, clock } = deps;
  const now = () => iso(clock.now());
  const maxWeight = deps.cacheRows ?? PAINT_LIST_CACHE_ROWS;
  const version = (studioId: number) => repo.listsVersion(studioId);
  const keptPages = keptReads<Page<Paint>, VersionInZone>({ version, maxWeight, weigh: (p) => p.items.length + 1 });
  const keptCsv = keptReads<{ text: string; rows: number }, VersionInZone>({ version, maxWeight, weigh: (c) => c.rows + 1 });

  async function get(studioId: number, id: number) {
    const row = await repo.get(studioId, id);
    if (!row) throw errors.notFound('That paint');
    return toPaint(row);
  }

  /** The rack prepared for matching: Lab once per paint, rows by id for the answer. */
  async function rack(studioId: number) {
    const rows = await repo.colours(studioId);
    const byId = new Map(rows.map((r) => [r.id, r]));
    const prepared = prepareRack(rows.map((r) => ({ id: r.id, hex: r.hex! })));
    return {
      size: prepared.length,
      nearest(hex: string, k = 3): PaintMatchView[] {
        return nearestInRack(hexToLab(hex), prepared, k).map((m) => {
          const deltaE = round2(m.deltaE);
          // The band follows the rounded figure, so "1.99 · very close" and "2.00 · close" never disagree on screen.
          return { paint: toPaintRef(byId.get(m.id) as PaintRow), deltaE, band: matchBand(deltaE) };
        });
      },
    };
  }

  return {
    get,
    rack,
    list(studioId: number, q: PaintListQuery): Promise<Page<Paint>> {
      const key = JSON.stringify([q.q ?? null, q.type ?? null, q.stock ?? null, q.limit, q.offset]);
      return keptPages(studioId, key, async () => {
        const { items, total } = await repo.list(studioId, q, q);
        return pageOf(items, total ?? 0, q);
      });
    },
    /** What recipes show of their paints, by id; ids not on this studio's rack are simply absent. */
    async refsByIds(studioId: number, ids: number[]) {
      return new Map((await repo.byIds(studioId, ids)).map((r) => [r.id, toPaintRef(r)]));
    },
    async byIds(studioId: number, ids: number[]) {
      return new Map((await repo.byIds(studioId, ids)).map((r) => [r.id, toPaint(r)]));
    },

    async create(studioId: number, input: CreatePaintInput) {
      if (await repo.findByMatchKey(studioId, matchKey(input.name, input.maker))) throw duplicate();
      try {
        return get(studioId, await repo.create(studioId, input, now()));
      } catch (err) {
        if (isUniqueViolation(err)) throw duplicate();
        throw err;
      }
    },

    async update(studioId: number, id: number, input: UpdatePaintInput) {
      const current = await get(studioId, id);
      // The merged paint must still be a whole paint (a colour paint keeps a colour).
      const merged = parseOrThrow(createPaintInput, { ...current, ...Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined)) });
      const key = matchKey(merged.name, merged.maker);
      const other = await repo.findByMatchKey(studioId, key);
      if (other && other.id !== id) throw duplicate();
      try {
        await repo.update(studioId, id, input, key, now());
      } catch (err) {
        if (isUniqueViolation(err)) throw duplicate();
        throw err;
      }
      return get(studioId, id);
    },

    async remove(studioId: number, id: number) {
      await get(studioId, id);
      const using = await repo.recipesUsing(studioId, id);
      if (using.length) {
        const names = using.slice(0, 3).map((r) => `"${r.name}"`).join(', ') + (using.length > 3 ? ` and ${using.length - 3} more` : '');
        throw errors.conflict(`This paint is in ${using.length === 1 ? 'a recipe' : `${using.length} recipes`} (${names}). Take it out of them first, or set its stock to 0.`, 'paint_in_use', { recipes: using });
      }
      await repo.remove(studioId, id);
    },

    /**
     * Good rows go in (a paint of the same name and maker is updated), bad ones are reported by line.
     * Columns the file leaves out keep their values on paints that exist. One transaction for the good rows.
     */
    async importCsv(studioId: number, csv: string): Promise<ImportReport> {
      const parsed = parsePaintsCsv(csv);
      const skipped = [...parsed.skipped];
      const firstLine = new Map<string, number>();
      const rows = parsed.rows.filter((r) => {
        const key = matchKey(r.input.name, r.input.maker);
        const earlier = firstLine.get(key);
        if (earlier !== undefined) {
          skipped.push({ line: r.line, message: `Same name and maker as line ${earlier}; only the first was imported.` });
          return false;
        }
        firstLine.set(key, r.line);
        return true;
      });
      let created = 0;
      let updated = 0;
      await db.transaction(async (trx) => {
        const at = now();
        const existing = new Map<string, PaintRow>();
        for (let i = 0; i < rows.length; i += 500) {
          const chunk = rows.slice(i, i + 500).map((r) => matchKey(r.input.name, r.input.maker));
          for (const p of await repo.byMatchKeys(studioId, chunk, trx)) existing.set(p.match_key, p);
        }
        for (const r of rows) {
          const key = matchKey(r.input.name, r.input.maker);
          const found = existing.get(key);
          if (found) {
            const patch = Object.fromEntries(parsed.columns.map((c) => [c, r.input[c]])) as UpdatePaintInput;
            await repo.update(studioId, found.id, patch, key, at, trx);
            updated++;
          } else if (colourMissing(r.input)) {
            skipped.push({ line: r.line, message: `Colour: ${NEEDS_COLOUR_MESSAGE} This paint is new to the rack, and the file has no Colour column.` });
          } else {
            await repo.create(studioId, r.input, at, trx);
            created++;
          }
        }
      });
      skipped.sort((a, b) => a.line - b.line);
      return { created, updated, skipped, notes: parsed.notes };
    },

    async exportCsv(studioId: number): Promise<string> {
      const csv = await keptCsv(studioId, 'csv', async () => {
        const rows = await repo.exportRows(studioId);
        const text = paintsToCsv(rows.map((r) => ({ name: r.name, maker: r.maker, range: r.range_name, type: r.type, finish: r.finish, hex: r.hex, stock: r.stock, lowStockThreshold: r.low_stock_threshold, notes: r.notes })));
        return { text, rows: rows.length };
      });
      return csv.text;
    },

    async nearest(studioId: number, hex: string, k: number) {
      const r = await rack(studioId);
      return { hex, matches: r.nearest(hex, k) };
    },
  };
}

export type PaintsService = ReturnType<typeof paintsService>;
