// Script payloads in every text field a person can write (tests/support/hostile.ts makes the studio):
// the API stores and returns them literally; every e-mail escapes them in its HTML part; the invoice PDF
// prints them as text and links nothing; CSV exports guard formula starts; the calendar feed escapes them.
import { parse as parseCsv } from 'csv-parse/sync';
import { extractText, getDocumentProxy } from 'unpdf';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { escapeHtml } from '../../server/lib/html';
import { Caller, linkIn, mailTo, signInAs, startTestApp, type TestApp } from '../support/app';
import { upload } from '../support/fixtures';
import { seedHostileStudio, stored, type HostileStudio, type Http } from '../support/hostile';

const OWNER = 'owner@hostile.demo.test';
const CLIENT = 'client@hostile.demo.test';
const VISITOR = 'visitor@hostile.demo.test';
const DECLINED = 'declined@hostile.demo.test';

let sw: TestApp;
let h: HostileStudio;
/** Each field's payload as the API keeps it. */
let want: Record<string, string>;
let owner: Caller;
let client: Caller;
let S: string;
let C: string;

const http = (c: Caller): Http => ({ get: (u) => c.get(u), post: c.post, put: c.put, patch: c.patch, upload: (u, fields, file) => upload(c, u, [file], fields) });

beforeAll(async () => {
  sw = await startTestApp();
  h = await seedHostileStudio({
    caller: () => http(new Caller(sw.app)),
    inviteToken: async (email) => linkIn((await mailTo(sw, email)).at(-1).text, '/invite/'),
    ownerEmail: OWNER,
    clientEmail: CLIENT,
    visitorEmail: VISITOR,
    declinedEmail: DECLINED,
  });
  want = Object.fromEntries(Object.entries(h.values).map(([k, v]) => [k, stored(v)]));
  owner = await signInAs(sw, OWNER);
  client = await signInAs(sw, CLIENT);
  S = `/api/studios/${h.studioId}`;
  C = `${S}/commissions/${h.commissionId}`;
}, 120_000);
afterAll(() => sw.stop());

/** Every string anywhere in a JSON value. */
function strings(v: unknown, out = new Set<string>()): Set<string> {
  if (typeof v === 'string') out.add(v);
  else if (Array.isArray(v)) v.forEach((x) => strings(x, out));
  else if (v && typeof v === 'object') Object.values(v).forEach((x) => strings(x, out));
  return out;
}

async function readAll(c: Caller, urls: string[]) {
  const seen = new Set<string>();
  for (const u of urls) {
    const r = await c.get(u);
    expect(r.status, `GET ${u}: ${JSON.stringify(r.body)}`).toBe(200);
    strings(r.body, seen);
  }
  return seen;
}

describe('the API', () => {
  it('stores every payload and answers it back literally, character for character, but a bidi override it never closes', async () => {
    const enquiries = (await owner.get(`${S}/enquiries`)).body.items as { id: number }[];
    const quotes = (await owner.get(`${S}/quotes?commissionId=${h.commissionId}`)).body.items as { id: number }[];
    const invoices = (await owner.get(`${S}/invoices?commissionId=${h.commissionId}`)).body.items as { id: number }[];
    const stageIds = ((await owner.get(C)).body.figures as { stages: { id: number }[] }[]).flatMap((f) => f.stages.map((s) => s.id));
    const seen = await readAll(owner, [
      '/api/auth/me',
      S,
      `${S}/members`,
      `${S}/clients`,
      `${S}/clients/${h.clientId}`,
      `${S}/commissions`,
      C,
      `${S}/commissions/${h.commission2Id}`,
      `${C}/activity`,
      ...stageIds.map((id) => `${S}/stages/${id}/time`),
      `${S}/board`,
      `${S}/stage-template`,
      `${S}/lists`,
      `${S}/hazards`,
      `${C}/photos`,
      `${C}/comments`,
      `${C}/approvals`,
      `${S}/paints`,
      `${S}/paints/${h.paintId}`,
      `${S}/recipes/${h.recipeId}`,
      `${C}/scheme`,
      `${S}/public-page`,
      `/api/public/studios/${h.slug}`,
      ...enquiries.map((e) => `${S}/enquiries/${e.id}`),
      `${C}/models-in`,
      `${S}/shipping-settings`,
      `${C}/shipments`,
      `${S}/price-table`,
      ...quotes.map((q) => `${S}/quotes/${q.id}`),
      ...invoices.map((i) => `${S}/invoices/${i.id}`),
    ]);
    // The note to the client about the models lives only in its e-mail (checked below); a hazard's
    // caution comes back with the standard safety footer after it.
    const returned = (value: string) => seen.has(value) || [...seen].some((x) => x.startsWith(`${value} `));
    const missing = Object.entries(want).filter(([field, value]) => field !== 'models.notice' && !returned(value));
    expect(missing.map(([field]) => field)).toEqual([]);
    // The unclosed right-to-left override (U+202E) is gone; the zero-width space and the closed
    // right-to-left isolate (U+2067 … U+2069) are kept.
    expect(h.values['client.name']).toContain('\u202E');
    expect(want['client.name']).toBe(h.values['client.name'].replace('\u202E', ''));
    expect(want['client.name']).toContain('\u200B \u2067rtl\u2069');
    expect(seen.has(h.values['client.name'])).toBe(false);
    expect(Object.keys(h.values).length).toBeGreaterThan(60);
  });

  it('gives the client the payloads of their own commission literally too', async () => {
    const seen = await readAll(client, ['/api/auth/me', C, `${C}/comments`, `${C}/approvals`, `${C}/photos`, `${C}/shipments`, `${S}/quotes/${h.quoteId}`, `${S}/quotes?commissionId=${h.commissionId}`, `${S}/invoices/${h.invoiceId}`]);
    for (const field of ['commission.title', 'commission.brief', 'figure.name', 'comment.owner', 'comment.client', 'approval.note', 'approval.changes', 'photo.caption', 'invoice.line', 'invoice.note', 'studio.name', 'price.terms']) {
      expect(seen.has(want[field]), field).toBe(true);
    }
  });
});

/** The only elements our mail layout uses; anything else in an HTML part came from user text. */
const MAIL_ELEMENTS = new Set(['html', 'body', 'div', 'h1', 'p', 'a', 'strong']);

describe('e-mails', () => {
  type Mail = { to: string; subject: string; text: string; html: string; headers: string };
  let mails: Mail[];
  beforeAll(async () => {
    await sw.jobs.deliverMail();
    mails = await sw.db('captured_mail').orderBy('id');
  });

  it('escapes every payload in the HTML part: no element, attribute or link comes from user text', async () => {
    expect(mails.length).toBeGreaterThanOrEqual(15);
    let carried = 0;
    for (const m of mails) {
      const where = `mail "${m.subject}"`;
      expect(m.html, where).not.toMatch(/<\s*(script|img|svg|iframe|object|embed|form|input|style|link|meta|base)\b/i);
      for (const [, name, attrs] of m.html.matchAll(/<\s*([a-zA-Z][\w-]*)([^>]*)>/g)) {
        expect(MAIL_ELEMENTS.has(name.toLowerCase()), `${where}: element <${name}>`).toBe(true);
        expect(attrs, `${where}: <${name}${attrs}>`).not.toMatch(/\son[a-z]+\s*=/i);
      }
      for (const [, href] of m.html.matchAll(/\shref\s*=\s*"([^"]*)"/gi)) expect(href, where).toMatch(/^http:\/\/sablework\.test\//);
      // Whatever user text the plain part carries literally, the HTML part carries escaped.
      for (const [field, value] of Object.entries(want)) {
        if (!m.text.includes(value)) continue;
        carried++;
        expect(m.html.includes(escapeHtml(value)), `${where}: ${field}`).toBe(true);
      }
    }
    expect(carried).toBeGreaterThanOrEqual(30);
  });

  it('every payload that belongs in a message reaches it literally in the plain-text part', async () => {
    const inText = (field: string) => mails.some((m) => m.text.includes(want[field]));
    for (const field of ['studio.name', 'owner.name', 'client.name', 'client.user.name', 'commission.title', 'comment.owner', 'comment.client', 'approval.note', 'approval.changes', 'photo.caption', 'quote.changes', 'quote.accepted.name', 'models.notice', 'enquiry.name', 'enquiry.figure', 'enquiry.decline']) {
      expect(inText(field), field).toBe(true);
    }
  });

  it('line breaks in a title do not add headers or recipients', async () => {
    const addresses = new Set([OWNER, CLIENT, VISITOR, DECLINED]);
    for (const m of mails) {
      expect(addresses.has(m.to), m.to).toBe(true);
      expect(m.subject).not.toMatch(/[\r\n]/);
      const headers = Object.keys(JSON.parse(m.headers)).map((k) => k.toLowerCase());
      expect(headers.filter((k) => ['bcc', 'cc', 'attach', 'x-injected', 'description'].includes(k)), m.subject).toEqual([]);
    }
    expect(mails.some((m) => m.subject.includes('commission2.title'))).toBe(true);
  });
});

/** Text as a PDF viewer gives it back: line breaks where the layout wraps, and no bidi or zero-width marks (the fonts have none). */
const squash = (t: string) => t.replace(/[\s\p{Cc}\u200B-\u200F\u202A-\u202E\u2066-\u2069]+/gu, '');
const binary = (c: Caller, url: string) =>
  c
    .get(url)
    .buffer(true)
    .parse((res, cb) => {
      const parts: Buffer[] = [];
      res.on('data', (b: Buffer) => parts.push(b));
      res.on('end', () => cb(null, Buffer.concat(parts)));
    });

/** Text pieces of a PDF page as boxes in points, from pdf.js. */
async function textBoxes(bytes: Buffer) {
  const doc = await getDocumentProxy(new Uint8Array(bytes));
  const out: { page: number; str: string; x: number; y: number; w: number; h: number; pageWidth: number }[] = [];
  for (let i = 1; i <= doc.numPages; i++) {
    const page = await doc.getPage(i);
    const [, , pageWidth] = page.view;
    for (const item of (await page.getTextContent()).items as { str: string; transform: number[]; width: number; height: number }[]) {
      if (!item.str.trim()) continue;
      out.push({ page: i, str: item.str, x: item.transform[4], y: item.transform[5], w: item.width, h: item.height, pageWidth });
    }
  }
  return out;
}

describe('the invoice PDF', () => {
  it('keeps long hostile names and lines inside the page, and no two pieces of text on top of each other', async () => {
    const boxes = await textBoxes((await binary(owner, `${S}/invoices/${h.invoiceId}/pdf`).expect(200)).body as Buffer);
    expect(boxes.length).toBeGreaterThan(20);
    for (const b of boxes) {
      expect(b.x, b.str).toBeGreaterThanOrEqual(49);
      expect(b.x + b.w, b.str).toBeLessThanOrEqual(b.pageWidth - 49);
    }
    const overlaps: string[] = [];
    for (const [i, a] of boxes.entries()) {
      for (const b of boxes.slice(i + 1)) {
        if (a.page !== b.page) continue;
        const dx = Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x);
        const dy = Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y);
        if (dx > 1 && dy > 2) overlaps.push(`${JSON.stringify(a.str)} / ${JSON.stringify(b.str)}`);
      }
    }
    expect(overlaps).toEqual([]);
  });


  it('prints every payload on it as plain text, whole, and holds no link, action or script', async () => {
    for (const who of [owner, client]) {
      const r = await binary(who, `${S}/invoices/${h.invoiceId}/pdf`).expect(200);
      expect(r.headers['content-type']).toBe('application/pdf');
      const bytes = r.body as Buffer;
      // pdfkit writes its object dictionaries uncompressed, so these names would show.
      for (const name of ['/Annots', '/Annot', '/Link', '/URI', '/JavaScript', '/JS', '/Launch', '/OpenAction', '/AA', '/SubmitForm', '/AcroForm', '/EmbeddedFile']) {
        expect(bytes.includes(Buffer.from(`${name} `)) || bytes.includes(Buffer.from(`${name}\n`)) || bytes.includes(Buffer.from(`${name}/`)) || bytes.includes(Buffer.from(`${name}<<`)), name).toBe(false);
      }
      const doc = await getDocumentProxy(new Uint8Array(bytes));
      for (let i = 1; i <= doc.numPages; i++) expect(await (await doc.getPage(i)).getAnnotations(), `annotations on page ${i}`).toEqual([]);
      const text = squash((await extractText(doc, { mergePages: true })).text);
      for (const field of ['studio.name', 'client.name', 'client.line1', 'client.line2', 'client.city', 'client.region', 'commission.title', 'invoice.line', 'invoice.note', 'payment.reference', 'tax', 'tax.id']) {
        expect(text.includes(squash(want[field])), `${field} on the PDF`).toBe(true);
      }
    }
  });
});

describe('CSV exports', () => {
  /** A cell a spreadsheet would run: it starts with = + - @ (or a tab or CR) and is not a plain number. */
  const runnable = (cell: string) => /^[=+\-@\t\r]/.test(cell) && !/^-?\d+(\.\d+)?$/.test(cell);

  it('the invoice export guards every formula start with an apostrophe and keeps the rest of the text', async () => {
    const r = await owner.get(`${S}/invoices/export.csv`).expect(200);
    expect(r.headers['content-type']).toMatch(/^text\/csv/);
    expect(r.headers['content-disposition']).toMatch(/^attachment/);
    const rows = parseCsv(r.text, { bom: true }) as string[][];
    const cells = rows.flat();
    expect(cells.filter(runnable)).toEqual([]);
    for (const field of ['client.name', 'commission.title', 'tax', 'tax.id']) expect(cells, field).toContain(`'${want[field]}`);
  });

  it('the paint rack export does the same for names, makers, ranges and notes', async () => {
    const r = await owner.get(`${S}/paints/export`).expect(200);
    const cells = (parseCsv(r.text, { bom: true }) as string[][]).flat();
    expect(cells.filter(runnable)).toEqual([]);
    for (const field of ['paint.name', 'paint.maker', 'paint.range', 'paint.notes']) expect(cells, field).toContain(`'${want[field]}`);
  });
});

describe('the calendar feed', () => {
  /** RFC 5545 text unescaped: \\ \; \, \n */
  const unescapeText = (v: string) => v.replace(/\\([\\;,nN])/g, (_, c: string) => (c === 'n' || c === 'N' ? '\n' : c));

  it('writes titles and client names as escaped text, and a line break in a title adds no property', async () => {
    const feed = await owner.post(`${S}/calendar-feed`);
    expect(feed.status, JSON.stringify(feed.body)).toBe(201);
    const r = await new Caller(sw.app).get(new URL(feed.body.url).pathname).expect(200);
    expect(r.headers['content-type']).toMatch(/^text\/calendar/);
    const ics = r.text;
    // Lines end in CRLF only: no bare CR or LF anywhere a reader could take for a line end.
    expect(ics.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
    const lines = ics.replace(/\r\n[ \t]/g, '').split('\r\n').filter(Boolean);
    const names = new Set(lines.map((l) => /^([A-Z-]+)[;:]/.exec(l)?.[1] ?? `unreadable: ${l}`));
    expect([...names].filter((n) => !['BEGIN', 'END', 'VERSION', 'PRODID', 'METHOD', 'X-WR-CALNAME', 'X-PUBLISHED-TTL', 'CALSCALE', 'UID', 'SUMMARY', 'DTSTAMP', 'DTSTART', 'DTEND', 'DESCRIPTION', 'STATUS', 'TRANSP'].includes(n))).toEqual([]);
    expect(lines.filter((l) => l.startsWith('ATTACH') || l.startsWith('X-INJECTED'))).toEqual([]);

    const summaries = lines.filter((l) => l.startsWith('SUMMARY:')).map((l) => unescapeText(l.slice('SUMMARY:'.length)));
    expect(summaries).toContain(`Due: ${want['commission.title']}`);
    const breaker = summaries.find((x) => x.includes('commission2.title'));
    expect(breaker, 'the line-breaking title is in the feed').toBeDefined();
    // Its text survives whole, with its breaks as escaped newlines inside the one SUMMARY value.
    expect(breaker!.replace(/\n/g, ' ')).toBe(`Due: ${h.values['commission2.title'].replace(/\r\n|\r|\n/g, ' ')}`);
    const descriptions = lines.filter((l) => l.startsWith('DESCRIPTION:')).map((l) => unescapeText(l.slice('DESCRIPTION:'.length)));
    expect(descriptions.some((d) => d.startsWith(`${want['client.name']} · `))).toBe(true);
  });
});
