// Recipes (ordered steps for an area), a commission's scheme and its shopping list: requests (zod),
// responses and the small rules both sides share (a step's hazards, how a dilution reads).
import { z } from 'zod';
import type { LadderStep } from '../color';
import { hazardsOfTechniques, type HazardKey } from '../hazards';
import { arrayPageParams } from './common';
import { optionalHex, type PaintRef, type PaintType } from './paints';

export const recipeTechniques = [
  'basecoat',
  'layer',
  'highlight',
  'edge-highlight',
  'glaze',
  'wash',
  'drybrush',
  'stipple',
  'wet-blend',
  'airbrush',
  'sponge-chipping',
  'weathering',
  'varnish',
] as const;
export type RecipeTechnique = (typeof recipeTechniques)[number];
export const techniqueLabels: Record<RecipeTechnique, string> = {
  basecoat: 'Basecoat',
  layer: 'Layer',
  highlight: 'Highlight',
  'edge-highlight': 'Edge highlight',
  glaze: 'Glaze',
  wash: 'Wash',
  drybrush: 'Drybrush',
  stipple: 'Stipple',
  'wet-blend': 'Wet blend',
  airbrush: 'Airbrush',
  'sponge-chipping': 'Sponge chipping',
  weathering: 'Weathering',
  varnish: 'Varnish',
};

export const diluents = ['water', 'medium', 'thinner'] as const;
export type Diluent = (typeof diluents)[number];
export const diluentLabels: Record<Diluent, string> = { water: 'water', medium: 'medium', thinner: 'solvent thinner' };

export const MAX_MIX_PAINTS = 6;
export const MAX_LADDER_STEPS = 10;
/** A range that covers airbrush work; glazing is commonly about 10–15 psi (common practice). */
export const MIN_PSI = 1;
export const MAX_PSI = 60;

const partsOf = (what: string) =>
  z
    .number({ error: `Enter the parts of ${what}.` })
    .int('Use whole parts (1:1, 3:1, 5:1).')
    .min(0, 'Cannot be below 0.')
    .max(50, 'Use at most 50 parts.');

export const dilutionInput = z.object({
  diluent: partsOf('water or medium'),
  paint: partsOf('paint').min(1, 'At least 1 part paint.'),
  with: z.enum(diluents, { error: 'Choose water, medium or solvent thinner.' }),
});
export type DilutionInput = z.infer<typeof dilutionInput>;

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max} characters.`)
    .nullable()
    .optional()
    .transform((v) => (v === '' ? null : v));

export const stepInput = z
  .object({
    technique: z.enum(recipeTechniques, { error: 'Choose a technique.' }),
    /** Applied with an airbrush (always so for the airbrush technique). */
    airbrush: z.boolean().optional().default(false),
    psi: z
      .number({ error: 'Enter the pressure in psi.' })
      .min(MIN_PSI, `At least ${MIN_PSI} psi.`)
      .max(MAX_PSI, `At most ${MAX_PSI} psi.`)
      .nullable()
      .optional()
      .transform((v) => v ?? null),
    dilution: dilutionInput
      .nullable()
      .optional()
      .transform((v) => v ?? null),
    paints: z
      .array(
        z.object({
          paintId: z.number({ error: 'Choose a paint.' }).int().positive('Choose a paint.'),
          parts: z.number({ error: 'Enter the parts.' }).positive('Parts must be above 0.').max(100, 'Use at most 100 parts.').optional().default(1),
        }),
      )
      .max(MAX_MIX_PAINTS, `At most ${MAX_MIX_PAINTS} paints in one step.`)
      .optional()
      .default([]),
    /** A ladder of progressive mixes from the first paint to the second in this many steps. */
    ladderSteps: z
      .number({ error: 'Enter the number of steps.' })
      .int('Use a whole number.')
      .min(1, 'At least 1 step.')
      .max(MAX_LADDER_STEPS, `At most ${MAX_LADDER_STEPS} steps.`)
      .nullable()
      .optional()
      .transform((v) => v ?? null),
    tool: optionalText(80),
    notes: optionalText(1000),
  })
  .transform((s) => ({ ...s, airbrush: s.airbrush || s.technique === 'airbrush' }))
  .superRefine((s, ctx) => {
    if (s.psi !== null && !s.airbrush) ctx.addIssue({ code: 'custom', path: ['psi'], message: 'Air pressure is for airbrush steps; tick "airbrush" or clear it.' });
    if (s.ladderSteps !== null && s.paints.length !== 2) {
      ctx.addIssue({ code: 'custom', path: ['paints'], message: 'A ladder goes from one paint to another: choose exactly two.' });
    }
    const seen = new Set<number>();
    s.paints.forEach((p, i) => {
      if (seen.has(p.paintId)) ctx.addIssue({ code: 'custom', path: ['paints', i, 'paintId'], message: 'This paint is already in the step.' });
      seen.add(p.paintId);
    });
  });
export type StepInput = z.infer<typeof stepInput>;

export const recipeInput = z.object({
  name: z.string({ error: 'Name the recipe.' }).trim().min(1, 'Name the recipe, e.g. "washed denim".').max(120, 'Use at most 120 characters.'),
  description: optionalText(2000),
  colour: optionalHex,
  sourcePhotoId: z.number().int().positive().nullable().optional(),
  steps: z.array(stepInput).max(30, 'At most 30 steps.').optional().default([]),
});
export type RecipeInput = z.infer<typeof recipeInput>;

export const recipeListQuery = arrayPageParams.extend({ q: z.string().trim().max(200).optional() });
export type RecipeListQuery = z.infer<typeof recipeListQuery>;

export const schemeEntryInput = z.object({
  figureId: z.number({ error: 'Choose a figure, or the whole commission.' }).int().positive().nullable().optional(),
  area: z.string({ error: 'Name the area, e.g. "cloak".' }).trim().min(1, 'Name the area, e.g. "cloak".').max(80, 'Use at most 80 characters.'),
  recipeId: z.number({ error: 'Choose a recipe.' }).int('Choose a recipe.').positive('Choose a recipe.'),
  notes: optionalText(500),
});
export type SchemeEntryInput = z.infer<typeof schemeEntryInput>;
export const updateSchemeEntryInput = schemeEntryInput.partial();
export type UpdateSchemeEntryInput = z.infer<typeof updateSchemeEntryInput>;

// --- rules both sides share ---------------------------------------------------------------------

/**
 * A step's hazards, through shared/hazards: an airbrush sprays, a solvent thinner or an enamel or oil
 * wash is a solvent, weathering pigments raise dust.
 */
export function stepHazards(step: { technique: string; airbrush: boolean; dilution: { with: Diluent } | null }, paintTypes: Iterable<PaintType>): HazardKey[] {
  const uses: string[] = [];
  if (step.airbrush || step.technique === 'airbrush') uses.push('airbrush');
  if (step.dilution?.with === 'thinner') uses.push('enamel-wash');
  for (const t of paintTypes) {
    if (t === 'solvent-wash') uses.push('enamel-wash');
    if (t === 'pigment') uses.push('pigment');
  }
  return hazardsOfTechniques(uses);
}

/** "5:1 water" — parts of water or medium to parts of paint. */
export function formatDilution(d: { diluent: number; paint: number; with: Diluent }): string {
  return `${d.diluent}:${d.paint} ${diluentLabels[d.with]} to paint`;
}

/** "1:1", "3:1", "2:1:1": the parts of a mix in order. */
export function formatParts(parts: number[]): string {
  return parts.map((p) => String(Math.round(p * 100) / 100)).join(':');
}

/** The colours a recipe shows, in step order: each mix's preview, each ladder's paints and rungs. */
export function swatchesOf(steps: RecipeStep[]): { technique: RecipeTechnique; hex: string }[] {
  const out: { technique: RecipeTechnique; hex: string }[] = [];
  const push = (technique: RecipeTechnique, hex: string | null) => {
    if (hex && out[out.length - 1]?.hex !== hex) out.push({ technique, hex });
  };
  for (const s of steps) {
    if (!s.mix) continue;
    if (s.mix.kind === 'mix') push(s.technique, s.mix.previewHex);
    else {
      push(s.technique, s.mix.from.hex);
      for (const r of s.mix.rungs) push(s.technique, r.hex);
      push(s.technique, s.mix.to.hex);
    }
  }
  return out;
}

// --- responses ----------------------------------------------------------------------------------

export type StepMix =
  | { kind: 'mix'; paints: { paint: PaintRef; parts: number }[]; ratio: string; previewHex: string | null }
  | { kind: 'ladder'; from: PaintRef; to: PaintRef; steps: number; rungs: LadderStep[] };

export type RecipeStep = {
  id: number;
  position: number;
  technique: RecipeTechnique;
  airbrush: boolean;
  psi: number | null;
  /** psi in bar, two decimals */
  bar: number | null;
  dilution: DilutionInput | null;
  /** null when the step uses no paint from the rack */
  mix: StepMix | null;
  tool: string | null;
  notes: string | null;
  hazards: HazardKey[];
};

export type Recipe = {
  id: number;
  name: string;
  description: string | null;
  /** the target colour, when one was chosen */
  colour: string | null;
  /** what the recipe shows as: the target colour, or the preview of its first step with paint */
  swatch: string | null;
  sourcePhotoId: number | null;
  steps: RecipeStep[];
  hazards: HazardKey[];
  /** scheme entries using it */
  schemeCount: number;
  createdAt: string;
  updatedAt: string;
};

export type RecipeSummary = Omit<Recipe, 'steps' | 'description'> & { stepCount: number; techniques: RecipeTechnique[]; swatches: string[] };

export type SchemeEntry = {
  id: number;
  area: string;
  figure: { id: number; name: string } | null;
  notes: string | null;
  position: number;
  recipe: RecipeSummary;
};

/** What the client sees: colours and recipe names, never the rack. */
export type ClientSchemeEntry = {
  id: number;
  area: string;
  figure: { id: number; name: string } | null;
  recipe: { name: string; swatch: string | null; swatches: { technique: RecipeTechnique; hex: string }[] };
};

export type StudioScheme = { view: 'studio'; commissionId: number; entries: SchemeEntry[] };
export type ClientScheme = { view: 'client'; commissionId: number; entries: ClientSchemeEntry[] };
export type Scheme = StudioScheme | ClientScheme;

export type ShoppingList = {
  commissionId: number;
  /** paints the scheme uses that are out of stock or under their threshold */
  restock: { paint: PaintRef; lowStockThreshold: number | null; recipes: string[] }[];
  /** recipe colours the rack has nothing within ΔE00 5 of */
  unmatched: { recipeId: number; recipeName: string; hex: string; nearest: { paint: PaintRef; deltaE: number } | null }[];
};
