import { isHex, ladder, mixPreview, psiToBar } from '../../../shared/color';
import { sortHazards } from '../../../shared/hazards';
import { stockState, type PaintRef } from '../../../shared/schemas/paints';
import {
  formatParts,
  stepHazards,
  swatchesOf,
  type Recipe,
  type RecipeInput,
  type RecipeListQuery,
  type RecipeStep,
  type RecipeSummary,
  type StepMix,
} from '../../../shared/schemas/recipes';
import { iso, type Clock } from '../../lib/clock';
import { errors } from '../../lib/errors';
import { pageOf } from '../../lib/page';
import type { PaintsService } from '../paints/paints.service';
import type { RecipeListRow, RecipeRow, RecipesRepository, StepRow } from './recipes.repository';
import { pushTo } from '../../lib/group-by';
import { keptReads, type VersionInZone } from '../../lib/version-cache';
import type { Page } from '../../../shared/schemas/common';

/** Recipes the kept list pages may hold across studios and queries. */
export const RECIPE_LIST_CACHE_ROWS = 20_000;

const round2 = (n: number) => Math.round(n * 100) / 100;

type StepPaint = { parts: number; paint: PaintRef };

function mixOf(step: StepRow, paints: StepPaint[]): StepMix | null {
  if (!paints.length) return null;
  const refs = paints.map((p) => p.paint);
  if (step.ladder_steps && refs.length === 2) {
    const [from, to] = refs;
    const rungs = from.hex && to.hex ? ladder(from.hex, to.hex, step.ladder_steps) : [];
    return { kind: 'ladder', from, to, steps: step.ladder_steps, rungs };
  }
  // A medium or varnish without a colour thins the mix but does not tint the preview.
  const coloured = paints.filter((p) => p.paint.hex && isHex(p.paint.hex));
  const previewHex = coloured.length ? mixPreview(coloured.map((p) => ({ hex: p.paint.hex!, parts: p.parts }))) : null;
  return { kind: 'mix', paints: paints.map((p, i) => ({ paint: refs[i], parts: p.parts })), ratio: formatParts(paints.map((p) => p.parts)), previewHex };
}

function stepView(step: StepRow, paints: StepPaint[]): RecipeStep {
  const dilution =
    step.dilution_with && step.dilution_paint_parts !== null
      ? { diluent: step.dilution_diluent_parts ?? 0, paint: step.dilution_paint_parts, with: step.dilution_with }
      : null;
  const airbrush = Boolean(step.airbrush) || step.technique === 'airbrush';
  return {
    id: step.id,
    position: step.position,
    technique: step.technique,
    airbrush,
    psi: step.psi,
    bar: step.psi === null ? null : round2(psiToBar(step.psi)),
    dilution,
    mix: mixOf(step, paints),
    tool: step.tool,
    notes: step.notes,
    hazards: stepHazards({ technique: step.technique, airbrush, dilution }, paints.map((p) => p.paint.type)),
  };
}

/**
 * A page of the list is kept per studio, lists version and query (`cacheRows` recipes at most; 0 turns it
 * off): its steps' swatches, mixes and hazards were worked out from the same rows on every request.
 */
export function recipesService(deps: { repo: RecipesRepository; paints: Pick<PaintsService, 'refsByIds'>; clock: Clock; cacheRows?: number }) {
  const { repo, paints, clock } = deps;
  const now = () => iso(clock.now());
  const keptPages = keptReads<Page<RecipeSummary>, VersionInZone>({ version: (studioId) => repo.listsVersion(studioId), maxWeight: deps.cacheRows ?? RECIPE_LIST_CACHE_ROWS, weigh: (p) => p.items.length + 1 });

  /** Recipes from their rows and their steps in order, with each step's paints (by step id). */
  function assemble(rows: (RecipeListRow & Partial<Pick<RecipeRow, 'description'>>)[], steps: StepRow[], paintsByStep: ReadonlyMap<number, StepPaint[]>): Recipe[] {
    const stepsByRecipe = new Map<number, RecipeStep[]>();
    for (const s of steps) pushTo(stepsByRecipe, s.recipe_id, stepView(s, paintsByStep.get(s.id) ?? []));
    return rows.map((r) => {
      const views = stepsByRecipe.get(r.id) ?? [];
      return {
        id: r.id,
        name: r.name,
        description: r.description ?? null,
        colour: r.colour,
        swatch: r.colour ?? swatchesOf(views)[0]?.hex ?? null,
        sourcePhotoId: r.source_photo_id,
        steps: views,
        hazards: sortHazards(views.flatMap((s) => s.hazards)),
        schemeCount: Number(r.scheme_count ?? 0),
        createdAt: r.created_at,
        updatedAt: r.updated_at,
      };
    });
  }

  /**
   * Recipes with their steps and paints, loaded in one query whatever the number: the steps joined with
   * their paints, a paint that is not on this studio's rack left out (as refsByIds leaves it out).
   */
  async function hydrate(studioId: number, rows: RecipeRow[]): Promise<Recipe[]> {
    const joined = await repo.stepsWithPaints(studioId, rows.map((r) => r.id));
    const steps: StepRow[] = [];
    const paintsByStep = new Map<number, StepPaint[]>();
    for (const row of joined) {
      if (steps[steps.length - 1]?.id !== row.id) steps.push(row);
      if (row.p_id === null) continue;
      // As toPaintRef has it (the same keys in the same order).
      const paint: PaintRef = {
        id: row.p_id,
        name: row.p_name!,
        maker: row.p_maker,
        range: row.p_range_name,
        type: row.p_type!,
        hex: row.p_hex,
        stock: row.p_stock!,
        stockState: stockState(row.p_stock!, row.p_low_stock_threshold),
      };
      pushTo(paintsByStep, row.id, { parts: row.sp_parts!, paint });
    }
    return assemble(rows, steps, paintsByStep);
  }

  /**
   * The summaries of a page of recipes, as summarise(hydrate(...)) gives them, read with only what a summary
   * shows: a step's technique, airbrush, thinner and ladder, its paints' type, colour and parts. The step
   * and paint fields a summary drops (position, PSI, diluent parts, tool, notes; a paint's name, maker, range
   * and stock) are left empty in what is assembled, and nothing of them reaches the answer.
   */
  async function summariesOf(studioId: number, rows: RecipeListRow[]): Promise<RecipeSummary[]> {
    const lean = await repo.summarySteps(studioId, rows.map((r) => r.id));
    const steps: StepRow[] = [];
    const paintsByStep = new Map<number, StepPaint[]>();
    for (const row of lean) {
      if (steps[steps.length - 1]?.id !== row.id) {
        // Filled in on the row itself: a copy of a driver's row object (spread) costs more than the rest of this loop.
        steps.push(Object.assign(row, { studio_id: studioId, position: 0, psi: null, dilution_diluent_parts: null, tool: null, notes: null }));
      }
      if (row.p_type === null) continue;
      const paint: PaintRef = { id: 0, name: '', maker: null, range: null, type: row.p_type, hex: row.p_hex, stock: 0, stockState: 'out' };
      pushTo(paintsByStep, row.id, { parts: row.sp_parts!, paint });
    }
    return assemble(rows, steps, paintsByStep).map(summarise);
  }

  const summarise = (r: Recipe): RecipeSummary => {
    const { steps, description: _d, ...rest } = r;
    const swatches = swatchesOf(steps).map((s) => s.hex);
    return { ...rest, stepCount: steps.length, techniques: [...new Set(steps.map((s) => s.technique))], swatches };
  };

  async function get(studioId: number, id: number) {
    const row = await repo.get(studioId, id);
    if (!row) throw errors.notFound('That recipe');
    return (await hydrate(studioId, [row]))[0];
  }

  /** Every paint must be on this studio's rack; the photo, if any, one of its photos. */
  async function check(studioId: number, input: RecipeInput) {
    const ids = [...new Set(input.steps.flatMap((s) => s.paints.map((p) => p.paintId)))];
    const found = await paints.refsByIds(studioId, ids);
    const fields: Record<string, string> = {};
    input.steps.forEach((s, i) =>
      s.paints.forEach((p, j) => {
        if (!found.has(p.paintId)) fields[`steps.${i}.paints.${j}.paintId`] = 'That paint is not on the rack.';
      }),
    );
    if (input.sourcePhotoId && !(await repo.photoInStudio(studioId, input.sourcePhotoId))) fields.sourcePhotoId = 'That photo was not found.';
    if (Object.keys(fields).length) throw errors.invalid('Some fields need a look.', fields);
  }

  return {
    get,
    hydrate,
    summarise,
    list(studioId: number, q: RecipeListQuery): Promise<Page<RecipeSummary>> {
      return keptPages(studioId, JSON.stringify([q.q ?? null, q.limit, q.offset]), async () => {
        const { rows, total } = await repo.list(studioId, q);
        return pageOf(await summariesOf(studioId, rows), total, q);
      });
    },
    /** Summaries of the given recipes, by id (for schemes). */
    async summaries(studioId: number, ids: number[]) {
      return new Map((await hydrate(studioId, await repo.byIds(studioId, ids))).map((r) => [r.id, r]));
    },
    async create(studioId: number, userId: number, input: RecipeInput) {
      await check(studioId, input);
      return get(studioId, await repo.create(studioId, userId, input, now()));
    },
    async replace(studioId: number, id: number, input: RecipeInput) {
      await get(studioId, id);
      await check(studioId, input);
      await repo.replace(studioId, id, input, now());
      return get(studioId, id);
    },
    async remove(studioId: number, id: number) {
      await get(studioId, id);
      const using = await repo.schemesUsing(studioId, id);
      if (using.length) {
        const names = using.slice(0, 3).map((c) => `"${c.title}"`).join(', ') + (using.length > 3 ? ` and ${using.length - 3} more` : '');
        throw errors.conflict(`This recipe is in the scheme of ${names}. Take it out of the scheme first.`, 'recipe_in_use', { commissions: using });
      }
      await repo.remove(studioId, id);
    },
  };
}

export type RecipesService = ReturnType<typeof recipesService>;
