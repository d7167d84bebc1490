// Real records of one studio for every route parameter the router uses, built through the API the same way
// tests/api/route-table.test.ts builds its ids (that file keeps its own copy as the independent hand-written check).
// The security suite builds this for studio A and studio B, so it can call every route with real ids of either.
import { Caller, mailTo, type TestApp } from './app';
import { images, upload } from './fixtures';

export type StudioMembers = { studioId: number; owner: Caller; painter: Caller; client: Caller; clientId: number };
export type RouteIds = Record<string, string>;

/** A token of the right shape that no invitation or calendar feed has. */
export const FAKE_TOKEN = 'x'.repeat(43);

const check = <T extends { status: number; body: unknown }>(what: string, res: T, ...ok: number[]) => {
  if (!ok.includes(res.status)) throw new Error(`route fixture: ${what} answered ${res.status} ${JSON.stringify(res.body)}`);
  return res;
};

/**
 * For one studio (its owner, painter and client from twoStudios): a commission with a figure, a time entry, a
 * shared photo, an approval waiting for the client, a paint in a recipe in the commission's scheme, a reference
 * photo, the public page on with a visitor's enquiry and its photo, a started shipment, a sent quote, an issued
 * invoice, a pending invitation and a day off. Only the ids are returned (as strings, ready for a URL).
 * `tag` names the studio's people as twoStudios does (painter-<tag>@studio.test).
 */
export async function studioRecords(sw: TestApp, s: StudioMembers, tag: string): Promise<RouteIds> {
  const A = `/api/studios/${s.studioId}`;
  const painterUser = await sw.db('users').where({ email: `painter-${tag}@studio.test` }).first('id');
  const ids: RouteIds = { studioId: String(s.studioId), clientId: String(s.clientId), userId: String(painterUser.id), painterId: String(painterUser.id), token: FAKE_TOKEN, size: 'thumb' };

  const invitation = check('invitation', await s.owner.post(`${A}/invitations`, { email: `spare-${tag}@studio.test`, role: 'painter' }), 201);
  await mailTo(sw, `spare-${tag}@studio.test`);
  const commission = check(
    'commission',
    await s.owner.post(`${A}/commissions`, { clientId: s.clientId, title: `Security ${tag}`, figures: [{ name: `Figure ${tag}`, quantity: 1, sizeClass: '28', tier: 'tabletop' }] }),
    201,
  );
  const figure = commission.body.figures[0];
  const entry = check('time entry', await s.owner.post(`${A}/stages/${figure.stages[0].id}/time`, { hours: 1 }), 201);
  Object.assign(ids, {
    invitationId: String(invitation.body.id),
    commissionId: String(commission.body.id),
    figureId: String(figure.id),
    stageId: String(figure.stages[0].id),
    entryId: String(entry.body.id),
  });
  const dayOff = check('day off', await s.owner.post(`${A}/capacity/days-off`, { userId: painterUser.id, kind: 'day_off', from: '2027-03-01', to: '2027-03-02' }), 201);
  ids.dayOffId = String(dayOff.body.id);

  const photos = check('photo', await upload(s.owner, `${A}/commissions/${ids.commissionId}/photos`, [{ data: await images.twoTone(64, 48), name: `${tag}.jpg` }], { kind: 'progress', shared: 'true' }), 201);
  const approval = check('approval', await s.owner.post(`${A}/commissions/${ids.commissionId}/approvals`, { subject: 'scheme' }), 201);
  Object.assign(ids, { photoId: String(photos.body[0].id), approvalId: String(approval.body.id) });

  const paint = check('paint', await s.owner.post(`${A}/paints`, { name: `Navy ${tag}`, type: 'base', hex: '#1F3A93' }), 201);
  const recipe = check('recipe', await s.owner.post(`${A}/recipes`, { name: `Denim ${tag}`, steps: [{ technique: 'basecoat', paints: [{ paintId: paint.body.id }] }] }), 201);
  const scheme = check('scheme', await s.owner.post(`${A}/commissions/${ids.commissionId}/scheme`, { area: 'Trousers', recipeId: recipe.body.id }), 201, 200);
  const reference = check('reference photo', await upload(s.client, `${A}/commissions/${ids.commissionId}/photos`, [{ data: await images.twoTone(64, 48), name: 'ref.jpg' }], { kind: 'reference' }), 201);
  Object.assign(ids, { paintId: String(paint.body.id), recipeId: String(recipe.body.id), schemeEntryId: String(scheme.body.entries[0].id), referencePhotoId: String(reference.body[0].id) });

  check('public page', await s.owner.put(`${A}/public-page`, { enabled: true, turnaroundSource: 'text' }), 200);
  const slug = (await sw.db('studios').where({ id: s.studioId }).first('slug')).slug as string;
  const visitor = new Caller(sw.app);
  await visitor.csrf();
  check(
    'enquiry',
    await upload(visitor, `/api/public/studios/${slug}/enquiries`, [{ data: await images.twoTone(64, 48), name: 'wish.jpg' }], {
      name: `Visitor ${tag}`,
      email: `visitor-${tag}@route.test`,
      figures: JSON.stringify([{ name: 'Wish', quantity: 1, sizeClass: '28' }]),
      consent: 'true',
    }),
    201,
  );
  const enquiry = await sw.db('enquiries').where({ studio_id: s.studioId }).first('id');
  const enquiryPhoto = await sw.db('enquiry_photos').where({ enquiry_id: enquiry.id }).first('id');
  const shipment = check('shipment', await s.owner.post(`${A}/commissions/${ids.commissionId}/shipments`, {}), 201);
  Object.assign(ids, { slug, enquiryId: String(enquiry.id), enquiryPhotoId: String(enquiryPhoto.id), shipmentId: String(shipment.body.id) });

  const money = check('money commission', await s.owner.post(`${A}/commissions`, { clientId: s.clientId, title: `Money ${tag}`, figures: [{ name: 'Money figure', quantity: 1, sizeClass: '28', tier: 'tabletop' }] }), 201);
  const quote = check('quote', await s.owner.post(`${A}/commissions/${money.body.id}/quotes`, {}), 201);
  check('quote send', await s.owner.post(`${A}/quotes/${quote.body.id}/send`), 200);
  const invoice = check('invoice', await s.owner.post(`${A}/invoices`, { commissionId: money.body.id, kind: 'custom', lines: [{ description: `Line ${tag}`, quantity: 1, unitMinor: 1000 }] }), 201);
  check('invoice issue', await s.owner.post(`${A}/invoices/${invoice.body.id}/issue`), 200);
  Object.assign(ids, { quoteId: String(quote.body.id), invoiceId: String(invoice.body.id) });
  return ids;
}

/** Path parameters that name a record by number (the ones a foreign or guessed id can stand in for). */
export const NON_ID_PARAMS = new Set(['size', 'slug', 'token']);

export const paramsOf = (path: string) => [...path.matchAll(/:(\w+)/g)].map((m) => m[1]);

/** Fills a route path with values; throws for a parameter that has no value, so a new kind of id is noticed. */
export function fill(path: string, values: RouteIds, over: Record<string, string> = {}) {
  return path.replace(/:(\w+)/g, (_, k: string) => {
    const v = over[k] ?? values[k];
    if (v === undefined) throw new Error(`no value for :${k} in ${path}; add a record for it in tests/support/route-fixtures.ts`);
    return v;
  });
}

/**
 * Valid bodies (and queries) for the routes that check their body before their records, so that a foreign id on
 * them meets the record lookup instead of a 400 for the body. Keyed `METHOD /api/path`; a route without one is
 * called with `{}`. `ids` are the caller's own studio's records (a body may name one).
 */
export function sampleInputs(ids: RouteIds): Record<string, { body?: unknown; query?: string }> {
  return {
    'PATCH /api/studios/:studioId/commissions/:commissionId/scheme-notes': { body: { schemeNotes: 'Notes' } },
    'POST /api/studios/:studioId/commissions/:commissionId/transitions': { body: { to: 'on_hold', reason: 'Waiting' } },
    'POST /api/studios/:studioId/commissions/:commissionId/figures': { body: { name: 'Extra', quantity: 1, sizeClass: '28', tier: 'tabletop' } },
    'POST /api/studios/:studioId/stages/:stageId/time': { body: { hours: 1 } },
    'POST /api/studios/:studioId/commissions/:commissionId/comments': { body: { body: 'A comment' } },
    'POST /api/studios/:studioId/commissions/:commissionId/approvals': { body: { subject: 'scheme' } },
    'POST /api/studios/:studioId/approvals/:approvalId/request-changes': { body: { comment: 'Change this' } },
    'POST /api/studios/:studioId/quotes/:quoteId/accept': { body: { name: 'Client', acceptTerms: true } },
    'POST /api/studios/:studioId/quotes/:quoteId/request-changes': { body: { comment: 'Change this' } },
    'POST /api/studios/:studioId/invoices/:invoiceId/payments': { body: { method: 'cash', amountMinor: 100 } },
    'POST /api/studios/:studioId/invoices/:invoiceId/refunds': { body: { amountMinor: 100, reason: 'Refund' } },
    'POST /api/studios/:studioId/commissions/:commissionId/cancellation': { body: { reason: 'Cancelled' } },
    'PUT /api/studios/:studioId/capacity/painters/:painterId/hours': { body: { hours: {} } },
    'PUT /api/studios/:studioId/recipes/:recipeId': { body: { name: 'Renamed' } },
    'POST /api/studios/:studioId/commissions/:commissionId/scheme': { body: { area: 'Cloak', recipeId: Number(ids.recipeId) } },
    'GET /api/studios/:studioId/reference-photos/:referencePhotoId/point': { query: 'x=0.5&y=0.5' },
    'POST /api/studios/:studioId/enquiries/:enquiryId/decline': { body: { message: 'Not this time' } },
    'PUT /api/studios/:studioId/commissions/:commissionId/models-in': { body: { supplier: 'client_ships' } },
    'POST /api/studios/:studioId/commissions/:commissionId/models-in/notice': { body: { message: 'A note' } },
    'POST /api/studios/:studioId/commissions/:commissionId/shipments/:shipmentId/delivered': { body: { deliveredOn: '2026-03-02' } },
    'POST /api/studios/:studioId/clients/:clientId/erase': { body: { confirmName: 'Nobody' } },
  };
}
