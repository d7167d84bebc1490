import type { SchemeEntryInput, UpdateSchemeEntryInput } from '../../../shared/schemas/recipes';
import type { Db } from '../../lib/db';

export type SchemeRow = {
  id: number;
  studio_id: number;
  commission_id: number;
  figure_id: number | null;
  figure_name: string | null;
  area: string;
  recipe_id: number;
  position: number;
  notes: string | null;
  created_at: string;
  updated_at: string;
};

const idOf = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));

export function schemesRepository(db: Db) {
  const base = (studioId: number) =>
    db('schemes as s').leftJoin('figures as f', 'f.id', 's.figure_id').where('s.studio_id', studioId).select('s.*', 'f.name as figure_name');
  return {
    commission: (studioId: number, id: number) =>
      db('commissions').where({ studio_id: studioId, id }).first('id', 'client_id', 'title') as Promise<{ id: number; client_id: number; title: string } | undefined>,
    figure: (studioId: number, commissionId: number, figureId: number) =>
      db('figures').where({ studio_id: studioId, commission_id: commissionId, id: figureId }).first('id') as Promise<{ id: number } | undefined>,
    recipe: (studioId: number, recipeId: number) => db('recipes').where({ studio_id: studioId, id: recipeId }).first('id') as Promise<{ id: number } | undefined>,
    list: (studioId: number, commissionId: number) =>
      base(studioId)
        .where('s.commission_id', commissionId)
        // Whole-commission entries first, then by figure in the commission's order.
        .orderByRaw('case when s.figure_id is null then 0 else 1 end, f.position, s.figure_id, s.position, s.id')
        .then((rows) => rows as SchemeRow[]),
    get: (studioId: number, id: number) =>
      base(studioId)
        .where('s.id', id)
        .first()
        .then((r) => r as SchemeRow | undefined),
    /** Another entry for the same figure (or the whole commission) and area, ignoring case. */
    sameArea: (studioId: number, commissionId: number, figureId: number | null, area: string, exceptId?: number) => {
      const qb = db('schemes').where({ studio_id: studioId, commission_id: commissionId }).whereRaw('lower(area) = ?', [area.toLowerCase()]);
      if (figureId === null) qb.whereNull('figure_id');
      else qb.where('figure_id', figureId);
      if (exceptId) qb.whereNot('id', exceptId);
      return qb.first('id') as Promise<{ id: number } | undefined>;
    },
    async create(studioId: number, commissionId: number, input: SchemeEntryInput, now: string) {
      return db.transaction(async (trx) => {
        const last = await trx('schemes').where({ studio_id: studioId, commission_id: commissionId }).max({ p: 'position' }).first();
        const [row] = await trx('schemes')
          .insert({
            studio_id: studioId,
            commission_id: commissionId,
            figure_id: input.figureId ?? null,
            area: input.area,
            recipe_id: input.recipeId,
            position: Number(last?.p ?? -1) + 1,
            notes: input.notes ?? null,
            created_at: now,
            updated_at: now,
          })
          .returning('id');
        return idOf(row);
      });
    },
    update(studioId: number, id: number, input: UpdateSchemeEntryInput, now: string) {
      const row: Record<string, unknown> = { updated_at: now };
      if (input.figureId !== undefined) row.figure_id = input.figureId;
      if (input.area !== undefined) row.area = input.area;
      if (input.recipeId !== undefined) row.recipe_id = input.recipeId;
      if (input.notes !== undefined) row.notes = input.notes;
      return db('schemes').where({ studio_id: studioId, id }).update(row);
    },
    remove: (studioId: number, id: number) => db('schemes').where({ studio_id: studioId, id }).delete(),
  };
}

export type SchemesRepository = ReturnType<typeof schemesRepository>;
