// Colour maths for paints, recipes and reference photos. Pure: no I/O, used by client and server.
// Conversions and CIEDE2000 come from culori (its tree-shakable `culori/fn` entry, so the client
// bundle only carries the modes registered here).
import {
  converter,
  differenceCiede2000,
  formatHex,
  modeLab65,
  modeLrgb,
  modeRgb,
  useMode,
} from 'culori/fn';

useMode(modeRgb);
useMode(modeLrgb);
useMode(modeLab65);

/** CIELAB (D65 white, 2° observer). l is 0..100; a and b are roughly -128..128 for sRGB colours. */
export interface Lab {
  l: number;
  a: number;
  b: number;
}

const toLab65 = converter('lab65');
const toRgb = converter('rgb');
const toLrgb = converter('lrgb');
const ciede2000 = differenceCiede2000();

const HEX = /^#?([0-9a-f]{3}|[0-9a-f]{6})$/i;

/** True when `value` is a colour `normalizeHex` accepts: "#RRGGBB" or "#RGB", with or without "#". */
export function isHex(value: unknown): value is string {
  return typeof value === 'string' && HEX.test(value.trim());
}

/** "#abc", "aabbcc", " #AaBbCc " → "#AABBCC". Throws on anything else. */
export function normalizeHex(value: string): string {
  const m = HEX.exec(value.trim());
  if (!m) throw new RangeError(`Not a hex colour: ${JSON.stringify(value)}`);
  const digits = m[1].length === 3 ? m[1].replace(/./g, (d) => d + d) : m[1];
  return `#${digits.toUpperCase()}`;
}

/** 8-bit sRGB channels to CIELAB D65. */
export function rgbToLab(r: number, g: number, b: number): Lab {
  const lab = toLab65({ mode: 'rgb', r: r / 255, g: g / 255, b: b / 255 });
  return { l: lab.l, a: lab.a, b: lab.b };
}

/** sRGB hex (any form `normalizeHex` accepts) to CIELAB with the D65 white. */
export function hexToLab(hex: string): Lab {
  const digits = normalizeHex(hex);
  const n = Number.parseInt(digits.slice(1), 16);
  return rgbToLab((n >> 16) & 0xff, (n >> 8) & 0xff, n & 0xff);
}

/** CIELAB D65 to the nearest sRGB hex; colours outside the sRGB gamut are clipped per channel. */
export function labToHex(lab: Lab): string {
  const rgb = toRgb({ mode: 'lab65', l: lab.l, a: lab.a, b: lab.b });
  return formatHex({
    mode: 'rgb',
    r: clamp01(rgb.r),
    g: clamp01(rgb.g),
    b: clamp01(rgb.b),
  }).toUpperCase();
}

/** CIEDE2000 colour difference (kL = kC = kH = 1). Symmetric in its two arguments. */
export function deltaE2000(lab1: Lab, lab2: Lab): number {
  return ciede2000(
    { mode: 'lab65', l: lab1.l, a: lab1.a, b: lab1.b },
    { mode: 'lab65', l: lab2.l, a: lab2.a, b: lab2.b },
  );
}

export type MatchBand = 'very close' | 'close' | 'far';

/** Plain words for a ΔE00: below 2 "very close", below 5 "close", else "far". */
export function matchBand(deltaE: number): MatchBand {
  if (deltaE < 2) return 'very close';
  if (deltaE < 5) return 'close';
  return 'far';
}

export interface PaintColour<Id> {
  id: Id;
  hex: string;
}

export interface RackEntry<Id> {
  id: Id;
  hex: string;
  lab: Lab;
}

export interface PaintMatch<Id> {
  id: Id;
  deltaE: number;
}

/**
 * Converts a rack's colours to Lab once, for repeated `nearestInRack` calls. Paints whose hex is not
 * a valid colour (a medium or varnish may have none) are left out rather than failing the whole rack.
 */
export function prepareRack<Id>(paints: readonly PaintColour<Id>[]): RackEntry<Id>[] {
  const rack: RackEntry<Id>[] = [];
  for (const p of paints) {
    if (!isHex(p.hex)) continue;
    rack.push({ id: p.id, hex: normalizeHex(p.hex), lab: hexToLab(p.hex) });
  }
  return rack;
}

/** The k paints nearest to `lab` by CIEDE2000, nearest first; ties keep rack order. */
export function nearestInRack<Id>(lab: Lab, rack: readonly RackEntry<Id>[], k = 3): PaintMatch<Id>[] {
  if (!Number.isInteger(k) || k < 0) throw new RangeError(`k must be a whole number ≥ 0, got ${k}`);
  const best: PaintMatch<Id>[] = [];
  if (k === 0) return best;
  for (const entry of rack) {
    const deltaE = deltaE2000(lab, entry.lab);
    if (best.length === k && deltaE >= best[k - 1].deltaE) continue;
    // Insertion into a short sorted list beats sorting the whole rack when k is small.
    let i = best.length < k ? best.length : k - 1;
    while (i > 0 && best[i - 1].deltaE > deltaE) {
      best[i] = best[i - 1];
      i--;
    }
    best[i] = { id: entry.id, deltaE };
  }
  return best;
}

/** The k paints nearest to `hex` by CIEDE2000, nearest first. Use prepareRack + nearestInRack in loops. */
export function nearestPaints<Id>(hex: string, paints: readonly PaintColour<Id>[], k = 3): PaintMatch<Id>[] {
  return nearestInRack(hexToLab(hex), prepareRack(paints), k);
}

export interface MixPart {
  hex: string;
  parts: number;
}

/**
 * Approximate preview of mixing paints in the given parts: a weighted average in linear-light sRGB.
 * Real pigments mix subtractively and often darker or duller than this; the UI labels the swatch
 * "approximate". Entries with 0 parts are ignored; at least one must have parts > 0.
 */
export function mixPreview(mix: readonly MixPart[]): string {
  let r = 0;
  let g = 0;
  let b = 0;
  let total = 0;
  for (const { hex, parts } of mix) {
    if (!Number.isFinite(parts) || parts < 0) throw new RangeError(`Parts must be ≥ 0, got ${parts}`);
    if (parts === 0) continue;
    const lin = toLrgb(hexToRgb(hex));
    r += lin.r * parts;
    g += lin.g * parts;
    b += lin.b * parts;
    total += parts;
  }
  if (total === 0) throw new RangeError('A mix needs at least one paint with parts > 0');
  const rgb = toRgb({ mode: 'lrgb', r: r / total, g: g / total, b: b / total });
  return formatHex({ mode: 'rgb', r: clamp01(rgb.r), g: clamp01(rgb.g), b: clamp01(rgb.b) }).toUpperCase();
}

export interface LadderStep {
  /** Parts of the first paint and of the second, in lowest terms (3:1, 1:1, 1:3). */
  partsA: number;
  partsB: number;
  /** "3:1" — parts of A to parts of B. */
  ratio: string;
  /** Approximate preview of the mix (see mixPreview). */
  hex: string;
}

/**
 * The intermediate mixes of a highlight ladder from paint A to paint B in `steps` steps (A and B
 * themselves excluded): step i of n mixes (n + 1 - i) parts A with i parts B, so 3 steps give
 * 3:1, 1:1, 1:3 (progressive mixes are common practice; no published source).
 */
export function ladder(hexA: string, hexB: string, steps: number): LadderStep[] {
  if (!Number.isInteger(steps) || steps < 1 || steps > 20) {
    throw new RangeError(`steps must be a whole number from 1 to 20, got ${steps}`);
  }
  const out: LadderStep[] = [];
  for (let i = 1; i <= steps; i++) {
    const d = gcd(steps + 1 - i, i);
    const partsA = (steps + 1 - i) / d;
    const partsB = i / d;
    out.push({
      partsA,
      partsB,
      ratio: `${partsA}:${partsB}`,
      hex: mixPreview([
        { hex: hexA, parts: partsA },
        { hex: hexB, parts: partsB },
      ]),
    });
  }
  return out;
}

// 1 psi = 1 lbf/in²; the pound is exactly 0.45359237 kg, standard gravity exactly 9.80665 m/s²,
// the inch exactly 0.0254 m, and 1 bar exactly 100 000 Pa — so this is exact up to float rounding
// (≈ 0.0689476 bar).
const PA_PER_PSI = (0.45359237 * 9.80665) / (0.0254 * 0.0254);
export const BAR_PER_PSI = PA_PER_PSI / 100_000;

/** Airbrush pressure in psi to bar. */
export function psiToBar(psi: number): number {
  return psi * BAR_PER_PSI;
}

/** Airbrush pressure in bar to psi. */
export function barToPsi(bar: number): number {
  return bar / BAR_PER_PSI;
}

function hexToRgb(hex: string) {
  const n = Number.parseInt(normalizeHex(hex).slice(1), 16);
  return { mode: 'rgb' as const, r: ((n >> 16) & 0xff) / 255, g: ((n >> 8) & 0xff) / 255, b: (n & 0xff) / 255 };
}

function clamp01(v: number): number {
  return v < 0 ? 0 : v > 1 ? 1 : v;
}

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}
