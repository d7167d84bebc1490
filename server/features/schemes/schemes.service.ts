import type { Paint, PaintRef } from '../../../shared/schemas/paints';
import { swatchesOf, type ClientScheme, type Recipe, type SchemeEntryInput, type ShoppingList, type StudioScheme, type UpdateSchemeEntryInput } from '../../../shared/schemas/recipes';
import { iso, type Clock } from '../../lib/clock';
import { errors } from '../../lib/errors';
import type { Member } from '../../lib/policy';
import type { PaintsService } from '../paints/paints.service';
import type { RecipesService } from '../recipes/recipes.service';
import type { SchemeRow, SchemesRepository } from './schemes.repository';

/** Below this ΔE00 a rack paint is close enough to a recipe's colour (the "close" band of shared/color). */
export const CLOSE_ENOUGH = 5;

export function schemesService(deps: { repo: SchemesRepository; recipes: Pick<RecipesService, 'summaries' | 'summarise'>; paints: Pick<PaintsService, 'rack' | 'byIds'>; clock: Clock }) {
  const { repo, recipes, paints, clock } = deps;
  const now = () => iso(clock.now());

  /** The commission as the caller may see it: a client only their own; anything else is 404. */
  async function commissionFor(m: Member, commissionId: number) {
    const c = await repo.commission(m.studioId, commissionId);
    if (!c || (m.role === 'client' && c.client_id !== m.clientId)) throw errors.notFound('That commission');
    return c;
  }

  async function entries(studioId: number, commissionId: number) {
    const rows = await repo.list(studioId, commissionId);
    const byId = await recipes.summaries(studioId, [...new Set(rows.map((r) => r.recipe_id))]);
    return rows.flatMap((row) => {
      const recipe = byId.get(row.recipe_id);
      return recipe ? [{ row, recipe }] : [];
    });
  }

  const figureOf = (row: SchemeRow) => (row.figure_id === null ? null : { id: row.figure_id, name: row.figure_name ?? '' });

  async function studioView(studioId: number, commissionId: number): Promise<StudioScheme> {
    const list = await entries(studioId, commissionId);
    return {
      view: 'studio',
      commissionId,
      entries: list.map(({ row, recipe }) => ({ id: row.id, area: row.area, figure: figureOf(row), notes: row.notes, position: row.position, recipe: recipes.summarise(recipe) })),
    };
  }

  /** Colours and recipe names only: nothing of the rack (no paint, maker, stock or match) reaches a client. */
  async function clientView(studioId: number, commissionId: number): Promise<ClientScheme> {
    const list = await entries(studioId, commissionId);
    return {
      view: 'client',
      commissionId,
      entries: list.map(({ row, recipe }) => ({
        id: row.id,
        area: row.area,
        figure: figureOf(row),
        recipe: { name: recipe.name, swatch: recipe.swatch, swatches: swatchesOf(recipe.steps) },
      })),
    };
  }

  async function checkPlacement(m: Member, commissionId: number, input: { figureId?: number | null; recipeId?: number; area?: string }, current?: SchemeRow) {
    const fields: Record<string, string> = {};
    if (input.figureId && !(await repo.figure(m.studioId, commissionId, input.figureId))) fields.figureId = 'That figure is not part of this commission.';
    if (input.recipeId !== undefined && !(await repo.recipe(m.studioId, input.recipeId))) fields.recipeId = 'That recipe was not found.';
    if (Object.keys(fields).length) throw errors.invalid('Some fields need a look.', fields);
    const figureId = input.figureId !== undefined ? input.figureId : (current?.figure_id ?? null);
    const area = input.area ?? current?.area ?? '';
    if (await repo.sameArea(m.studioId, commissionId, figureId ?? null, area, current?.id)) {
      const who = figureId ? 'This figure' : 'The whole commission';
      throw errors.field('area', `${who} already has a recipe for "${area}". Name another area, or take that one out of the scheme first.`);
    }
  }

  async function entryFor(m: Member, entryId: number) {
    const row = await repo.get(m.studioId, entryId);
    if (!row) throw errors.notFound('That scheme entry');
    return row;
  }

  return {
    async get(m: Member, commissionId: number) {
      await commissionFor(m, commissionId);
      return m.role === 'client' ? clientView(m.studioId, commissionId) : studioView(m.studioId, commissionId);
    },
    async add(m: Member, commissionId: number, input: SchemeEntryInput) {
      await commissionFor(m, commissionId);
      await checkPlacement(m, commissionId, input);
      await repo.create(m.studioId, commissionId, input, now());
      return studioView(m.studioId, commissionId);
    },
    async update(m: Member, entryId: number, input: UpdateSchemeEntryInput) {
      const row = await entryFor(m, entryId);
      await checkPlacement(m, row.commission_id, input, row);
      await repo.update(m.studioId, entryId, input, now());
      return studioView(m.studioId, row.commission_id);
    },
    async remove(m: Member, entryId: number) {
      const row = await entryFor(m, entryId);
      await repo.remove(m.studioId, entryId);
      return studioView(m.studioId, row.commission_id);
    },

    /**
     * What to buy before the scheme can be painted: its paints that are out or under their threshold,
     * and the recipes' target colours the rack has nothing within ΔE00 5 of.
     */
    async shoppingList(m: Member, commissionId: number): Promise<ShoppingList> {
      await commissionFor(m, commissionId);
      const list = await entries(m.studioId, commissionId);
      const recipesById = new Map<number, Recipe>(list.map(({ recipe }) => [recipe.id, recipe]));
      const usedBy = new Map<number, Set<string>>();
      for (const r of recipesById.values()) {
        for (const s of r.steps) {
          const refs: PaintRef[] = !s.mix ? [] : s.mix.kind === 'mix' ? s.mix.paints.map((p) => p.paint) : [s.mix.from, s.mix.to];
          for (const p of refs) usedBy.set(p.id, (usedBy.get(p.id) ?? new Set()).add(r.name));
        }
      }
      const full = await paints.byIds(m.studioId, [...usedBy.keys()]);
      const restock = [...full.values()]
        .filter((p: Paint) => p.stockState !== 'ok')
        .sort((a, b) => (a.stockState === b.stockState ? a.name.localeCompare(b.name) : a.stockState === 'out' ? -1 : 1))
        .map((p) => ({
          paint: { id: p.id, name: p.name, maker: p.maker, range: p.range, type: p.type, hex: p.hex, stock: p.stock, stockState: p.stockState },
          lowStockThreshold: p.lowStockThreshold,
          recipes: [...(usedBy.get(p.id) ?? [])].sort(),
        }));

      const rack = await paints.rack(m.studioId);
      const unmatched: ShoppingList['unmatched'] = [];
      for (const r of recipesById.values()) {
        if (!r.colour) continue;
        const [nearest] = rack.nearest(r.colour, 1);
        if (!nearest || nearest.deltaE >= CLOSE_ENOUGH) {
          unmatched.push({ recipeId: r.id, recipeName: r.name, hex: r.colour, nearest: nearest ? { paint: nearest.paint, deltaE: nearest.deltaE } : null });
        }
      }
      unmatched.sort((a, b) => a.recipeName.localeCompare(b.recipeName));
      return { commissionId, restock, unmatched };
    },
  };
}

export type SchemesService = ReturnType<typeof schemesService>;
