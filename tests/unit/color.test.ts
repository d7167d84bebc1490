import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  barToPsi,
  deltaE2000,
  hexToLab,
  isHex,
  labToHex,
  ladder,
  matchBand,
  mixPreview,
  nearestInRack,
  nearestPaints,
  normalizeHex,
  prepareRack,
  psiToBar,
} from '../../shared/color';

/** Reads a reference TSV: '#' lines are comments, the first other line names the columns. */
function readTsv(name: string): Record<string, string>[] {
  const text = readFileSync(new URL(`../../../shared/reference/${name}`, import.meta.url), 'utf8');
  const lines = text.split(/\r?\n/).filter((line) => line.trim() !== '' && !line.startsWith('#'));
  const header = lines[0].split('\t');
  return lines.slice(1).map((line) => {
    const cells = line.split('\t');
    return Object.fromEntries(header.map((h, i) => [h, cells[i]]));
  });
}

const num = (s: string | undefined) => {
  const v = Number(s);
  if (s === undefined || s.trim() === '' || !Number.isFinite(v)) throw new Error(`Not a number in TSV: ${s}`);
  return v;
};

function rgbDistance(hexA: string, hexB: string): number {
  const parse = (h: string) => [1, 3, 5].map((i) => Number.parseInt(normalizeHex(h).slice(i, i + 2), 16));
  const [a, b] = [parse(hexA), parse(hexB)];
  return Math.hypot(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
}

describe('deltaE2000', () => {
  // Source: Sharma, Wu & Dalal (2005), "The CIEDE2000 Color-Difference Formula: Implementation Notes,
  // Supplementary Test Data, and Mathematical Observations", Color Res. Appl. 30(1), Table 1 —
  // ../shared/reference/ciede2000_sharma2005.tsv (34 pairs, ΔE00 to 4 decimals).
  const pairs = readTsv('ciede2000_sharma2005.tsv');

  it('has all 34 published pairs to check against', () => {
    expect(pairs).toHaveLength(34);
  });

  it.each(pairs.map((p) => [p.pair, p] as const))('matches Sharma et al. (2005) pair %s within 1e-4', (_pair, p) => {
    const lab1 = { l: num(p.L1), a: num(p.a1), b: num(p.b1) };
    const lab2 = { l: num(p.L2), a: num(p.a2), b: num(p.b2) };
    const expected = num(p.dE00);
    expect(Math.abs(deltaE2000(lab1, lab2) - expected)).toBeLessThanOrEqual(1e-4);
    // CIEDE2000 is symmetric, so the swapped pair must give the same published value.
    expect(Math.abs(deltaE2000(lab2, lab1) - expected)).toBeLessThanOrEqual(1e-4);
  });

  it('is zero for identical colours', () => {
    const lab = hexToLab('#7A3E9D');
    expect(deltaE2000(lab, lab)).toBe(0);
  });
});

describe('hexToLab', () => {
  // Source: Bruce Lindbloom's CIE Color Calculator (sRGB, D65, 2°), via scikit-image's test data and
  // vispy for mid grey — ../shared/reference/srgb_to_cielab_d65.tsv, columns L_4dp, a_4dp, b_4dp.
  const rows = readTsv('srgb_to_cielab_d65.tsv');

  it('has reference rows to check against', () => {
    expect(rows.length).toBeGreaterThanOrEqual(9);
  });

  it.each(rows.map((r) => [r.name, r] as const))('matches Lindbloom for %s within 0.01', (_name, r) => {
    const lab = hexToLab(r.hex);
    expect(Math.abs(lab.l - num(r.L_4dp))).toBeLessThanOrEqual(0.01);
    expect(Math.abs(lab.a - num(r.a_4dp))).toBeLessThanOrEqual(0.01);
    expect(Math.abs(lab.b - num(r.b_4dp))).toBeLessThanOrEqual(0.01);
  });

  it('round-trips through labToHex', () => {
    for (const hex of ['#1F3A93', '#D9A066', '#FFFFFF', '#000000', '#4A6FA5', '#0A0B0C']) {
      expect(labToHex(hexToLab(hex))).toBe(hex);
    }
  });

  it('rejects what is not a hex colour', () => {
    expect(() => hexToLab('#12345')).toThrow(RangeError);
    expect(() => hexToLab('red')).toThrow(RangeError);
  });
});

describe('isHex and normalizeHex', () => {
  it('accepts 3 and 6 digits with or without #, any case, and normalises to #RRGGBB', () => {
    expect(normalizeHex('abc')).toBe('#AABBCC');
    expect(normalizeHex(' #a1B2c3 ')).toBe('#A1B2C3');
    expect(isHex('#fff')).toBe(true);
    expect(isHex('12ab9F')).toBe(true);
  });

  it('refuses other forms', () => {
    for (const bad of ['', '#', '#ffff', '#12345g', '#11223344', 'rgb(1,2,3)', 42, null]) {
      expect(isHex(bad)).toBe(false);
    }
    expect(() => normalizeHex('#11223344')).toThrow(RangeError);
  });
});

describe('nearestPaints', () => {
  const paints = [
    { id: 'greener', hex: '#4A88A5' },
    { id: 'bluer', hex: '#4A6FC3' },
    { id: 'orange', hex: '#E07020' },
    { id: 'medium', hex: '' }, // a paint with no colour is left out, not an error
  ];

  it('follows CIEDE2000 where RGB distance picks the other paint', () => {
    const target = '#4A6FA5';
    // Euclidean RGB distance prefers the greener paint (25 vs 30 levels)...
    const byRgb = paints.filter((p) => isHex(p.hex)).sort((p, q) => rgbDistance(target, p.hex) - rgbDistance(target, q.hex));
    expect(byRgb[0].id).toBe('greener');
    // ...but the eye (CIEDE2000) finds the bluer one much closer.
    const matches = nearestPaints(target, paints, 2);
    expect(matches.map((m) => m.id)).toEqual(['bluer', 'greener']);
    expect(matches[0].deltaE).toBeLessThan(matches[1].deltaE);
    expect(matches[0].deltaE).toBeCloseTo(deltaE2000(hexToLab(target), hexToLab('#4A6FC3')), 10);
  });

  it('returns k matches nearest first, fewer when the rack is small', () => {
    const all = nearestPaints('#E07424', paints, 10);
    expect(all).toHaveLength(3);
    expect(all[0].id).toBe('orange');
    for (let i = 1; i < all.length; i++) expect(all[i].deltaE).toBeGreaterThanOrEqual(all[i - 1].deltaE);
    expect(nearestPaints('#E07424', paints, 0)).toEqual([]);
  });

  it('gives the same answer from a prepared rack as from a full sort', () => {
    // A rack of 200 pseudo-random colours, checked against sorting every ΔE00.
    let s = 12345;
    const next = () => (s = (s * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
    const rackPaints = Array.from({ length: 200 }, (_, i) => ({
      id: i,
      hex: `#${Math.floor(next() * 0xffffff).toString(16).padStart(6, '0')}`,
    }));
    const rack = prepareRack(rackPaints);
    for (const target of ['#1F3A93', '#D9A066', '#808080', '#FF00FF']) {
      const lab = hexToLab(target);
      const sorted = rack.map((r) => ({ id: r.id, deltaE: deltaE2000(lab, r.lab) })).sort((a, b) => a.deltaE - b.deltaE);
      expect(nearestInRack(lab, rack, 3)).toEqual(sorted.slice(0, 3));
    }
  });
});

describe('matchBand', () => {
  it('says very close below 2, close below 5, far beyond', () => {
    expect(matchBand(0)).toBe('very close');
    expect(matchBand(1.99)).toBe('very close');
    expect(matchBand(2)).toBe('close');
    expect(matchBand(4.99)).toBe('close');
    expect(matchBand(5)).toBe('far');
    expect(matchBand(40)).toBe('far');
  });
});

describe('mixPreview', () => {
  it('mixing a colour with itself gives itself', () => {
    for (const hex of ['#1F3A93', '#D9A066', '#7F7F7F']) {
      expect(mixPreview([{ hex, parts: 3 }, { hex, parts: 1 }])).toBe(hex);
    }
  });

  it('1:1 of black and white in linear light is about #BCBCBC', () => {
    // Linear 0.5 encodes to sRGB 0.7354 → 187.5 of 255 (the sRGB transfer function of IEC 61966-2-1,
    // from memory).
    const mid = mixPreview([{ hex: '#000000', parts: 1 }, { hex: '#FFFFFF', parts: 1 }]);
    expect(mid).toBe('#BCBCBC');
    expect(deltaE2000(hexToLab(mid), hexToLab('#BCBCBC'))).toBeLessThan(0.5);
  });

  it('depends on the proportions only, and ignores 0 parts', () => {
    const a = mixPreview([{ hex: '#1F3A93', parts: 1 }, { hex: '#D9A066', parts: 3 }]);
    expect(mixPreview([{ hex: '#1F3A93', parts: 2 }, { hex: '#D9A066', parts: 6 }, { hex: '#FF0000', parts: 0 }])).toBe(a);
    expect(a).not.toBe(mixPreview([{ hex: '#1F3A93', parts: 3 }, { hex: '#D9A066', parts: 1 }]));
  });

  it('refuses an empty mix and negative parts', () => {
    expect(() => mixPreview([])).toThrow(RangeError);
    expect(() => mixPreview([{ hex: '#FFFFFF', parts: 0 }])).toThrow(RangeError);
    expect(() => mixPreview([{ hex: '#FFFFFF', parts: -1 }])).toThrow(RangeError);
  });
});

describe('ladder', () => {
  it('steps 3:1, 1:1, 1:3 for three steps, each previewed as its mix', () => {
    const steps = ladder('#2A3B1C', '#E8E0B0', 3);
    expect(steps.map((s) => s.ratio)).toEqual(['3:1', '1:1', '1:3']);
    for (const s of steps) {
      expect(s.hex).toBe(mixPreview([{ hex: '#2A3B1C', parts: s.partsA }, { hex: '#E8E0B0', parts: s.partsB }]));
    }
  });

  it('climbs in lightness from the dark paint to the light one', () => {
    const a = '#2A3B1C';
    const b = '#E8E0B0';
    const ls = [a, ...ladder(a, b, 5).map((s) => s.hex), b].map((h) => hexToLab(h).l);
    for (let i = 1; i < ls.length; i++) expect(ls[i]).toBeGreaterThan(ls[i - 1]);
    expect(ladder(a, b, 5).map((s) => s.ratio)).toEqual(['5:1', '2:1', '1:1', '1:2', '1:5']);
  });

  it('a one-step ladder is the 1:1 mix; a ladder of one colour stays that colour', () => {
    expect(ladder('#000000', '#FFFFFF', 1)).toEqual([{ partsA: 1, partsB: 1, ratio: '1:1', hex: '#BCBCBC' }]);
    expect(ladder('#D9A066', '#D9A066', 4).every((s) => s.hex === '#D9A066')).toBe(true);
  });

  it('refuses nonsense step counts', () => {
    expect(() => ladder('#000000', '#FFFFFF', 0)).toThrow(RangeError);
    expect(() => ladder('#000000', '#FFFFFF', 2.5)).toThrow(RangeError);
  });
});

describe('psiToBar', () => {
  it('uses 1 psi = 0.0689476 bar (from the international pound, standard gravity and the inch)', () => {
    // 0.45359237 kg × 9.80665 m/s² / (0.0254 m)² = 6894.757 Pa; NIST SP 811 appendix B lists
    // 1 psi = 6.894 757 E+03 Pa (from memory).
    expect(psiToBar(1)).toBeCloseTo(0.0689476, 7);
    expect(psiToBar(15)).toBeCloseTo(1.0342, 4);
    expect(barToPsi(1)).toBeCloseTo(14.5038, 4);
    expect(barToPsi(psiToBar(12))).toBeCloseTo(12, 12);
  });
});
