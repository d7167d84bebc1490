// Crash safety: the real server (node --import tsx server/index.ts, SQLite in a temp DATA_DIR, the local payment
// fake) is killed with SIGKILL in the middle of one burst of writes, photo uploads, payment events and invoice
// numbering at once, then started again on the same DATA_DIR: what it had answered must all be there, whole,
// once. The streams start one after another and the kill comes after the k-th answer of the last one, never after
// a sleep, so the timing holds on a slow machine. A copy of the killed server's database files is opened too,
// to show SQLite's WAL recovery alone gives a sound database with every answered write in it.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import sharp from 'sharp';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkoutCompletedEvent } from '../support/payment-events';
import { Http, ServerRun } from '../support/server-process';

/**
 * A real JPEG in two colour fields, made as tests/support/fixtures.ts makes its images (not imported from there:
 * that module loads the whole server into the test process, and this test only talks to a child process).
 */
async function twoToneJpeg(width: number, height: number) {
  const left = await sharp({ create: { width: Math.ceil(width / 2), height, channels: 3, background: '#7a4b2c' } }).png().toBuffer();
  return sharp({ create: { width, height, channels: 3, background: '#3d6b52' } }).composite([{ input: left, left: 0, top: 0 }]).jpeg().toBuffer();
}
const WEBHOOK_SECRET = 'whsec_crash_test_0123456789abcdef';
const PASSWORD = 'correct horse battery';

type Answer = { status: number; body: unknown };

/** One request; the answer counts only when its whole body arrived (a reply cut off by the kill is null). */
async function call(run: () => Promise<Response>): Promise<Answer | null> {
  try {
    const res = await run();
    const text = await res.text();
    return { status: res.status, body: text ? JSON.parse(text) : null };
  } catch {
    return null;
  }
}

/** A one-shot gate: opened by a count reaching its mark, or (so nothing hangs) when the stream before it is done. */
function gate() {
  let open!: () => void;
  const opened = new Promise<void>((r) => (open = r));
  return { open: () => open(), opened };
}

/** Opens a copy of the killed server's database files (main file and WAL): SQLite replays the WAL into the copy. */
function recoveredCopy(dataDir: string) {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-crash-copy-'));
  const src = path.join(dataDir, 'sablework.sqlite');
  fs.copyFileSync(src, path.join(dir, 'sablework.sqlite'));
  const walBytes = fs.existsSync(`${src}-wal`) ? fs.statSync(`${src}-wal`).size : 0;
  if (walBytes) fs.copyFileSync(`${src}-wal`, path.join(dir, 'sablework.sqlite-wal'));
  const db = new Database(path.join(dir, 'sablework.sqlite'));
  return {
    db,
    walBytes,
    close() {
      db.close();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

function expectSound(db: Database.Database) {
  expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
  expect(db.pragma('foreign_key_check')).toEqual([]);
}

/** Every file under DATA_DIR/photos (temporary ones included), relative to it. */
function photoFiles(dataDir: string) {
  const dir = path.join(dataDir, 'photos');
  return (fs.readdirSync(dir, { recursive: true }) as string[]).filter((p) => fs.statSync(path.join(dir, p)).isFile()).sort();
}

/** The files the rows of photos and enquiry photos say must exist. */
function expectedPhotoFiles(db: Database.Database) {
  const rows = db.prepare('select storage_key, format from photos union select storage_key, format from enquiry_photos').all() as { storage_key: string; format: string }[];
  const ext: Record<string, string> = { jpeg: 'jpg', png: 'png', webp: 'webp' };
  return rows.flatMap((r) => [`${r.storage_key}/original.${ext[r.format] ?? r.format}`, ...['large', 'medium', 'thumb'].map((s) => `${r.storage_key}/${s}.webp`)]).sort();
}

const stripe = new Stripe('sk_test_crash_signing_only');
const deliver = (server: ServerRun, payload: string) =>
  fetch(`${server.base}/api/webhooks/payments`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'stripe-signature': stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET }) },
    body: payload,
  });

/** A fixed shuffle, so a failure can be replayed. */
function shuffled<T>(xs: T[], seed = 7) {
  const out = [...xs];
  let s = seed;
  for (let i = out.length - 1; i > 0; i--) {
    s = (s * 1103515245 + 12345) % 2147483648;
    const j = s % (i + 1);
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** Numbers per year ("2026-0007"): each year's sequence must run 1, 2, 3 … without a hole or a repeat. */
function expectGapFree(numbers: string[]) {
  expect(new Set(numbers).size).toBe(numbers.length);
  const byYear = new Map<string, number[]>();
  for (const n of numbers) {
    const [year, seq] = n.split('-');
    byYear.set(year, [...(byYear.get(year) ?? []), Number(seq)]);
  }
  for (const seqs of byYear.values()) {
    expect(seqs.sort((a, b) => a - b)).toEqual(seqs.map((_, i) => i + 1));
  }
}

const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-crash-'));
let server: ServerRun;
let owner: Http;
let studioId: number;
let commissionId: number;
const url = (p: string) => `/api/studios/${studioId}${p}`;
type Checkout = { invoiceId: number; sessionId: string; amount: number };
const checkouts: Checkout[] = [];

// The burst: photo uploads start; at the KP-th answered upload invoices start being created and issued; at the
// KI-th answered issue the payment events go out; at the KE-th answered event the server is killed. Each stream
// is long enough to be still in flight then (40 invoice chains all finished before the tenth event once, in a
// clean-clone run of 2026-12-02: 80 leave a margin).
const PHOTO_UPLOADS = 14;
const PHOTOS_PER_UPLOAD = 3;
const INVOICE_CHAINS = 80;
const KP = 3;
const KI = 8;
const KE = 10;

type Event = { id: string; payload: string };
let events: Event[];
const burst = {
  photos: [] as (Answer | null)[],
  invoices: [] as { create: Answer | null; issue: Answer | null }[],
  events: [] as { id: string; answer: Answer | null }[],
};
/** What the killed server's files held, before any start-up code ran on them. */
let atKill: { walBytes: number; leftBehind: string[]; photoIds: number[]; eventIds: string[]; numbers: string[] };

beforeAll(async () => {
  const t0 = Date.now();
  const laps: string[] = [];
  const lap = (what: string) => laps.push(`${what} ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  server = new ServerRun(dataDir, { STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET });
  await server.start();
  lap('started');
  const signup = new Http(server);
  await signup.csrf();
  await signup.ok('POST', '/api/auth/signup', { name: 'Crash Owner', email: 'crash-owner@demo.test', password: PASSWORD, studioName: 'Crash Test Studio', currency: 'EUR', timezone: 'Europe/Berlin' }, 201);
  // Signed in over HTTP with a fresh cookie jar; the session lives in the database, so it outlives the kill.
  owner = new Http(server);
  await owner.csrf();
  const me = await owner.ok('POST', '/api/auth/login', { email: 'crash-owner@demo.test', password: PASSWORD });
  await owner.csrf();
  studioId = me.memberships[0].studioId;
  const client = await owner.ok('POST', url('/clients'), { name: 'Crash Client', email: 'crash-client@demo.test' }, 201);
  commissionId = (await owner.ok('POST', url('/commissions'), { clientId: client.id, title: 'Marsh wardens' }, 201)).id;
  // Invoices with an open checkout each, for the payment events.
  for (let i = 0; i < 12; i++) {
    const draft = await owner.ok('POST', url('/invoices'), { commissionId, kind: 'custom', lines: [{ description: `Basing set ${i + 1}`, quantity: 1, unitMinor: 2000 + 150 * i }] }, 201);
    await owner.ok('POST', url(`/invoices/${draft.id}/issue`));
    const co = await owner.ok('POST', url(`/invoices/${draft.id}/checkout`));
    checkouts.push({ invoiceId: draft.id, sessionId: co.sessionId, amount: co.amountMinor });
  }
  // Per checkout: its event, the same event delivered twice, and a second event with another id for the same session.
  events = checkouts.flatMap((c, i) => {
    const s = { sessionId: c.sessionId, amount: c.amount, invoiceId: c.invoiceId, studioId };
    const first = { id: `evt_crash_${i}`, payload: checkoutCompletedEvent(`evt_crash_${i}`, { ...s, paymentIntent: `pi_crash_${s.invoiceId}` }) };
    const other = { id: `evt_crash_${i}_other`, payload: checkoutCompletedEvent(`evt_crash_${i}_other`, { ...s, paymentIntent: `pi_crash_${s.invoiceId}` }) };
    return [first, first, other];
  });

  lap('set up');
  const jpeg = await twoToneJpeg(1200, 900);
  const invoicesGo = gate();
  const eventsGo = gate();
  const answered = { photos: 0, invoices: 0, events: 0 };
  const photoStream = Promise.all(
    Array.from({ length: PHOTO_UPLOADS }, async (_, i) => {
      const form = new FormData();
      form.append('kind', 'progress');
      form.append('caption', `burst ${i}`);
      for (let j = 0; j < PHOTOS_PER_UPLOAD; j++) form.append('photos', new Blob([new Uint8Array(jpeg)], { type: 'image/jpeg' }), `burst-${i}-${j}.jpg`);
      const a = await call(() => owner.send('POST', url(`/commissions/${commissionId}/photos`), form));
      burst.photos.push(a);
      if (a?.status === 201 && ++answered.photos === KP) invoicesGo.open();
    }),
  ).then(invoicesGo.open);
  const invoiceStream = Promise.all(
    Array.from({ length: INVOICE_CHAINS }, async (_, i) => {
      await invoicesGo.opened;
      const entry = { create: null as Answer | null, issue: null as Answer | null };
      burst.invoices.push(entry);
      entry.create = await call(() => owner.send('POST', url('/invoices'), { commissionId, kind: 'progress', lines: [{ description: `Stage payment ${i + 1}`, quantity: 1, unitMinor: 1000 + i }] }));
      if (entry.create?.status !== 201) return;
      entry.issue = await call(() => owner.send('POST', url(`/invoices/${(entry.create!.body as { id: number }).id}/issue`)));
      if (entry.issue?.status === 200 && ++answered.invoices === KI) eventsGo.open();
    }),
  ).then(eventsGo.open);
  const eventStream = Promise.all(
    shuffled(events).map(async (e) => {
      await eventsGo.opened;
      const a = await call(() => deliver(server, e.payload));
      burst.events.push({ id: e.id, answer: a });
      if (a?.status === 200 && ++answered.events === KE) server.kill();
    }),
  );
  await Promise.all([photoStream, invoiceStream, eventStream]);
  await server.killed();
  lap('killed');

  // The killed server's files as it left them: a copy of the database and its WAL opens, and SQLite replays the WAL.
  const copy = recoveredCopy(dataDir);
  expectSound(copy.db);
  const expected = new Set(expectedPhotoFiles(copy.db));
  atKill = {
    walBytes: copy.walBytes,
    leftBehind: photoFiles(dataDir).filter((f) => !expected.has(f)),
    photoIds: copy.db.prepare('select id from photos').pluck().all() as number[],
    eventIds: copy.db.prepare('select id from payment_events').pluck().all() as string[],
    numbers: copy.db.prepare('select number from invoices where number is not null').pluck().all() as string[],
  };
  copy.close();
  console.info(
    `at the kill: ${answered.photos}/${PHOTO_UPLOADS} uploads, ${answered.invoices}/${INVOICE_CHAINS} issues, ${answered.events}/${events.length} events answered; ` +
      `WAL ${atKill.walBytes} bytes; ${atKill.leftBehind.length} temporary or unreferenced photo files on disk`,
  );

  server = new ServerRun(dataDir, { STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET });
  await server.start();
  owner.server = server;
  lap('restarted');
  console.info(`timing: ${laps.join(', ')}`);
}, 150_000);

afterAll(async () => {
  await server?.stop();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

const readDb = <T>(fn: (db: Database.Database) => T) => {
  const db = new Database(path.join(dataDir, 'sablework.sqlite'), { readonly: true });
  try {
    return fn(db);
  } finally {
    db.close();
  }
};

// The child server always runs on SQLite (its WAL recovery is what is tested), so the PostgreSQL pass of the
// API suite (DATABASE_URL set) would only run the same test a second time.
describe.skipIf(Boolean(process.env.DATABASE_URL))('SIGKILL in the middle of a burst of uploads, payment events and invoice numbering, then a restart', () => {
  it('the kill landed mid-burst: every stream had answered requests and requests still in flight', () => {
    const inFlight = (xs: (Answer | null)[]) => xs.filter((a) => a === null).length;
    expect(burst.photos.filter((a) => a?.status === 201).length).toBeGreaterThanOrEqual(KP);
    expect(inFlight(burst.photos)).toBeGreaterThan(0);
    expect(burst.invoices.filter((x) => x.issue?.status === 200).length).toBeGreaterThanOrEqual(KI);
    expect(burst.invoices.filter((x) => x.issue === null).length).toBeGreaterThan(0);
    expect(burst.events.filter((x) => x.answer?.status === 200).length).toBeGreaterThanOrEqual(KE);
    expect(inFlight(burst.events.map((x) => x.answer))).toBeGreaterThan(0);
    // SQLite's own recovery of the killed server's files (a copy, before any of our start-up code) holds every answered write
    for (const a of burst.photos.filter((x) => x?.status === 201)) for (const p of a!.body as { id: number }[]) expect(atKill.photoIds).toContain(p.id);
    for (const e of burst.events.filter((x) => x.answer?.status === 200)) expect(atKill.eventIds).toContain(e.id);
    for (const x of burst.invoices.filter((y) => y.issue?.status === 200)) expect(atKill.numbers).toContain((x.issue!.body as { number: string }).number);
    // nothing was refused: an answer is a success or there is none
    expect([...burst.photos, ...burst.invoices.flatMap((x) => [x.create, x.issue]), ...burst.events.map((x) => x.answer)].every((a) => a === null || a.status < 300)).toBe(true);
  });

  it('photo uploads: every answered upload is whole, no row lacks a file, no half-written or orphan file remains', async () => {
    const answered = burst.photos.filter((a) => a?.status === 201).flatMap((a) => (a!.body as { id: number }[]).map((p) => p.id));
    expect(answered.length).toBe(burst.photos.filter((a) => a?.status === 201).length * PHOTOS_PER_UPLOAD);
    const page = await owner.ok('GET', url(`/commissions/${commissionId}/photos?limit=100`));
    const listed = (Array.isArray(page) ? page : page.items) as { id: number }[];
    const ids = listed.map((p) => p.id);
    for (const id of answered) expect(ids).toContain(id);
    // Uploads are all or nothing: photos committed just before the kill come in whole uploads of three.
    expect(ids.length % PHOTOS_PER_UPLOAD).toBe(0);
    // Every photo listed (answered, or committed just before the kill) has all its files, whole.
    for (const id of ids) {
      for (const size of ['original', 'large', 'medium', 'thumb']) {
        const res = await owner.send('GET', url(`/photos/${id}/${size}`));
        expect(res.status, `photo ${id} ${size}`).toBe(200);
        const { info } = await sharp(Buffer.from(await res.arrayBuffer()), { failOn: 'truncated' }).raw().toBuffer({ resolveWithObject: true });
        expect(info.width).toBeGreaterThan(0);
      }
    }
    // The files on disk are exactly the files of the rows: nothing left in .incoming, no folder without its row.
    readDb((db) => {
      expect(photoFiles(dataDir)).toEqual(expectedPhotoFiles(db));
      expect((db.prepare('select count(*) as n from photos').get() as { n: number }).n).toBe(ids.length);
    });
  }, 60_000);

  it('payment events: none answered is lost; delivered again, each is applied once', async () => {
    const stored = () =>
      readDb((db) => ({
        events: db.prepare("select id, outcome, invoice_id from payment_events where id like 'evt_crash_%'").all() as { id: string; outcome: string; invoice_id: number }[],
        payments: db.prepare('select invoice_id, amount from invoice_payments').all() as { invoice_id: number; amount: number }[],
      }));
    const before = stored();
    for (const e of burst.events.filter((x) => x.answer?.status === 200)) expect(before.events.map((r) => r.id)).toContain(e.id);

    // The payment service delivers every event again after the outage, the answered ones too.
    for (const e of events) expect((await deliver(server, e.payload)).status).toBe(200);
    const after = stored();
    expect(after.events).toHaveLength(checkouts.length * 2);
    for (const c of checkouts) {
      const inv = await owner.ok('GET', url(`/invoices/${c.invoiceId}`));
      expect(inv).toMatchObject({ status: 'paid', paid: c.amount, balanceDue: 0 });
      expect(inv.payments).toEqual([expect.objectContaining({ method: 'card', amountMinor: c.amount })]);
      expect(after.payments.filter((p) => p.invoice_id === c.invoiceId).map((p) => p.amount)).toEqual([c.amount]);
      // of the two events of the session, one paid it and the other found it paid already
      expect(after.events.filter((r) => r.invoice_id === c.invoiceId).map((r) => r.outcome).sort()).toEqual(['ignored', 'paid']);
    }
  }, 60_000);

  it('invoice numbering: every answered invoice exists, no number repeats, numbers run without gaps, also after more issuing', async () => {
    const all = async () => (await owner.ok('GET', url('/invoices?limit=200'))).items as { id: number; number: string | null; status: string }[];
    let invoices = await all();
    const byId = new Map(invoices.map((x) => [x.id, x]));
    for (const x of burst.invoices.filter((y) => y.create?.status === 201)) expect(byId.has((x.create!.body as { id: number }).id)).toBe(true);
    for (const x of burst.invoices.filter((y) => y.issue?.status === 200)) {
      const issued = x.issue!.body as { id: number; number: string };
      expect(byId.get(issued.id)).toMatchObject({ number: issued.number, status: 'open' });
    }
    expectGapFree(invoices.flatMap((x) => (x.number ? [x.number] : [])));

    // Issuing goes on after the restart: the drafts left behind and new invoices, all at once.
    const drafts = invoices.filter((x) => x.status === 'draft');
    await Promise.all([
      ...drafts.map((d) => owner.ok('POST', url(`/invoices/${d.id}/issue`))),
      ...Array.from({ length: 5 }, async (_, i) => {
        const d = await owner.ok('POST', url('/invoices'), { commissionId, kind: 'custom', lines: [{ description: `After the restart ${i + 1}`, quantity: 1, unitMinor: 500 }] }, 201);
        await owner.ok('POST', url(`/invoices/${d.id}/issue`));
      }),
    ]);
    invoices = await all();
    expect(invoices.filter((x) => x.status === 'draft')).toEqual([]);
    expect(invoices.length).toBeGreaterThan(checkouts.length + KI);
    expectGapFree(invoices.map((x) => x.number!));
  }, 60_000);

  it('the database opens cleanly after a normal stop too: integrity check ok, no broken references', async () => {
    await server.stop();
    const db = new Database(path.join(dataDir, 'sablework.sqlite'));
    expectSound(db);
    db.close();
  }, 60_000);
});
