// Reference-photo colours: sharp decodes and downsamples, shared/palette clusters. The photo's own
// colour profile is converted to sRGB by sharp; transparency is flattened onto white.
import sharp, { type Metadata } from 'sharp';
import { clusterPalette, rgbToLabPixels, type PaletteColour, type PaletteOptions } from '../../../shared/palette';
import { labToHex, rgbToLab } from '../../../shared/color';
import { errors } from '../errors';

/** Refuse images above 40 megapixels (decompression bombs); sharp enforces it as well. */
export const MAX_INPUT_PIXELS = 40_000_000;
/** The palette is computed on about this many pixels: plenty for dominant colours, and fast. */
export const PALETTE_SAMPLE_PIXELS = 10_000;
/** Point picks read from a copy at most this wide or high. */
const PICK_MAX_SIDE = 1024;
/** Point picks average a square of about this fraction of the photo's shorter side. */
const PICK_WINDOW_FRACTION = 0.01;

const open = (buffer: Buffer) => sharp(buffer, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error' }).autoOrient();

/** Oriented width and height; maps unreadable and oversized images to the app's 415 and 413 errors. */
async function orientedSize(buffer: Buffer): Promise<{ width: number; height: number }> {
  let meta: Metadata;
  try {
    meta = await sharp(buffer).metadata();
  } catch {
    throw errors.unsupported('That file is not an image we can read (use JPEG, PNG, WebP, AVIF, GIF or TIFF).');
  }
  const { width, height } = meta.autoOrient ?? meta;
  if (!width || !height) throw errors.unsupported('That image has no size we can read.');
  if (width * height > MAX_INPUT_PIXELS) {
    throw errors.tooLarge(`That image is over ${MAX_INPUT_PIXELS / 1_000_000} megapixels; send a smaller one.`);
  }
  return { width, height };
}

/** 8-bit RGB pixels of the photo scaled to fit width × height (never enlarged), alpha flattened on white. */
async function rgbPixels(buffer: Buffer, width: number, height: number, kernel: 'nearest' | 'linear') {
  try {
    const { data, info } = await open(buffer)
      .resize(width, height, { fit: 'inside', withoutEnlargement: true, kernel })
      .flatten({ background: '#ffffff' })
      .toColourspace('srgb')
      .raw({ depth: 'uchar' })
      .toBuffer({ resolveWithObject: true });
    return { data, width: info.width, height: info.height, channels: info.channels };
  } catch {
    // The header read fine (orientedSize) but the pixels did not: a damaged or truncated file.
    throw errors.unsupported('That image is damaged or incomplete; try saving it again.');
  }
}

/**
 * Dominant colours of a photo, largest share first: at most 8, clusters closer than ΔE00 3 merged
 * (see shared/palette for the options). Throws the app's 415 for unreadable input and 413 above
 * 40 megapixels.
 */
export async function extractPalette(buffer: Buffer, options?: PaletteOptions): Promise<PaletteColour[]> {
  const { width, height } = await orientedSize(buffer);
  const scale = Math.min(1, Math.sqrt(PALETTE_SAMPLE_PIXELS / (width * height)));
  // Point samples (nearest), not averages: each sample is a colour really in the photo, so area
  // shares stay honest and edges add no in-between colours. JPEGs are still shrunk on load by DCT
  // scaling first, which is what keeps a 12-megapixel photo fast.
  const px = await rgbPixels(buffer, Math.max(1, Math.round(width * scale)), Math.max(1, Math.round(height * scale)), 'nearest');
  return clusterPalette(rgbToLabPixels(px.data, px.channels), options);
}

/**
 * The colour at a point of the photo as "#RRGGBB", (x, y) given as fractions 0..1 of the oriented
 * photo's width and height (what the user sees), averaged over a small square around it so one
 * noisy pixel does not decide. The average is taken in CIELAB.
 */
export async function colourAt(buffer: Buffer, x: number, y: number): Promise<string> {
  if (!(x >= 0 && x <= 1 && y >= 0 && y <= 1)) {
    throw errors.invalid('The point must lie within the photo (x and y from 0 to 1).', { x: 'From 0 to 1.', y: 'From 0 to 1.' });
  }
  await orientedSize(buffer);
  const px = await rgbPixels(buffer, PICK_MAX_SIDE, PICK_MAX_SIDE, 'linear');
  const cx = Math.min(px.width - 1, Math.floor(x * px.width));
  const cy = Math.min(px.height - 1, Math.floor(y * px.height));
  const radius = Math.max(1, Math.round((PICK_WINDOW_FRACTION * Math.min(px.width, px.height)) / 2));
  let l = 0;
  let a = 0;
  let b = 0;
  let count = 0;
  for (let yy = Math.max(0, cy - radius); yy <= Math.min(px.height - 1, cy + radius); yy++) {
    for (let xx = Math.max(0, cx - radius); xx <= Math.min(px.width - 1, cx + radius); xx++) {
      const i = (yy * px.width + xx) * px.channels;
      const lab = rgbToLab(px.data[i], px.data[i + 1], px.data[i + 2]);
      l += lab.l;
      a += lab.a;
      b += lab.b;
      count++;
    }
  }
  return labToHex({ l: l / count, a: a / count, b: b / count });
}
