import type { Diluent, RecipeInput, RecipeListQuery, RecipeTechnique } from '../../../shared/schemas/recipes';
import type { Db } from '../../lib/db';
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

export type StepPaintRow = { step_id: number; position: number; parts: number; paint_id: number };

const idOf = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));
const escapeLike = (s: string) => `%${s.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

export function recipesRepository(db: Db) {
  const base = (studioId: number, trx: Db = db) =>
    trx('recipes as r')
      .where('r.studio_id', studioId)
      // studio and recipe, in that order: the (studio_id, recipe_id) index of schemes answers the count
      .select('r.*', trx('schemes as sc').whereRaw('sc.studio_id = r.studio_id and sc.recipe_id = r.id').count('*').as('scheme_count'));

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

  return {
    /** One page of the recipes, by name. */
    list(studioId: number, q: RecipeListQuery) {
      const qb = base(studioId);
      if (q.q) qb.whereRaw("lower(r.name) like ? escape '\\'", [escapeLike(q.q)]);
      return pageRows<RecipeRow>(qb.orderByRaw('lower(r.name), r.id'), q);
    },
    get: (studioId: number, id: number, trx: Db = db) =>
      base(studioId, trx)
        .where('r.id', id)
        .first()
        .then((r) => r as RecipeRow | undefined),
    byIds: (studioId: number, ids: number[]) => (ids.length ? base(studioId).whereIn('r.id', ids).then((rows) => rows as RecipeRow[]) : Promise.resolve([] as RecipeRow[])),
    steps: (studioId: number, recipeIds: number[]) =>
      recipeIds.length
        ? (db('recipe_steps').where('studio_id', studioId).whereIn('recipe_id', recipeIds).orderBy(['recipe_id', 'position']) as Promise<StepRow[]>)
        : Promise.resolve([] as StepRow[]),
    stepPaints: (studioId: number, stepIds: number[]) =>
      stepIds.length
        ? (db('recipe_step_paints').where('studio_id', studioId).whereIn('step_id', stepIds).orderBy(['step_id', 'position']).select('step_id', 'position', 'parts', 'paint_id') as Promise<StepPaintRow[]>)
        : Promise.resolve([] as StepPaintRow[]),
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
