// The paint rack, colour matches and reference-photo palettes: requests (zod) and responses.
import { z } from 'zod';
import { isHex, normalizeHex, type MatchBand } from '../color';
import { arrayPageParams } from './common';

export const paintTypes = ['primer', 'base', 'layer', 'wash', 'glaze', 'ink', 'metallic', 'tint', 'medium', 'varnish', 'solvent-wash', 'pigment'] as const;
export type PaintType = (typeof paintTypes)[number];
export const paintTypeLabels: Record<PaintType, string> = {
  primer: 'Primer',
  base: 'Base',
  layer: 'Layer',
  wash: 'Shade / wash',
  glaze: 'Glaze',
  ink: 'Ink',
  metallic: 'Metallic',
  tint: 'One-coat tint',
  medium: 'Medium',
  varnish: 'Varnish',
  'solvent-wash': 'Enamel or oil wash',
  pigment: 'Pigment',
};
/** Types that may have no colour of their own. */
export const colourlessTypes: readonly PaintType[] = ['medium', 'varnish'];

export const finishes = ['matte', 'satin', 'gloss'] as const;
export type Finish = (typeof finishes)[number];
export const finishLabels: Record<Finish, string> = { matte: 'Matte', satin: 'Satin', gloss: 'Gloss' };

export const HEX_MESSAGE = 'Use a colour such as #1F3A93: # and six digits 0–9 or letters A–F.';

/** "#abc", "aabbcc", "#AABBCC" → "#AABBCC"; anything else is refused with a message for the field. */
export const hexColour = z
  .string({ error: HEX_MESSAGE })
  .trim()
  .refine((v) => isHex(v), HEX_MESSAGE)
  .transform((v) => normalizeHex(v));

/** A colour that may be cleared: null or '' clear it, undefined leaves it. */
export const optionalHex = z
  .string({ error: HEX_MESSAGE })
  .trim()
  .nullable()
  .optional()
  .refine((v) => v === undefined || v === null || v === '' || isHex(v), HEX_MESSAGE)
  .transform((v) => (v === undefined || v === null ? v : v === '' ? null : normalizeHex(v)));

/** Text that can be cleared: null or '' clear it. */
const clearable = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `Use at most ${max} characters.`)
    .nullable()
    .optional()
    .transform((v) => (v === '' ? null : v));

const count = (what: string) =>
  z
    .number({ error: `Enter ${what} as a whole number.` })
    .int('Use a whole number.')
    .min(0, 'Cannot be below 0.')
    .max(9999, 'Use at most 9999.');

const paintFields = z.object({
  name: z.string({ error: 'Enter the name of the paint.' }).trim().min(1, 'Enter the name of the paint.').max(120, 'Use at most 120 characters.'),
  maker: clearable(80),
  range: clearable(80),
  type: z.enum(paintTypes, { error: 'Choose a type from the list.' }),
  finish: z.preprocess((v) => (v === '' ? null : v), z.enum(finishes, { error: 'Choose matte, satin or gloss.' }).nullable().optional()),
  hex: optionalHex,
  stock: count('the pots in stock').optional(),
  lowStockThreshold: count('the low-stock level').nullable().optional(),
  notes: clearable(2000),
});

export const NEEDS_COLOUR_MESSAGE = 'Give the colour (a medium or varnish may go without).';
/** True when a paint of this type must have a colour and has none. */
export const colourMissing = (p: { type?: PaintType; hex?: string | null }) => Boolean(p.type && !colourlessTypes.includes(p.type) && !p.hex);

const needsColour = (p: { type?: PaintType; hex?: string | null }, ctx: z.RefinementCtx) => {
  if (colourMissing(p)) ctx.addIssue({ code: 'custom', path: ['hex'], message: NEEDS_COLOUR_MESSAGE });
};

/** The fields without the colour rule: a CSV without a Colour column may still update stock. */
export const paintRowFields = paintFields;

export const createPaintInput = paintFields.superRefine(needsColour);
export type CreatePaintInput = z.infer<typeof createPaintInput>;

/** Partial: the merged paint is checked again on the server (a colour paint still needs its colour). */
export const updatePaintInput = paintFields.partial();
export type UpdatePaintInput = z.infer<typeof updatePaintInput>;

export const stockStates = ['ok', 'low', 'out'] as const;
export type StockState = (typeof stockStates)[number];

export const paintListQuery = arrayPageParams.extend({
  q: z.string().trim().max(200).optional(),
  type: z.enum(paintTypes).optional(),
  stock: z.enum(['low', 'out', 'short']).optional(), // short: low or out
});
export type PaintListQuery = z.infer<typeof paintListQuery>;
/** What the rack is filtered by, without the page. */
export type PaintFilter = Omit<PaintListQuery, 'limit' | 'offset'>;

export const nearestQuery = z.object({
  hex: hexColour,
  k: z.coerce.number().int().min(1).max(10).default(3),
});
export type NearestQuery = z.infer<typeof nearestQuery>;

/** The CSV travels as text inside JSON; about 900 kB leaves room in the 1 MB body limit. */
export const importPaintsInput = z.object({
  csv: z.string({ error: 'Send the CSV file as text.' }).min(1, 'The file is empty.').max(900_000, 'That file is too large; split it into files under 900 kB.'),
});
export type ImportPaintsInput = z.infer<typeof importPaintsInput>;

export const pointQuery = z.object({
  x: z.coerce.number({ error: 'Give x from 0 to 1.' }).min(0, 'From 0 to 1.').max(1, 'From 0 to 1.'),
  y: z.coerce.number({ error: 'Give y from 0 to 1.' }).min(0, 'From 0 to 1.').max(1, 'From 0 to 1.'),
});
export type PointQuery = z.infer<typeof pointQuery>;

// --- responses ----------------------------------------------------------------------------------

export type Paint = {
  id: number;
  name: string;
  maker: string | null;
  range: string | null;
  type: PaintType;
  finish: Finish | null;
  hex: string | null;
  stock: number;
  lowStockThreshold: number | null;
  notes: string | null;
  stockState: StockState;
  /** recipes that use this paint */
  recipeCount: number;
  createdAt: string;
  updatedAt: string;
};

/** What a recipe step or a match shows of a paint. */
export type PaintRef = Pick<Paint, 'id' | 'name' | 'maker' | 'range' | 'type' | 'hex' | 'stock' | 'stockState'>;

export type PaintMatchView = { paint: PaintRef; deltaE: number; band: MatchBand };

export type ImportReport = {
  created: number;
  updated: number;
  /** rows left out, by the line of the file they start on */
  skipped: { line: number; message: string }[];
  /** remarks on the file as a whole (unknown columns, a quote never closed) */
  notes: string[];
};

export type PaletteEntry = { hex: string; share: number; matches: PaintMatchView[] };
export type PhotoPalette = { photoId: number; commissionId: number; colours: PaletteEntry[] };
export type PointColour = { hex: string; x: number; y: number; matches: PaintMatchView[] };

/** When stock is under the threshold it is low; 0 pots is out whatever the threshold. */
export function stockState(stock: number, threshold: number | null): StockState {
  if (stock <= 0) return 'out';
  if (threshold !== null && stock < threshold) return 'low';
  return 'ok';
}
