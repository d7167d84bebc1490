import exifReader from 'exif-reader';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, twoStudios, type TestApp } from '../support/app';
import { failInsertsInto } from '../support/db-faults';
import { images, insertCommission, insertFigure, photoFiles, upload, userId } from '../support/fixtures';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let commissionId: number;
let figure: { figureId: number; stageIds: number[] };
let hugePng: Buffer;
let url: string;

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  commissionId = await insertCommission(sw, s.a.studioId, s.a.clientId);
  figure = await insertFigure(sw, s.a.studioId, commissionId, await userId(sw, 'painter-a@studio.test'));
  url = `/api/studios/${s.a.studioId}/commissions/${commissionId}/photos`;
  // 144 megapixels of one colour: compresses to a small file, far over the 40-megapixel limit.
  hugePng = await sharp({ create: { width: 12000, height: 12000, channels: 3, background: '#556b2f' } }).png({ compressionLevel: 9 }).toBuffer();
});
afterAll(() => sw.stop());

const get = (path: string) => s.a.owner.get(path).buffer(true);

describe('photo upload', () => {
  it('stores an upright original and WebP renditions at 320, 1280 and 2560 px, never enlarged', async () => {
    const res = await upload(s.a.owner, url, [
      { data: await images.twoTone(3000, 2000), name: 'big.jpg' },
      { data: await images.twoTone(200, 100, 'png'), name: 'small.png', type: 'image/png' },
    ]);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toHaveLength(2);
    const [big, small] = res.body;
    expect(big).toMatchObject({ commissionId, kind: 'progress', shared: false, width: 3000, height: 2000, uploadedBy: { name: 'Test Person' } });
    expect(big.urls.thumb).toBe(`/api/studios/${s.a.studioId}/photos/${big.id}/thumb`);

    const sizes = async (p: { urls: Record<string, string> }) => {
      const out: Record<string, [string | undefined, number | undefined, number | undefined]> = {};
      for (const [k, u] of Object.entries(p.urls)) {
        const r = await get(u).expect(200);
        const m = await sharp(r.body as Buffer).metadata();
        out[k] = [m.format, m.width, m.height];
      }
      return out;
    };
    expect(await sizes(big)).toEqual({ thumb: ['webp', 320, 213], medium: ['webp', 1280, 853], large: ['webp', 2560, 1707], original: ['jpeg', 3000, 2000] });
    expect(await sizes(small)).toEqual({ thumb: ['webp', 200, 100], medium: ['webp', 200, 100], large: ['webp', 200, 100], original: ['png', 200, 100] });
    const row = await sw.db('photos').where({ id: big.id }).first();
    expect(row.format).toBe('jpeg');
    expect(row.bytes).toBeGreaterThan(0);
  });

  it('keeps the upload\'s format for the original: WebP stays WebP, a PNG keeps its transparency; greyscale is fine', async () => {
    const webp = await images.twoTone(300, 200, 'webp');
    const clear = await sharp({ create: { width: 120, height: 80, channels: 4, background: { r: 200, g: 30, b: 30, alpha: 0 } } }).png().toBuffer();
    const grey = await sharp(await images.twoTone(100, 100)).greyscale().jpeg().toBuffer();
    const res = await upload(s.a.owner, url, [
      { data: webp, name: 'a.webp', type: 'image/webp' },
      { data: clear, name: 'b.png', type: 'image/png' },
      { data: grey, name: 'c.jpg' },
    ]);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const [w, p, g] = res.body as { urls: Record<string, string> }[];
    expect((await get(w.urls.original).expect(200)).headers['content-type']).toBe('image/webp');
    const png = (await get(p.urls.original).expect(200)).body as Buffer;
    const pm = await sharp(png).metadata();
    expect([pm.format, pm.hasAlpha]).toEqual(['png', true]);
    const thumb = await sharp((await get(p.urls.thumb).expect(200)).body as Buffer).metadata();
    expect(thumb.hasAlpha).toBe(true);
    expect((await sharp((await get(g.urls.medium).expect(200)).body as Buffer).metadata()).format).toBe('webp');
  });

  it('removes an EXIF GPS position (and all other metadata) from the original and every rendition', async () => {
    const input = await sharp({ create: { width: 640, height: 480, channels: 3, background: '#8a9a5b' } })
      .jpeg()
      .withExif({
        IFD0: { Make: 'Invented Camera Co', Copyright: 'Someone' },
        IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 30/1' },
      })
      .toBuffer();
    // The input really carries the position, so the test can fail.
    const inMeta = await sharp(input).metadata();
    const inExif = exifReader(inMeta.exif!);
    expect(inExif.GPSInfo?.GPSLatitude).toEqual([51, 30, 0]);
    expect(inExif.GPSInfo?.GPSLatitudeRef).toBe('N');

    const res = await upload(s.a.owner, url, [{ data: input, name: 'gps.jpg' }]);
    expect(res.status).toBe(201);
    for (const u of Object.values(res.body[0].urls as Record<string, string>)) {
      const body = (await get(u).expect(200)).body as Buffer;
      const m = await sharp(body).metadata();
      expect(m.exif, u).toBeUndefined();
      expect(m.xmp, u).toBeUndefined();
      expect(m.iptc, u).toBeUndefined();
      expect(m.icc, u).toBeUndefined();
      // Nor anywhere in the bytes: the EXIF marker and the camera's name are gone.
      expect(body.includes(Buffer.from('Exif\0\0')), u).toBe(false);
      expect(body.includes(Buffer.from('Invented Camera Co')), u).toBe(false);
    }
  });

  it('turns a photo upright by its EXIF orientation (6: width and height swap)', async () => {
    // Stored 400 × 200 with red on the left; orientation 6 means "turn 90° clockwise to view",
    // so the upright picture is 200 × 400 with red on top.
    const input = await sharp(await images.twoTone(400, 200)).withMetadata({ orientation: 6 }).jpeg().toBuffer();
    expect((await sharp(input).metadata()).orientation).toBe(6);
    const res = await upload(s.a.owner, url, [{ data: input, name: 'turned.jpg' }]);
    expect(res.status).toBe(201);
    expect(res.body[0]).toMatchObject({ width: 200, height: 400 });
    for (const size of ['original', 'thumb'] as const) {
      const body = (await get(res.body[0].urls[size]).expect(200)).body as Buffer;
      const m = await sharp(body).metadata();
      expect([m.width, m.height, m.orientation ?? 1], size).toEqual(size === 'original' ? [200, 400, 1] : [160, 320, 1]);
      const { data, info } = await sharp(body).raw().toBuffer({ resolveWithObject: true });
      const px = (x: number, y: number) => [...data.subarray((y * info.width + x) * info.channels, (y * info.width + x) * info.channels + 3)];
      const top = px(Math.floor(info.width / 2), 5);
      const bottom = px(Math.floor(info.width / 2), info.height - 5);
      expect(top[0], `${size} top is red`).toBeGreaterThan(150);
      expect(bottom[2], `${size} bottom is blue`).toBeGreaterThan(150);
    }
  });

  it('answers 415 for a text file named .jpg, judged by content and not by name or declared type', async () => {
    const res = await upload(s.a.owner, url, [{ data: Buffer.from('these are not the pixels you are looking for\n'.repeat(50)), name: 'photo.jpg', type: 'image/jpeg' }]);
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media');
    // A GIF is a real image, but not one we take.
    const gif = await sharp({ create: { width: 10, height: 10, channels: 3, background: '#000' } }).gif().toBuffer();
    expect((await upload(s.a.owner, url, [{ data: gif, name: 'a.jpg' }])).status).toBe(415);
  });

  it('answers 422 above 40 megapixels (a 12000 × 12000 PNG)', async () => {
    expect(hugePng.length).toBeLessThan(25 * 1024 * 1024);
    const res = await upload(s.a.owner, url, [{ data: hugePng, name: 'huge.png', type: 'image/png' }]);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/40 megapixels/);
  });

  it('answers 413 for a file over 25 MB', async () => {
    const big = Buffer.alloc(25 * 1024 * 1024 + 1, 0x41);
    const res = await upload(s.a.owner, url, [{ data: big, name: 'big.jpg' }]);
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('too_large');
  });

  it('refuses more than 10 files and an upload without files', async () => {
    const one = await images.twoTone(20, 20);
    const res = await upload(s.a.owner, url, Array.from({ length: 11 }, (_, i) => ({ data: one, name: `${i}.jpg` })));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.photos).toMatch(/at most 10/);
    const none = await upload(s.a.owner, url, []);
    expect(none.status).toBe(400);
    expect(none.body.error.fields.photos).toBeDefined();
  });

  it('a failed upload leaves neither a row nor a file, also when one good photo came first', async () => {
    const rowsBefore = (await sw.db('photos').count({ n: '*' }).first())!.n;
    const filesBefore = photoFiles(sw);
    expect(filesBefore.length).toBeGreaterThan(0);
    const good = await images.twoTone(800, 600);
    // Header fine, pixels cut off: found only while decoding, after the good photo's files were written.
    const fullPng = await sharp({ create: { width: 600, height: 600, channels: 3, background: '#000', noise: { type: 'gaussian', mean: 128, sigma: 40 } } }).png().toBuffer();
    const truncated = fullPng.subarray(0, Math.floor(fullPng.length / 2));
    const res = await upload(s.a.owner, url, [{ data: good, name: 'good.jpg' }, { data: truncated, name: 'cut.png', type: 'image/png' }]);
    expect(res.status).toBe(415);
    expect((await sw.db('photos').count({ n: '*' }).first())!.n).toBe(rowsBefore);
    expect(photoFiles(sw)).toEqual(filesBefore);
  });

  it('a failure in the database transaction removes the files already written', async () => {
    const filesBefore = photoFiles(sw);
    const rowsBefore = (await sw.db('photos').count({ n: '*' }).first())!.n;
    // Test-only fault: the insert fails after every file has been written under its temporary name.
    const restore = await failInsertsInto(sw.db, 'photos', 'disk on fire');
    try {
      const res = await upload(s.a.owner, url, [{ data: await images.twoTone(500, 400), name: 'a.jpg' }, { data: await images.twoTone(300, 300), name: 'b.jpg' }]);
      expect(res.status).toBe(500);
    } finally {
      await restore();
    }
    expect((await sw.db('photos').count({ n: '*' }).first())!.n).toBe(rowsBefore);
    expect(photoFiles(sw)).toEqual(filesBefore);
  });

  it('ties a photo to a figure or stage of the same commission only', async () => {
    const small = [{ data: await images.twoTone(40, 30), name: 's.jpg' }];
    const ok = await upload(s.a.owner, url, small, { kind: 'progress', stageId: String(figure.stageIds[1]), caption: 'Basecoat done' });
    expect(ok.status).toBe(201);
    expect(ok.body[0]).toMatchObject({ figureId: figure.figureId, stageId: figure.stageIds[1], caption: 'Basecoat done' });
    const other = await insertCommission(sw, s.a.studioId, s.a.clientId, { title: 'Other job' });
    const otherFigure = await insertFigure(sw, s.a.studioId, other);
    const bad = await upload(s.a.owner, url, small, { kind: 'progress', figureId: String(otherFigure.figureId) });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.figureId).toBeDefined();
    const badStage = await upload(s.a.owner, url, small, { kind: 'progress', stageId: String(otherFigure.stageIds[0]) });
    expect(badStage.body.error.fields.stageId).toBeDefined();
    const badKind = await upload(s.a.owner, url, small, { kind: 'selfie' });
    expect(badKind.status).toBe(400);
    expect(badKind.body.error.fields.kind).toBeDefined();
  });

  it('a painter of one studio cannot upload to another studio (404), nor list its photos', async () => {
    const small = [{ data: await images.twoTone(40, 30), name: 's.jpg' }];
    expect((await upload(s.b.painter, url, small)).status).toBe(404);
    expect((await s.b.painter.get(url)).status).toBe(404);
    // Nor through their own studio's path with the other studio's commission id.
    expect((await upload(s.b.painter, `/api/studios/${s.b.studioId}/commissions/${commissionId}/photos`, small)).status).toBe(404);
    // The painter of studio A may.
    expect((await upload(s.a.painter, url, small)).status).toBe(201);
  });
});

describe('serving photos', () => {
  it('sends an ETag and private cache headers, and 304 when the tag matches', async () => {
    const up = await upload(s.a.owner, url, [{ data: await images.twoTone(600, 400), name: 'e.jpg' }]);
    const u = up.body[0].urls.medium as string;
    const first = await get(u).expect(200);
    expect(first.headers['content-type']).toBe('image/webp');
    expect(first.headers['cache-control']).toMatch(/^private, max-age=\d+$/);
    const etag = first.headers.etag;
    expect(etag).toMatch(/^"[^"]+"$/);
    const again = await s.a.owner.get(u).set('If-None-Match', etag);
    expect(again.status).toBe(304);
    expect(again.headers.etag).toBe(etag);
    const other = await get(up.body[0].urls.thumb).expect(200);
    expect(other.headers.etag).not.toBe(etag);
    expect((await s.a.owner.get(u).set('If-None-Match', '"something-else"')).status).toBe(200);
    const download = await get(`${up.body[0].urls.original}?download=1`).expect(200);
    expect(download.headers['content-disposition']).toMatch(/^attachment; filename="photo-\d+-original\.jpg"$/);
  });

  it('answers 404 for an unknown size or photo, and never serves photo files from a public path', async () => {
    const up = await upload(s.a.owner, url, [{ data: await images.twoTone(60, 40), name: 'x.jpg' }]);
    expect((await s.a.owner.get(`/api/studios/${s.a.studioId}/photos/${up.body[0].id}/huge`)).status).toBe(404);
    expect((await s.a.owner.get(`/api/studios/${s.a.studioId}/photos/999999/thumb`)).status).toBe(404);
    const row = await sw.db('photos').where({ id: up.body[0].id }).first();
    for (const p of [`/photos/${row.storage_key}/thumb.webp`, `/data/photos/${row.storage_key}/thumb.webp`, `/api/photos/${row.storage_key}/thumb.webp`]) {
      expect((await s.a.owner.get(p)).status, p).toBe(404);
    }
  });

  it('a caption and the shared switch can be changed; deleting removes the row and its files', async () => {
    const up = await upload(s.a.owner, url, [{ data: await images.twoTone(60, 40), name: 'x.jpg' }]);
    const id = up.body[0].id as number;
    const res = await s.a.painter.patch(`/api/studios/${s.a.studioId}/photos/${id}`, { caption: 'Wet blending on the cloak', shared: true });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ caption: 'Wet blending on the cloak', shared: true });
    const key = (await sw.db('photos').where({ id }).first()).storage_key as string;
    expect(photoFiles(sw).filter((f) => f.startsWith(key))).toHaveLength(4);
    expect((await s.a.painter.delete(`/api/studios/${s.a.studioId}/photos/${id}`)).status).toBe(204);
    expect(await sw.db('photos').where({ id }).first()).toBeUndefined();
    expect(photoFiles(sw).filter((f) => f.startsWith(key))).toEqual([]);
    expect((await get(up.body[0].urls.thumb)).status).toBe(404);
    const log = await sw.db('activity').where({ commission_id: commissionId }).pluck('action');
    expect(log).toEqual(expect.arrayContaining(['photo.added', 'photo.shared', 'photo.deleted']));
  });
});
