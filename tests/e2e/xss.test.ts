// Script payloads rendered back in the browser: a studio whose every text is a payload (made through the
// API by tests/support/hostile.ts), opened as its owner, as its client and as a visitor of its public page.
// Fails on any dialog, on any element or attribute the payloads could have added, and unless the payloads
// show on the page as the literal text they are.
import type { Page } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedHostileStudio, stored, type HostileStudio, type Http } from '../support/hostile';
import { newPage, shot, signIn, startE2E, type E2E } from './support/harness';

const PASSWORD = 'correct horse battery';
const OWNER = 'owner@hostile.demo.test';
const CLIENT = 'client@hostile.demo.test';

let e2e: E2E;
let h: HostileStudio;

/** A caller on the real server over fetch: keeps the session cookie and sends the CSRF token. */
function fetchCaller(base: string): Http {
  let cookie = '';
  let token: string | null = null;
  const send = async (method: string, url: string, body?: BodyInit, type?: string) => {
    const headers: Record<string, string> = {};
    if (method !== 'GET') {
      if (!token) token = ((await send('GET', '/api/auth/csrf')).body as { token: string }).token;
      headers['x-csrf-token'] = token!;
    }
    if (cookie) headers.cookie = cookie;
    if (type) headers['content-type'] = type;
    const res = await fetch(base + url, { method, headers, body });
    const set = res.headers.getSetCookie().find((c) => c.startsWith('sablework.sid='));
    if (set) cookie = set.split(';')[0];
    if (/\/auth\/(login|logout|signup)|\/accept$/.test(url)) token = null;
    const text = await res.text();
    const parse = () => {
      try {
        return text ? JSON.parse(text) : null;
      } catch {
        return text;
      }
    };
    return { status: res.status, body: parse() as never, text };
  };
  const json = (method: string) => (url: string, body?: unknown) => send(method, url, body === undefined ? undefined : JSON.stringify(body), body === undefined ? undefined : 'application/json');
  return {
    get: (url) => send('GET', url),
    post: json('POST'),
    put: json('PUT'),
    patch: json('PATCH'),
    upload(url, fields, file) {
      const form = new FormData();
      for (const [k, v] of Object.entries(fields)) form.append(k, v);
      form.append('photos', new Blob([new Uint8Array(file.data)], { type: file.type }), file.name);
      return send('POST', url, form);
    },
  };
}

/** The invitation link's token from the local mail inbox (/dev/mail), waiting for the outbox to deliver. */
async function inviteToken(email: string) {
  for (let i = 0; i < 100; i++) {
    const inbox = await (await fetch(`${e2e.baseUrl}/dev/mail`)).text();
    const row = new RegExp(`<td>${email.replace(/[.@]/g, (c) => `\\${c}`)}</td><td><a href="/dev/mail/(\\d+)">`).exec(inbox);
    if (row) {
      const m = /\/invite\/([A-Za-z0-9_-]+)/.exec(await (await fetch(`${e2e.baseUrl}/dev/mail/${row[1]}`)).text());
      if (m) return m[1];
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no invitation mail for ${email}`);
}

beforeAll(async () => {
  e2e = await startE2E();
  h = await seedHostileStudio({
    caller: () => fetchCaller(e2e.baseUrl),
    inviteToken,
    ownerEmail: OWNER,
    clientEmail: CLIENT,
    visitorEmail: 'visitor@hostile.demo.test',
    declinedEmail: 'declined@hostile.demo.test',
  });
  // A reference photo from the client, so their own upload shows on their side too.
  const photo = await sharp({ create: { width: 80, height: 60, channels: 3, background: '#8a6d3b' } }).png().toBuffer();
  const client = fetchCaller(e2e.baseUrl);
  await client.post('/api/auth/login', { email: CLIENT, password: PASSWORD });
  const up = await client.upload(`/api/studios/${h.studioId}/commissions/${h.commissionId}/photos`, { kind: 'reference', caption: h.values['comment.client'] }, { data: photo, name: 'ref.png', type: 'image/png' });
  if (up.status !== 201) throw new Error(`client photo: ${up.status} ${JSON.stringify(up.body)}`);
}, 180_000);
afterAll(() => e2e?.stop());

/**
 * Elements and attributes that only an injected payload would put in the page, and text that leaves a
 * bidirectional override or embedding open (it would turn the page's words after it around).
 */
function injected(page: Page) {
  return page.evaluate(() => {
    const found: string[] = [];
    const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
    for (let n = walker.nextNode(); n; n = walker.nextNode()) {
      let open = 0;
      for (const ch of (n as Text).data) {
        if (/[\u202A\u202B\u202D\u202E\u2066-\u2068]/.test(ch)) open++;
        else if (/[\u202C\u2069]/.test(ch) && open > 0) open--;
      }
      if (open > 0) found.push(`text leaves a bidi override open: ${JSON.stringify((n as Text).data.slice(0, 80))}`);
    }
    for (const el of Array.from(document.querySelectorAll('*'))) {
      const tag = el.tagName.toLowerCase();
      if (['iframe', 'object', 'embed', 'base', 'frame'].includes(tag)) found.push(`<${tag}>`);
      if (tag === 'script' && !(el as HTMLScriptElement).src) found.push('inline <script>');
      if (tag === 'img' && /(^|\/)x$/.test(el.getAttribute('src') ?? '')) found.push('<img src=x>');
      for (const a of Array.from(el.attributes)) {
        if (/^on/i.test(a.name)) found.push(`<${tag} ${a.name}>`);
        if (['href', 'src', 'action', 'formaction', 'xlink:href'].includes(a.name.toLowerCase()) && /^\s*javascript:/i.test(a.value)) found.push(`<${tag} ${a.name}="${a.value}">`);
      }
    }
    return found;
  });
}

type Visit = { who: 'owner' | 'client' | 'visitor'; path: string; name: string; fields: string[] };

describe('script payloads in the app', () => {
  it('shows every payload as literal text on the owner’s, the client’s and the public pages, and none of them runs or adds anything', async () => {
    const S = `/studio/${h.studioId}`;
    const visits: Visit[] = [
      { who: 'owner', name: 'owner-commission', path: `${S}/commissions/${h.commissionId}`, fields: ['commission.title', 'commission.brief', 'figure.name', 'comment.owner', 'comment.client', 'approval.note', 'approval.changes', 'photo.caption', 'client.name'] },
      { who: 'owner', name: 'owner-client', path: `${S}/clients/${h.clientId}`, fields: ['client.name', 'client.notes', 'client.line1', 'client.city'] },
      { who: 'owner', name: 'owner-invoice', path: `${S}/invoices/${h.invoiceId}`, fields: ['invoice.line', 'invoice.note', 'client.name', 'payment.reference'] },
      { who: 'owner', name: 'owner-recipe', path: `${S}/paints/recipes/${h.recipeId}`, fields: ['recipe.name', 'recipe.description', 'paint.name'] },
      { who: 'owner', name: 'owner-paints', path: `${S}/paints`, fields: ['paint.name'] },
      { who: 'owner', name: 'owner-enquiry', path: `${S}/enquiries/${h.enquiryId}`, fields: ['enquiry.name', 'enquiry.notes', 'enquiry.figure'] },
      { who: 'owner', name: 'owner-bench', path: `${S}/bench`, fields: ['figure.name'] },
      { who: 'client', name: 'client-home', path: S, fields: ['commission.title'] },
      { who: 'client', name: 'client-commission', path: `${S}/commissions/${h.commissionId}`, fields: ['commission.title', 'figure.name', 'comment.owner', 'comment.client', 'approval.note', 'photo.caption'] },
      { who: 'client', name: 'client-invoice', path: `${S}/invoices/${h.invoiceId}`, fields: ['invoice.line', 'invoice.note'] },
      { who: 'visitor', name: 'public-page', path: `/s/${h.slug}`, fields: ['studio.name', 'public.intro', 'public.turnaround'] },
    ];
    const problems: string[] = [];
    const pages: Record<Visit['who'], Page> = {} as never;
    for (const who of ['owner', 'client', 'visitor'] as const) {
      const { page } = await newPage(e2e);
      page.on('dialog', (d) => {
        problems.push(`${who}: a ${d.type()} dialog opened: ${d.message()}`);
        void d.dismiss();
      });
      page.on('pageerror', (err) => problems.push(`${who}: page error ${err.message}`));
      page.on('console', (m) => {
        if (m.type() === 'error' && !/Failed to load resource/.test(m.text())) problems.push(`${who}: console error ${m.text().slice(0, 300)}`);
      });
      if (who !== 'visitor') {
        await signIn(page, who === 'owner' ? OWNER : CLIENT, PASSWORD);
        await page.waitForURL(/\/studio\//);
      }
      pages[who] = page;
    }

    for (const v of visits) {
      const page = pages[v.who];
      await page.goto(v.path);
      for (const [i, field] of v.fields.entries()) {
        // The payload arrived as text, with its quotes, brackets and marks: on the page, or in a form's
        // box. The first one waits for the page; folded sections are opened.
        const text = stored(h.values[field]);
        const shown = await page
          .getByText(text)
          .first()
          .waitFor({ state: 'visible', timeout: i === 0 ? 15_000 : 2_000 })
          .then(() => true)
          .catch(() => false);
        if (shown) continue;
        await page.evaluate(() => document.querySelectorAll('details').forEach((d) => (d.open = true)));
        const again = await page.getByText(text).first().isVisible();
        const inBox = await page.evaluate((t) => Array.from(document.querySelectorAll('input, textarea')).some((e) => (e as HTMLInputElement).value === t), text);
        if (!again && !inBox) problems.push(`${v.name}: ${field} is not shown as text`);
      }
      // Give late requests (comments, photos, approvals) their time before looking for what they added.
      await page.waitForLoadState('networkidle');
      for (const p of await injected(page)) problems.push(`${v.name}: ${p}`);
      await shot(page, `xss-${v.name}`);
    }
    for (const page of Object.values(pages)) await page.context().close();
    expect(problems).toEqual([]);
  }, 300_000);
});
