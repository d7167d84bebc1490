import { paintsRepository } from '../server/features/paints/paints.repository';
import { paintsService } from '../server/features/paints/paints.service';
import { recipesRepository } from '../server/features/recipes/recipes.repository';
import { recipesService } from '../server/features/recipes/recipes.service';
import { schemesRepository } from '../server/features/schemes/schemes.repository';
import { schemesService } from '../server/features/schemes/schemes.service';
import type { Member } from '../server/lib/policy';
import type { CreatePaintInput, PaintType } from '../shared/schemas/paints';
import type { RecipeInput } from '../shared/schemas/recipes';
import type { DemoContext } from './demo';

// The demo rack: about sixty paints from three makers, all invented (names, makers and ranges are
// ours; none is a real brand or product). Colours are plain sRGB picks for each name.
const QUILLMOOR = 'Quillmoor Colour Works';
const BRACKENFOLD = 'Brackenfold Pigments';
const TANSY = 'Tansy & Lowe';

type Row = [name: string, maker: string, range: string | null, type: PaintType, hex: string | null, stock: number, low?: number];

const rack: Row[] = [
  // Quillmoor: a general bench range
  ['Grey primer', QUILLMOOR, 'Ground', 'primer', '#8C8C88', 2],
  ['Bone primer', QUILLMOOR, 'Ground', 'primer', '#D8CDB4', 1],
  ['Soot primer', QUILLMOOR, 'Ground', 'primer', '#26231F', 0],
  ['Fen moss', QUILLMOOR, 'Bench', 'base', '#4A5D23', 3, 2],
  ['Bog green', QUILLMOOR, 'Bench', 'base', '#3E4A2A', 1, 2],
  ['Reed green', QUILLMOOR, 'Bench', 'layer', '#7A8B4A', 2],
  ['Lichen', QUILLMOOR, 'Bench', 'layer', '#A7B07A', 2],
  ['Peat brown', QUILLMOOR, 'Bench', 'base', '#4B3621', 2],
  ['Saddle leather', QUILLMOOR, 'Bench', 'base', '#7B4A2A', 1],
  ['Tallow', QUILLMOOR, 'Bench', 'layer', '#E4D6A7', 2],
  ['Warm bone', QUILLMOOR, 'Bench', 'base', '#CDBA8E', 4, 2],
  ['Old parchment', QUILLMOOR, 'Bench', 'layer', '#EDE3C8', 2],
  ['Chalk white', QUILLMOOR, 'Bench', 'layer', '#F4F1EA', 3, 2],
  ['Lamp black', QUILLMOOR, 'Bench', 'base', '#1E1C1A', 3],
  ['Slate grey', QUILLMOOR, 'Bench', 'base', '#5A6066', 2],
  ['Dove grey', QUILLMOOR, 'Bench', 'layer', '#A9ACAA', 1],
  ['Harbour navy', QUILLMOOR, 'Bench', 'base', '#1F3A93', 2],
  ['Faded denim', QUILLMOOR, 'Bench', 'layer', '#5B7DB1', 1],
  ['Sky wash blue', QUILLMOOR, 'Bench', 'layer', '#9DB8D9', 1],
  ['Brick red', QUILLMOOR, 'Bench', 'base', '#8E3B2E', 2],
  ['Poppy red', QUILLMOOR, 'Bench', 'layer', '#C8372D', 1],
  ['Ember orange', QUILLMOOR, 'Bench', 'layer', '#D9682B', 1],
  ['Ochre', QUILLMOOR, 'Bench', 'base', '#C08A2E', 2],
  ['Straw yellow', QUILLMOOR, 'Bench', 'layer', '#E2C25B', 1],
  ['Warm flesh', QUILLMOOR, 'Bench', 'base', '#C98F6B', 2],
  ['Pale flesh', QUILLMOOR, 'Bench', 'layer', '#E7BFA0', 1],
  ['Plum', QUILLMOOR, 'Bench', 'base', '#5B2C4F', 1],
  ['Heather', QUILLMOOR, 'Bench', 'layer', '#9B7A9E', 0],
  // Brackenfold: washes, glazes, inks and the solvent-based shades
  ['Umber shade', BRACKENFOLD, 'Deep shade', 'wash', '#3B2A1E', 2],
  ['Moss shade', BRACKENFOLD, 'Deep shade', 'wash', '#2E3A1C', 1],
  ['Soot shade', BRACKENFOLD, 'Deep shade', 'wash', '#1B1A1C', 2],
  ['Sepia shade', BRACKENFOLD, 'Deep shade', 'wash', '#6B4A2B', 1],
  ['Teal glaze', BRACKENFOLD, 'Clear glazes', 'glaze', '#2F8C86', 1],
  ['Rose glaze', BRACKENFOLD, 'Clear glazes', 'glaze', '#B5566A', 1],
  ['Amber glaze', BRACKENFOLD, 'Clear glazes', 'glaze', '#C7861F', 1],
  ['Marsh ink', BRACKENFOLD, 'Lantern inks', 'ink', '#1F5E4B', 1],
  ['Lantern ink', BRACKENFOLD, 'Lantern inks', 'ink', '#3FB7A5', 0],
  ['Indigo ink', BRACKENFOLD, 'Lantern inks', 'ink', '#27306B', 1],
  ['Carmine ink', BRACKENFOLD, 'Lantern inks', 'ink', '#8C1C2E', 1],
  ['Grime wash (enamel)', BRACKENFOLD, 'Field shades', 'solvent-wash', '#4A3A2A', 1],
  ['Rust streak (oil)', BRACKENFOLD, 'Field shades', 'solvent-wash', '#8A4B24', 1],
  ['Deep black wash (enamel)', BRACKENFOLD, 'Field shades', 'solvent-wash', '#201D1A', 0],
  ['Lichen tint', BRACKENFOLD, 'One coat', 'tint', '#6F7F3C', 2],
  ['Bruise tint', BRACKENFOLD, 'One coat', 'tint', '#5A3B5C', 1],
  ['Driftwood tint', BRACKENFOLD, 'One coat', 'tint', '#8B7A62', 1],
  // Tansy & Lowe: metals, pigments, mediums and varnishes
  ['Dark iron', TANSY, 'Foundry', 'metallic', '#4B4B4D', 2],
  ['Bright steel', TANSY, 'Foundry', 'metallic', '#B7BABD', 1],
  ['Old brass', TANSY, 'Foundry', 'metallic', '#9C7A3C', 1],
  ['Red copper', TANSY, 'Foundry', 'metallic', '#A25B37', 0],
  ['Pale gold', TANSY, 'Foundry', 'metallic', '#D1B25E', 1],
  ['Verdigris crust', TANSY, 'Foundry', 'layer', '#4FA08B', 1],
  ['Road dust', TANSY, 'Field pigments', 'pigment', '#B59B7A', 1],
  ['Fresh rust', TANSY, 'Field pigments', 'pigment', '#9A4A22', 1],
  ['Peat mud', TANSY, 'Field pigments', 'pigment', '#4E3B2A', 1],
  ['Soot pigment', TANSY, 'Field pigments', 'pigment', '#2A2826', 1],
  ['Glaze medium', TANSY, 'Mediums', 'medium', null, 2],
  ['Flow improver', TANSY, 'Mediums', 'medium', null, 1],
  ['Matte coat', TANSY, 'Varnishes', 'varnish', null, 2],
  ['Gloss coat', TANSY, 'Varnishes', 'varnish', null, 1],
  ['Satin coat', TANSY, 'Varnishes', 'varnish', null, 1],
];

const finishFor = (r: Row): CreatePaintInput['finish'] =>
  r[3] === 'varnish' ? (r[0].startsWith('Gloss') ? 'gloss' : r[0].startsWith('Satin') ? 'satin' : 'matte') : r[3] === 'metallic' || r[3] === 'ink' || r[3] === 'glaze' ? 'satin' : 'matte';

/** The rack, four recipes and the scheme of Priya's goblin warband (on the bench). */
export async function paintsDemo(ctx: DemoContext) {
  const { db, studioId, users, clock } = ctx;
  const paints = paintsService({ db, repo: paintsRepository(db), clock });
  const recipes = recipesService({ repo: recipesRepository(db), paints, clock });
  const schemes = schemesService({ repo: schemesRepository(db), recipes, paints, clock });

  const id: Record<string, number> = {};
  for (const r of rack) {
    const p = await paints.create(studioId, {
      name: r[0],
      maker: r[1],
      range: r[2],
      type: r[3],
      finish: finishFor(r),
      hex: r[4],
      stock: r[5],
      lowStockThreshold: r[6] ?? null,
      notes: r[3] === 'solvent-wash' ? 'Thin with white spirit; keep the lid on between uses.' : null,
    });
    id[r[0]] = p.id;
  }
  const use = (name: string, parts = 1) => ({ paintId: id[name], parts });
  const step = (s: Partial<RecipeInput['steps'][number]> & Pick<RecipeInput['steps'][number], 'technique'>): RecipeInput['steps'][number] => ({
    airbrush: false,
    psi: null,
    dilution: null,
    paints: [],
    ladderSteps: null,
    tool: null,
    notes: null,
    ...s,
  });

  const skin = await recipes.create(studioId, users.painter, {
    name: 'Bog goblin skin',
    description: 'Muted swamp green that still reads on the table.',
    colour: '#50622A',
    steps: [
      step({ technique: 'basecoat', paints: [use('Bog green')], tool: 'Size 2 round', notes: 'Two thin coats.' }),
      step({ technique: 'wash', paints: [use('Moss shade')], notes: 'Into the recesses only.' }),
      step({ technique: 'layer', paints: [use('Fen moss', 3), use('Bog green', 1)] }),
      step({ technique: 'highlight', paints: [use('Fen moss'), use('Lichen')], ladderSteps: 3, tool: 'Size 1 round' }),
    ],
  });
  const glow = await recipes.create(studioId, users.painter, {
    name: 'Sickly lantern glow',
    description: 'Teal light around the lanterns, from the client’s reference photo.',
    colour: '#48D1C0',
    steps: [
      step({ technique: 'basecoat', paints: [use('Chalk white')] }),
      step({ technique: 'airbrush', airbrush: true, psi: 12, paints: [use('Lantern ink', 1), use('Glaze medium', 2)], dilution: { diluent: 5, paint: 1, with: 'water' }, notes: 'Light passes from the lantern outwards.' }),
      step({ technique: 'glaze', paints: [use('Teal glaze')], dilution: { diluent: 6, paint: 1, with: 'water' }, tool: 'Size 0 round' }),
      step({ technique: 'edge-highlight', paints: [use('Chalk white', 1), use('Teal glaze', 1)] }),
    ],
  });
  const bone = await recipes.create(studioId, users.owner, {
    name: 'Warm bone',
    description: 'Horns, tusks and bone charms.',
    colour: null,
    steps: [
      step({ technique: 'basecoat', paints: [use('Warm bone')] }),
      step({ technique: 'wash', paints: [use('Sepia shade')] }),
      step({ technique: 'highlight', paints: [use('Warm bone'), use('Old parchment')], ladderSteps: 2 }),
      step({ technique: 'edge-highlight', paints: [use('Chalk white')] }),
    ],
  });
  const iron = await recipes.create(studioId, users.owner, {
    name: 'Rusted iron',
    description: 'Blades and lantern frames.',
    colour: null,
    steps: [
      step({ technique: 'basecoat', paints: [use('Dark iron')] }),
      step({ technique: 'wash', paints: [use('Grime wash (enamel)')], dilution: { diluent: 1, paint: 1, with: 'thinner' }, notes: 'Remove the excess with a brush damp with thinner.' }),
      step({ technique: 'sponge-chipping', paints: [use('Peat brown')], tool: 'Blister-pack foam' }),
      step({ technique: 'weathering', paints: [use('Fresh rust')], tool: 'Old stiff brush' }),
      step({ technique: 'edge-highlight', paints: [use('Bright steel')] }),
      step({ technique: 'varnish', airbrush: true, psi: 20, paints: [use('Matte coat')] }),
    ],
  });

  const warband = await db('commissions')
    .where({ studio_id: studioId, client_id: ctx.clients.client, status: 'on_bench' })
    .orderBy('id')
    .first('id');
  if (!warband) return;
  const shaman = await db('figures').where({ studio_id: studioId, commission_id: warband.id }).whereRaw('lower(name) like ?', ['%shaman%']).first('id');
  const painter: Member = { studioId, role: 'painter', clientId: null };
  await schemes.add(painter, warband.id, { area: 'Skin', recipeId: skin.id, notes: null });
  await schemes.add(painter, warband.id, { area: 'Horns and tusks', recipeId: bone.id, notes: null });
  await schemes.add(painter, warband.id, { area: 'Blades and lantern frames', recipeId: iron.id, notes: null });
  await schemes.add(painter, warband.id, { area: 'Lantern glow', recipeId: glow.id, figureId: shaman?.id ?? null, notes: 'The shaman’s staff lantern is the brightest point.' });
}
