import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, twoStudios, withQueries, type TestApp } from '../support/app';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let A: string; // studio A's API prefix
let painterAId: number;

const goblins = { name: 'Bog-lantern goblins', quantity: 10, sizeClass: '25', tier: 'tabletop', extras: ['magnetising'], subAssemblies: [], lightSource: 'top left' };

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  A = `/api/studios/${s.a.studioId}`;
  painterAId = (await s.a.painter.get('/api/auth/me')).body.user.id;
});
afterAll(() => sw.stop());

async function newCommission(body: Record<string, unknown> = {}) {
  const res = await s.a.owner.post(`${A}/commissions`, { clientId: s.a.clientId, title: 'Marsh warband', ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body;
}

async function moveTo(id: number, ...steps: string[]) {
  let res;
  for (const to of steps) {
    res = await s.a.owner.post(`${A}/commissions/${id}/transitions`, { to, ...(to === 'cancelled' ? { reason: 'client asked' } : {}) });
    expect(res.status, `${to}: ${JSON.stringify(res.body)}`).toBe(200);
  }
  return res!.body;
}

describe('creating commissions and figures', () => {
  it('creates a commission with figures whose stages are copied from the studio template', async () => {
    const c = await newCommission({
      brief: 'Muted greens, warm bone.',
      dueDate: '2026-05-31',
      priority: 'high',
      figures: [goblins, { name: 'Fen troll', quantity: 1, sizeClass: 'large', footprint: '80 × 60 mm', tier: 'display', painterId: painterAId }],
    });
    expect(c).toMatchObject({ status: 'enquiry', priority: 'high', dueDate: '2026-05-31', brief: 'Muted greens, warm bone.', figureCount: 2, modelCount: 11, client: { id: s.a.clientId, name: 'Client a' } });
    expect(c.allowedTransitions).toEqual(['quoted', 'cancelled', 'on_hold']);
    const template = (await s.a.owner.get(`${A}/stage-template`)).body;
    const [g, troll] = c.figures;
    expect(g.stages.map((st: { key: string }) => st.key)).toEqual(template.map((t: { key: string }) => t.key));
    // estimate = template default hours × quantity
    for (const [i, st] of g.stages.entries()) expect(st.estimateHours).toBeCloseTo(template[i].defaultHours * 10, 2);
    expect(g.stages.every((st: { status: string }) => st.status === 'todo')).toBe(true);
    expect(g.currentStageId).toBe(g.stages[0].id);
    expect(g.extras).toEqual(['magnetising']);
    expect(g.lightSource).toBe('top left');
    expect(troll).toMatchObject({ sizeClass: 'large', footprint: '80 × 60 mm', painter: { id: painterAId, name: 'Painter a' } });
    expect(g.stages.find((st: { key: string }) => st.key === 'prime').hazards).toEqual(['spray']);
    expect(g.stages.find((st: { key: string }) => st.key === 'basecoat').hazards).toEqual([]);
    expect(c.progress).toEqual({ stagesDone: 0, stagesTotal: 22, hoursDone: 0, hoursTotal: c.progress.hoursTotal, share: 0 });
  });

  it('answers field messages for bad input, never a 500', async () => {
    const bad = await s.a.owner.post(`${A}/commissions`, { clientId: 'x', title: '', dueDate: '2026-02-30', priority: 'urgent', figures: [{ name: '', quantity: 0, sizeClass: '27' }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toMatchObject({
      clientId: expect.any(String),
      title: 'Enter a title.',
      dueDate: 'Use a date such as 2026-05-31.',
      priority: 'Choose low, normal or high.',
      'figures.0.name': 'Enter a name for the figure.',
      'figures.0.quantity': 'At least 1.',
      'figures.0.sizeClass': 'Choose a base size, or large/vehicle.',
    });
    const large = await s.a.owner.post(`${A}/commissions`, { clientId: s.a.clientId, title: 'X', figures: [{ ...goblins, sizeClass: 'large' }] });
    expect(large.status).toBe(400);
    expect(large.body.error.fields['figures.0.footprint']).toMatch(/footprint/);
    for (const body of [null, [], 'text', { title: { nested: true } }, { clientId: 1e300, title: 'x' }]) {
      const r = await s.a.owner.agent.post(`${A}/commissions`).set('x-csrf-token', await s.a.owner.csrf()).set('content-type', 'application/json').send(JSON.stringify(body));
      expect([400], JSON.stringify(body)).toContain(r.status);
    }
  });

  it("checks tier, extras and painter against the studio's own lists and team", async () => {
    const other = await s.b.owner.get('/api/auth/me');
    const res = await s.a.owner.post(`${A}/commissions`, {
      clientId: s.a.clientId,
      title: 'Refs',
      figures: [{ ...goblins, tier: 'gold', extras: ['magnetising', 'glitter'], painterId: other.body.user.id }],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({
      'figures.0.tier': "Choose one of the studio's tiers: Tabletop, Enhanced, Display.",
      'figures.0.extras.1': "“glitter” is not one of the studio's extras.",
      'figures.0.painterId': 'Choose a painter or owner of this studio.',
    });
    // nothing half-made was left behind
    expect(await sw.db('commissions').where({ title: 'Refs' }).first()).toBeUndefined();
    // a client of another studio is no client of this one
    const wrongClient = await s.a.owner.post(`${A}/commissions`, { clientId: s.b.clientId, title: 'Nope' });
    expect(wrongClient.status).toBe(400);
    expect(wrongClient.body.error.fields).toEqual({ clientId: 'Choose a client of this studio.' });
  });

  it('adds, edits and removes figures; a new quantity scales the estimates', async () => {
    const c = await newCommission();
    const add = await s.a.owner.post(`${A}/commissions/${c.id}/figures`, goblins);
    expect(add.status).toBe(201);
    const before = add.body.stages.map((st: { estimateHours: number }) => st.estimateHours);
    const edit = await s.a.owner.patch(`${A}/figures/${add.body.id}`, { quantity: 5, tier: 'enhanced', painterId: painterAId, subAssemblies: ['standard bearer'] });
    expect(edit.status).toBe(200);
    expect(edit.body).toMatchObject({ quantity: 5, tier: 'enhanced', painter: { id: painterAId }, subAssemblies: ['standard bearer'] });
    edit.body.stages.forEach((st: { estimateHours: number }, i: number) => expect(st.estimateHours).toBeCloseTo(before[i] / 2, 1));
    const toLarge = await s.a.owner.patch(`${A}/figures/${add.body.id}`, { sizeClass: 'large' });
    expect(toLarge.status).toBe(400);
    expect(toLarge.body.error.fields.footprint).toBeDefined();
    expect((await s.a.owner.delete(`${A}/figures/${add.body.id}`)).status).toBe(204);
    expect((await s.a.owner.get(`${A}/commissions/${c.id}`)).body.figures).toEqual([]);
    expect((await s.a.owner.patch(`${A}/figures/${add.body.id}`, { name: 'Gone' })).status).toBe(404);
  });
});

describe('lifecycle through the API', () => {
  it('walks enquiry → closed and refuses skipping ahead with 409 naming the allowed moves', async () => {
    const c = await newCommission();
    const refused = await s.a.owner.post(`${A}/commissions/${c.id}/transitions`, { to: 'shipped' });
    expect(refused.status).toBe(409);
    expect(refused.body.error).toEqual({
      code: 'invalid_transition',
      message: 'A commission that is Enquiry cannot move to Shipped. It can move to Quoted, Cancelled or On hold.',
      allowed: ['quoted', 'cancelled', 'on_hold'],
    });
    await moveTo(c.id, 'quoted', 'booked', 'on_bench', 'ready_to_ship', 'on_bench', 'ready_to_ship');
    // No balance has been paid (this commission was never quoted), so the parcel may leave only
    // through the shipping section with the owner's logged reason.
    const unpaid = await s.a.owner.post(`${A}/commissions/${c.id}/transitions`, { to: 'shipped' });
    expect(unpaid.status).toBe(409);
    expect(unpaid.body.error.code).toBe('balance_unpaid');
    const shipment = await s.a.owner.post(`${A}/commissions/${c.id}/shipments`);
    expect(shipment.status).toBe(201);
    const parcel = await s.a.owner.patch(`${A}/commissions/${c.id}/shipments/${shipment.body.id}`, {
      carrier: 'Heron Parcel Post',
      tracking: 'HPP-0042',
      shipTo: { name: 'Client a', line1: 'Reedway 4', city: 'Saltmarsh', postalCode: '1234', country: 'DE' },
    });
    expect(parcel.status, JSON.stringify(parcel.body)).toBe(200);
    const shipped = await s.a.owner.post(`${A}/commissions/${c.id}/shipments/${shipment.body.id}/ship`, { overrideUnpaid: true, overrideReason: 'Paid in person at the fair' });
    expect(shipped.status, JSON.stringify(shipped.body)).toBe(200);
    const end = await moveTo(c.id, 'closed');
    expect(end.status).toBe('closed');
    expect(end.allowedTransitions).toEqual([]);
    const again = await s.a.owner.post(`${A}/commissions/${c.id}/transitions`, { to: 'enquiry' });
    expect(again.status).toBe(409);
    expect(again.body.error.allowed).toEqual([]);
    // figures of a closed commission no longer change
    const locked = await s.a.owner.post(`${A}/commissions/${c.id}/figures`, goblins);
    expect(locked.status).toBe(409);
    expect(locked.body.error.code).toBe('commission_locked');
  });

  it('on hold remembers where it came from and goes back only there', async () => {
    const c = await newCommission();
    const held = await moveTo(c.id, 'quoted', 'booked', 'on_hold');
    expect(held).toMatchObject({ status: 'on_hold', statusBeforeHold: 'booked', allowedTransitions: ['booked', 'cancelled'] });
    const wrong = await s.a.owner.post(`${A}/commissions/${c.id}/transitions`, { to: 'on_bench' });
    expect(wrong.status).toBe(409);
    expect(wrong.body.error.allowed).toEqual(['booked', 'cancelled']);
    const back = await moveTo(c.id, 'booked');
    expect(back).toMatchObject({ status: 'booked', statusBeforeHold: null });
  });

  it('cancelling needs a reason and keeps it', async () => {
    const c = await newCommission();
    const noReason = await s.a.owner.post(`${A}/commissions/${c.id}/transitions`, { to: 'cancelled' });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fields).toEqual({ reason: 'Give a reason for cancelling.' });
    const done = await s.a.owner.post(`${A}/commissions/${c.id}/transitions`, { to: 'cancelled', reason: 'Client moved abroad' });
    expect(done.status).toBe(200);
    expect(done.body).toMatchObject({ status: 'cancelled', cancelReason: 'Client moved abroad', allowedTransitions: [] });
    const unknown = await s.a.owner.post(`${A}/commissions/${c.id}/transitions`, { to: 'painted' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields.to).toBe('Choose the status to move to.');
  });
});

describe('activity log', () => {
  it('records who did what, with a readable summary, newest first', async () => {
    const c = await newCommission({ figures: [goblins] });
    await s.a.owner.patch(`${A}/commissions/${c.id}`, { title: 'Marsh warband II', dueDate: '2026-06-01' });
    await moveTo(c.id, 'quoted');
    const stage = c.figures[0].stages[0];
    await s.a.painter.patch(`${A}/stages/${stage.id}`, { status: 'done' });
    await s.a.client.patch(`${A}/commissions/${c.id}/scheme-notes`, { schemeNotes: 'Lanterns glow teal, please.' });
    await s.a.owner.delete(`${A}/figures/${c.figures[0].id}`);
    const res = await s.a.painter.get(`${A}/commissions/${c.id}/activity`);
    expect(res.status).toBe(200);
    expect(res.body.map((e: { action: string }) => e.action)).toEqual([
      'figure.removed',
      'commission.scheme_notes',
      'stage.status',
      'commission.status',
      'commission.updated',
      'figure.added',
      'commission.created',
    ]);
    const summaries = res.body.map((e: { summary: string }) => e.summary);
    expect(summaries).toEqual([
      'Test Person removed “Bog-lantern goblins”.',
      'Client a updated the scheme notes.',
      'Painter a marked Prep & clean of “Bog-lantern goblins” done.',
      'Test Person moved the commission from Enquiry to Quoted.',
      'Test Person changed the title and the due date (— → 2026-06-01).',
      'Test Person added 10 × “Bog-lantern goblins”.',
      'Test Person created the commission “Marsh warband”.',
    ]);
    expect(res.body[2]).toMatchObject({ user: { id: painterAId, name: 'Painter a' }, at: expect.stringMatching(/^\d{4}-\d\d-\d\dT/) });
    expect((await s.a.owner.get(`${A}/commissions/${c.id}`)).body.schemeNotes).toBe('Lanterns glow teal, please.');
  });
});

describe('who sees what', () => {
  it('a client lists and reads only their own commissions, without studio-only data', async () => {
    const other = await s.a.owner.post(`${A}/clients`, { name: 'Someone else' });
    const theirs = await newCommission({ clientId: other.body.id, title: 'Not yours' });
    const mine = await newCommission({ title: 'Yours', figures: [goblins] });
    const list = await s.a.client.get(`${A}/commissions?limit=200`);
    expect(list.status).toBe(200);
    expect(list.body.items.length).toBeGreaterThan(0);
    expect(list.body.items.every((c: { client: { id: number } }) => c.client.id === s.a.clientId)).toBe(true);
    expect(list.body.items.some((c: { id: number }) => c.id === theirs.id)).toBe(false);
    expect((await s.a.client.get(`${A}/commissions/${theirs.id}`)).status).toBe(404);
    expect((await s.a.client.patch(`${A}/commissions/${theirs.id}/scheme-notes`, { schemeNotes: 'x' })).status).toBe(404);
    const own = await s.a.client.get(`${A}/commissions/${mine.id}`);
    expect(own.status).toBe(200);
    expect(own.body.loggedHours).toBeNull();
    expect(own.body.figures[0].loggedHours).toBeNull();
    expect(own.body.figures[0].stages[0].loggedHours).toBeNull();
    expect((await s.a.client.get(`${A}/commissions/${mine.id}/activity`)).status).toBe(403);
    expect((await s.a.client.get(`${A}/stages/${mine.figures[0].stages[0].id}/time`)).status).toBe(403);
    // the owner filtering by the other client sees only theirs
    const filtered = await s.a.owner.get(`${A}/commissions?clientId=${other.body.id}`);
    expect(filtered.body.items.map((c: { id: number }) => c.id)).toEqual([theirs.id]);
  });

  it("another studio's members get 404 for this studio's commissions, figures and stages, by either path", async () => {
    const c = await newCommission({ figures: [goblins] });
    const fig = c.figures[0];
    const B = `/api/studios/${s.b.studioId}`;
    expect((await s.b.owner.post(`${B}/commissions/${c.id}/transitions`, { to: 'quoted' })).status).toBe(404);
    for (const caller of [s.b.owner, s.b.painter]) {
      expect((await caller.get(`${B}/commissions/${c.id}`)).status).toBe(404);
      expect((await caller.patch(`${B}/stages/${fig.stages[0].id}`, { status: 'done' })).status).toBe(404);
      expect((await caller.post(`${B}/figures/${fig.id}/advance`)).status).toBe(404);
      expect((await caller.post(`${B}/stages/${fig.stages[0].id}/timer`)).status).toBe(404);
      expect((await caller.post(`${B}/stages/${fig.stages[0].id}/time`, { hours: 1 })).status).toBe(404);
      expect((await caller.patch(`${A}/stages/${fig.stages[0].id}`, { status: 'done' })).status).toBe(404);
    }
    expect((await s.b.owner.patch(`${B}/figures/${fig.id}`, { name: 'Stolen' })).status).toBe(404);
    expect((await s.b.owner.delete(`${B}/figures/${fig.id}`)).status).toBe(404);
    const after = await s.a.owner.get(`${A}/commissions/${c.id}`);
    expect(after.body.status).toBe('enquiry');
    expect(after.body.figures[0].name).toBe('Bog-lantern goblins');
    expect(after.body.figures[0].stages.every((st: { status: string }) => st.status === 'todo')).toBe(true);
    const blist = await s.b.owner.get(`${B}/commissions`);
    expect(blist.body.items.some((x: { id: number }) => x.id === c.id)).toBe(false);
  });

  it('a painter works the bench but cannot create, edit or move commissions', async () => {
    const c = await newCommission();
    expect((await s.a.painter.post(`${A}/commissions`, { clientId: s.a.clientId, title: 'Mine' })).status).toBe(403);
    expect((await s.a.painter.patch(`${A}/commissions/${c.id}`, { title: 'Mine' })).status).toBe(403);
    expect((await s.a.painter.post(`${A}/commissions/${c.id}/transitions`, { to: 'quoted' })).status).toBe(403);
    expect((await s.a.painter.post(`${A}/commissions/${c.id}/figures`, goblins)).status).toBe(403);
    expect((await s.a.painter.get(`${A}/commissions/${c.id}`)).status).toBe(200);
  });
});

describe('the list', () => {
  it('shows the same progress as the detail, filters by status and text, and pages', async () => {
    const c = await newCommission({ title: 'Progress check', figures: [goblins, { ...goblins, name: 'Lantern bearers', quantity: 2 }] });
    const [g] = c.figures;
    await s.a.owner.patch(`${A}/stages/${g.stages[0].id}`, { status: 'done' });
    await s.a.owner.patch(`${A}/stages/${g.stages[1].id}`, { status: 'skipped' });
    await moveTo(c.id, 'quoted', 'booked');
    const detail = (await s.a.owner.get(`${A}/commissions/${c.id}`)).body;
    const list = await s.a.owner.get(`${A}/commissions?status=booked,on_bench&q=progress`);
    expect(list.body.items).toHaveLength(1);
    const row = list.body.items[0];
    expect(row.progress).toEqual(detail.progress);
    expect(row).toMatchObject({ id: c.id, figureCount: 2, modelCount: 12, status: 'booked' });
    // one done stage of the 10 goblins; skipped leaves the total
    expect(detail.progress.stagesDone).toBe(1);
    expect(detail.progress.stagesTotal).toBe(21);
    expect(detail.progress.hoursDone).toBe(g.stages[0].estimateHours);
    const page = await s.a.owner.get(`${A}/commissions?limit=2&offset=1`);
    expect(page.body).toMatchObject({ limit: 2, offset: 1 });
    expect(page.body.items).toHaveLength(2);
    expect(page.body.total).toBeGreaterThan(3);
    expect((await s.a.owner.get(`${A}/commissions?status=nope`)).status).toBe(400);
  });

  it('reads the page in a fixed number of queries, however many commissions it holds', async () => {
    const count = async (limit: number) => {
      const { sql } = await withQueries(sw.db, () => s.a.owner.get(`${A}/commissions?limit=${limit}`).expect(200));
      return sql.filter((q) => /commissions/.test(q)).length;
    };
    const one = await count(1);
    const many = await count(200);
    expect(many).toBe(one);
    expect(many).toBeLessThanOrEqual(2);
  });
});
