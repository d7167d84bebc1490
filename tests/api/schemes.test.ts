import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { deltaE2000, hexToLab } from '../../shared/color';
import { startTestApp, twoStudios, type TestApp } from '../support/app';
import { insertCommission, insertFigure, secondClient } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let A: string;
let commissionId: number;
let figureId: number;
let otherFigureId: number;
const paints: Record<string, { id: number; name: string; maker: string | null }> = {};
const recipes: Record<string, { id: number }> = {};

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  A = `/api/studios/${s.a.studioId}`;
  commissionId = await insertCommission(sw, s.a.studioId, s.a.clientId);
  figureId = (await insertFigure(sw, s.a.studioId, commissionId)).figureId;
  const otherCommission = await insertCommission(sw, s.a.studioId, s.a.clientId, { title: 'Another' });
  otherFigureId = (await insertFigure(sw, s.a.studioId, otherCommission)).figureId;

  const add = async (key: string, body: Record<string, unknown>) => {
    const res = await s.a.owner.post(`${A}/paints`, { type: 'base', maker: 'Quillmoor Colour Works', ...body });
    if (res.status !== 201) throw new Error(JSON.stringify(res.body));
    paints[key] = res.body;
  };
  await add('moss', { name: 'Bog moss', hex: '#4A5D23', stock: 0 }); // out of stock
  await add('bone', { name: 'Old bone', hex: '#D9C8A0', stock: 1, lowStockThreshold: 2 }); // low
  await add('teal', { name: 'Lantern teal', hex: '#2FA39A', stock: 4, lowStockThreshold: 2 }); // fine
  await add('unused', { name: 'Never used', hex: '#FF00FF', stock: 0 }); // out, but in no recipe

  const recipe = async (key: string, body: Record<string, unknown>) => {
    const res = await s.a.painter.post(`${A}/recipes`, body);
    if (res.status !== 201) throw new Error(JSON.stringify(res.body));
    recipes[key] = res.body;
  };
  await recipe('skin', {
    name: 'Goblin skin',
    // Close to the moss on the rack (ΔE00 < 5): nothing to buy for the colour itself.
    colour: '#4C5F25',
    steps: [
      { technique: 'basecoat', paints: [{ paintId: paints.moss.id }] },
      { technique: 'highlight', paints: [{ paintId: paints.moss.id }, { paintId: paints.bone.id }], ladderSteps: 2 },
    ],
  });
  await recipe('glow', {
    name: 'Sickly lantern glow',
    // A violet the rack has nothing near.
    colour: '#6A0DAD',
    steps: [{ technique: 'glaze', paints: [{ paintId: paints.teal.id }], dilution: { diluent: 6, paint: 1, with: 'water' } }],
  });
});
afterAll(() => sw.stop());

describe('scheme', () => {
  it('attaches recipes to the whole commission and to a figure, by area', async () => {
    const whole = await s.a.painter.post(`${A}/commissions/${commissionId}/scheme`, { area: 'Skin', recipeId: recipes.skin.id });
    expect(whole.status).toBe(201);
    const fig = await s.a.owner.post(`${A}/commissions/${commissionId}/scheme`, { area: 'Lantern', recipeId: recipes.glow.id, figureId, notes: 'Only the shaman’s lantern.' });
    expect(fig.status).toBe(201);
    expect(fig.body.view).toBe('studio');
    expect(fig.body.entries.map((e: { area: string; figure: { name: string } | null; recipe: { name: string } }) => [e.area, e.figure?.name ?? null, e.recipe.name])).toEqual([
      ['Skin', null, 'Goblin skin'],
      ['Lantern', 'Bog shaman', 'Sickly lantern glow'],
    ]);
    expect(fig.body.entries[1].notes).toBe('Only the shaman’s lantern.');
  });

  it('refuses a second recipe for the same figure and area, and figures of other commissions', async () => {
    const dup = await s.a.owner.post(`${A}/commissions/${commissionId}/scheme`, { area: 'skin', recipeId: recipes.glow.id });
    expect(dup.status).toBe(400);
    expect(dup.body.error.fields.area).toMatch(/already has a recipe for "skin"/);
    const elsewhere = await s.a.owner.post(`${A}/commissions/${commissionId}/scheme`, { area: 'Cloak', recipeId: recipes.glow.id, figureId: otherFigureId });
    expect(elsewhere.body.error.fields.figureId).toMatch(/not part of this commission/);
    const noRecipe = await s.a.owner.post(`${A}/commissions/${commissionId}/scheme`, { area: 'Cloak', recipeId: 999999 });
    expect(noRecipe.body.error.fields.recipeId).toMatch(/not found/);
  });

  it('shows the client swatches and recipe names, and nothing of the rack', async () => {
    const res = await s.a.client.get(`${A}/commissions/${commissionId}/scheme`);
    expect(res.status).toBe(200);
    expect(res.body.view).toBe('client');
    const [skin, glow] = res.body.entries;
    expect(skin).toEqual({
      id: expect.any(Number),
      area: 'Skin',
      figure: null,
      recipe: { name: 'Goblin skin', swatch: '#4C5F25', swatches: expect.any(Array) },
    });
    expect(skin.recipe.swatches[0]).toEqual({ technique: 'basecoat', hex: '#4A5D23' });
    expect(glow.figure).toEqual({ id: figureId, name: 'Bog shaman' });
    const text = JSON.stringify(res.body);
    for (const secret of ['Bog moss', 'Old bone', 'Lantern teal', 'Quillmoor', 'stock', 'paint', 'dilution', 'notes', 'Only the shaman']) expect(text).not.toContain(secret);
  });

  it('keeps the scheme of one client from another, and writing it to the studio', async () => {
    const other = await secondClient(sw, s.a.owner, s.a.studioId, 'second-client@studio.test');
    expect((await other.caller.get(`${A}/commissions/${commissionId}/scheme`)).status).toBe(404);
    expect((await s.a.client.post(`${A}/commissions/${commissionId}/scheme`, { area: 'Cloak', recipeId: recipes.glow.id })).status).toBe(403);
    expect((await s.b.owner.get(`${A}/commissions/${commissionId}/scheme`)).status).toBe(404);
    expect((await s.b.owner.get(`/api/studios/${s.b.studioId}/commissions/${commissionId}/scheme`)).status).toBe(404);
  });

  it('a recipe in a scheme cannot be removed', async () => {
    const res = await s.a.owner.delete(`${A}/recipes/${recipes.glow.id}`);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/Swamp goblin warband/);
  });
});

describe('shopping list', () => {
  it('lists the scheme’s paints that are out or low, and recipe colours the rack cannot match', async () => {
    const res = await s.a.painter.get(`${A}/commissions/${commissionId}/shopping-list`);
    expect(res.status).toBe(200);
    expect(res.body.restock.map((r: { paint: { name: string; stockState: string }; recipes: string[] }) => [r.paint.name, r.paint.stockState, r.recipes])).toEqual([
      ['Bog moss', 'out', ['Goblin skin']],
      ['Old bone', 'low', ['Goblin skin']],
    ]);
    expect(res.body.restock[1].lowStockThreshold).toBe(2);
    expect(res.body.unmatched).toHaveLength(1);
    const [u] = res.body.unmatched;
    expect(u).toMatchObject({ recipeName: 'Sickly lantern glow', hex: '#6A0DAD' });
    expect(u.nearest.deltaE).toBeGreaterThanOrEqual(5);
    // The skin colour is close to the moss, so it is not on the list (checked, not assumed).
    expect(deltaE2000(hexToLab('#4C5F25'), hexToLab('#4A5D23'))).toBeLessThan(5);
  });

  it('follows the rack: restocked paints leave the list, a close new paint answers the colour', async () => {
    await s.a.owner.patch(`${A}/paints/${paints.moss.id}`, { stock: 3 });
    await s.a.owner.post(`${A}/paints`, { name: 'Amethyst ink', type: 'ink', hex: '#6B0FAE', stock: 1 });
    const res = await s.a.owner.get(`${A}/commissions/${commissionId}/shopping-list`);
    expect(res.body.restock.map((r: { paint: { name: string } }) => r.paint.name)).toEqual(['Old bone']);
    expect(res.body.unmatched).toEqual([]);
  });

  it('is the studio’s alone', async () => {
    expect((await s.a.client.get(`${A}/commissions/${commissionId}/shopping-list`)).status).toBe(403);
    expect((await s.b.owner.get(`${A}/commissions/${commissionId}/shopping-list`)).status).toBe(404);
  });
});

describe('scheme entries', () => {
  it('change recipe or area, and go', async () => {
    const scheme = (await s.a.owner.get(`${A}/commissions/${commissionId}/scheme`)).body;
    const lantern = scheme.entries.find((e: { area: string }) => e.area === 'Lantern');
    const patched = await s.a.painter.patch(`${A}/scheme-entries/${lantern.id}`, { area: 'Lantern glass' });
    expect(patched.status).toBe(200);
    const entry = patched.body.entries.find((e: { id: number }) => e.id === lantern.id);
    expect(entry).toMatchObject({ area: 'Lantern glass', notes: 'Only the shaman’s lantern.', figure: { id: figureId } });
    expect((await s.a.client.patch(`${A}/scheme-entries/${lantern.id}`, { area: 'x' })).status).toBe(403);
    const removed = await s.a.painter.delete(`${A}/scheme-entries/${lantern.id}`);
    expect(removed.status).toBe(200);
    expect(removed.body.entries.map((e: { area: string }) => e.area)).toEqual(['Skin']);
    expect((await s.a.painter.delete(`${A}/scheme-entries/${lantern.id}`)).status).toBe(404);
  });
});
