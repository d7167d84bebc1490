import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ladder, mixPreview, psiToBar } from '../../shared/color';
import { startTestApp, twoStudios, type TestApp } from '../support/app';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let A: string;
const paint: Record<string, { id: number; hex: string | null }> = {};

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  A = `/api/studios/${s.a.studioId}`;
  const add = async (key: string, body: Record<string, unknown>) => {
    const res = await s.a.owner.post(`${A}/paints`, { stock: 2, ...body });
    if (res.status !== 201) throw new Error(JSON.stringify(res.body));
    paint[key] = res.body;
  };
  await add('navy', { name: 'Harbour navy', type: 'base', hex: '#1F3A93' });
  await add('bone', { name: 'Old bone', type: 'layer', hex: '#D9C8A0' });
  await add('white', { name: 'Chalk white', type: 'layer', hex: '#F4F1EA' });
  await add('brownWash', { name: 'Peat wash', type: 'solvent-wash', hex: '#3B2A1E' });
  await add('dust', { name: 'Road dust', type: 'pigment', hex: '#B59B7A' });
  await add('medium', { name: 'Glaze medium', type: 'medium' });
});
afterAll(() => sw.stop());

const denim = () => ({
  name: 'Washed denim',
  description: 'Trousers and caps of the militia.',
  steps: [
    { technique: 'basecoat', paints: [{ paintId: paint.navy.id }], tool: 'Size 2 round' },
    { technique: 'layer', paints: [{ paintId: paint.navy.id, parts: 3 }, { paintId: paint.bone.id, parts: 1 }] },
    { technique: 'highlight', paints: [{ paintId: paint.navy.id }, { paintId: paint.white.id }], ladderSteps: 3 },
    { technique: 'glaze', paints: [{ paintId: paint.navy.id }, { paintId: paint.medium.id, parts: 1 }], dilution: { diluent: 5, paint: 1, with: 'water' } },
    { technique: 'airbrush', psi: 12, paints: [{ paintId: paint.bone.id }], notes: 'Zenithal from above.' },
  ],
});

describe('recipes', () => {
  it('keeps ordered steps with mixes, ladders, dilution and airbrush pressure in psi and bar', async () => {
    const res = await s.a.painter.post(`${A}/recipes`, denim());
    expect(res.status).toBe(201);
    const r = res.body;
    expect(r.name).toBe('Washed denim');
    expect(r.steps.map((x: { technique: string; position: number }) => [x.position, x.technique])).toEqual([
      [0, 'basecoat'],
      [1, 'layer'],
      [2, 'highlight'],
      [3, 'glaze'],
      [4, 'airbrush'],
    ]);
    const [basecoat, layer, highlight, glaze, air] = r.steps;
    expect(basecoat.mix).toMatchObject({ kind: 'mix', ratio: '1', previewHex: '#1F3A93' });
    expect(basecoat.tool).toBe('Size 2 round');
    expect(layer.mix.ratio).toBe('3:1');
    expect(layer.mix.previewHex).toBe(mixPreview([{ hex: '#1F3A93', parts: 3 }, { hex: '#D9C8A0', parts: 1 }]));
    expect(layer.mix.paints.map((p: { paint: { name: string }; parts: number }) => [p.paint.name, p.parts])).toEqual([
      ['Harbour navy', 3],
      ['Old bone', 1],
    ]);
    expect(highlight.mix).toMatchObject({ kind: 'ladder', steps: 3, from: { name: 'Harbour navy' }, to: { name: 'Chalk white' } });
    expect(highlight.mix.rungs).toEqual(ladder('#1F3A93', '#F4F1EA', 3));
    expect(highlight.mix.rungs.map((x: { ratio: string }) => x.ratio)).toEqual(['3:1', '1:1', '1:3']);
    expect(glaze.dilution).toEqual({ diluent: 5, paint: 1, with: 'water' });
    // The medium has no colour: it thins the glaze but does not tint the preview.
    expect(glaze.mix.previewHex).toBe('#1F3A93');
    expect(air).toMatchObject({ airbrush: true, psi: 12, bar: Math.round(psiToBar(12) * 100) / 100, hazards: ['spray'], notes: 'Zenithal from above.' });
    expect(r.hazards).toEqual(['spray']);
    expect(r.swatch).toBe('#1F3A93');
  });

  it('gives solvent and pigment steps their cautions', async () => {
    const res = await s.a.owner.post(`${A}/recipes`, {
      name: 'Road grime',
      colour: '#7a6040',
      steps: [
        { technique: 'wash', paints: [{ paintId: paint.brownWash.id }] },
        { technique: 'weathering', paints: [{ paintId: paint.dust.id }] },
        { technique: 'glaze', paints: [{ paintId: paint.navy.id }], dilution: { diluent: 4, paint: 1, with: 'thinner' } },
        { technique: 'varnish', airbrush: true, psi: 20 },
      ],
    });
    expect(res.status).toBe(201);
    expect(res.body.steps.map((x: { hazards: string[] }) => x.hazards)).toEqual([['solvent'], ['pigment'], ['solvent'], ['spray']]);
    expect(res.body.hazards).toEqual(['spray', 'solvent', 'pigment']);
    expect(res.body.colour).toBe('#7A6040');
    expect(res.body.swatch).toBe('#7A6040');
  });

  it('says which field of which step is wrong', async () => {
    const bad = await s.a.owner.post(`${A}/recipes`, {
      name: 'Broken',
      steps: [
        { technique: 'layer', psi: 15 },
        { technique: 'highlight', paints: [{ paintId: paint.navy.id }], ladderSteps: 3 },
        { technique: 'spraying' },
      ],
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields['steps.0.psi']).toMatch(/airbrush/);
    expect(bad.body.error.fields['steps.1.paints']).toMatch(/exactly two/);
    expect(bad.body.error.fields['steps.2.technique']).toMatch(/Choose a technique/);
    expect((await s.a.owner.post(`${A}/recipes`, { steps: [] })).body.error.fields.name).toMatch(/Name the recipe/);
  });

  it('refuses paints from another studio’s rack', async () => {
    const theirs = (await s.b.owner.post(`/api/studios/${s.b.studioId}/paints`, { name: 'Elsewhere', type: 'base', hex: '#123456' })).body;
    const res = await s.a.owner.post(`${A}/recipes`, { name: 'Sneaky', steps: [{ technique: 'basecoat', paints: [{ paintId: paint.navy.id }] }, { technique: 'layer', paints: [{ paintId: theirs.id }] }] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ 'steps.1.paints.0.paintId': 'That paint is not on the rack.' });
  });

  it('saves the whole recipe again with steps reordered, and lists summaries', async () => {
    const created = (await s.a.owner.post(`${A}/recipes`, { name: 'Warm skin', steps: [{ technique: 'basecoat', paints: [{ paintId: paint.bone.id }] }, { technique: 'glaze', paints: [{ paintId: paint.navy.id }] }] })).body;
    const put = await s.a.painter.put(`${A}/recipes/${created.id}`, {
      name: 'Warm skin',
      steps: [{ technique: 'glaze', paints: [{ paintId: paint.navy.id }] }, { technique: 'basecoat', paints: [{ paintId: paint.bone.id }] }, { technique: 'edge-highlight', paints: [{ paintId: paint.white.id }] }],
    });
    expect(put.status).toBe(200);
    expect(put.body.steps.map((x: { technique: string }) => x.technique)).toEqual(['glaze', 'basecoat', 'edge-highlight']);
    const list = await s.a.painter.get(`${A}/recipes?q=warm`);
    expect(list.body).toHaveLength(1);
    expect(list.body[0]).toMatchObject({ name: 'Warm skin', stepCount: 3, techniques: ['glaze', 'basecoat', 'edge-highlight'], swatches: ['#1F3A93', '#D9C8A0', '#F4F1EA'] });
    expect(list.body[0].steps).toBeUndefined();
    // The paint now counts the recipes that use it, and cannot leave the rack while they do.
    expect((await s.a.owner.get(`${A}/paints/${paint.white.id}`)).body.recipeCount).toBe(2);
    const del = await s.a.owner.delete(`${A}/paints/${paint.white.id}`);
    expect(del.status).toBe(409);
    expect(del.body.error.message).toMatch(/Washed denim/);
  });

  it('removes a recipe, and keeps recipes from clients and other studios', async () => {
    const r = (await s.a.owner.post(`${A}/recipes`, { name: 'Temporary' })).body;
    for (const c of [s.a.client]) {
      expect((await c.get(`${A}/recipes`)).status).toBe(403);
      expect((await c.get(`${A}/recipes/${r.id}`)).status).toBe(403);
      expect((await c.post(`${A}/recipes`, { name: 'x' })).status).toBe(403);
    }
    expect((await s.b.owner.get(`${A}/recipes/${r.id}`)).status).toBe(404);
    expect((await s.b.owner.get(`/api/studios/${s.b.studioId}/recipes/${r.id}`)).status).toBe(404);
    expect((await s.a.painter.delete(`${A}/recipes/${r.id}`)).status).toBe(204);
    expect((await s.a.painter.get(`${A}/recipes/${r.id}`)).status).toBe(404);
  });
});
