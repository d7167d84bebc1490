import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { deltaE2000, hexToLab } from '../../shared/color';
import { clusterPalette, rgbToLabPixels, seededRandom, type PaletteColour } from '../../shared/palette';
import { colourAt, extractPalette } from '../../server/lib/images/palette';
import { AppError } from '../../server/lib/errors';

const W = 600;
const H = 400;
const AREAS = [
  { hex: '#1F3A93', share: 0.6 },
  { hex: '#D9A066', share: 0.3 },
  { hex: '#FFFFFF', share: 0.1 },
];

function rgbOf(hex: string): [number, number, number] {
  const n = Number.parseInt(hex.slice(1), 16);
  return [(n >> 16) & 0xff, (n >> 8) & 0xff, n & 0xff];
}

/**
 * 600×400 RGBA test image with known areas: a white strip along the bottom (rows 360–399, 10 %), a
 * tan block in the top right (columns 300–599 × rows 0–239, 30 %) and blue everywhere else (60 %),
 * so edges run both ways. With `transparentWhite` the strip is fully transparent black instead, and
 * must come out white (flattened onto white).
 */
function knownAreaPixels(transparentWhite = false): Buffer {
  const channels = 4;
  const data = Buffer.alloc(W * H * channels);
  const [blue, tan, white] = AREAS.map((a) => rgbOf(a.hex));
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      let c = blue;
      let alpha = 255;
      if (y >= 360) {
        c = white; // bottom 40 rows of 400: 10 % of the area
        if (transparentWhite) alpha = 0;
      } else if (x >= 300 && y < 240) {
        c = tan; // 300 × 240 = 72 000 px = 30 % of 240 000
      }
      const i = (y * W + x) * channels;
      data[i] = transparentWhite && alpha === 0 ? 0 : c[0];
      data[i + 1] = transparentWhite && alpha === 0 ? 0 : c[1];
      data[i + 2] = transparentWhite && alpha === 0 ? 0 : c[2];
      data[i + 3] = alpha;
    }
  }
  return data;
}

const image = (transparentWhite = false) => sharp(knownAreaPixels(transparentWhite), { raw: { width: W, height: H, channels: 4 } });

function expectKnownAreas(palette: PaletteColour[]) {
  expect(palette.length).toBeGreaterThanOrEqual(3);
  expect(palette.length).toBeLessThanOrEqual(8);
  for (const area of AREAS) {
    const target = hexToLab(area.hex);
    const found = palette.reduce((best, c) => (deltaE2000(c.lab, target) < deltaE2000(best.lab, target) ? c : best));
    expect(deltaE2000(found.lab, target), `colour for ${area.hex}`).toBeLessThan(2);
    expect(Math.abs(found.share - area.share), `share of ${area.hex}`).toBeLessThanOrEqual(0.03);
  }
  const total = palette.reduce((s, c) => s + c.share, 0);
  expect(total).toBeCloseTo(1, 6);
  for (let i = 1; i < palette.length; i++) expect(palette[i].share).toBeLessThanOrEqual(palette[i - 1].share);
}

describe('extractPalette', () => {
  it('finds 60 % #1F3A93, 30 % #D9A066 and 10 % #FFFFFF in a PNG', async () => {
    const png = await image().png().toBuffer();
    expectKnownAreas(await extractPalette(png));
  });

  it('finds the same in a JPEG, despite compression and chroma subsampling', async () => {
    const jpeg = await image().flatten({ background: '#ffffff' }).jpeg({ quality: 85 }).toBuffer();
    expectKnownAreas(await extractPalette(jpeg));
  });

  it('flattens transparency onto white', async () => {
    const png = await image(true).png().toBuffer();
    expectKnownAreas(await extractPalette(png));
  });

  it('is deterministic: the same photo gives the same palette', async () => {
    const jpeg = await image().flatten({ background: '#ffffff' }).jpeg({ quality: 70 }).toBuffer();
    expect(await extractPalette(jpeg)).toEqual(await extractPalette(jpeg));
  });

  it('refuses what is not an image (415) and images over 40 megapixels (413)', async () => {
    await expect(extractPalette(Buffer.from('not an image at all'))).rejects.toMatchObject({ status: 415 });
    const huge = await sharp({ create: { width: 8000, height: 5001, channels: 3, background: '#808080' } })
      .png({ compressionLevel: 1 })
      .toBuffer();
    const err = await extractPalette(huge).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect(err).toMatchObject({ status: 413 });
  });
});

describe('colourAt', () => {
  it('reads the colour under a point given as fractions of the photo', async () => {
    const png = await image().png().toBuffer();
    const near = async (x: number, y: number, hex: string) =>
      expect(deltaE2000(hexToLab(await colourAt(png, x, y)), hexToLab(hex))).toBeLessThan(1);
    await near(0.2, 0.3, '#1F3A93');
    await near(0.75, 0.3, '#D9A066');
    await near(0.5, 0.95, '#FFFFFF');
    await near(1, 1, '#FFFFFF'); // the far corner is inside the photo
  });

  it('uses the orientation the viewer sees (EXIF rotation applied)', async () => {
    // Stored landscape: left half blue, right half white; EXIF orientation 6 shows it turned 90°
    // clockwise, so blue is on top and white below.
    const raw = Buffer.alloc(200 * 100 * 3);
    for (let y = 0; y < 100; y++) {
      for (let x = 0; x < 200; x++) raw.set(x < 100 ? rgbOf('#1F3A93') : [255, 255, 255], (y * 200 + x) * 3);
    }
    const jpeg = await sharp(raw, { raw: { width: 200, height: 100, channels: 3 } })
      .jpeg({ quality: 95 })
      .withMetadata({ orientation: 6 })
      .toBuffer();
    expect(deltaE2000(hexToLab(await colourAt(jpeg, 0.5, 0.2)), hexToLab('#1F3A93'))).toBeLessThan(2);
    expect(deltaE2000(hexToLab(await colourAt(jpeg, 0.5, 0.8)), hexToLab('#FFFFFF'))).toBeLessThan(2);
  });

  it('refuses points outside the photo', async () => {
    const png = await image().png().toBuffer();
    await expect(colourAt(png, 1.2, 0.5)).rejects.toMatchObject({ status: 400 });
    await expect(colourAt(png, Number.NaN, 0.5)).rejects.toMatchObject({ status: 400 });
  });
});

describe('clusterPalette', () => {
  const labPixels = (colours: { hex: string; count: number }[], noise = 0, seed = 7) => {
    const random = seededRandom(seed);
    const rgb: number[] = [];
    for (const { hex, count } of colours) {
      const c = rgbOf(hex);
      for (let i = 0; i < count; i++) {
        for (const v of c) rgb.push(Math.max(0, Math.min(255, Math.round(v + (random() - 0.5) * 2 * noise))));
      }
    }
    return rgbToLabPixels(Uint8Array.from(rgb), 3);
  };

  it('merges clusters closer than ΔE00 3 into one colour', () => {
    // #808080 and #838383 differ by about ΔE00 1; #2050C0 is far from both.
    expect(deltaE2000(hexToLab('#808080'), hexToLab('#838383'))).toBeLessThan(3);
    const palette = clusterPalette(labPixels([{ hex: '#808080', count: 300 }, { hex: '#838383', count: 300 }, { hex: '#2050C0', count: 400 }]));
    expect(palette).toHaveLength(2);
    expect(palette[0].share).toBeCloseTo(0.6, 6);
    expect(deltaE2000(palette[0].lab, hexToLab('#818181'))).toBeLessThan(1);
  });

  it('returns at most 8 colours from a noisy many-coloured image, shares summing to 1', () => {
    const hues = ['#FF0000', '#00FF00', '#0000FF', '#FFFF00', '#00FFFF', '#FF00FF', '#000000', '#FFFFFF', '#808080', '#804000', '#008040', '#400080'];
    const palette = clusterPalette(labPixels(hues.map((hex) => ({ hex, count: 500 })), 20));
    expect(palette.length).toBeLessThanOrEqual(8);
    expect(palette.length).toBeGreaterThanOrEqual(6);
    expect(palette.reduce((s, c) => s + c.share, 0)).toBeCloseTo(1, 6);
    for (let i = 0; i < palette.length; i++) {
      for (let j = i + 1; j < palette.length; j++) expect(deltaE2000(palette[i].lab, palette[j].lab)).toBeGreaterThanOrEqual(3);
    }
  });

  it('respects maxColours and gives the same result for the same seed', () => {
    const px = labPixels([{ hex: '#C03020', count: 500 }, { hex: '#20A040', count: 300 }, { hex: '#2040C0', count: 200 }], 30);
    const two = clusterPalette(px, { maxColours: 2 });
    expect(two).toHaveLength(2);
    expect(clusterPalette(px)).toEqual(clusterPalette(px));
  });

  it('handles one flat colour and no pixels', () => {
    const flat = clusterPalette(labPixels([{ hex: '#D9A066', count: 50 }]));
    expect(flat).toEqual([{ hex: '#D9A066', lab: expect.any(Object), share: 1 }]);
    expect(clusterPalette(new Float32Array(0))).toEqual([]);
  });
});
