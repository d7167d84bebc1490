// A studio whose every user-writable text is a script payload, made through the API only, for the
// security tests: tests/api/security-xss.test.ts (supertest) and tests/e2e/xss.test.ts (a real server
// and a browser). The transport is passed in, so both drive exactly the same steps.
import sharp from 'sharp';
import { defaultPriceTable } from '../../shared/schemas/price-table';
import { dropUnclosedBidi } from '../../shared/text';

/** The pieces of a payload, most important first; a field too short for all of them keeps the first ones. */
const PIECES = [
  '"><img src=x onerror=alert(1)>',
  '<script>alert(1)</script>',
  // An override never closed (dropped on the way in), then a closed right-to-left isolate (kept). Its
  // letters are Latin: the invoice PDF's fonts have no Hebrew or Arabic (see docs/security.md).
  '\u202Egpj.exe\u200B \u2067rtl\u2069',
  '{{7*7}}${7*7}',
  "javascript:alert('x')",
];
/**
 * A payload that fits in `max` characters, unique by its tag. It starts with "=" (a spreadsheet formula)
 * and holds an attribute break-out with an onerror image, a script tag, an unclosed right-to-left
 * override, a zero-width space, a closed right-to-left isolate, template syntax and a javascript: URL, as far
 * as the field's length allows.
 */
export function hostile(tag: string, max = 200): string {
  const pieces = [...PIECES];
  const build = () => `=1+1 ${pieces.join(' ')} #${tag}`;
  while (build().length > max && pieces.length > 1) pieces.pop();
  // The shortest that still carries an element with a handler, for fields of about 30 characters.
  const out = build().length <= max ? build() : `=<svg/onload=alert(1)>#${tag}`;
  if (out.length > max) throw new Error(`field "${tag}" is too short for a payload (${max})`);
  return out;
}
/** What the API keeps of a payload: all of it but an override it never closes (shared/text.ts). */
export const stored = dropUnclosedBidi;

/** For fields that look like addresses: what a link would run if anyone made it one. */
export const jsUrl = (tag: string) => `javascript:alert('${tag}')//`;
/** Line breaks where one line is expected: tries to add lines to mail headers and calendar entries. */
export const lineBreaker = (tag: string) => `Heron ${tag}\r\nBcc: victim@demo.test\r\nATTACH:http://evil.test/x\rX-INJECTED:1\nDESCRIPTION:forged`;

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- response bodies of many shapes, read field by field
type Res = { status: number; body: any; text?: string };
/** A signed-in or anonymous caller that keeps its cookies and sends the CSRF header. */
export type Http = {
  get(url: string): PromiseLike<Res>;
  post(url: string, body?: unknown): PromiseLike<Res>;
  put(url: string, body?: unknown): PromiseLike<Res>;
  patch(url: string, body?: unknown): PromiseLike<Res>;
  /** multipart, field `photos` */
  upload(url: string, fields: Record<string, string>, file: { data: Buffer; name: string; type: string }): PromiseLike<Res>;
};

export type HostileStudio = Awaited<ReturnType<typeof seedHostileStudio>>;

async function ok(p: PromiseLike<Res>, what: string, status = [200, 201]) {
  const r = await p;
  if (!status.includes(r.status)) throw new Error(`${what}: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body;
}

/**
 * Signs up an owner, invites and signs in a client, and fills every text field a person can write with
 * its own payload. `values` lists them all by field; `mailed` those that go out in some e-mail.
 */
export async function seedHostileStudio(io: { caller(): Http; inviteToken(email: string): Promise<string>; ownerEmail: string; clientEmail: string; visitorEmail: string; declinedEmail: string }) {
  const values: Record<string, string> = {};
  const v = (tag: string, max?: number) => (values[tag] = hostile(tag, max));

  // The owner and the studio
  const owner = io.caller();
  const signup = await ok(owner.post('/api/auth/signup', { name: v('owner.name', 120), email: io.ownerEmail, password: 'correct horse battery', studioName: v('studio.name', 80), currency: 'EUR', timezone: 'Europe/Berlin' }), 'signup');
  const studioId = signup.memberships[0].studioId as number;
  const S = `/api/studios/${studioId}`;
  await ok(owner.patch(S, { about: v('studio.about', 2000) }), 'studio about');
  const page = await ok(owner.put(`${S}/public-page`, { enabled: true, intro: v('public.intro', 1000), turnaroundText: v('public.turnaround', 300), turnaroundSource: 'text' }), 'public page');
  const slug = page.slug as string;

  // Studio setup: stage names, tier and extra labels, hazard cautions, the price table's words
  const template = await ok(owner.get(`${S}/stage-template`), 'stage template');
  const stages = (template.stages ?? template) as { key: string; name: string; defaultHours: number; waitHours: number; hazards: string[] }[];
  stages[0].name = v('stage.name', 80);
  await ok(owner.put(`${S}/stage-template`, { stages: stages.map(({ key, name, defaultHours, waitHours, hazards }) => ({ key, name, defaultHours, waitHours, hazards })) }), 'put stage template');
  const lists = await ok(owner.get(`${S}/lists`), 'lists');
  lists.tiers[0].label = v('tier.label', 80);
  lists.extras[0].label = v('extra.label', 80);
  await ok(owner.put(`${S}/lists`, { tiers: lists.tiers.map(({ key, label }: { key: string; label: string }) => ({ key, label })), extras: lists.extras.map(({ key, label }: { key: string; label: string }) => ({ key, label })) }), 'put lists');
  const hazards = (await ok(owner.get(`${S}/hazards`), 'hazards')) as { key: string; title: string; text: string }[];
  hazards[0].title = v('hazard.title', 80);
  hazards[0].text = v('hazard.text', 2000);
  await ok(owner.put(`${S}/hazards`, hazards.map(({ key, title, text }) => ({ key, title, text }))), 'put hazards');
  const table = defaultPriceTable('EUR');
  table.tax = { rateBp: 2000, label: v('tax', 30), pricesIncludeTax: true, taxId: v('tax.id', 60) };
  table.terms = v('price.terms', 20000);
  await ok(owner.put(`${S}/price-table`, table), 'price table');
  await ok(owner.put(`${S}/shipping-settings`, { autoCloseDays: 21, fromCountry: null, packingItems: [v('packing.item', 200)] }), 'shipping settings');

  // The client, with an account
  const client0 = await ok(
    owner.post(`${S}/clients`, {
      name: v('client.name', 120),
      email: io.clientEmail,
      notes: v('client.notes', 4000),
      address: { line1: v('client.line1', 200), line2: v('client.line2', 200), city: v('client.city', 100), region: v('client.region', 100) },
    }),
    'client',
  );
  const clientId = client0.id as number;
  await ok(owner.post(`${S}/clients/${clientId}/invite`), 'invite client');
  const client = io.caller();
  await ok(client.post(`/api/invitations/${await io.inviteToken(io.clientEmail)}/accept`, { name: v('client.user.name', 120), password: 'correct horse battery' }), 'accept invitation');

  // Paints and a recipe
  const paint = await ok(owner.post(`${S}/paints`, { name: v('paint.name', 120), maker: v('paint.maker', 80), range: v('paint.range', 80), type: 'base', hex: '#5A6B3C', notes: v('paint.notes', 2000) }), 'paint');
  const recipe = await ok(
    owner.post(`${S}/recipes`, { name: v('recipe.name', 120), description: v('recipe.description', 2000), steps: [{ technique: 'basecoat', paints: [{ paintId: paint.id }], tool: v('recipe.step.tool', 80), notes: v('recipe.step.notes', 1000) }] }),
    'recipe',
  );

  // The commission, its figure, the bench
  const commission = await ok(
    owner.post(`${S}/commissions`, {
      clientId,
      title: v('commission.title', 120),
      brief: v('commission.brief', 10000),
      dueDate: '2026-09-30',
      figures: [{ name: v('figure.name', 120), quantity: 1, sizeClass: '28', tier: 'tabletop', lightSource: v('figure.light', 200), subAssemblies: [v('figure.part', 60)] }],
    }),
    'commission',
  );
  const commissionId = commission.id as number;
  const C = `${S}/commissions/${commissionId}`;
  const figure = commission.figures[0] as { id: number; stages: { id: number }[] };
  await ok(owner.patch(`${C}/scheme-notes`, { schemeNotes: v('commission.scheme', 10000) }), 'scheme notes');
  await ok(owner.post(`${S}/stages/${figure.stages[0].id}/time`, { hours: 1, note: v('time.note', 500) }), 'time');
  await ok(owner.post(`${C}/scheme`, { figureId: figure.id, area: v('scheme.area', 80), recipeId: recipe.id, notes: v('scheme.notes', 500) }), 'scheme entry');

  // Talk: comments, an approval with changes asked, a shared photo with a caption
  await ok(owner.post(`${C}/comments`, { body: v('comment.owner', 4000) }), 'owner comment');
  await ok(client.post(`${C}/comments`, { body: v('comment.client', 4000) }), 'client comment');
  const approval = await ok(owner.post(`${C}/approvals`, { subject: 'scheme', note: v('approval.note', 2000) }), 'approval');
  await ok(client.post(`${S}/approvals/${approval.id}/request-changes`, { comment: v('approval.changes', 2000) }), 'changes');
  const photo = await sharp({ create: { width: 120, height: 90, channels: 3, background: '#6b8e23' } }).jpeg().toBuffer();
  await ok(owner.upload(`${C}/photos`, { kind: 'progress', shared: 'true', caption: v('photo.caption', 300) }, { data: photo, name: 'progress.jpg', type: 'image/jpeg' }), 'photo');

  // Money: a quote with a hostile extra line, changes asked, a second version accepted by a hostile name
  const q1 = await ok(owner.post(`${C}/quotes`, { extraLines: [{ kind: 'shipping', label: v('quote.line', 80), unitAmount: 1000 }] }), 'quote');
  await ok(owner.post(`${S}/quotes/${q1.id}/send`), 'send quote');
  await ok(client.post(`${S}/quotes/${q1.id}/request-changes`, { comment: v('quote.changes', 4000) }), 'quote changes');
  const q2 = await ok(owner.post(`${C}/quotes`, {}), 'quote v2');
  await ok(owner.post(`${S}/quotes/${q2.id}/send`), 'send quote v2');
  await ok(client.post(`${S}/quotes/${q2.id}/accept`, { name: v('quote.accepted.name', 120), acceptTerms: true }), 'accept quote');
  const invoice = await ok(
    owner.post(`${S}/invoices`, { commissionId, kind: 'custom', lines: [{ description: v('invoice.line', 300), quantity: 1, unitMinor: 2500 }], note: v('invoice.note', 500) }),
    'invoice',
  );
  await ok(owner.post(`${S}/invoices/${invoice.id}/issue`), 'issue invoice');
  await ok(owner.post(`${S}/invoices/${invoice.id}/payments`, { method: 'bank', amountMinor: 500, reference: v('payment.reference', 200) }), 'payment');
  // Booked by hand (as if the deposit had come by bank), so it sits in the queue and the calendar feed.
  await ok(owner.post(`${C}/transitions`, { to: 'booked' }), 'book');

  // Models in and the parcel out; the tracking fields get a javascript: address
  values['models.tracking'] = jsUrl('models.tracking');
  values['shipment.tracking'] = jsUrl('shipment.tracking');
  await ok(
    owner.put(`${C}/models-in`, { supplier: 'retailer', retailer: v('models.retailer', 120), carrier: v('models.carrier', 80), tracking: values['models.tracking'], note: v('models.note', 2000), figures: [{ figureId: figure.id, received: 1, damaged: true, note: v('models.figure.note', 300) }] }),
    'models in',
  );
  await ok(owner.post(`${C}/models-in/notice`, { message: v('models.notice', 4000) }), 'models notice');
  const shipment = await ok(owner.post(`${C}/shipments`, {}), 'shipment');
  await ok(
    owner.patch(`${C}/shipments/${shipment.id}`, {
      shipTo: { name: v('ship.name', 120), line1: v('ship.line1', 200), city: v('ship.city', 100) },
      carrier: v('shipment.carrier', 80),
      tracking: values['shipment.tracking'],
      customsText: v('shipment.customs', 2000),
      checklist: [{ label: v('shipment.check', 200), done: false }],
    }),
    'shipment details',
  );

  // A second commission whose title tries to break lines in mail headers and calendar entries
  values['commission2.title'] = lineBreaker('commission2.title');
  const c2 = await ok(owner.post(`${S}/commissions`, { clientId, title: values['commission2.title'], dueDate: '2026-10-15', figures: [{ name: 'Reed heron', quantity: 1, sizeClass: '32', tier: 'tabletop' }] }), 'commission 2');
  await ok(owner.post(`${S}/commissions/${c2.id}/comments`, { body: 'A note so the client hears of it.' }), 'comment on commission 2');
  for (const to of ['quoted', 'booked']) await ok(owner.post(`${S}/commissions/${c2.id}/transitions`, { to }), `commission 2 ${to}`);

  // The public page: one enquiry kept, one declined with a hostile message
  const visitor = io.caller();
  const enquiryBody = (email: string, tag: string) => ({ name: v(`${tag}.name`, 120), email, figures: [{ name: v(`${tag}.figure`, 120), quantity: 2, sizeClass: '32' }], notes: v(`${tag}.notes`, 4000), consent: true });
  await ok(visitor.post(`/api/public/studios/${slug}/enquiries`, enquiryBody(io.visitorEmail, 'enquiry')), 'enquiry');
  await ok(visitor.post(`/api/public/studios/${slug}/enquiries`, enquiryBody(io.declinedEmail, 'enquiry2')), 'enquiry 2');
  const inbox = await ok(owner.get(`${S}/enquiries`), 'enquiries');
  const byEmail = (e: string) => (inbox.items as { id: number; email: string }[]).find((x) => x.email === e)!.id;
  const enquiryId = byEmail(io.visitorEmail);
  await ok(owner.post(`${S}/enquiries/${byEmail(io.declinedEmail)}/decline`, { message: v('enquiry.decline', 4000) }), 'decline');

  return { owner, client, studioId, slug, clientId, commissionId, commission2Id: c2.id as number, figureId: figure.id, recipeId: recipe.id as number, paintId: paint.id as number, invoiceId: invoice.id as number, quoteId: q2.id as number, enquiryId, values };
}
