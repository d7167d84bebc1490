import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { deltaE2000, hexToLab } from '../../shared/color';
import { startTestApp, twoStudios, type TestApp } from '../support/app';
import { images, insertCommission, upload } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let A: string;
let commissionId: number;
let referenceId: number;
let progressId: number;

/** 60 % #1F3A93 (left), 30 % #D9A066 (middle), 10 % #FFFFFF (right), as vertical bands of a PNG. */
async function knownAreas(width = 200, height = 120) {
  const band = (w: number, hex: string) => sharp({ create: { width: w, height, channels: 3, background: hex } }).png().toBuffer();
  return sharp({ create: { width, height, channels: 3, background: '#FFFFFF' } })
    .composite([
      { input: await band(width * 0.6, '#1F3A93'), left: 0, top: 0 },
      { input: await band(width * 0.3, '#D9A066'), left: width * 0.6, top: 0 },
    ])
    .png()
    .toBuffer();
}

const near = (a: string, b: string) => deltaE2000(hexToLab(a), hexToLab(b));

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  A = `/api/studios/${s.a.studioId}`;
  commissionId = await insertCommission(sw, s.a.studioId, s.a.clientId);
  const rack: [string, string][] = [
    ['Harbour navy', '#1F3A93'],
    ['Night navy', '#243F8F'],
    ['Cornflower', '#3A5BB8'],
    ['Ochre skin', '#D9A066'],
    ['Sand', '#D4A56E'],
    ['Chalk white', '#FFFFFF'],
    ['Bone', '#EFE8DA'],
    ['Moss', '#4A5D23'],
  ];
  for (const [name, hex] of rack) await s.a.owner.post(`${A}/paints`, { name, type: 'base', hex, stock: 1 });
  // The client sends the reference photo through the photos route, as in the portal.
  const ref = await upload(s.a.client, `${A}/commissions/${commissionId}/photos`, [{ data: await knownAreas(), name: 'reference.png', type: 'image/png' }], { kind: 'reference' });
  if (ref.status !== 201) throw new Error(JSON.stringify(ref.body));
  referenceId = ref.body[0].id;
  const prog = await upload(s.a.owner, `${A}/commissions/${commissionId}/photos`, [{ data: await images.twoTone(64, 48), name: 'wip.jpg' }], { kind: 'progress', shared: 'true' });
  progressId = prog.body[0].id;
});
afterAll(() => sw.stop());

describe('reference-photo palette', () => {
  it('finds the known colours with their shares, each with the three nearest paints', async () => {
    const res = await s.a.painter.get(`${A}/reference-photos/${referenceId}/palette`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ photoId: referenceId, commissionId });
    const colours = res.body.colours as { hex: string; share: number; matches: { paint: { name: string }; deltaE: number; band: string }[] }[];
    expect(colours).toHaveLength(3);
    const expected: [string, number, string][] = [
      ['#1F3A93', 0.6, 'Harbour navy'],
      ['#D9A066', 0.3, 'Ochre skin'],
      ['#FFFFFF', 0.1, 'Chalk white'],
    ];
    expected.forEach(([hex, share, paint], i) => {
      expect(near(colours[i].hex, hex)).toBeLessThan(2);
      expect(Math.abs(colours[i].share - share)).toBeLessThanOrEqual(0.03);
      expect(colours[i].matches).toHaveLength(3);
      expect(colours[i].matches[0]).toMatchObject({ paint: { name: paint }, band: 'very close' });
      const d = colours[i].matches.map((m) => m.deltaE);
      expect(d).toEqual([...d].sort((a, b) => a - b));
    });
    // The navy's other matches are the rack's next-nearest blues, with their bands.
    expect(colours[0].matches.map((m) => m.paint.name)).toEqual(['Harbour navy', 'Night navy', 'Cornflower']);
    expect(colours[0].matches[2].band).toBe('far');
  });

  it('keeps the palette, and matches it against the rack as it is now', async () => {
    expect(await sw.db('photo_palettes').where({ photo_id: referenceId }).count({ n: '*' }).first()).toEqual({ n: 1 });
    await s.a.owner.post(`${A}/paints`, { name: 'Ochre skin, new pot', type: 'base', hex: '#D9A067', stock: 1 });
    const res = await s.a.owner.get(`${A}/reference-photos/${referenceId}/palette`);
    expect(res.body.colours[1].matches.map((m: { paint: { name: string } }) => m.paint.name).slice(0, 2).sort()).toEqual(['Ochre skin', 'Ochre skin, new pot']);
  });

  it('gives the colour at a clicked point and its nearest paints', async () => {
    const blue = await s.a.painter.get(`${A}/reference-photos/${referenceId}/point?x=0.25&y=0.5`);
    expect(blue.status).toBe(200);
    expect(near(blue.body.hex, '#1F3A93')).toBeLessThan(1);
    expect(blue.body.matches[0].paint.name).toBe('Harbour navy');
    const ochre = await s.a.painter.get(`${A}/reference-photos/${referenceId}/point?x=0.75&y=0.1`);
    expect(ochre.body.matches[0].paint.name).toMatch(/^Ochre skin/);
    const outside = await s.a.painter.get(`${A}/reference-photos/${referenceId}/point?x=1.5&y=0.5`);
    expect(outside.status).toBe(400);
    expect(outside.body.error.fields.x).toBe('From 0 to 1.');
  });

  it('starts a recipe from a colour of the photo', async () => {
    const point = (await s.a.painter.get(`${A}/reference-photos/${referenceId}/point?x=0.75&y=0.5`)).body;
    const res = await s.a.painter.post(`${A}/recipes`, { name: 'Warm ochre skin', colour: point.hex, sourcePhotoId: referenceId, steps: [{ technique: 'basecoat', paints: [{ paintId: point.matches[0].paint.id }] }] });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ colour: point.hex, sourcePhotoId: referenceId, swatch: point.hex });
  });

  it('is only for the studio, only for reference photos, and only its own', async () => {
    expect((await s.a.client.get(`${A}/reference-photos/${referenceId}/palette`)).status).toBe(403);
    expect((await s.a.client.get(`${A}/reference-photos/${referenceId}/point?x=0.5&y=0.5`)).status).toBe(403);
    expect((await s.a.owner.get(`${A}/reference-photos/${progressId}/palette`)).status).toBe(404);
    expect((await s.b.owner.get(`${A}/reference-photos/${referenceId}/palette`)).status).toBe(404);
    expect((await s.b.owner.get(`/api/studios/${s.b.studioId}/reference-photos/${referenceId}/palette`)).status).toBe(404);
  });

  it('forgets the palette with the photo', async () => {
    expect((await s.a.owner.delete(`${A}/photos/${referenceId}`)).status).toBe(204);
    expect(await sw.db('photo_palettes').where({ photo_id: referenceId }).first()).toBeUndefined();
    expect((await s.a.owner.get(`${A}/reference-photos/${referenceId}/palette`)).status).toBe(404);
  });
});
