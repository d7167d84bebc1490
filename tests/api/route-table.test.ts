import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Caller, PASSWORD, startTestApp, twoStudios, type TestApp } from '../support/app';
import { images, upload } from '../support/fixtures';

/**
 * Who may call what, written out by hand (never derived from the allow() calls it checks).
 * Columns: anonymous, owner, painter, client of studio A, and the owner of studio B calling studio A.
 * Studio routes are called on studio A with an empty body: a caller who gets past the policy meets
 * validation (400) or the resource's own answer; one who does not gets 401, 403 or 404.
 * Every route on the router must be listed; a new route fails this test until it joins the table.
 */
type Row = [method: string, path: string, anon: number, owner: number, painter: number, client: number, stranger: number];
const FAKE_TOKEN = 'x'.repeat(43);

const table: Row[] = [
  ['GET', '/api/health', 200, 200, 200, 200, 200],
  ['GET', '/api/meta', 200, 200, 200, 200, 200],
  ['GET', '/api/auth/csrf', 200, 200, 200, 200, 200],
  ['POST', '/api/auth/signup', 400, 400, 400, 400, 400],
  ['POST', '/api/auth/login', 400, 400, 400, 400, 400],
  ['POST', '/api/auth/logout', 204, 204, 204, 204, 204],
  ['GET', '/api/auth/me', 401, 200, 200, 200, 200],
  ['PATCH', '/api/auth/me', 401, 200, 200, 200, 200],
  ['POST', '/api/auth/password', 401, 400, 400, 400, 400],
  ['POST', '/api/auth/password-reset', 400, 400, 400, 400, 400],
  ['POST', '/api/auth/password-reset/confirm', 400, 400, 400, 400, 400],
  ['GET', '/api/invitations/:token', 404, 404, 404, 404, 404],
  ['POST', '/api/invitations/:token/accept', 400, 400, 400, 400, 400],
  ['GET', '/api/studios/:studioId', 401, 200, 200, 200, 404],
  ['PATCH', '/api/studios/:studioId', 401, 200, 403, 403, 404],
  ['GET', '/api/studios/:studioId/members', 401, 200, 403, 403, 404],
  ['DELETE', '/api/studios/:studioId/members/:userId', 401, 404, 403, 403, 404],
  ['GET', '/api/studios/:studioId/invitations', 401, 200, 403, 403, 404],
  ['POST', '/api/studios/:studioId/invitations', 401, 400, 403, 403, 404],
  ['DELETE', '/api/studios/:studioId/invitations/:invitationId', 401, 404, 403, 403, 404],
  ['GET', '/api/studios/:studioId/clients', 401, 200, 200, 403, 404],
  ['POST', '/api/studios/:studioId/clients', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/clients/:clientId', 401, 200, 200, 403, 404],
  ['PATCH', '/api/studios/:studioId/clients/:clientId', 401, 200, 403, 403, 404],
  ['POST', '/api/studios/:studioId/clients/:clientId/invite', 401, 409, 403, 403, 404],
  // Privacy (issue 8): the client's data as a ZIP, what stops an erase, and the erase (the empty body lacks the typed name).
  ['GET', '/api/studios/:studioId/clients/:clientId/privacy', 401, 200, 403, 403, 404],
  ['GET', '/api/studios/:studioId/clients/:clientId/export', 401, 200, 403, 403, 404],
  ['POST', '/api/studios/:studioId/clients/:clientId/erase', 401, 400, 403, 403, 404],
  // Commissions, figures, stages, time, board, studio settings (issue 3, server part E). The client of studio A owns the commission.
  ['GET', '/api/studios/:studioId/commissions', 401, 200, 200, 200, 404],
  ['POST', '/api/studios/:studioId/commissions', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/commissions/:commissionId', 401, 200, 200, 200, 404],
  ['PATCH', '/api/studios/:studioId/commissions/:commissionId', 401, 200, 403, 403, 404],
  ['PATCH', '/api/studios/:studioId/commissions/:commissionId/scheme-notes', 401, 400, 403, 400, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/transitions', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/commissions/:commissionId/activity', 401, 200, 200, 403, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/figures', 401, 400, 403, 403, 404],
  ['PATCH', '/api/studios/:studioId/figures/:figureId', 401, 200, 403, 403, 404],
  ['POST', '/api/studios/:studioId/figures/:figureId/advance', 401, 200, 200, 403, 404],
  ['PATCH', '/api/studios/:studioId/stages/:stageId', 401, 200, 200, 403, 404],
  ['GET', '/api/studios/:studioId/stages/:stageId/time', 401, 200, 200, 403, 404],
  ['POST', '/api/studios/:studioId/stages/:stageId/time', 401, 400, 400, 403, 404],
  ['POST', '/api/studios/:studioId/stages/:stageId/timer', 401, 201, 201, 403, 404],
  ['GET', '/api/studios/:studioId/timer', 401, 200, 200, 403, 404],
  ['POST', '/api/studios/:studioId/timer/stop', 401, 200, 200, 403, 404],
  ['PATCH', '/api/studios/:studioId/time/:entryId', 401, 200, 403, 403, 404],
  ['GET', '/api/studios/:studioId/board', 401, 200, 200, 403, 404],
  ['GET', '/api/studios/:studioId/stage-template', 401, 200, 200, 403, 404],
  ['PUT', '/api/studios/:studioId/stage-template', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/lists', 401, 200, 200, 200, 404],
  ['PUT', '/api/studios/:studioId/lists', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/hazards', 401, 200, 200, 200, 404],
  ['PUT', '/api/studios/:studioId/hazards', 401, 400, 403, 403, 404],
  // Photos, comments, approvals (issue 3, server part F). The photo is shared with the client; the approval waits for them.
  ['GET', '/api/studios/:studioId/commissions/:commissionId/photos', 401, 200, 200, 200, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/photos', 401, 400, 400, 400, 404],
  ['GET', '/api/studios/:studioId/photos/:photoId/:size', 401, 200, 200, 200, 404],
  ['PATCH', '/api/studios/:studioId/photos/:photoId', 401, 200, 200, 403, 404],
  ['GET', '/api/studios/:studioId/commissions/:commissionId/comments', 401, 200, 200, 200, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/comments', 401, 400, 400, 400, 404],
  ['GET', '/api/studios/:studioId/commissions/:commissionId/approvals', 401, 200, 200, 200, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/approvals', 401, 400, 400, 403, 404],
  ['POST', '/api/studios/:studioId/approvals/:approvalId/request-changes', 401, 403, 403, 400, 404],
  // The client's approval decides the request; no row after this one uses it.
  ['POST', '/api/studios/:studioId/approvals/:approvalId/approve', 401, 403, 403, 200, 404],
  // Capacity, queue and forecast, calendar feeds (issue 6). :painterId is studio A's painter (their own hours); no day off exists.
  ['GET', '/api/studios/:studioId/capacity', 401, 200, 200, 403, 404],
  ['PUT', '/api/studios/:studioId/capacity/painters/:painterId/hours', 401, 400, 400, 403, 404],
  ['POST', '/api/studios/:studioId/capacity/days-off', 401, 400, 400, 403, 404],
  ['DELETE', '/api/studios/:studioId/capacity/days-off/:dayOffId', 401, 404, 404, 403, 404],
  ['GET', '/api/studios/:studioId/schedule', 401, 200, 200, 200, 404],
  ['PUT', '/api/studios/:studioId/schedule/queue', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/schedule/earliest-delivery', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/calendar-feed', 401, 200, 200, 403, 404],
  ['POST', '/api/studios/:studioId/calendar-feed', 401, 201, 201, 403, 404],
  ['DELETE', '/api/studios/:studioId/calendar-feed', 401, 204, 204, 403, 404],
  ['GET', '/api/calendar/:token.ics', 404, 404, 404, 404, 404],
  ['GET', '/api/studios/:studioId/reports/actuals', 401, 200, 403, 403, 404],
  ['GET', '/api/studios/:studioId/reports/earnings', 401, 200, 403, 403, 404],
  ['PUT', '/api/studios/:studioId/reports/settings', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/dashboard', 401, 200, 200, 200, 404],
  // Paint rack, recipes, schemes, palettes (issue 5). The paint is in the recipe and the recipe in the scheme, so neither can be removed (409).
  ['GET', '/api/studios/:studioId/paints', 401, 200, 200, 403, 404],
  ['POST', '/api/studios/:studioId/paints', 401, 400, 400, 403, 404],
  ['GET', '/api/studios/:studioId/paints/export', 401, 200, 200, 403, 404],
  ['POST', '/api/studios/:studioId/paints/import', 401, 400, 400, 403, 404],
  ['GET', '/api/studios/:studioId/paints/nearest', 401, 400, 400, 403, 404],
  ['GET', '/api/studios/:studioId/paints/:paintId', 401, 200, 200, 403, 404],
  ['PATCH', '/api/studios/:studioId/paints/:paintId', 401, 200, 200, 403, 404],
  ['DELETE', '/api/studios/:studioId/paints/:paintId', 401, 409, 409, 403, 404],
  ['GET', '/api/studios/:studioId/recipes', 401, 200, 200, 403, 404],
  ['POST', '/api/studios/:studioId/recipes', 401, 400, 400, 403, 404],
  ['GET', '/api/studios/:studioId/recipes/:recipeId', 401, 200, 200, 403, 404],
  ['PUT', '/api/studios/:studioId/recipes/:recipeId', 401, 400, 400, 403, 404],
  ['DELETE', '/api/studios/:studioId/recipes/:recipeId', 401, 409, 409, 403, 404],
  ['GET', '/api/studios/:studioId/commissions/:commissionId/scheme', 401, 200, 200, 200, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/scheme', 401, 400, 400, 403, 404],
  ['GET', '/api/studios/:studioId/commissions/:commissionId/shopping-list', 401, 200, 200, 403, 404],
  ['PATCH', '/api/studios/:studioId/scheme-entries/:schemeEntryId', 401, 200, 200, 403, 404],
  ['GET', '/api/studios/:studioId/reference-photos/:referencePhotoId/palette', 401, 200, 200, 403, 404],
  ['GET', '/api/studios/:studioId/reference-photos/:referencePhotoId/point', 401, 400, 400, 403, 404],
  // Public page, enquiries, models in, shipping (issue 7). The page of studio A is on; a visitor's enquiry has one photo;
  // the table commission has its shipment started (still packing, so its client does not see it yet).
  ['GET', '/api/public/studios/:slug', 200, 200, 200, 200, 200],
  ['POST', '/api/public/studios/:slug/enquiries', 400, 400, 400, 400, 400],
  ['GET', '/api/studios/:studioId/public-page', 401, 200, 403, 403, 404],
  ['PUT', '/api/studios/:studioId/public-page', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/enquiries', 401, 200, 403, 403, 404],
  ['GET', '/api/studios/:studioId/enquiries/:enquiryId', 401, 200, 403, 403, 404],
  ['GET', '/api/studios/:studioId/enquiries/:enquiryId/photos/:enquiryPhotoId/:size', 401, 200, 403, 403, 404],
  ['POST', '/api/studios/:studioId/enquiries/:enquiryId/decline', 401, 400, 403, 403, 404],
  // The owner's accept decides the enquiry; no row after this one uses it.
  ['POST', '/api/studios/:studioId/enquiries/:enquiryId/accept', 401, 201, 403, 403, 404],
  ['GET', '/api/studios/:studioId/commissions/:commissionId/models-in', 401, 200, 200, 403, 404],
  ['PUT', '/api/studios/:studioId/commissions/:commissionId/models-in', 401, 400, 400, 403, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/models-in/notice', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/shipping-settings', 401, 200, 200, 403, 404],
  ['PUT', '/api/studios/:studioId/shipping-settings', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/commissions/:commissionId/shipments', 401, 200, 200, 200, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/shipments', 401, 409, 403, 403, 404],
  ['PATCH', '/api/studios/:studioId/commissions/:commissionId/shipments/:shipmentId', 401, 200, 200, 403, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/shipments/:shipmentId/ship', 401, 400, 403, 403, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/shipments/:shipmentId/delivered', 401, 400, 403, 403, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/shipments/:shipmentId/received', 401, 403, 403, 404, 404],
  // Quotes, invoices, payments (issue 4). A second commission of the client has a sent quote and an issued invoice;
  // the client's decline decides the quote and the owner's void the invoice: no row after theirs uses them.
  ['GET', '/api/studios/:studioId/price-table', 401, 200, 403, 403, 404],
  ['PUT', '/api/studios/:studioId/price-table', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/price-table/public-summary', 401, 200, 200, 200, 404],
  ['GET', '/api/studios/:studioId/quotes', 401, 200, 403, 200, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/quotes', 401, 201, 403, 403, 404],
  ['POST', '/api/studios/:studioId/quotes/preview', 401, 200, 403, 403, 404],
  ['GET', '/api/studios/:studioId/quotes/:quoteId', 401, 200, 403, 200, 404],
  ['PATCH', '/api/studios/:studioId/quotes/:quoteId', 401, 409, 403, 403, 404],
  ['POST', '/api/studios/:studioId/quotes/:quoteId/send', 401, 409, 403, 403, 404],
  ['POST', '/api/studios/:studioId/quotes/:quoteId/accept', 401, 403, 403, 400, 404],
  ['POST', '/api/studios/:studioId/quotes/:quoteId/request-changes', 401, 403, 403, 400, 404],
  ['POST', '/api/studios/:studioId/quotes/:quoteId/decline', 401, 403, 403, 200, 404],
  ['GET', '/api/studios/:studioId/commissions/:commissionId/cancellation', 401, 200, 403, 403, 404],
  ['POST', '/api/studios/:studioId/commissions/:commissionId/cancellation', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/invoices', 401, 200, 403, 200, 404],
  ['POST', '/api/studios/:studioId/invoices', 401, 400, 403, 403, 404],
  ['GET', '/api/studios/:studioId/invoices/export.csv', 401, 200, 403, 403, 404],
  ['GET', '/api/studios/:studioId/invoices/:invoiceId', 401, 200, 403, 200, 404],
  ['GET', '/api/studios/:studioId/invoices/:invoiceId/pdf', 401, 200, 403, 200, 404],
  ['POST', '/api/studios/:studioId/invoices/:invoiceId/issue', 401, 409, 403, 403, 404],
  ['POST', '/api/studios/:studioId/invoices/:invoiceId/payments', 401, 400, 403, 403, 404],
  ['POST', '/api/studios/:studioId/invoices/:invoiceId/refunds', 401, 400, 403, 403, 404],
  ['POST', '/api/studios/:studioId/invoices/:invoiceId/checkout', 401, 200, 403, 200, 404],
  ['POST', '/api/studios/:studioId/invoices/:invoiceId/void', 401, 200, 403, 403, 404],
  ['GET', '/api/studios/:studioId/money', 401, 200, 403, 403, 404],
  ['POST', '/api/webhooks/payments', 400, 400, 400, 400, 400],
  // Deletions run last among these rows: the owner's call removes the record, so the painter after it meets 404.
  ['DELETE', '/api/studios/:studioId/time/:entryId', 401, 204, 404, 403, 404],
  ['DELETE', '/api/studios/:studioId/figures/:figureId', 401, 204, 403, 403, 404],
  ['DELETE', '/api/studios/:studioId/photos/:photoId', 401, 204, 404, 403, 404],
  ['DELETE', '/api/studios/:studioId/scheme-entries/:schemeEntryId', 401, 200, 404, 403, 404],
];

let sw: TestApp;
let ids: Record<string, string>;
const who = ['anon', 'owner', 'painter', 'client', 'stranger'] as const;
const emails = { owner: 'owner-a@studio.test', painter: 'painter-a@studio.test', client: 'client-a@studio.test', stranger: 'owner-b@studio.test' };

beforeAll(async () => {
  sw = await startTestApp();
  const { a } = await twoStudios(sw);
  ids = { studioId: String(a.studioId), clientId: String(a.clientId), userId: '999999', invitationId: '999999', token: FAKE_TOKEN };
  // A commission of studio A's client with one figure, and a time entry logged by the owner on its first stage.
  const commission = await a.owner.post(`/api/studios/${a.studioId}/commissions`, {
    clientId: a.clientId,
    title: 'Route table',
    figures: [{ name: 'Table figure', quantity: 1, sizeClass: '28', tier: 'tabletop' }],
  });
  const figure = commission.body.figures[0];
  const entry = await a.owner.post(`/api/studios/${a.studioId}/stages/${figure.stages[0].id}/time`, { hours: 1 });
  Object.assign(ids, { commissionId: String(commission.body.id), figureId: String(figure.id), stageId: String(figure.stages[0].id), entryId: String(entry.body.id) });
  // A photo on that commission shared with the client, and a scheme approval waiting for the client.
  const photos = await upload(a.owner, `/api/studios/${a.studioId}/commissions/${ids.commissionId}/photos`, [{ data: await images.twoTone(64, 48), name: 'table.jpg' }], { kind: 'progress', shared: 'true' });
  const approval = await a.owner.post(`/api/studios/${a.studioId}/commissions/${ids.commissionId}/approvals`, { subject: 'scheme' });
  Object.assign(ids, { photoId: String(photos.body[0].id), size: 'thumb', approvalId: String(approval.body.id) });
  // Issue 6: the painter's own capacity row; a day off that does not exist.
  Object.assign(ids, { painterId: String((await sw.db('users').where({ email: emails.painter }).first('id')).id), dayOffId: '999999' });
  // Issue 5: a paint in a recipe, the recipe in the commission's scheme, and a reference photo the client sent.
  const A = `/api/studios/${a.studioId}`;
  const paint = await a.owner.post(`${A}/paints`, { name: 'Table navy', type: 'base', hex: '#1F3A93' });
  const recipe = await a.owner.post(`${A}/recipes`, { name: 'Table denim', steps: [{ technique: 'basecoat', paints: [{ paintId: paint.body.id }] }] });
  const scheme = await a.owner.post(`${A}/commissions/${ids.commissionId}/scheme`, { area: 'Trousers', recipeId: recipe.body.id });
  const reference = await upload(a.client, `${A}/commissions/${ids.commissionId}/photos`, [{ data: await images.twoTone(64, 48), name: 'ref.jpg' }], { kind: 'reference' });
  Object.assign(ids, { paintId: String(paint.body.id), recipeId: String(recipe.body.id), schemeEntryId: String(scheme.body.entries[0].id), referencePhotoId: String(reference.body[0].id) });
  // Issue 7: studio A's public page on, a visitor's enquiry with a photo, and the table commission's shipment started.
  await a.owner.put(`${A}/public-page`, { enabled: true, turnaroundSource: 'text' });
  const slug = (await sw.db('studios').where({ id: a.studioId }).first('slug')).slug as string;
  const visitor = new Caller(sw.app);
  await visitor.csrf();
  const sent = await upload(visitor, `/api/public/studios/${slug}/enquiries`, [{ data: await images.twoTone(64, 48), name: 'wish.jpg' }], {
    name: 'Route Visitor',
    email: 'visitor@route.test',
    figures: JSON.stringify([{ name: 'Table wish', quantity: 1, sizeClass: '28' }]),
    consent: 'true',
  });
  if (sent.status !== 201) throw new Error(JSON.stringify(sent.body));
  const enquiry = await sw.db('enquiries').where({ studio_id: a.studioId }).first('id');
  const enquiryPhoto = await sw.db('enquiry_photos').where({ enquiry_id: enquiry.id }).first('id');
  const shipment = await a.owner.post(`${A}/commissions/${ids.commissionId}/shipments`, {});
  Object.assign(ids, { slug, enquiryId: String(enquiry.id), enquiryPhotoId: String(enquiryPhoto.id), shipmentId: String(shipment.body.id) });
  // Issue 4: a second commission of the client with a sent quote and an issued invoice (studio A quotes from the default table).
  const money = await a.owner.post(`${A}/commissions`, { clientId: a.clientId, title: 'Route money', figures: [{ name: 'Money figure', quantity: 1, sizeClass: '28', tier: 'tabletop' }] });
  const quote = await a.owner.post(`${A}/commissions/${money.body.id}/quotes`, {});
  await a.owner.post(`${A}/quotes/${quote.body.id}/send`);
  const invoice = await a.owner.post(`${A}/invoices`, { commissionId: money.body.id, kind: 'custom', lines: [{ description: 'Route line', quantity: 1, unitMinor: 1000 }] });
  await a.owner.post(`${A}/invoices/${invoice.body.id}/issue`);
  Object.assign(ids, { quoteId: String(quote.body.id), invoiceId: String(invoice.body.id) });
});
afterAll(() => sw.stop());

async function callerFor(role: (typeof who)[number]) {
  const c = new Caller(sw.app);
  if (role !== 'anon') await c.post('/api/auth/login', { email: emails[role], password: PASSWORD });
  return c;
}

describe('role × route table', () => {
  it('lists every route on the router, and nothing that is not there', () => {
    const onRouter = sw.routes().map((r) => `${r.method} ${r.path}`).sort();
    const inTable = table.map(([m, p]) => `${m} ${p}`).sort();
    expect(onRouter).toEqual(inTable);
  });

  it.each(table)('%s %s', async (method, path, ...expected) => {
    const url = path.replace(/:(\w+)/g, (_, k: string) => ids[k]);
    const got: number[] = [];
    for (const role of who) {
      const c = await callerFor(role);
      const m = method.toLowerCase() as 'get' | 'post' | 'patch' | 'delete' | 'put';
      const res = m === 'get' ? await c.get(url) : await c[m](url, {});
      got.push(res.status);
    }
    expect(Object.fromEntries(who.map((w, i) => [w, got[i]]))).toEqual(Object.fromEntries(who.map((w, i) => [w, expected[i]])));
  });
});
