// npm run bench:palette — reference-photo palette + nearest paints, end to end, on a generated
// 12-megapixel photo-like image (gradients, shaded shapes, sensor-like noise; not a real photo)
// against a 1,000-paint rack of random colours. Aim: under 400 ms on this 2-core machine.
import os from 'node:os';
import { performance } from 'node:perf_hooks';
import sharp from 'sharp';
import { nearestInRack, prepareRack } from '../../shared/color';
import { seededRandom } from '../../shared/palette';
import { extractPalette } from '../../server/lib/images/palette';

const AIM_MS = 400;
const WIDTH = 4000;
const HEIGHT = 3000; // 12 MP
const RACK_SIZE = 1000;
const WARMUP = 2;
const RUNS = 9;

// Each run must decode the photo again, as a request would; libvips would otherwise reuse results.
sharp.cache(false);

function photoLikePixels(seed: number): Buffer {
  const random = seededRandom(seed);
  const data = Buffer.alloc(WIDTH * HEIGHT * 3);
  // A few shaded ellipses (a painted figure on a backdrop, roughly) over a two-way gradient.
  const shapes = Array.from({ length: 7 }, () => ({
    cx: random() * WIDTH,
    cy: random() * HEIGHT,
    rx: (0.05 + random() * 0.2) * WIDTH,
    ry: (0.05 + random() * 0.25) * HEIGHT,
    rgb: [random() * 255, random() * 255, random() * 255],
  }));
  const noise = new Float32Array(4096).map(() => (random() + random() + random() - 1.5) * 12);
  let n = 0;
  for (let y = 0; y < HEIGHT; y++) {
    const fy = y / HEIGHT;
    for (let x = 0; x < WIDTH; x++) {
      const fx = x / WIDTH;
      let r = 40 + 150 * fx;
      let g = 60 + 90 * fy;
      let b = 170 - 100 * fx * fy;
      for (const s of shapes) {
        const dx = (x - s.cx) / s.rx;
        const dy = (y - s.cy) / s.ry;
        const d = dx * dx + dy * dy;
        if (d < 1) {
          const shade = 1.15 - 0.5 * d - 0.25 * dy; // lit from above
          r = s.rgb[0] * shade;
          g = s.rgb[1] * shade;
          b = s.rgb[2] * shade;
        }
      }
      const i = (y * WIDTH + x) * 3;
      data[i] = r + noise[n++ & 4095];
      data[i + 1] = g + noise[(n * 7) & 4095];
      data[i + 2] = b + noise[(n * 13) & 4095];
    }
  }
  return data;
}

function randomRack(seed: number) {
  const random = seededRandom(seed);
  return Array.from({ length: RACK_SIZE }, (_, i) => ({
    id: i + 1,
    hex: `#${Math.floor(random() * 0x1000000).toString(16).padStart(6, '0')}`,
  }));
}

async function paletteAndMatches(photo: Buffer, paints: ReturnType<typeof randomRack>) {
  const t0 = performance.now();
  const palette = await extractPalette(photo);
  const t1 = performance.now();
  const rack = prepareRack(paints);
  const matches = palette.map((c) => ({ colour: c, paints: nearestInRack(c.lab, rack, 3) }));
  const t2 = performance.now();
  return { matches, paletteMs: t1 - t0, matchMs: t2 - t1, totalMs: t2 - t0 };
}

const median = (xs: number[]) => {
  const s = xs.slice().sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

async function bench(label: string, photo: Buffer, paints: ReturnType<typeof randomRack>) {
  for (let i = 0; i < WARMUP; i++) await paletteAndMatches(photo, paints);
  const runs = [];
  for (let i = 0; i < RUNS; i++) runs.push(await paletteAndMatches(photo, paints));
  return {
    label,
    mb: photo.length / 1e6,
    palette: median(runs.map((r) => r.paletteMs)),
    match: median(runs.map((r) => r.matchMs)),
    total: median(runs.map((r) => r.totalMs)),
    worst: Math.max(...runs.map((r) => r.totalMs)),
    last: runs[runs.length - 1].matches,
  };
}

const genStart = performance.now();
const pixels = photoLikePixels(2024);
const raw = { raw: { width: WIDTH, height: HEIGHT, channels: 3 as const } };
const jpeg = await sharp(pixels, raw).jpeg({ quality: 90 }).toBuffer();
const png = await sharp(pixels, raw).png({ compressionLevel: 6 }).toBuffer();
const paints = randomRack(1000);
console.log(
  `Generated ${WIDTH}×${HEIGHT} (${(WIDTH * HEIGHT) / 1e6} MP) photo-like image and a ${RACK_SIZE}-paint rack in ` +
    `${((performance.now() - genStart) / 1000).toFixed(1)} s. Node ${process.version}, ${os.availableParallelism()} cores, ` +
    `libvips ${sharp.versions.vips}, libvips threads ${sharp.concurrency()}. Median of ${RUNS} runs after ${WARMUP} warm-up.`,
);

const results = [await bench('JPEG q90 (a camera photo)', jpeg, paints), await bench('PNG (lossless; for comparison)', png, paints)];

const pad = (s: string, n: number) => s.padEnd(n);
const ms = (v: number) => `${v.toFixed(1)} ms`.padStart(10);
console.log(`\n${pad('input', 32)}${pad('size', 9)}${'palette'.padStart(10)}${'match'.padStart(10)}${'total'.padStart(10)}${'worst'.padStart(10)}`);
for (const r of results) {
  console.log(`${pad(r.label, 32)}${pad(`${r.mb.toFixed(1)} MB`, 9)}${ms(r.palette)}${ms(r.match)}${ms(r.total)}${ms(r.worst)}`);
}

const main = results[0];
console.log(`\nPalette of the JPEG (share, colour, 3 nearest paints by ΔE00):`);
for (const { colour, paints: near } of main.last) {
  console.log(
    `  ${(colour.share * 100).toFixed(1).padStart(5)} %  ${colour.hex}  ` +
      near.map((m) => `#${m.id} ΔE ${m.deltaE.toFixed(1)}`).join(', '),
  );
}
const met = main.total < AIM_MS;
console.log(`\nAim: palette + 3 nearest paints for a 12 MP photo under ${AIM_MS} ms → ${main.total.toFixed(1)} ms: ${met ? 'MET' : 'NOT MET'}.`);
if (!met) process.exitCode = 1;
