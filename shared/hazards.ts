// Safety cautions: the hazard keys, their default texts, and which stages and techniques carry them.
// Texts follow the handbook's safety notes (product.md, "Safety"); studios may edit title and text,
// but the closing sentence (SAFETY_FOOTER) is always shown after them.

export const hazardKeys = ['spray', 'solvent', 'resin', 'pigment', 'superglue'] as const;
export type HazardKey = (typeof hazardKeys)[number];

export const isHazardKey = (k: string): k is HazardKey => (hazardKeys as readonly string[]).includes(k);

export const SAFETY_FOOTER = "Follow the product's safety data sheet and your local rules.";

export type HazardText = { key: HazardKey; title: string; text: string };

/** Default texts, from product.md "Safety" (the studio can edit them). Stored without the footer. */
export const defaultHazards: HazardText[] = [
  {
    key: 'spray',
    title: 'Airbrushing and spraying',
    text: 'Airbrushing and spray priming or varnishing: use a spray booth or extraction, wear a respirator with particulate filters (and organic-vapour cartridges for solvent-based paints), and keep ignition sources away.',
  },
  {
    key: 'solvent',
    title: 'Solvents, enamels and oils',
    text: 'Enamel and oil washes, thinners, mineral spirits and isopropyl alcohol are flammable: ventilate and wear gloves. Rags soaked in oil or spirits can self-heat: dry them flat outdoors or keep them in a closed metal can.',
  },
  {
    key: 'resin',
    title: 'Resin dust',
    text: 'Resin prep: wet-sand, wear a mask and eye protection, wash the parts, and keep the dust off your skin.',
  },
  {
    key: 'pigment',
    title: 'Weathering pigments',
    text: 'Weathering pigments: avoid raising dust; wear a mask and gloves.',
  },
  {
    key: 'superglue',
    title: 'Superglue',
    text: 'Superglue: ventilate, as people become sensitised. On contact with the eyes, flush with water for 15 minutes and get help.',
  },
];

/** The text as shown: the studio's text, then the footer once. */
export function withFooter(text: string): string {
  const t = stripFooter(text);
  return t ? `${t} ${SAFETY_FOOTER}` : SAFETY_FOOTER;
}

/** Removes a trailing footer, so a text read from the API and sent back is not stored with it twice. */
export function stripFooter(text: string): string {
  let t = text.trim();
  while (t.endsWith(SAFETY_FOOTER)) t = t.slice(0, -SAFETY_FOOTER.length).trim();
  return t;
}

/** Hazard keys in their canonical order, without repeats or unknown keys. */
export function sortHazards(keys: Iterable<string>): HazardKey[] {
  const set = new Set(keys);
  return hazardKeys.filter((k) => set.has(k));
}

// --- techniques (recipe steps use these; a stage's hazards are its own plus those of its techniques) ---

export const techniques = [
  'brush',
  'drybrush',
  'wet-blend',
  'sponge',
  'airbrush',
  'spray-can',
  'enamel-wash',
  'oil-wash',
  'oil-paint',
  'pigment',
  'superglue',
  'resin-sanding',
  'strip-ipa',
] as const;
export type Technique = (typeof techniques)[number];

/** Which hazards a technique carries; brush work carries none. */
export const techniqueHazards: Record<Technique, HazardKey[]> = {
  brush: [],
  drybrush: [],
  'wet-blend': [],
  sponge: [],
  airbrush: ['spray'],
  'spray-can': ['spray'],
  'enamel-wash': ['solvent'],
  'oil-wash': ['solvent'],
  'oil-paint': ['solvent'],
  pigment: ['pigment'],
  superglue: ['superglue'],
  'resin-sanding': ['resin'],
  'strip-ipa': ['solvent'],
};

/** The hazards of a list of techniques (e.g. the steps of a recipe), unknown techniques carry none. */
export function hazardsOfTechniques(list: Iterable<string>): HazardKey[] {
  const out: string[] = [];
  for (const t of list) out.push(...(techniqueHazards[t as Technique] ?? []));
  return sortHazards(out);
}

// --- the default stage template --------------------------------------------------------------------

export type TemplateStage = { key: string; name: string; defaultMinutes: number; waitMinutes: number; hazards: HazardKey[] };

/**
 * Hazards of the default stages as they are usually worked (common practice): prep of resin parts raises
 * dust, assembly and basing (tufts, bits) use superglue, priming and varnishing are sprayed, weathering uses
 * pigments and enamel or oil washes. Brush-only stages (basecoat … details) carry none; when a recipe puts an
 * airbrush on them, hazardsOfTechniques adds the spray caution.
 */
export const stageHazards: Record<string, HazardKey[]> = {
  prep: ['resin'],
  assembly: ['superglue'],
  prime: ['spray'],
  basecoat: [],
  shade: [],
  layer: [],
  glaze: [],
  details: [],
  basing: ['superglue'],
  weathering: ['solvent', 'pigment'],
  varnish: ['spray'],
};

/** A stage's hazards: its own (from the template) plus those of the techniques used on it. */
export function hazardsForStage(own: Iterable<string>, stageTechniques: Iterable<string> = []): HazardKey[] {
  return sortHazards([...own, ...hazardsOfTechniques(stageTechniques)]);
}

/**
 * The template a new studio starts with. Default minutes are invented starting values for one 28 mm
 * tabletop figure (the same figures as the price table's tabletop defaults); the owner edits them.
 * Waits after a stage, from ../reference/acrylic_drying_dilution.tsv:
 * - prime 2 h: acrylic gesso (primer) "dry for at least one hour" before the next coat, overnight before
 *   detail work (GOLDEN / Just Paint, "Suggested Drying Times Between Acrylic Products", source 2);
 *   2 h is the handbook's lower bound for primer (product.md: 2 h to 24 h).
 * - varnish 24 h: water-based varnish recoat after at least an hour, full cure over weeks (Jo Sonja matte
 *   varnish directions, source 6); 24 h before handling for packing is the handbook's figure.
 * - other acrylic stages 0: recoat "when touch-dry" (Liquitex "Drying Time", source 5).
 */
export const defaultStageTemplate: TemplateStage[] = [
  { key: 'prep', name: 'Prep & clean', defaultMinutes: 15, waitMinutes: 0, hazards: stageHazards.prep },
  { key: 'assembly', name: 'Assembly', defaultMinutes: 15, waitMinutes: 0, hazards: stageHazards.assembly },
  { key: 'prime', name: 'Prime', defaultMinutes: 6, waitMinutes: 120, hazards: stageHazards.prime },
  { key: 'basecoat', name: 'Basecoat', defaultMinutes: 30, waitMinutes: 0, hazards: stageHazards.basecoat },
  { key: 'shade', name: 'Shade', defaultMinutes: 9, waitMinutes: 0, hazards: stageHazards.shade },
  { key: 'layer', name: 'Layer & highlight', defaultMinutes: 30, waitMinutes: 0, hazards: stageHazards.layer },
  { key: 'glaze', name: 'Glaze', defaultMinutes: 9, waitMinutes: 0, hazards: stageHazards.glaze },
  { key: 'details', name: 'Details', defaultMinutes: 15, waitMinutes: 0, hazards: stageHazards.details },
  { key: 'basing', name: 'Basing', defaultMinutes: 15, waitMinutes: 0, hazards: stageHazards.basing },
  { key: 'weathering', name: 'Weathering', defaultMinutes: 6, waitMinutes: 0, hazards: stageHazards.weathering },
  { key: 'varnish', name: 'Varnish', defaultMinutes: 6, waitMinutes: 24 * 60, hazards: stageHazards.varnish },
];
