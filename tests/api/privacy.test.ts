import path from 'node:path';
import AdmZip from 'adm-zip';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { privacyRepository } from '../../server/features/privacy/privacy.repository';
import { privacyService } from '../../server/features/privacy/privacy.service';
import { clientTables, otherTables } from '../../server/features/privacy/privacy.tables';
import { localDiskStorage } from '../../server/lib/storage/local-disk';
import type { Db } from '../../server/lib/db';
import { Caller, PASSWORD, linkIn, mailTo, startTestApp, type TestApp } from '../support/app';
import { images, photoFiles, upload } from '../support/fixtures';
import { invoicesOf, listen, moneyStudios, payOnCheckoutPage, shipping, type Side } from './money-flow';

/**
 * A client's export and erase, on a client with everything the studio can hold about them: two
 * commissions (one invoiced and paid, one still an enquiry), photos both ways, comments, an approval,
 * a scheme, models in, a shipment, a quote they accepted, a deposit paid by card, a custom invoice
 * paid by bank, an enquiry with a photo from their e-mail address, mails both ways, a failed sign-in.
 * A second client of the same studio and a second studio stand beside them, and must not move.
 */
const NAME = 'Quillon Ashgrove';
const EMAIL = 'quillon.ashgrove@privacy.test';
const OTHER = 'Tamsin Oakhurst';

let sw: TestApp;
let a: Side;
let b: Side;
let server: Awaited<ReturnType<typeof listen>>;
let client: Caller;
let clientId: number;
let otherClientId: number;
let kept: number; // the invoiced commission
let open: number; // the commission still at enquiry
let otherCommission: number;
const A = () => `/api/studios/${a.studioId}`;

function ok(res: Response, status = 200) {
  if (res.status !== status) throw new Error(`expected ${status}, got ${res.status} ${JSON.stringify(res.body)}`);
  return res.body;
}

/** Every table of the live schema with its columns (SQLite or PostgreSQL). */
async function schema(db: Db): Promise<Map<string, string[]>> {
  const out = new Map<string, string[]>();
  if (db.client.config.client === 'pg') {
    const rows = await db('information_schema.columns').whereRaw('table_schema = current_schema()').select('table_name', 'column_name');
    for (const r of rows) out.set(r.table_name, [...(out.get(r.table_name) ?? []), r.column_name]);
  } else {
    const tables = await db('sqlite_master').where('type', 'table').whereNot('name', 'like', 'sqlite_%').pluck('name');
    for (const t of tables) out.set(t, (await db.raw(`pragma table_info("${t}")`)).map((c: { name: string }) => c.name));
  }
  return out;
}

/**
 * Every row of every table, as sorted JSON lines: two dumps are equal when nothing changed. Left out: the
 * sessions (every request touches its expiry) and the local mail fake's inbox (filled by its SMTP server on
 * its own time, and never the erase's business).
 */
async function dump(db: Db, skip: string[] = ['sessions', 'captured_mail', 'captured_mail_attachments']) {
  const out: Record<string, string[]> = {};
  for (const t of (await schema(db)).keys()) {
    if (skip.includes(t)) continue;
    out[t] = (await db(t).select('*')).map((r) => JSON.stringify(r)).sort();
  }
  return out;
}

/** A commission of our client: two 28 mm Tabletop figures lines (as the money tests' table prices them). */
async function ourCommission(title: string) {
  return ok(
    await a.owner.post(`${A()}/commissions`, {
      clientId,
      title,
      brief: `Painted for ${NAME}, who wants a mossy look.`,
      figures: [
        { name: 'Knights', quantity: 2, sizeClass: '28', tier: 'tabletop' },
        { name: 'Banner bearer', quantity: 1, sizeClass: '28', tier: 'tabletop' },
      ],
    }),
    201,
  ) as { id: number; figures: { id: number; stages: { id: number }[] }[] };
}

const exportZip = async (c: Caller, studioId: number, id: number) => {
  const res = await c.get(`/api/studios/${studioId}/clients/${id}/export`).buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (d: Buffer) => chunks.push(d));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
  return res;
};

beforeAll(async () => {
  sw = await startTestApp();
  ({ a, b } = await moneyStudios(sw));
  server = await listen(sw);

  // The client, with an account through a real invitation.
  clientId = ok(await a.owner.post(`${A()}/clients`, { name: NAME, email: EMAIL, phone: '+49 30 1234567', address: { line1: '7 Kiln Lane', city: 'Emberford', postalCode: '10999', country: 'DE' }, notes: `${NAME} prefers muted greens.` }), 201).id;
  ok(await a.owner.post(`${A()}/clients/${clientId}/invite`), 201);
  const [invite] = await mailTo(sw, EMAIL);
  client = new Caller(sw.app);
  ok(await client.post(`/api/invitations/${linkIn(invite.text, '/invite/')}/accept`, { name: NAME, password: PASSWORD }));

  // Commission 1: quote accepted, deposit paid by card, a custom invoice; then finished.
  const k = await ourCommission(`${NAME}'s ash knights`);
  kept = k.id;
  const quote = ok(await a.owner.post(`${A()}/commissions/${kept}/quotes`, { extraLines: shipping }), 201);
  ok(await a.owner.post(`${A()}/quotes/${quote.id}/send`));
  ok(await client.post(`${A()}/quotes/${quote.id}/accept`, { name: NAME, acceptTerms: true }));
  const [deposit] = await invoicesOf(a.owner, a.studioId, kept);
  const co = ok(await client.post(`${A()}/invoices/${deposit.id}/checkout`));
  expect((await payOnCheckoutPage(co.url)).status).toBe(303);
  await sw.paymentsFake!.idle();
  ok(await a.owner.post(`${A()}/stages/${k.figures[0].stages[0].id}/time`, { hours: 1.5, note: `Matched the green ${NAME} sent` }), 201);
  const custom = ok(await a.owner.post(`${A()}/invoices`, { commissionId: kept, kind: 'custom', lines: [{ description: `Freehand banner for ${NAME}`, quantity: 1, unitMinor: 2500 }], note: `Thank you, ${NAME}!` }), 201);
  ok(await a.owner.post(`${A()}/invoices/${custom.id}/issue`));

  // Commission 2, still an enquiry: photos, comments, an approval, a scheme, models in, a shipment.
  open = (await ourCommission('Marsh drake')).id;
  const C = `${A()}/commissions/${open}`;
  ok(await upload(a.owner, `${C}/photos`, [{ data: await images.twoTone(80, 60), name: 'wip.jpg' }], { kind: 'progress', shared: 'true', caption: `For ${NAME}` }), 201);
  const ref = ok(await upload(client, `${C}/photos`, [{ data: await images.twoTone(90, 60, 'png'), name: 'ref.png', type: 'image/png' }], { kind: 'reference' }), 201);
  ok(await a.owner.get(`${A()}/reference-photos/${ref[0].id}/palette`));
  ok(await client.post(`${C}/comments`, { body: `Hello, this is ${NAME}: more moss please.` }), 201);
  ok(await a.owner.post(`${C}/comments`, { body: `Will do, ${NAME}.` }), 201);
  ok(await a.owner.post(`${C}/approvals`, { subject: 'scheme', note: 'Greens as agreed' }), 201);
  const paint = ok(await a.owner.post(`${A()}/paints`, { name: 'Moss bank', type: 'base', hex: '#4A6B3A' }), 201);
  const recipe = ok(await a.owner.post(`${A()}/recipes`, { name: 'Marsh hide', steps: [{ technique: 'basecoat', paints: [{ paintId: paint.id }] }] }), 201);
  ok(await a.owner.post(`${C}/scheme`, { area: 'Hide', recipeId: recipe.id, notes: `As ${NAME} asked` }), 201);
  ok(await a.owner.put(`${C}/models-in`, { supplier: 'client_ships', carrier: 'Parcel owl', note: `${NAME} sends them` }));
  const ship = ok(await a.owner.post(`${C}/shipments`, {}), 201);
  ok(await a.owner.patch(`${C}/shipments/${ship.id}`, { shipTo: { name: NAME, line1: '7 Kiln Lane', city: 'Emberford', postalCode: '10999', country: 'DE' } }));

  // An enquiry with a photo from the client's address, through the public form.
  ok(await a.owner.put(`${A()}/public-page`, { enabled: true, turnaroundSource: 'text' }));
  const slug = (await sw.db('studios').where({ id: a.studioId }).first('slug')).slug as string;
  const visitor = new Caller(sw.app);
  await visitor.csrf();
  ok(
    await upload(visitor, `/api/public/studios/${slug}/enquiries`, [{ data: await images.twoTone(70, 70), name: 'wish.jpg' }], {
      name: NAME,
      email: EMAIL,
      figures: JSON.stringify([{ name: 'Bog wyrm', quantity: 1, sizeClass: '40' }]),
      notes: `I am ${NAME}, reach me at ${EMAIL}.`,
      consent: 'true',
    }),
    201,
  );
  // A failed sign-in (kept for throttling, keyed by the e-mail address).
  expect((await new Caller(sw.app).post('/api/auth/login', { email: EMAIL, password: 'not the password' })).status).toBe(401);

  // Another client of the same studio, with a commission, a photo and a comment.
  otherClientId = ok(await a.owner.post(`${A()}/clients`, { name: OTHER, email: 'tamsin@privacy.test' }), 201).id;
  otherCommission = ok(await a.owner.post(`${A()}/commissions`, { clientId: otherClientId, title: 'Oak wardens', figures: [{ name: 'Warden', quantity: 1, sizeClass: '32', tier: 'tabletop' }] }), 201).id;
  ok(await upload(a.owner, `${A()}/commissions/${otherCommission}/photos`, [{ data: await images.twoTone(64, 64), name: 'oak.jpg' }], { kind: 'progress' }), 201);
  ok(await a.owner.post(`${A()}/commissions/${otherCommission}/comments`, { body: `Note for ${OTHER}` }), 201);
  await sw.jobs.deliverMail();
}, 120_000);

afterAll(async () => {
  await server?.close();
  await sw?.stop();
});

describe('which tables hold client data', () => {
  it('puts every table of the schema on one list, and every table with a client, commission, enquiry, invoice or photo column on the client list', async () => {
    const tables = await schema(sw.db);
    const listed = new Set([...Object.keys(clientTables), ...Object.keys(otherTables)]);
    expect([...tables.keys()].filter((t) => !listed.has(t)).sort()).toEqual([]);
    const linked = [...tables].filter(([, cols]) => cols.some((c) => ['client_id', 'commission_id', 'enquiry_id', 'invoice_id', 'photo_id', 'figure_id', 'stage_id'].includes(c))).map(([t]) => t);
    expect(linked.filter((t) => !(t in clientTables)).sort()).toEqual([]);
    // and no list names a table that is not there
    expect([...listed].filter((t) => !tables.has(t)).sort()).toEqual([]);
  });
});

describe('export', () => {
  let zip: AdmZip;
  let data: Record<string, unknown> & Record<string, Record<string, unknown>[]>;

  it('is for owners only: a painter gets 403, the client 403, another studio and an unknown client 404', async () => {
    expect((await a.painter.get(`${A()}/clients/${clientId}/export`)).status).toBe(403);
    expect((await client.get(`${A()}/clients/${clientId}/export`)).status).toBe(403);
    expect((await b.owner.get(`${A()}/clients/${clientId}/export`)).status).toBe(404);
    expect((await b.owner.get(`/api/studios/${b.studioId}/clients/${clientId}/export`)).status).toBe(404);
    expect((await a.owner.get(`${A()}/clients/999999/export`)).status).toBe(404);
  });

  it('is a ZIP with data.json, README.txt and the original of every photo', async () => {
    const res = await exportZip(a.owner, a.studioId, clientId);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/zip');
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="quillon-ashgrove-\d+-data-\d{4}-\d{2}-\d{2}\.zip"$/);
    zip = new AdmZip(res.body as Buffer);
    const names = zip.getEntries().map((e) => e.entryName);
    expect(names).toContain('data.json');
    expect(names).toContain('README.txt');
    expect(zip.readAsText('README.txt')).toMatch(/data\.json/);
    data = JSON.parse(zip.readAsText('data.json'));
    expect(data.missingFiles).toEqual([]);

    // Two commission photos (one the client's PNG) and the enquiry photo, byte for byte the stored originals.
    const photos = data.photos as { id: number; file: string; format: string }[];
    expect(photos).toHaveLength(2);
    const enquiryPhotos = data.enquiryPhotos as { id: number; file: string }[];
    expect(enquiryPhotos).toHaveLength(1);
    for (const p of photos) {
      const original = await a.owner.get(`${A()}/photos/${p.id}/original`).buffer(true).parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (d: Buffer) => chunks.push(d));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
      expect(original.status).toBe(200);
      expect(zip.getEntry(p.file)?.getData().equals(original.body as Buffer)).toBe(true);
    }
    expect(photos.map((p) => p.file).some((f) => f.endsWith('.png'))).toBe(true);
    expect(zip.getEntry(enquiryPhotos[0].file)?.getData().length).toBeGreaterThan(0);
    expect(names.filter((n) => n.startsWith('photos/')).sort()).toEqual([...photos.map((p) => p.file), enquiryPhotos[0].file].sort());
  });

  it('holds the client, their account without its password, and every record that points at them', async () => {
    expect(data.client).toMatchObject({ id: clientId, name: NAME, email: EMAIL, phone: '+49 30 1234567', addressCity: 'Emberford' });
    expect(data.account).toMatchObject({ email: EMAIL, name: NAME });
    const text = zip.readAsText('data.json');
    expect(text).not.toMatch(/passwordHash|password_hash|tokenHash|storageKey/);
    // no sign-in or invitation link leaves in the ZIP (mail bodies are left out)
    expect(text).not.toMatch(/\/(invite|reset-password|reset)\/[A-Za-z0-9_-]{20,}/);
    expect((data.commissions as { id: number }[]).map((c) => c.id).sort()).toEqual([kept, open].sort());

    // Generic check against the live schema: every row of every table that points at the client, one of
    // their commissions, enquiries, invoices or photos is in the export (a table left out fails here).
    const tables = await schema(sw.db);
    const ids = {
      client_id: [clientId],
      commission_id: [kept, open],
      invoice_id: (await sw.db('invoices').where({ client_id: clientId }).pluck('id')) as number[],
      enquiry_id: (await sw.db('enquiries').where({ studio_id: a.studioId, email: EMAIL }).pluck('id')) as number[],
      photo_id: (await sw.db('photos').whereIn('commission_id', [kept, open]).pluck('id')) as number[],
    };
    const key = (t: string) => t.replace(/_([a-z0-9])/g, (_, c: string) => c.toUpperCase());
    let checked = 0;
    for (const [table, cols] of tables) {
      if (table === 'clients') continue;
      for (const [col, values] of Object.entries(ids)) {
        if (!cols.includes(col)) continue;
        const rows = await sw.db(table).whereIn(col, values).select('*');
        if (!rows.length) continue;
        const use = clientTables[table as keyof typeof clientTables];
        expect(use?.export, `${table}.${col} rows must be exported`).toBe('rows');
        const exported = data[key(table)] as Record<string, unknown>[];
        expect(exported, `${table} in data.json`).toBeDefined();
        for (const r of rows) {
          // rows are matched on their id, or on all their columns that were exported (tables without one)
          const match = 'id' in r ? exported.some((e) => e.id === r.id) : exported.some((e) => Object.entries(r).every(([c, v]) => !(key(c) in e) || JSON.stringify(e[key(c)]) === JSON.stringify(v) || typeof v === 'string'));
          expect(match, `${table} row ${JSON.stringify(r).slice(0, 120)}`).toBe(true);
          checked++;
        }
      }
    }
    expect(checked).toBeGreaterThan(30);
    // The scenario's kinds of record all arrived.
    for (const k of ['figures', 'stages', 'timeEntries', 'activity', 'comments', 'approvals', 'schemes', 'recipes', 'recipeSteps', 'recipeStepPaints', 'paints', 'photoPalettes', 'quotes', 'invoices', 'invoicePayments', 'checkouts', 'paymentEvents', 'enquiries', 'enquiryFigures', 'enquiryPhotos', 'modelsIn', 'shipments', 'invitations', 'memberships', 'outbox']) {
      expect((data[k] as unknown[]).length, k).toBeGreaterThan(0);
    }
    expect((data.comments as { body: string }[]).map((c) => c.body)).toContain(`Hello, this is ${NAME}: more moss please.`);
    expect((data.invoices as { total: number; number: string | null }[]).every((i) => Number.isInteger(Number(i.total)))).toBe(true);
    expect((data.outbox as { to: string }[]).every((m) => m.to === EMAIL)).toBe(true);
  });

  it("holds nothing of another client or another studio", () => {
    const text = zip.readAsText('data.json');
    expect(text).not.toContain(OTHER);
    expect(text).not.toContain('tamsin@privacy.test');
    expect(text).not.toContain('Oak wardens');
    expect(text).not.toContain('Client A'); // studio A's invited client
    expect((data.commissions as { clientId: number }[]).every((c) => c.clientId === clientId)).toBe(true);
    expect((data.photos as { commissionId: number }[]).every((p) => [kept, open].includes(p.commissionId))).toBe(true);
  });
});

describe('erase', () => {
  const url = () => `${A()}/clients/${clientId}/erase`;
  let storedKeys: string[];
  let invoicesBefore: Record<string, unknown>[];

  it('is for owners only and needs the name typed', async () => {
    expect((await a.painter.post(url(), { confirmName: NAME })).status).toBe(403);
    expect((await client.post(url(), { confirmName: NAME })).status).toBe(403);
    expect((await b.owner.post(url(), { confirmName: NAME })).status).toBe(404);
    const none = await a.owner.post(url(), {});
    expect(none.status).toBe(400);
    expect(none.body.error.fields.confirmName).toBeTruthy();
    const wrong = await a.owner.post(url(), { confirmName: 'Quillon' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields.confirmName).toContain(NAME);
  });

  it('refuses with 409 while an invoice is unpaid, whatever the override says, and names it', async () => {
    const summary = ok(await a.owner.get(`${A()}/clients/${clientId}/privacy`));
    const invoice = summary.blockers.find((x: { kind: string }) => x.kind === 'invoice');
    expect(invoice).toMatchObject({ overridable: false });
    expect(invoice.reason).toMatch(/€25\.00 is still to pay/);
    expect(summary.blockers.find((x: { kind: string; id: number }) => x.kind === 'commission' && x.id === open)).toMatchObject({ overridable: true });
    const res = await a.owner.post(url(), { confirmName: NAME, deleteOpenCommissions: true });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('open_work');
    expect(res.body.error.message).toContain(invoice.label);
    expect(res.body.error.blockers).toHaveLength(summary.blockers.length);
  });

  it('refuses with 409 while a commission is open, unless told to delete open commissions', async () => {
    const inv = (await invoicesOf(a.owner, a.studioId, kept)).find((i) => i.status === 'open')!;
    ok(await a.owner.post(`${A()}/invoices/${inv.id}/payments`, { method: 'bank', amountMinor: inv.balanceDue, reference: `Bank transfer from ${NAME}` }));
    // The invoiced commission is finished (the lifecycle to closed is tested elsewhere); the enquiry stays open.
    await sw.db('commissions').where({ id: kept }).update({ status: 'closed' });
    const res = await a.owner.post(url(), { confirmName: NAME });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/Marsh drake/);
    expect(res.body.error.message).toMatch(/Also delete open commissions/);
  });

  it('changes nothing at all when a step fails halfway, files included', async () => {
    // Mail goes out in the background after some changes; let it settle so only the erase could change rows.
    await sw.jobs.deliverMail();
    storedKeys = photoFiles(sw).filter((f) => !f.startsWith('.incoming'));
    const before = await dump(sw.db);
    const failing = privacyService({
      db: sw.db,
      repo: privacyRepository(sw.db),
      storage: localDiskStorage(path.join(sw.dataDir, 'photos')),
      clock: sw.clock,
      hooks: {
        afterStep: (step) => {
          if (step === 'account') throw new Error('disk full (test)');
        },
      },
    });
    const userId = (await sw.db('users').where({ email: 'owner-a@studio.test' }).first('id')).id;
    await expect(failing.erase({ studioId: a.studioId, userId }, clientId, { confirmName: NAME, deleteOpenCommissions: true })).rejects.toThrow('disk full (test)');
    expect(await dump(sw.db)).toEqual(before);
    expect(photoFiles(sw).filter((f) => !f.startsWith('.incoming'))).toEqual(storedKeys);
  });

  it('erases the personal data everywhere and keeps the invoices as they were, under a placeholder', async () => {
    const invoiceColumns = ['id', 'number', 'kind', 'status', 'currency', 'subtotal', 'tax', 'total', 'paid', 'issued_at', 'due_date', 'tax_inclusive', 'tax_label', 'tax_id'];
    invoicesBefore = await sw.db('invoices').where({ client_id: clientId }).whereNotNull('number').orderBy('id').select(invoiceColumns);
    const linesBefore = (await sw.db('invoices').where({ client_id: clientId }).whereNotNull('number').orderBy('id').select('lines_json')).map((r) => JSON.parse(r.lines_json).length);
    const payments = await sw.db('invoice_payments').whereIn('invoice_id', invoicesBefore.map((i) => i.id as number)).orderBy('id').select('id', 'amount', 'method', 'received_at');
    const ourKeys = [...(await sw.db('photos').whereIn('commission_id', [kept, open]).pluck('storage_key')), ...(await sw.db('enquiry_photos').where({ studio_id: a.studioId }).pluck('storage_key'))];
    const otherKeys = await sw.db('photos').where({ commission_id: otherCommission }).pluck('storage_key');
    expect(invoicesBefore.length).toBe(2);

    const res = ok(await a.owner.post(url(), { confirmName: '  quillon   ashgrove ', deleteOpenCommissions: true }));
    expect(res).toMatchObject({ clientId, placeholder: `Erased client ${clientId}`, alreadyErased: false, account: 'deleted', kept: { commissions: 1, invoices: 2 } });

    // Not a trace of the name or the addresses in any text of any table (the local mail fake's inbox,
    // which stands in for the recipients' own mail servers, is not the studio's to change).
    const needles = [NAME.toLowerCase(), 'quillon', 'ashgrove', EMAIL];
    const found: string[] = [];
    for (const [table, cols] of await schema(sw.db)) {
      if (table.startsWith('captured_mail')) continue;
      for (const row of await sw.db(table).select('*')) {
        for (const col of cols) {
          const v = row[col];
          const s = typeof v === 'string' ? v.toLowerCase() : v && typeof v === 'object' && !Buffer.isBuffer(v) ? JSON.stringify(v).toLowerCase() : '';
          if (needles.some((n) => s.includes(n))) found.push(`${table}.${col}: ${s.slice(0, 80)}`);
        }
      }
    }
    expect(found).toEqual([]);

    // The placeholder client; the invoices with their numbers, amounts, tax and lines; the payments.
    expect(await sw.db('clients').where({ id: clientId }).first()).toMatchObject({ name: `Erased client ${clientId}`, email: null, phone: null, address_line1: null, address_city: null, notes: null, user_id: null });
    expect(await sw.db('invoices').where({ client_id: clientId }).orderBy('id').select(invoiceColumns)).toEqual(invoicesBefore);
    expect((await sw.db('invoices').where({ client_id: clientId }).orderBy('id').select('lines_json')).map((r) => JSON.parse(r.lines_json).length)).toEqual(linesBefore);
    expect(await sw.db('invoice_payments').whereIn('invoice_id', invoicesBefore.map((i) => i.id as number)).orderBy('id').select('id', 'amount', 'method', 'received_at')).toEqual(payments);
    const lines = JSON.parse((await sw.db('invoices').where({ client_id: clientId, kind: 'custom' }).first('lines_json')).lines_json);
    expect(JSON.stringify(lines)).toContain(`Freehand banner for Erased client ${clientId}`);
    const pdf = await a.owner.get(`${A()}/invoices/${invoicesBefore[0].id}/pdf`);
    expect(pdf.status).toBe(200);

    // The invoiced commission stays, bare; the open one is gone with its photos, comments and the rest.
    expect(await sw.db('commissions').where({ id: kept }).first('brief', 'scheme_notes', 'title')).toEqual({ brief: null, scheme_notes: null, title: `Erased client ${clientId}'s ash knights` });
    expect(await sw.db('commissions').where({ id: open }).first()).toBeUndefined();
    for (const t of ['photos', 'comments', 'approvals', 'schemes', 'shipments', 'models_in', 'quotes']) {
      expect(await sw.db(t).whereIn('commission_id', [kept, open]).count({ n: '*' }).first().then((r) => Number(r?.n)), t).toBe(0);
    }
    expect(await sw.db('enquiries').where({ studio_id: a.studioId }).count({ n: '*' }).first().then((r) => Number(r?.n))).toBe(0);
    expect(await sw.db('time_entries').where({ commission_id: kept }).whereNotNull('note').count({ n: '*' }).first().then((r) => Number(r?.n))).toBe(0);

    // Files: the client's gone from storage, the other client's still there.
    const files = photoFiles(sw);
    for (const k of ourKeys) expect(files.some((f) => f.startsWith(`${k}/`)), k).toBe(false);
    for (const k of otherKeys) expect(files.some((f) => f.startsWith(`${k}/`)), k).toBe(true);

    // The other client is untouched.
    expect(await sw.db('clients').where({ id: otherClientId }).first('name', 'email')).toEqual({ name: OTHER, email: 'tamsin@privacy.test' });
    expect(await sw.db('comments').where({ commission_id: otherCommission }).count({ n: '*' }).first().then((r) => Number(r?.n))).toBe(1);
  });

  it("ends the client's sessions and sign-in", async () => {
    expect((await client.get('/api/auth/me')).status).toBe(401);
    expect((await new Caller(sw.app).post('/api/auth/login', { email: EMAIL, password: PASSWORD })).status).toBe(401);
    expect(await sw.db('users').where({ email: EMAIL }).first()).toBeUndefined();
  });

  it('is harmless the second time: 200, nothing changes', async () => {
    await sw.jobs.deliverMail();
    const before = await dump(sw.db);
    const again = ok(await a.owner.post(url(), { confirmName: NAME }));
    expect(again).toMatchObject({ alreadyErased: true, clientId });
    expect(await dump(sw.db)).toEqual(before);
    const summary = ok(await a.owner.get(`${A()}/clients/${clientId}/privacy`));
    expect(summary.erasedAt).toBeTruthy();
    expect(summary.blockers).toEqual([]);
  });

  it('refuses to edit the placeholder, so no name or address can be written back', async () => {
    const res = await a.owner.patch(`${A()}/clients/${clientId}`, { name: NAME, email: EMAIL });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('client_erased');
    expect((await sw.db('clients').where({ id: clientId }).first()).name).toBe(`Erased client ${clientId}`);
  });

  it('takes no new commission for the placeholder: the error names the client field', async () => {
    const before = await sw.db('commissions').where({ client_id: clientId }).count({ n: '*' }).first();
    const res = await a.owner.post(`${A()}/commissions`, { clientId, title: 'Another warband' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.clientId).toMatch(/erased/);
    expect(await sw.db('commissions').where({ client_id: clientId }).count({ n: '*' }).first()).toEqual(before);
  });

  it('lists the placeholder as erased, and leaves it out when the picker for new work asks', async () => {
    const all = ok(await a.owner.get(`${A()}/clients?limit=200`));
    const listed = all.items.find((c: { id: number }) => c.id === clientId);
    expect(listed?.erasedAt).toBeTruthy();
    expect(all.items.find((c: { id: number }) => c.id === otherClientId)?.erasedAt).toBeNull();
    const forNewWork = ok(await a.owner.get(`${A()}/clients?limit=200&erased=hidden`));
    expect(forNewWork.items.map((c: { id: number }) => c.id)).not.toContain(clientId);
    expect(forNewWork.items.map((c: { id: number }) => c.id)).toContain(otherClientId);
    expect(forNewWork.total).toBe(all.total - 1);
    expect((await a.owner.get(`${A()}/clients?erased=maybe`)).status).toBe(400);
  });

  it('still exports the placeholder with the kept invoices', async () => {
    const res = await exportZip(a.owner, a.studioId, clientId);
    expect(res.status).toBe(200);
    const data = JSON.parse(new AdmZip(res.body as Buffer).readAsText('data.json'));
    expect(data.client.name).toBe(`Erased client ${clientId}`);
    expect(data.account).toBeNull();
    expect(data.invoices.map((i: { number: string }) => i.number).sort()).toEqual(invoicesBefore.map((i) => i.number).sort());
    expect(data.photos).toEqual([]);
  });
});

describe('a client who also belongs to another studio', () => {
  it('keeps their account and their other studio; only this studio forgets them', async () => {
    // Studio B's client is invited to studio A as a client too.
    const shared = 'client-b@studio.test';
    const id = ok(await a.owner.post(`${A()}/clients`, { name: 'Client B', email: shared }), 201).id;
    ok(await a.owner.post(`${A()}/clients/${id}/invite`), 201);
    const mails = await mailTo(sw, shared);
    ok(await b.client.post(`/api/invitations/${linkIn(mails[mails.length - 1].text, '/invite/')}/accept`, { password: PASSWORD }));
    const user = await sw.db('users').where({ email: shared }).first('id');
    expect(await sw.db('memberships').where({ user_id: user.id }).count({ n: '*' }).first().then((r) => Number(r?.n))).toBe(2);

    const res = ok(await a.owner.post(`${A()}/clients/${id}/erase`, { confirmName: 'Client B' }));
    expect(res.account).toBe('kept');
    expect(await sw.db('memberships').where({ user_id: user.id }).pluck('studio_id')).toEqual([b.studioId]);
    expect((await b.client.get('/api/auth/me')).status).toBe(200);
    expect((await b.client.get(`${A()}/commissions`)).status).toBe(404);
    expect(await sw.db('clients').where({ studio_id: b.studioId, email: shared }).first('name')).toEqual({ name: 'Client b' });
  });
});
