// npm run bench:photos — one generated 24-megapixel JPEG (gradients, shapes and sensor-like noise made
// by code; not a real photo) through the app's own upload processing (processPhoto: the upright,
// metadata-free original plus the 320/1280/2560 WebP renditions), beside a bare sharp
// decode-and-resize of the same photo: decode, turn upright, resize to 2560 px and encode that one WebP
// with the same settings, which is the least any upload must do. Then four photos at once through the
// upload concurrency limit, with peak memory (RSS sampled every 5 ms).
// Aims: processing at most 1.3 × the bare job; four at once under 400 MB peak.
// Each measurement runs in a fresh child process, so memory kept by one phase does not count in the next.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import sharp from 'sharp';
import { encoders, processPhoto, tuneSharpForUploads } from '../../server/lib/images/photos';
import { createLimiter } from '../../server/lib/upload';

const WIDTH = 6000;
const HEIGHT = 4000; // 24 MP
const RUNS = 7;
const AIM_RATIO = 1.3;
const AIM_PEAK_MB = 400;
const UPLOAD_CONCURRENCY = 2; // as in server/app.ts

tuneSharpForUploads();

/** A photo-like 24 MP JPEG, built inside libvips (no 72 MB pixel buffer in JavaScript). */
async function generatedPhoto(): Promise<Buffer> {
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${WIDTH}" height="${HEIGHT}">
    <defs>
      <linearGradient id="bg" x1="0" y1="0" x2="1" y2="1"><stop offset="0" stop-color="#2b3a55"/><stop offset="1" stop-color="#b89f7a"/></linearGradient>
      <radialGradient id="fig" cx="0.4" cy="0.3" r="0.8"><stop offset="0" stop-color="#d8e0c0"/><stop offset="0.6" stop-color="#6f8a3c"/><stop offset="1" stop-color="#1e2a12"/></radialGradient>
    </defs>
    <rect width="100%" height="100%" fill="url(#bg)"/>
    <ellipse cx="3000" cy="2300" rx="1100" ry="1500" fill="url(#fig)"/>
    <rect x="600" y="3100" width="4800" height="700" rx="120" fill="#5b4a3a"/>
    <circle cx="4700" cy="900" r="500" fill="#c9a227" opacity="0.8"/>
    <path d="M400 2600 Q1500 1400 2400 2700 T5600 2400" stroke="#2f5d50" stroke-width="160" fill="none"/>
  </svg>`;
  const scene = await sharp(Buffer.from(svg)).png({ compressionLevel: 1 }).toBuffer();
  const noise = await sharp({ create: { width: WIDTH, height: HEIGHT, channels: 3, background: '#000', noise: { type: 'gaussian', mean: 128, sigma: 24 } } })
    .png({ compressionLevel: 1 })
    .toBuffer();
  return sharp(scene).composite([{ input: noise, blend: 'soft-light' }]).removeAlpha().jpeg({ quality: 92 }).toBuffer();
}

/** The least an upload must do: decode, turn upright, resize to the largest rendition, encode it. */
const bare = (input: Buffer) =>
  encoders.rendition(sharp(input).autoOrient().resize({ width: 2560, height: 2560, fit: 'inside', withoutEnlargement: true })).toBuffer();

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const mb = (bytes: number) => (bytes / 1024 / 1024).toFixed(0);
async function time(fn: () => Promise<unknown>) {
  const t = performance.now();
  await fn();
  return performance.now() - t;
}
/** CPU time of the whole process (every thread) while fn runs, in ms: the work done, whatever the machine's load. */
async function cpu(fn: () => Promise<unknown>) {
  const c = process.cpuUsage();
  await fn();
  const d = process.cpuUsage(c);
  return (d.user + d.system) / 1000;
}

async function ratioPhase(input: Buffer) {
  // Warm-up, then alternate the two so a busy machine slows both alike.
  await bare(input);
  await processPhoto(input);
  const bareMs: number[] = [];
  const oursMs: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    bareMs.push(await time(() => bare(input)));
    oursMs.push(await time(() => processPhoto(input)));
  }
  const ratio = median(oursMs) / median(bareMs);
  const bareCpu: number[] = [];
  const oursCpu: number[] = [];
  for (let i = 0; i < 3; i++) {
    bareCpu.push(await cpu(() => bare(input)));
    oursCpu.push(await cpu(() => processPhoto(input)));
  }
  const out = await processPhoto(input);
  const kb = (b: Buffer) => `${(b.length / 1024).toFixed(0)} KB`;
  console.log(
    `one photo (median of ${RUNS}): processPhoto ${median(oursMs).toFixed(0)} ms vs bare decode-and-resize ${median(bareMs).toFixed(0)} ms ` +
      `→ ratio ${ratio.toFixed(2)} × (aim ≤ ${AIM_RATIO} ×) ${ratio <= AIM_RATIO ? 'OK' : 'OVER'}`,
  );
  console.log(
    `  CPU time: processPhoto ${median(oursCpu).toFixed(0)} ms vs bare ${median(bareCpu).toFixed(0)} ms (${(median(oursCpu) / median(bareCpu)).toFixed(2)} × the work; ` +
      `its two branches run side by side, so with two free cores the wall-time ratio is lower)`,
  );
  console.log(`  files: original ${kb(out.files.original)}, large ${kb(out.files.large)}, medium ${kb(out.files.medium)}, thumb ${kb(out.files.thumb)}`);
}

async function fourPhase(input: Buffer) {
  // Four uploads at once, each with its own buffer as multer would hold it, through the server's limit.
  const uploads = Array.from({ length: 4 }, () => Buffer.from(input));
  const limiter = createLimiter(UPLOAD_CONCURRENCY);
  const before = process.memoryUsage().rss;
  let peak = before;
  const sampler = setInterval(() => {
    peak = Math.max(peak, process.memoryUsage().rss);
  }, 5);
  const wall = await time(() => Promise.all(uploads.map((u) => limiter.run(() => processPhoto(u)))));
  clearInterval(sampler);
  peak = Math.max(peak, process.memoryUsage().rss);
  const arenas = process.env.MALLOC_ARENA_MAX ? `MALLOC_ARENA_MAX=${process.env.MALLOC_ARENA_MAX}` : 'default glibc malloc';
  console.log(
    `four at once (limit ${UPLOAD_CONCURRENCY}, ${arenas}): ${wall.toFixed(0)} ms, ${(wall / 4).toFixed(0)} ms per photo; ` +
      `peak RSS ${mb(peak)} MB (${mb(before)} MB at start) (aim < ${AIM_PEAK_MB} MB) ${peak < AIM_PEAK_MB * 1024 * 1024 ? 'OK' : 'OVER'}`,
  );
}

const [phase, file] = process.argv.slice(2);
if (phase) {
  const input = fs.readFileSync(file);
  await (phase === 'ratio' ? ratioPhase(input) : fourPhase(input));
} else {
  const input = await generatedPhoto();
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'bench-photos-')), 'photo.jpg');
  fs.writeFileSync(file, input);
  const meta = await sharp(input).metadata();
  console.log(
    `photo: ${meta.width} × ${meta.height} JPEG, ${(input.length / 1024 / 1024).toFixed(1)} MB; ${os.cpus().length} cores, ` +
      `load ${os.loadavg()[0].toFixed(1)}; sharp concurrency ${sharp.concurrency()}, cache off`,
  );
  const self = fileURLToPath(import.meta.url);
  const child = (p: string, env: NodeJS.ProcessEnv = {}) => {
    const r = spawnSync(process.execPath, [...process.execArgv, self, p, file], { stdio: 'inherit', env: { ...process.env, ...env } });
    if (r.status !== 0) process.exitCode = 1;
  };
  child('ratio');
  child('four');
  // glibc gives each thread that allocates its own arena and keeps freed pages there; libvips allocates
  // from several threads. With fewer arenas the same work keeps far less memory (set it for the server too).
  if (!process.env.MALLOC_ARENA_MAX) child('four', { MALLOC_ARENA_MAX: '2' });
  fs.rmSync(path.dirname(file), { recursive: true, force: true });
}
