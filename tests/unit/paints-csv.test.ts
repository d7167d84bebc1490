import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { stockState, type Paint } from '../../shared/schemas/paints';
import { parsePaintsCsv, paintsToCsv } from '../../server/features/paints/paints.csv';

const paint = (over: Partial<Paint>): Paint => ({
  id: 1,
  name: 'Fen moss',
  maker: 'Quillmoor Colour Works',
  range: 'Bench range',
  type: 'base',
  finish: 'matte',
  hex: '#4A5D23',
  stock: 2,
  lowStockThreshold: 1,
  notes: null,
  stockState: 'ok',
  recipeCount: 0,
  createdAt: '2026-01-01T00:00:00.000Z',
  updatedAt: '2026-01-01T00:00:00.000Z',
  ...over,
});

describe('paint rack CSV import', () => {
  it('reads quoted commas, doubled quotes and a byte-order mark', () => {
    const csv = '\uFEFFName,Maker,Type,Colour,Pots in stock,Notes\r\n"Bone, warm",Quillmoor Colour Works,Layer,#d9c8a0,3,"Thin it, then ""glaze"" it"\r\n';
    const { rows, skipped, notes } = parsePaintsCsv(csv);
    expect(skipped).toEqual([]);
    expect(notes).toEqual([]);
    expect(rows).toHaveLength(1);
    expect(rows[0].line).toBe(2);
    expect(rows[0].input).toMatchObject({ name: 'Bone, warm', maker: 'Quillmoor Colour Works', type: 'layer', hex: '#D9C8A0', stock: 3, notes: 'Thin it, then "glaze" it' });
  });

  it('reports each broken row by the line it starts on and keeps the rest', () => {
    const csv = [
      'Name,Maker,Type,Colour,Pots in stock',
      'Ash grey,Tansy & Lowe,Base,#8A8A85,1', // line 2: fine
      'Rust,Tansy & Lowe,Base,#A0522D', // line 3: a value short
      '"Deep, sea",Tansy & Lowe,Glaze,#1F3A93,2', // line 4: fine (quoted comma)
      'Ember,Tansy & Lowe,Base,not-a-colour,1', // line 5: bad colour
      'Mist,Tansy & Lowe,Sparkle,#DDE3E8,1', // line 6: unknown type
      '"Two', // line 7: a quoted newline inside the name …
      'lines",Tansy & Lowe,Ink,#102030,1', // … so this record starts on line 7
      'Moss,Tansy & Lowe,Base,#4A5D23,lots', // line 9: stock not a number
      '', // blank lines are not rows
      'Varnish coat,Tansy & Lowe,Varnish,,4', // line 11: fine without a colour
      'Shadow,Tansy & Lowe,Base,,1', // line 12: a base needs its colour
    ].join('\n');
    const { rows, skipped } = parsePaintsCsv(csv);
    expect(rows.map((r) => [r.line, r.input.name])).toEqual([
      [2, 'Ash grey'],
      [4, 'Deep, sea'],
      [7, 'Two\nlines'],
      [11, 'Varnish coat'],
    ]);
    expect(skipped.map((s) => s.line)).toEqual([3, 5, 6, 9, 12]);
    expect(skipped[0].message).toMatch(/4 values where the header has 5/);
    expect(skipped[1].message).toMatch(/^Colour: /);
    expect(skipped[2].message).toMatch(/"Sparkle" is not one we know/);
    expect(skipped[3].message).toMatch(/"lots" is not a whole number/);
    expect(skipped[4].message).toMatch(/^Colour: Give the colour/);
  });

  it('imports what comes before a quote that never closes, and says where it opened', () => {
    const csv = 'Name,Type,Colour\nAsh grey,Base,#8A8A85\n\n"Rust,Base,#A0522D\nMoss,Base,#4A5D23\n';
    const { rows, skipped } = parsePaintsCsv(csv);
    expect(rows.map((r) => r.input.name)).toEqual(['Ash grey']);
    expect(skipped).toHaveLength(1);
    expect(skipped[0].line).toBe(4);
    expect(skipped[0].message).toMatch(/never closed/);
  });

  it('takes columns in any order, by alias and case, and notes the ones it does not know', () => {
    const { rows, notes } = parsePaintsCsv('COLOR,paint,kind,Shelf\n#abc,Chalk,one-coat tint,B2\n');
    expect(rows[0].input).toMatchObject({ name: 'Chalk', hex: '#AABBCC', type: 'tint' });
    expect(notes).toEqual(['Left out columns we do not know: "Shelf".']);
  });

  it('needs a Name column', () => {
    const r = parsePaintsCsv('Maker,Type\nA,Base\n');
    expect(r.rows).toEqual([]);
    expect(r.notes.join(' ')).toMatch(/no Name column/);
  });
});

describe('paint rack CSV export', () => {
  const rack: Paint[] = [
    paint({ id: 1, name: 'Bone, warm', notes: 'Says "warm" on the lid' }),
    paint({ id: 2, name: 'Varnish coat', maker: null, range: null, type: 'varnish', finish: 'satin', hex: null, stock: 0, lowStockThreshold: null, stockState: stockState(0, null) }),
    paint({ id: 3, name: '=SUM(A1)', type: 'solvent-wash', hex: '#2B211C', notes: 'line one\nline two' }),
    paint({ id: 4, name: 'Ünterwald grün', maker: 'Brackenfold Pigments', type: 'pigment', finish: 'gloss', hex: '#3C5A2A', stock: 12, lowStockThreshold: 3 }),
  ];

  it('writes a byte-order mark, a header and values a CSV library reads back as they were', () => {
    const csv = paintsToCsv(rack);
    expect(csv.startsWith('\uFEFFName,Maker,Range,Type,Finish,Colour,Pots in stock,Low below,Notes\r\n')).toBe(true);
    const records = parse(csv, { bom: true }) as string[][];
    expect(records[1][0]).toBe('Bone, warm');
    expect(records[1][8]).toBe('Says "warm" on the lid');
    // A cell that a spreadsheet would run as a formula is guarded with an apostrophe.
    expect(records[3][0]).toBe("'=SUM(A1)");
  });

  it('imports back unchanged', () => {
    const { rows, skipped, notes } = parsePaintsCsv(paintsToCsv(rack));
    expect(skipped).toEqual([]);
    expect(notes).toEqual([]);
    const fields = (p: Paint) => ({
      name: p.name,
      maker: p.maker,
      range: p.range,
      type: p.type,
      finish: p.finish,
      hex: p.hex,
      stock: p.stock,
      lowStockThreshold: p.lowStockThreshold,
      notes: p.notes,
    });
    expect(rows.map((r) => r.input)).toEqual(rack.map(fields));
  });
});
