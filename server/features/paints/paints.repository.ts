import { stockState, type CreatePaintInput, type Finish, type Paint, type PaintFilter, type PaintRef, type PaintType, type UpdatePaintInput } from '../../../shared/schemas/paints';
import type { Knex } from 'knex';
import type { Db } from '../../lib/db';
import { listsVersion } from '../../lib/version-cache';
import type { PageParams } from '../../../shared/schemas/common';
import { pageRows } from '../../lib/page';

export type PaintRow = {
  id: number;
  studio_id: number;
  name: string;
  maker: string | null;
  range_name: string | null;
  type: PaintType;
  finish: Finish | null;
  hex: string | null;
  stock: number;
  low_stock_threshold: number | null;
  notes: string | null;
  match_key: string;
  created_at: string;
  updated_at: string;
  recipe_count?: number | string | null;
};

/** What a line of the rack's CSV reads. */
export type PaintCsvRow = Pick<PaintRow, 'name' | 'maker' | 'range_name' | 'type' | 'finish' | 'hex' | 'stock' | 'low_stock_threshold' | 'notes'>;

/** One paint of a name per maker in a studio, compared without regard to case. */
export const matchKey = (name: string, maker: string | null | undefined) => `${name.trim().toLowerCase()}|${(maker ?? '').trim().toLowerCase()}`;

export function toPaint(r: PaintRow): Paint {
  return {
    id: r.id,
    name: r.name,
    maker: r.maker,
    range: r.range_name,
    type: r.type,
    finish: r.finish,
    hex: r.hex,
    stock: r.stock,
    lowStockThreshold: r.low_stock_threshold,
    notes: r.notes,
    stockState: stockState(r.stock, r.low_stock_threshold),
    recipeCount: Number(r.recipe_count ?? 0),
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

export function toPaintRef(r: PaintRow | Paint): PaintRef {
  const p = 'studio_id' in r ? toPaint(r) : r;
  return { id: p.id, name: p.name, maker: p.maker, range: p.range, type: p.type, hex: p.hex, stock: p.stock, stockState: p.stockState };
}

function toRow(input: UpdatePaintInput) {
  const row: Record<string, unknown> = {};
  if (input.name !== undefined) row.name = input.name;
  if (input.maker !== undefined) row.maker = input.maker;
  if (input.range !== undefined) row.range_name = input.range;
  if (input.type !== undefined) row.type = input.type;
  if (input.finish !== undefined) row.finish = input.finish;
  if (input.hex !== undefined) row.hex = input.hex;
  if (input.stock !== undefined) row.stock = input.stock;
  if (input.lowStockThreshold !== undefined) row.low_stock_threshold = input.lowStockThreshold;
  if (input.notes !== undefined) row.notes = input.notes;
  return row;
}

const escapeLike = (s: string) => `%${s.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/** The rack's filter and order on a query of paints as p. */
function filtered(qb: Knex.QueryBuilder, q: PaintFilter) {
  if (q.q) {
    const like = escapeLike(q.q);
    qb.where((w) =>
      w
        .whereRaw("lower(p.name) like ? escape '\\'", [like])
        .orWhereRaw("lower(p.maker) like ? escape '\\'", [like])
        .orWhereRaw("lower(p.range_name) like ? escape '\\'", [like])
        .orWhereRaw("lower(p.hex) like ? escape '\\'", [like]),
    );
  }
  if (q.type) qb.where('p.type', q.type);
  if (q.stock === 'out') qb.where('p.stock', '<=', 0);
  if (q.stock === 'low') qb.where('p.stock', '>', 0).whereNotNull('p.low_stock_threshold').whereRaw('p.stock < p.low_stock_threshold');
  if (q.stock === 'short') qb.where((w) => w.where('p.stock', '<=', 0).orWhere((o) => o.whereNotNull('p.low_stock_threshold').whereRaw('p.stock < p.low_stock_threshold')));
  qb.orderByRaw('lower(p.name), lower(p.maker), p.id');
  return qb;
}

/** Every query takes the studio id first. */
export function paintsRepository(db: Db) {
  // What toPaint reads (not the match key), with the count of recipes using the paint.
  const base = (studioId: number, trx: Db = db) =>
    trx('paints as p')
      .where('p.studio_id', studioId)
      .select(
        'p.id',
        'p.name',
        'p.maker',
        'p.range_name',
        'p.type',
        'p.finish',
        'p.hex',
        'p.stock',
        'p.low_stock_threshold',
        'p.notes',
        'p.created_at',
        'p.updated_at',
        // studio and paint, in that order: the (studio_id, paint_id) index of recipe_step_paints answers it
        trx('recipe_step_paints as sp').join('recipe_steps as s', 's.id', 'sp.step_id').whereRaw('sp.studio_id = p.studio_id and sp.paint_id = p.id').countDistinct('s.recipe_id').as('recipe_count'),
      );
  return {
    /** The studio's lists version (server/lib/version-cache.ts). */
    listsVersion: (studioId: number) => listsVersion(db, studioId),
    /** The paints that match the filter, by name; one page of them when `page` is given. */
    async list(studioId: number, q: PaintFilter = {}, page?: PageParams) {
      const qb = filtered(base(studioId), q);
      if (!page) return { items: ((await qb) as PaintRow[]).map(toPaint), total: null };
      const { rows, total } = await pageRows<PaintRow>(qb, page);
      return { items: rows.map(toPaint), total };
    },
    /** The whole rack by name with what its CSV shows: no recipe counts, ids or times. */
    exportRows: (studioId: number) =>
      db('paints as p')
        .where('p.studio_id', studioId)
        .orderByRaw('lower(p.name), lower(p.maker), p.id')
        .select('p.name', 'p.maker', 'p.range_name', 'p.type', 'p.finish', 'p.hex', 'p.stock', 'p.low_stock_threshold', 'p.notes') as Promise<PaintCsvRow[]>,
    get: (studioId: number, id: number, trx: Db = db) =>
      base(studioId, trx)
        .where('p.id', id)
        .first()
        .then((r) => r as PaintRow | undefined),
    byIds: (studioId: number, ids: number[], trx: Db = db) =>
      ids.length ? (trx('paints').where('studio_id', studioId).whereIn('id', ids) as Promise<PaintRow[]>) : Promise.resolve([] as PaintRow[]),
    /** All the rack's colours, for matching. */
    colours: (studioId: number) => db('paints').where('studio_id', studioId).whereNotNull('hex').select('*') as Promise<PaintRow[]>,
    byMatchKeys: (studioId: number, keys: string[], trx: Db = db) =>
      keys.length ? (trx('paints').where('studio_id', studioId).whereIn('match_key', keys) as Promise<PaintRow[]>) : Promise.resolve([] as PaintRow[]),
    findByMatchKey: (studioId: number, key: string, trx: Db = db) => trx('paints').where({ studio_id: studioId, match_key: key }).first('id') as Promise<{ id: number } | undefined>,
    async create(studioId: number, input: CreatePaintInput, now: string, trx: Db = db) {
      const [row] = await trx('paints')
        .insert({ studio_id: studioId, stock: 0, ...toRow(input), match_key: matchKey(input.name, input.maker), created_at: now, updated_at: now })
        .returning('id');
      return typeof row === 'object' ? (row.id as number) : (row as number);
    },
    update: (studioId: number, id: number, input: UpdatePaintInput, key: string, now: string, trx: Db = db) =>
      trx('paints').where({ studio_id: studioId, id }).update({ ...toRow(input), match_key: key, updated_at: now }),
    remove: (studioId: number, id: number) => db('paints').where({ studio_id: studioId, id }).delete(),
    /** Recipes that use the paint, for the message when it cannot be removed. */
    recipesUsing: (studioId: number, id: number) =>
      db('recipes as r')
        .where('r.studio_id', studioId)
        .whereExists(db('recipe_step_paints as sp').join('recipe_steps as s', 's.id', 'sp.step_id').whereRaw('s.recipe_id = r.id').where('sp.paint_id', id))
        .orderBy('r.name')
        .select('r.id', 'r.name') as Promise<{ id: number; name: string }[]>,
  };
}

export type PaintsRepository = ReturnType<typeof paintsRepository>;
