import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HOUR } from '../../server/lib/clock';
import { ENQUIRY_MAX_PHOTO_BYTES } from '../../shared/schemas/enquiries';
import { Caller, mailTo, signUp, startTestApp, type TestApp } from '../support/app';
import { images, type UploadFile } from '../support/fixtures';

let sw: TestApp;
let owner: Caller;
let studioId: number;
let ownerId: number;
let slug: string;
let ipCounter = 0;
/** Caller's unsafe methods answer a promise of the response; this checks it is a 200. */
async function ok(p: Promise<{ status: number; body: unknown }>) {
  const r = await p;
  expect(r.status, JSON.stringify(r.body)).toBe(200);
  return r;
}
/** Each test speaks from its own address (behind the trusted proxy), so the per-address limit of one does not touch another. */
const freshIp = () => `203.0.113.${++ipCounter}`;

const figures = [
  { name: 'Bog troll', quantity: 3, sizeClass: '40' },
  { name: 'Reed witch', quantity: 1, sizeClass: '32' },
];

function fieldsFor(email: string, over: Record<string, string> = {}) {
  return { name: 'Ilsa Marchwood', email, figures: JSON.stringify(figures), tier: 'enhanced', extras: JSON.stringify(['magnetising']), dueDate: '2026-06-30', budget: '320', notes: 'Muted swamp greens, please.', consent: 'true', ...over };
}

/** The form the way the browser sends it: multipart, photos in field `photos`, CSRF header. */
async function send(fields: Record<string, string>, files: UploadFile[] = [], ip = freshIp(), to = slug) {
  const c = new Caller(sw.app);
  const token = await c.csrf();
  let req = c.agent.post(`/api/public/studios/${to}/enquiries`).set('x-csrf-token', token).set('x-forwarded-for', ip);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  for (const f of files) req = req.attach('photos', f.data, { filename: f.name, contentType: f.type ?? 'image/jpeg' });
  return req;
}

beforeAll(async () => {
  sw = await startTestApp({ trustProxy: true });
  const o = await signUp(sw, { email: 'owner@marsh.test', name: 'Wilma Fen', studioName: 'Marsh Light Studio' });
  owner = o.caller;
  studioId = o.studioId;
  ownerId = o.user.id;
  const res = await owner.put(`/api/studios/${studioId}/public-page`, { enabled: true, intro: 'Swamp things, painted slowly.', turnaroundText: 'About six weeks.', turnaroundSource: 'text' });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  slug = res.body.slug;
});
afterAll(() => sw.stop());

describe('the public studio page', () => {
  it('shows name, text, the studio’s tiers with "from" prices of its price table, and the typed turnaround', async () => {
    const res = await new Caller(sw.app).get(`/api/public/studios/${slug}`).expect(200);
    expect(res.body).toMatchObject({ name: 'Marsh Light Studio', slug, intro: 'Swamp things, painted slowly.', currency: 'EUR', turnaround: { source: 'text', text: 'About six weeks.' } });
    expect(res.body.tiers.map((t: { key: string }) => t.key)).toEqual(['tabletop', 'enhanced', 'display']);
    // The same "from" prices the price table's own summary gives the studio (one 28 mm figure of each tier).
    const summary = await owner.get(`/api/studios/${studioId}/price-table/public-summary`).expect(200);
    for (const t of res.body.tiers) expect(t.fromMinor).toBe(summary.body.tiers.find((x: { key: string }) => x.key === t.key).fromMinor);
    const from = res.body.tiers.map((t: { fromMinor: number }) => t.fromMinor);
    expect(from[0]).toBeGreaterThan(0);
    expect(from[0]).toBeLessThan(from[1]);
    expect(from[1]).toBeLessThan(from[2]);
    expect(res.body.limits).toEqual({ maxPhotos: 5, maxPhotoBytes: ENQUIRY_MAX_PHOTO_BYTES, maxFigures: 30 });
  });

  it('turned off, the page and its form answer 404 like a studio that does not exist', async () => {
    await ok(owner.put(`/api/studios/${studioId}/public-page`, { enabled: false, turnaroundSource: 'text' }));
    await new Caller(sw.app).get(`/api/public/studios/${slug}`).expect(404);
    expect((await send(fieldsFor('off@visitor.test'))).status).toBe(404);
    await ok(owner.put(`/api/studios/${studioId}/public-page`, { enabled: true, intro: 'Swamp things, painted slowly.', turnaroundText: 'About six weeks.', turnaroundSource: 'text' }));
    await new Caller(sw.app).get('/api/public/studios/no-such-studio').expect(404);
  });
});

describe('sending an enquiry', () => {
  it('stores it with its figures and photos, mails the enquirer at once and tells the owner', async () => {
    const res = await send(fieldsFor('ilsa@visitor.test'), [{ data: await images.twoTone(800, 600), name: 'troll.jpg' }]);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.received).toBe(true);

    const [ack] = await mailTo(sw, 'ilsa@visitor.test');
    expect(ack.subject).toBe('Marsh Light Studio has your enquiry');
    expect(ack.text).toContain('3 × Bog troll (40 mm)');
    const [notice] = await mailTo(sw, 'owner@marsh.test');
    expect(notice.subject).toBe('New enquiry from Ilsa Marchwood');

    const list = await owner.get(`/api/studios/${studioId}/enquiries`).expect(200);
    const item = list.body.items.find((e: { email: string }) => e.email === 'ilsa@visitor.test');
    expect(item).toMatchObject({ status: 'new', figureCount: 2, modelCount: 4, photoCount: 1, tier: { key: 'enhanced', label: 'Enhanced' }, dueDate: '2026-06-30' });
    const e = await owner.get(`/api/studios/${studioId}/enquiries/${item.id}`).expect(200);
    expect(e.body).toMatchObject({ budgetMinor: 32000, currency: 'EUR', notes: 'Muted swamp greens, please.', extras: [{ key: 'magnetising', label: 'Magnetising' }] });
    expect(e.body.figures).toEqual(figures);
    const thumb = await owner.get(e.body.photos[0].urls.thumb).buffer(true).expect(200);
    expect((await sharp(thumb.body as Buffer).metadata()).format).toBe('webp');
  });

  it('also takes a JSON body without photos', async () => {
    const c = new Caller(sw.app);
    const res = await c.post(`/api/public/studios/${slug}/enquiries`, { name: 'Plain Post', email: 'json@visitor.test', figures: [{ name: 'Heron', quantity: 1, sizeClass: '50' }], consent: true });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
  });

  it('says per field what is wrong: missing consent, bad e-mail, empty figure list, unknown tier, past date, too-long notes', async () => {
    const res = await send({ name: '', email: 'not-an-address', figures: '[]', tier: 'gilded', dueDate: '2020-01-01', notes: 'x'.repeat(4001), consent: '' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toMatchObject({
      name: 'Enter a name.',
      email: 'That does not look like an e-mail address.',
      figures: 'List at least one figure.',
      notes: 'Use at most 4000 characters.',
      consent: 'Tick the box so the studio may contact you about this enquiry.',
    });
    // Tier and date are checked against the studio once the form itself is in order.
    const second = await send(fieldsFor('dates@visitor.test', { tier: 'gilded', dueDate: '2020-01-01', budget: '12.345' }));
    expect(second.status).toBe(400);
    expect(second.body.error.fields).toMatchObject({ tier: 'Choose one of the tiers the studio offers.', dueDate: 'Choose a date from today on.' });
    expect(second.body.error.fields.budget).toMatch(/2 decimal places/);
    const figureLine = await send(fieldsFor('lines@visitor.test', { figures: JSON.stringify([{ name: 'x'.repeat(121), quantity: 0, sizeClass: '33' }]) }));
    expect(figureLine.body.error.fields).toMatchObject({ 'figures.0.name': 'Use at most 120 characters.', 'figures.0.quantity': 'At least 1.', 'figures.0.sizeClass': 'Choose a base size.' });
    expect(await sw.db('enquiries').whereIn('email', ['not-an-address', 'dates@visitor.test', 'lines@visitor.test']).count({ n: '*' }).first()).toEqual({ n: 0 });
  });

  it('a filled honeypot answers like a success and keeps nothing, sends nothing', async () => {
    const before = await sw.db('enquiries').count({ n: '*' }).first();
    const res = await send(fieldsFor('robot@visitor.test', { website: 'http://spam.example' }));
    expect(res.status).toBe(201);
    expect(res.body.received).toBe(true);
    expect(await sw.db('enquiries').count({ n: '*' }).first()).toEqual(before);
    expect(await mailTo(sw, 'robot@visitor.test')).toHaveLength(0);
  });

  it('refuses a sixth photo, a photo over the visitors’ size cap and a file that is no photo', async () => {
    const small = await images.twoTone(64, 48);
    const six = Array.from({ length: 6 }, (_, i) => ({ data: small, name: `p${i}.jpg` }));
    const many = await send(fieldsFor('many@visitor.test'), six);
    expect(many.status).toBe(400);
    expect(many.body.error.fields.photos).toBe('Send at most 5 photos.');

    // Random bytes do not compress: a PNG just over the cap (the studio's own uploads take 25 MB).
    const noisy = await sharp(Buffer.alloc(1700 * 1700 * 3).map(() => Math.floor(Math.random() * 256)), { raw: { width: 1700, height: 1700, channels: 3 } }).png({ compressionLevel: 0 }).toBuffer();
    expect(noisy.length).toBeGreaterThan(ENQUIRY_MAX_PHOTO_BYTES);
    const big = await send(fieldsFor('big@visitor.test'), [{ data: noisy, name: 'big.png', type: 'image/png' }]);
    expect(big.status).toBe(413);
    expect(big.body.error.fields.photos).toBe('At most 8 MB per photo.');

    const fake = await send(fieldsFor('fake@visitor.test'), [{ data: Buffer.from('%PDF-1.4 not a photo'), name: 'troll.jpg' }]);
    expect(fake.status).toBe(415);
    expect(fake.body.error.fields.photos).toBe('That file is not a JPEG, PNG or WebP photo.');
    expect(await sw.db('enquiries').whereIn('email', ['many@visitor.test', 'big@visitor.test', 'fake@visitor.test']).count({ n: '*' }).first()).toEqual({ n: 0 });
  });
});

describe('rate limits', () => {
  it('takes five enquiries an hour from one address; the sixth gets 429 with Retry-After, and an hour later it works again', async () => {
    const ip = freshIp();
    for (let i = 0; i < 5; i++) expect((await send(fieldsFor(`burst${i}@visitor.test`), [], ip)).status).toBe(201);
    const sixth = await send(fieldsFor('burst5@visitor.test'), [], ip);
    expect(sixth.status).toBe(429);
    expect(Number(sixth.headers['retry-after'])).toBeGreaterThan(3000);
    expect(Number(sixth.headers['retry-after'])).toBeLessThanOrEqual(3600);
    // Another address is not affected.
    expect((await send(fieldsFor('elsewhere@visitor.test'))).status).toBe(201);
    sw.clock.advance(HOUR + 1000);
    expect((await send(fieldsFor('burst6@visitor.test'), [], ip)).status).toBe(201);
  });

  it('takes five enquiries an hour to one e-mail address, whatever the sending address', async () => {
    for (let i = 0; i < 5; i++) expect((await send(fieldsFor('Same@Visitor.test'))).status).toBe(201);
    const sixth = await send(fieldsFor('same@visitor.test'));
    expect(sixth.status).toBe(429);
    expect(sixth.headers['retry-after']).toBeDefined();
  });

  it('counts honeypot posts too, so a robot cannot send without end', async () => {
    const ip = freshIp();
    for (let i = 0; i < 5; i++) await send(fieldsFor(`bot${i}@visitor.test`, { website: 'x' }), [], ip);
    expect((await send(fieldsFor('bot5@visitor.test', { website: 'x' }), [], ip)).status).toBe(429);
  });

  it('stops an address after 30 posts an hour even when every one of them is invalid, before reading the upload', async () => {
    const ip = freshIp();
    for (let i = 0; i < 30; i++) expect((await send({ name: 'x' }, [], ip)).status).toBe(400);
    expect((await send(fieldsFor('valid@visitor.test'), [], ip)).status).toBe(429);
  });
});

describe('public page settings', () => {
  it('only the owner reads and changes them, with clear errors', async () => {
    const bad = await owner.put(`/api/studios/${studioId}/public-page`, { enabled: 'yes', intro: 'x'.repeat(1001), turnaroundSource: 'guess' });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['enabled', 'intro', 'turnaroundSource']);
    const got = await owner.get(`/api/studios/${studioId}/public-page`).expect(200);
    expect(got.body).toMatchObject({ enabled: true, slug, path: `/s/${slug}`, turnaroundSource: 'text' });
  });

  it('with the forecast chosen but no working hours set, the page falls back to the typed turnaround', async () => {
    await ok(owner.put(`/api/studios/${studioId}/public-page`, { enabled: true, turnaroundText: 'Eight weeks or so.', turnaroundSource: 'forecast' }));
    const res = await new Caller(sw.app).get(`/api/public/studios/${slug}`).expect(200);
    expect(res.body.turnaround).toEqual({ source: 'text', text: 'Eight weeks or so.' });
  });

  it('once the owner has working hours, the page shows when new work could start by the forecast', async () => {
    await ok(owner.put(`/api/studios/${studioId}/capacity/painters/${ownerId}/hours`, { hours: { 1: [{ start: '09:00', end: '17:00' }], 2: [{ start: '09:00', end: '17:00' }], 3: [{ start: '09:00', end: '17:00' }] } }));
    // Saving the settings again drops the page's cached forecast.
    await ok(owner.put(`/api/studios/${studioId}/public-page`, { enabled: true, turnaroundText: 'Eight weeks or so.', turnaroundSource: 'forecast' }));
    const res = await new Caller(sw.app).get(`/api/public/studios/${slug}`).expect(200);
    // The test clock stands on Monday 2026-03-02, a little after 10:00 in Berlin; the queue is empty, so an hour of work fits today.
    expect(res.body.turnaround).toEqual({ source: 'forecast', startDate: '2026-03-02', queueLength: 0 });
  });
});
