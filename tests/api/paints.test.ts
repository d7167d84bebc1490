import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { deltaE2000, hexToLab } from '../../shared/color';
import { startTestApp, twoStudios, type TestApp } from '../support/app';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let A: string;
let B: string;

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  A = `/api/studios/${s.a.studioId}`;
  B = `/api/studios/${s.b.studioId}`;
});
afterAll(() => sw.stop());

const base = { type: 'base', stock: 2 };

describe('paint rack', () => {
  it('owner and painter add paints; the colour is stored as #RRGGBB', async () => {
    const res = await s.a.owner.post(`${A}/paints`, { ...base, name: 'Fen moss', maker: 'Quillmoor Colour Works', range: 'Bench', hex: '4a5d23', finish: 'matte', lowStockThreshold: 1 });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ name: 'Fen moss', maker: 'Quillmoor Colour Works', range: 'Bench', type: 'base', finish: 'matte', hex: '#4A5D23', stock: 2, lowStockThreshold: 1, stockState: 'ok', recipeCount: 0 });
    const byPainter = await s.a.painter.post(`${A}/paints`, { ...base, name: 'Chalk', hex: '#abc' });
    expect(byPainter.status).toBe(201);
    expect(byPainter.body.hex).toBe('#AABBCC');
  });

  it('says what is wrong with a colour, and asks for one except on a medium or varnish', async () => {
    const bad = await s.a.owner.post(`${A}/paints`, { ...base, name: 'Oops', hex: '#12345G' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.hex).toMatch(/#1F3A93/);
    const none = await s.a.owner.post(`${A}/paints`, { ...base, name: 'No colour' });
    expect(none.status).toBe(400);
    expect(none.body.error.fields.hex).toMatch(/Give the colour/);
    const varnish = await s.a.owner.post(`${A}/paints`, { name: 'Satin coat', type: 'varnish', finish: 'satin', stock: 1 });
    expect(varnish.status).toBe(201);
    expect(varnish.body.hex).toBeNull();
  });

  it('refuses a second paint of the same name and maker, ignoring case', async () => {
    const res = await s.a.owner.post(`${A}/paints`, { ...base, name: 'FEN MOSS', maker: 'quillmoor colour works', hex: '#000000' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.name).toMatch(/already has/);
    // Same name from another maker is another paint.
    expect((await s.a.owner.post(`${A}/paints`, { ...base, name: 'Fen moss', maker: 'Tansy & Lowe', hex: '#4B5E24' })).status).toBe(201);
  });

  it('edits keep a colour paint coloured, and stock shows as ok, low or out', async () => {
    const p = (await s.a.owner.post(`${A}/paints`, { ...base, name: 'Rust', hex: '#A0522D', stock: 3, lowStockThreshold: 2 })).body;
    expect((await s.a.painter.patch(`${A}/paints/${p.id}`, { hex: null })).body.error.fields.hex).toMatch(/Give the colour/);
    expect((await s.a.painter.patch(`${A}/paints/${p.id}`, { stock: 1 })).body.stockState).toBe('low');
    expect((await s.a.painter.patch(`${A}/paints/${p.id}`, { stock: 0 })).body.stockState).toBe('out');
    const short = await s.a.owner.get(`${A}/paints?stock=short`);
    expect(short.body.map((x: { name: string }) => x.name)).toEqual(['Rust']);
    const searched = await s.a.owner.get(`${A}/paints?q=moss`);
    expect(searched.body.map((x: { maker: string }) => x.maker)).toEqual(['Quillmoor Colour Works', 'Tansy & Lowe']);
  });

  it('keeps the rack from clients and other studios', async () => {
    const paint = (await s.a.owner.get(`${A}/paints`)).body[0];
    for (const url of [`${A}/paints`, `${A}/paints/${paint.id}`, `${A}/paints/export`, `${A}/paints/nearest?hex=%23112233`]) {
      expect((await s.a.client.get(url)).status).toBe(403);
      expect((await s.b.owner.get(url)).status).toBe(404);
    }
    // Studio B's owner cannot reach A's paint through B either.
    expect((await s.b.owner.get(`${B}/paints/${paint.id}`)).status).toBe(404);
    expect((await s.b.owner.patch(`${B}/paints/${paint.id}`, { stock: 9 })).status).toBe(404);
  });

  it('finds the nearest paints by CIEDE2000, nearest first, with a plain band', async () => {
    const res = await s.a.painter.get(`${A}/paints/nearest?hex=%234A5D24&k=3`);
    expect(res.status).toBe(200);
    const m = res.body.matches as { paint: { name: string; maker: string; hex: string }; deltaE: number; band: string }[];
    expect(m).toHaveLength(3);
    expect(m[0].paint).toMatchObject({ name: 'Fen moss', maker: 'Quillmoor Colour Works' });
    expect(m[0].band).toBe('very close');
    expect(m[0].deltaE).toBeCloseTo(deltaE2000(hexToLab('#4A5D24'), hexToLab('#4A5D23')), 2);
    expect(m.map((x) => x.deltaE)).toEqual([...m.map((x) => x.deltaE)].sort((a, b) => a - b));
    expect((await s.a.painter.get(`${A}/paints/nearest?hex=blue`)).status).toBe(400);
  });

  it('removes a paint no recipe uses', async () => {
    const p = (await s.a.owner.post(`${A}/paints`, { ...base, name: 'Short-lived', hex: '#101010' })).body;
    expect((await s.a.painter.delete(`${A}/paints/${p.id}`)).status).toBe(204);
    expect((await s.a.painter.get(`${A}/paints/${p.id}`)).status).toBe(404);
  });
});

describe('paint rack CSV', () => {
  it('imports good rows, reports bad ones by line, and updates paints it already has', async () => {
    const csv = [
      '\uFEFFName,Maker,Range,Type,Finish,Colour,Pots in stock,Low below,Notes',
      '"Bone, warm",Brackenfold Pigments,Shelf,Layer,Matte,#D9C8A0,3,1,"Thin, then ""glaze"""',
      'Rust,,,Base,,#A0522D,5,2,', // line 3: the Rust made above (no maker): updated
      'Broken,Brackenfold Pigments,Layer,#FFFFFF', // line 4: too few values
      'Glow,Brackenfold Pigments,,Glitter,,#00FF00,1,,', // line 5: unknown type
      'Deep sea,Brackenfold Pigments,,Glaze,Gloss,#1F3A93,0,,', // line 6
    ].join('\r\n');
    const res = await s.a.owner.post(`${A}/paints/import`, { csv });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ created: 2, updated: 1, notes: [] });
    expect(res.body.skipped.map((x: { line: number }) => x.line)).toEqual([4, 5]);
    const rack = (await s.a.owner.get(`${A}/paints`)).body as { name: string; stock: number; notes: string | null; stockState: string }[];
    expect(rack.find((p) => p.name === 'Rust')).toMatchObject({ stock: 5, stockState: 'ok' });
    expect(rack.find((p) => p.name === 'Bone, warm')?.notes).toBe('Thin, then "glaze"');
    expect(rack.find((p) => p.name === 'Deep sea')?.stockState).toBe('out');
  });

  it('exports a CSV that imports back unchanged, into the same rack or an empty one', async () => {
    const first = await s.a.painter.get(`${A}/paints/export`);
    expect(first.status).toBe(200);
    expect(first.headers['content-type']).toMatch(/^text\/csv/);
    expect(first.headers['content-disposition']).toMatch(/attachment; filename="paint-rack.csv"/);
    const csv = first.text;
    expect(csv.startsWith('\uFEFFName,')).toBe(true);

    const again = await s.a.painter.post(`${A}/paints/import`, { csv });
    expect(again.body).toMatchObject({ created: 0, skipped: [], notes: [] });
    expect((await s.a.painter.get(`${A}/paints/export`)).text).toBe(csv);

    const intoB = await s.b.owner.post(`${B}/paints/import`, { csv });
    expect(intoB.body.created).toBe(again.body.updated);
    expect((await s.b.owner.get(`${B}/paints/export`)).text).toBe(csv);
  });

  it('changes only the columns the file has, and still asks new paints for a colour', async () => {
    const before = (await s.a.owner.get(`${A}/paints?q=rust`)).body.find((p: { name: string }) => p.name === 'Rust');
    const res = await s.a.owner.post(`${A}/paints/import`, { csv: 'Name,Type,Pots in stock\nRust,Base,7\nBrand new,Base,1\n' });
    expect(res.body).toMatchObject({ created: 0, updated: 1 });
    expect(res.body.skipped).toEqual([{ line: 3, message: expect.stringMatching(/^Colour: .*no Colour column/) }]);
    const after = (await s.a.owner.get(`${A}/paints/${before.id}`)).body;
    expect(after).toMatchObject({ stock: 7, hex: before.hex, lowStockThreshold: before.lowStockThreshold, maker: before.maker });
  });

  it('clients may not import', async () => {
    expect((await s.a.client.post(`${A}/paints/import`, { csv: 'Name,Type,Colour\nX,Base,#000000' })).status).toBe(403);
  });
});
