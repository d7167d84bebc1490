// Dominant colours of an image: k-means in CIELAB with k-means++ seeding from a fixed-seed PRNG, so
// the same pixels always give the same palette. Pure: the server decodes and downsamples the image
// (server/lib/images/palette.ts) and hands the pixels here.
import { deltaE2000, labToHex, rgbToLab, type Lab } from './color';

export interface PaletteColour {
  hex: string;
  lab: Lab;
  /** Fraction of the pixels (0..1) nearest this colour; the shares of a palette sum to 1. */
  share: number;
}

export interface PaletteOptions {
  /** Most colours to return, 1..8. Default 8. */
  maxColours?: number;
  /** Clusters closer than this CIEDE2000 are merged into one. Default 3. */
  mergeDeltaE?: number;
  /**
   * Clusters covering less than this fraction of the pixels are dropped and their pixels go to the
   * nearest remaining colour (mostly blends along edges, not colours anyone painted). Default 0.01.
   */
  minShare?: number;
  /** PRNG seed; fixed by default so the palette is deterministic. */
  seed?: number;
  /** Upper bound on k-means iterations. Default 40. */
  maxIterations?: number;
}

export const PALETTE_SEED = 0x5ab1e;
export const MAX_PALETTE_COLOURS = 8;

/** Mulberry32: a tiny 32-bit seeded PRNG returning floats in [0, 1). Deterministic across platforms. */
export function seededRandom(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Interleaved 8-bit pixels (`channels` per pixel, the first three R, G, B) to interleaved
 * L, a, b floats. Identical colours are converted once.
 */
export function rgbToLabPixels(data: Uint8Array, channels = 3): Float32Array {
  if (channels < 3) throw new RangeError(`Need at least 3 channels (RGB), got ${channels}`);
  const n = Math.floor(data.length / channels);
  const out = new Float32Array(n * 3);
  const seen = new Map<number, number>(); // packed RGB → pixel index already converted
  for (let i = 0; i < n; i++) {
    const r = data[i * channels];
    const g = data[i * channels + 1];
    const b = data[i * channels + 2];
    const key = (r << 16) | (g << 8) | b;
    const prev = seen.get(key);
    if (prev !== undefined) {
      out[i * 3] = out[prev * 3];
      out[i * 3 + 1] = out[prev * 3 + 1];
      out[i * 3 + 2] = out[prev * 3 + 2];
      continue;
    }
    const lab = rgbToLab(r, g, b);
    out[i * 3] = lab.l;
    out[i * 3 + 1] = lab.a;
    out[i * 3 + 2] = lab.b;
    seen.set(key, i);
  }
  return out;
}

interface Cluster {
  l: number;
  a: number;
  b: number;
  count: number;
}

/**
 * Clusters interleaved Lab pixels (L, a, b, L, a, b, ...) into at most `maxColours` dominant colours,
 * merges clusters closer than ΔE00 `mergeDeltaE`, and returns them by share, largest first.
 * k-means itself uses Euclidean Lab distance (ΔE76): its mean is what minimises it; CIEDE2000 is used
 * where perception decides, for merging.
 */
export function clusterPalette(pixels: Float32Array, options: PaletteOptions = {}): PaletteColour[] {
  const maxColours = options.maxColours ?? MAX_PALETTE_COLOURS;
  const mergeDeltaE = options.mergeDeltaE ?? 3;
  const minShare = options.minShare ?? 0.01;
  const maxIterations = options.maxIterations ?? 40;
  if (!Number.isInteger(maxColours) || maxColours < 1 || maxColours > MAX_PALETTE_COLOURS) {
    throw new RangeError(`maxColours must be a whole number from 1 to ${MAX_PALETTE_COLOURS}`);
  }
  if (pixels.length % 3 !== 0) throw new RangeError('Lab pixels must come in threes (L, a, b)');
  const n = pixels.length / 3;
  if (n === 0) return [];

  const random = seededRandom(options.seed ?? PALETTE_SEED);
  const labels = new Uint8Array(n);
  let clusters = seedKMeansPlusPlus(pixels, maxColours, random);
  clusters = lloyd(pixels, clusters, labels, maxIterations);

  // Merging and dropping change which centre is nearest for some pixels; reassign and repeat until
  // stable (a couple of rounds at most in practice).
  for (let round = 0; round < 4; round++) {
    const before = clusters.length;
    clusters = mergeClose(clusters, mergeDeltaE);
    clusters = dropSmall(clusters, minShare * n);
    clusters = lloyd(pixels, clusters, labels, 1);
    if (clusters.length === before) break;
  }

  return clusters
    .map((c) => {
      const lab = { l: c.l, a: c.a, b: c.b };
      return { hex: labToHex(lab), lab, share: c.count / n };
    })
    .sort((x, y) => y.share - x.share || y.lab.l - x.lab.l);
}

function dist2(pixels: Float32Array, i: number, c: Cluster): number {
  const dl = pixels[i * 3] - c.l;
  const da = pixels[i * 3 + 1] - c.a;
  const db = pixels[i * 3 + 2] - c.b;
  return dl * dl + da * da + db * db;
}

function seedKMeansPlusPlus(pixels: Float32Array, k: number, random: () => number): Cluster[] {
  const n = pixels.length / 3;
  const pick = (i: number): Cluster => ({ l: pixels[i * 3], a: pixels[i * 3 + 1], b: pixels[i * 3 + 2], count: 0 });
  const centres = [pick(Math.floor(random() * n))];
  const d2 = new Float64Array(n);
  for (let i = 0; i < n; i++) d2[i] = dist2(pixels, i, centres[0]);
  while (centres.length < k) {
    let sum = 0;
    for (let i = 0; i < n; i++) sum += d2[i];
    if (sum === 0) break; // fewer distinct colours than k: every pixel already sits on a centre
    let target = random() * sum;
    let chosen = n - 1;
    for (let i = 0; i < n; i++) {
      target -= d2[i];
      if (target < 0) {
        chosen = i;
        break;
      }
    }
    const c = pick(chosen);
    centres.push(c);
    for (let i = 0; i < n; i++) {
      const d = dist2(pixels, i, c);
      if (d < d2[i]) d2[i] = d;
    }
  }
  return centres;
}

/** Lloyd iterations: assign each pixel to its nearest centre, move centres to their means. */
function lloyd(pixels: Float32Array, start: Cluster[], labels: Uint8Array, maxIterations: number): Cluster[] {
  const n = pixels.length / 3;
  let centres = start;
  for (let iter = 0; iter < maxIterations; iter++) {
    const k = centres.length;
    const sums = new Float64Array(k * 3);
    const counts = new Uint32Array(k);
    let changed = iter === 0;
    // Centres in flat arrays: this loop is most of the work, and property lookups slow it down.
    const cl = Float64Array.from(centres, (c) => c.l);
    const ca = Float64Array.from(centres, (c) => c.a);
    const cb = Float64Array.from(centres, (c) => c.b);
    for (let i = 0; i < n; i++) {
      const pl = pixels[i * 3];
      const pa = pixels[i * 3 + 1];
      const pb = pixels[i * 3 + 2];
      let best = 0;
      let bestD = Infinity;
      for (let c = 0; c < k; c++) {
        const dl = pl - cl[c];
        const da = pa - ca[c];
        const db = pb - cb[c];
        const d = dl * dl + da * da + db * db;
        if (d < bestD) {
          bestD = d;
          best = c;
        }
      }
      if (labels[i] !== best) {
        labels[i] = best;
        changed = true;
      }
      sums[best * 3] += pl;
      sums[best * 3 + 1] += pa;
      sums[best * 3 + 2] += pb;
      counts[best]++;
    }
    const next: Cluster[] = [];
    const remap = new Int16Array(k).fill(-1);
    for (let c = 0; c < k; c++) {
      if (counts[c] === 0) continue; // an empty cluster simply disappears
      remap[c] = next.length;
      next.push({ l: sums[c * 3] / counts[c], a: sums[c * 3 + 1] / counts[c], b: sums[c * 3 + 2] / counts[c], count: counts[c] });
    }
    if (next.length !== k) for (let i = 0; i < n; i++) labels[i] = remap[labels[i]];
    centres = next;
    if (!changed) break;
  }
  return centres;
}

/** Repeatedly merges the closest pair while it is closer than `threshold` ΔE00 (count-weighted mean). */
function mergeClose(clusters: Cluster[], threshold: number): Cluster[] {
  const list = clusters.slice();
  for (;;) {
    let bi = -1;
    let bj = -1;
    let bestD = threshold;
    for (let i = 0; i < list.length; i++) {
      for (let j = i + 1; j < list.length; j++) {
        const d = deltaE2000(list[i], list[j]);
        if (d < bestD) {
          bestD = d;
          bi = i;
          bj = j;
        }
      }
    }
    if (bi < 0) return list;
    const x = list[bi];
    const y = list[bj];
    const count = x.count + y.count;
    list[bi] = {
      l: (x.l * x.count + y.l * y.count) / count,
      a: (x.a * x.count + y.a * y.count) / count,
      b: (x.b * x.count + y.b * y.count) / count,
      count,
    };
    list.splice(bj, 1);
  }
}

function dropSmall(clusters: Cluster[], minCount: number): Cluster[] {
  const kept = clusters.filter((c) => c.count >= minCount);
  if (kept.length > 0) return kept;
  // Never return nothing: keep the largest even when every cluster is tiny.
  return [clusters.reduce((a, b) => (b.count > a.count ? b : a))];
}
