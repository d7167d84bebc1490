import type { PaintType } from '../../../shared/schemas/paints';
import type { Diluent, RecipeInput, RecipeListQuery, RecipeTechnique } from '../../../shared/schemas/recipes';
import type { Db } from '../../lib/db';
import { listsVersion } from '../../lib/version-cache';
import { pageRows } from '../../lib/page';

export type RecipeRow = {
  id: number;
  studio_id: number;
  name: string;
  description: string | null;
  colour: string | null;
  source_photo_id: number | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
  scheme_count?: number | string | null;
};

export type StepRow = {
  id: number;
  studio_id: number;
  recipe_id: number;
  position: number;
  technique: RecipeTechnique;
  airbrush: boolean | number;
  psi: number | null;
  dilution_diluent_parts: number | null;
  dilution_paint_parts: number | null;
  dilution_with: Diluent | null;
  ladder_steps: number | null;
  tool: string | null;
  notes: string | null;
};

/** A recipe as its list's row reads it: what a summary shows. */
export type RecipeListRow = Pick<RecipeRow, 'id' | 'name' | 'colour' | 'source_photo_id' | 'created_at' | 'updated_at' | 'scheme_count'>;

/** A step as a summary needs it, with one of its paints' type, colour and parts (null: no paint on the rack). */
export type SummaryStepRow = Pick<StepRow, 'id' | 'recipe_id' | 'technique' | 'airbrush' | 'dilution_with' | 'dilution_paint_parts' | 'ladder_steps'> & {
  sp_parts: number | null;
  p_type: PaintType | null;
  p_hex: string | null;
};

/** A step with one of its paints (as the rack has it), or with none: the rows of stepsWithPaints. */
export type StepWithPaintRow = StepRow & {
  sp_parts: number | null;
  p_id: number | null;
  p_name: string | null;
  p_maker: string | null;
  p_range_name: string | null;
  p_type: PaintType | null;
  p_hex: string | null;
  p_stock: number | null;
  p_low_stock_threshold: number | null;
};

const idOf = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));
const escapeLike = (s: string) => `%${s.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

export function recipesRepository(db: Db) {
  // studio and recipe, in that order: the (studio_id, recipe_id) index of schemes answers the count
  const schemeCount = (trx: Db) => trx('schemes as sc').whereRaw('sc.studio_id = r.studio_id and sc.recipe_id = r.id').count('*').as('scheme_count');
  const base = (studioId: number, trx: Db = db) => trx('recipes as r').where('r.studio_id', studioId).select('r.*', schemeCount(trx));

  async function insertSteps(trx: Db, studioId: number, recipeId: number, input: RecipeInput) {
    for (const [position, s] of input.steps.entries()) {
      const [row] = await trx('recipe_steps')
        .insert({
          studio_id: studioId,
          recipe_id: recipeId,
          position,
          technique: s.technique,
          airbrush: s.airbrush,
          psi: s.psi,
          dilution_diluent_parts: s.dilution?.diluent ?? null,
          dilution_paint_parts: s.dilution?.paint ?? null,
          dilution_with: s.dilution?.with ?? null,
          ladder_steps: s.ladderSteps,
          tool: s.tool ?? null,
          notes: s.notes ?? null,
        })
        .returning('id');
      const stepId = idOf(row);
      if (s.paints.length) {
        await trx('recipe_step_paints').insert(s.paints.map((p, i) => ({ studio_id: studioId, step_id: stepId, paint_id: p.paintId, position: i, parts: p.parts })));
      }
    }
  }

  /**
   * The steps of some recipes in order, each with its paints in order: one row per paint on this studio's rack,
   * or one row with the paint columns null for a step without one. The caller picks the columns.
   */
  const stepPaintRows = (studioId: number, recipeIds: number[]) =>
    db('recipe_steps as s')
      .leftJoin('recipe_step_paints as sp', (j) => j.on('sp.step_id', 's.id').andOn('sp.studio_id', 's.studio_id'))
      .leftJoin('paints as p', (j) => j.on('p.id', 'sp.paint_id').andOn('p.studio_id', 's.studio_id'))
      .where('s.studio_id', studioId)
      .whereIn('s.recipe_id', recipeIds)
      .orderBy(['s.recipe_id', 's.position', 's.id', 'sp.position']);

  return {
    /** The studio's lists version (server/lib/version-cache.ts). */
    listsVersion: (studioId: number) => listsVersion(db, studioId),
    /** One page of the recipes, by name, with what a summary shows (no description). */
    list(studioId: number, q: RecipeListQuery) {
      const qb = db('recipes as r')
        .where('r.studio_id', studioId)
        .select('r.id', 'r.name', 'r.colour', 'r.source_photo_id', 'r.created_at', 'r.updated_at', schemeCount(db));
      if (q.q) qb.whereRaw("lower(r.name) like ? escape '\\'", [escapeLike(q.q)]);
      return pageRows<RecipeListRow>(qb.orderByRaw('lower(r.name), r.id'), q);
    },
    /**
     * What the summaries of some recipes are worked out from (the techniques, swatches and hazards of their
     * steps): each step in order with its paints' type, colour and parts (one row per paint on this studio's
     * rack, or one with them null), and none of the columns a summary does not show.
     */
    summarySteps: (studioId: number, recipeIds: number[]) =>
      recipeIds.length
        ? (stepPaintRows(studioId, recipeIds)
            .select('s.id', 's.recipe_id', 's.technique', 's.airbrush', 's.dilution_with', 's.dilution_paint_parts', 's.ladder_steps', 'sp.parts as sp_parts', 'p.type as p_type', 'p.hex as p_hex') as Promise<SummaryStepRow[]>)
        : Promise.resolve([] as SummaryStepRow[]),
    get: (studioId: number, id: number, trx: Db = db) =>
      base(studioId, trx)
        .where('r.id', id)
        .first()
        .then((r) => r as RecipeRow | undefined),
    byIds: (studioId: number, ids: number[]) => (ids.length ? base(studioId).whereIn('r.id', ids).then((rows) => rows as RecipeRow[]) : Promise.resolve([] as RecipeRow[])),
    /** The steps of some recipes with their paints, everything a recipe's view shows: one query for a page of recipes. */
    stepsWithPaints: (studioId: number, recipeIds: number[]) =>
      recipeIds.length
        ? (stepPaintRows(studioId, recipeIds)
            .select(
              's.id',
              's.recipe_id',
              's.position',
              's.technique',
              's.airbrush',
              's.psi',
              's.dilution_diluent_parts',
              's.dilution_paint_parts',
              's.dilution_with',
              's.ladder_steps',
              's.tool',
              's.notes',
              'sp.parts as sp_parts',
              'p.id as p_id',
              'p.name as p_name',
              'p.maker as p_maker',
              'p.range_name as p_range_name',
              'p.type as p_type',
              'p.hex as p_hex',
              'p.stock as p_stock',
              'p.low_stock_threshold as p_low_stock_threshold',
            ) as Promise<StepWithPaintRow[]>)
        : Promise.resolve([] as StepWithPaintRow[]),
    photoInStudio: (studioId: number, photoId: number) => db('photos').where({ studio_id: studioId, id: photoId }).first('id') as Promise<{ id: number } | undefined>,
    async create(studioId: number, userId: number, input: RecipeInput, now: string) {
      return db.transaction(async (trx) => {
        const [row] = await trx('recipes')
          .insert({
            studio_id: studioId,
            name: input.name,
            description: input.description ?? null,
            colour: input.colour ?? null,
            source_photo_id: input.sourcePhotoId ?? null,
            created_by: userId,
            created_at: now,
            updated_at: now,
          })
          .returning('id');
        const id = idOf(row);
        await insertSteps(trx, studioId, id, input);
        return id;
      });
    },
    /** Replaces the recipe and all its steps (the editor saves the whole recipe at once). */
    replace: (studioId: number, id: number, input: RecipeInput, now: string) =>
      db.transaction(async (trx) => {
        await trx('recipes')
          .where({ studio_id: studioId, id })
          .update({ name: input.name, description: input.description ?? null, colour: input.colour ?? null, ...(input.sourcePhotoId !== undefined ? { source_photo_id: input.sourcePhotoId } : {}), updated_at: now });
        const stepIds = await trx('recipe_steps').where({ studio_id: studioId, recipe_id: id }).pluck('id');
        if (stepIds.length) await trx('recipe_step_paints').where('studio_id', studioId).whereIn('step_id', stepIds).delete();
        await trx('recipe_steps').where({ studio_id: studioId, recipe_id: id }).delete();
        await insertSteps(trx, studioId, id, input);
      }),
    remove: (studioId: number, id: number) =>
      db.transaction(async (trx) => {
        const stepIds = await trx('recipe_steps').where({ studio_id: studioId, recipe_id: id }).pluck('id');
        if (stepIds.length) await trx('recipe_step_paints').where('studio_id', studioId).whereIn('step_id', stepIds).delete();
        await trx('recipe_steps').where({ studio_id: studioId, recipe_id: id }).delete();
        await trx('recipes').where({ studio_id: studioId, id }).delete();
      }),
    /** Commissions whose scheme uses the recipe, for the message when it cannot be removed. */
    schemesUsing: (studioId: number, id: number) =>
      db('schemes as s')
        .join('commissions as c', 'c.id', 's.commission_id')
        .where({ 's.studio_id': studioId, 's.recipe_id': id })
        .distinct('c.id', 'c.title')
        .orderBy('c.title') as Promise<{ id: number; title: string }[]>,
  };
}

export type RecipesRepository = ReturnType<typeof recipesRepository>;
