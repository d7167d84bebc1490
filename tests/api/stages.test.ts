import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { HOUR } from '../../server/lib/clock';
import { SAFETY_FOOTER } from '../../shared/hazards';
import { signUp, startTestApp, twoStudios, type TestApp } from '../support/app';

let sw: TestApp;
let s: Awaited<ReturnType<typeof twoStudios>>;
let A: string;
let painterAId: number;
let ownerAId: number;

type Stage = { id: number; key: string; name: string; status: string; estimateHours: number; doneBy: { id: number } | null; doneAt: string | null; waitUntil: string | null; hazards: string[] };
type Figure = { id: number; stages: Stage[]; progress: { share: number; hoursDone: number; hoursTotal: number; stagesDone: number; stagesTotal: number }; currentStageId: number | null };

const fig = (name: string, extra: Record<string, unknown> = {}) => ({ name, quantity: 1, sizeClass: '28', tier: 'tabletop', ...extra });

beforeAll(async () => {
  sw = await startTestApp();
  s = await twoStudios(sw);
  A = `/api/studios/${s.a.studioId}`;
  painterAId = (await s.a.painter.get('/api/auth/me')).body.user.id;
  ownerAId = (await s.a.owner.get('/api/auth/me')).body.user.id;
});
afterAll(() => sw.stop());

async function commission(status: string[], figures: Record<string, unknown>[], extra: Record<string, unknown> = {}) {
  const c = await s.a.owner.post(`${A}/commissions`, { clientId: s.a.clientId, title: 'Stage test', figures, ...extra });
  expect(c.status, JSON.stringify(c.body)).toBe(201);
  for (const to of status) expect((await s.a.owner.post(`${A}/commissions/${c.body.id}/transitions`, { to })).status).toBe(200);
  return c.body as { id: number; figures: Figure[] };
}

describe('a new studio', () => {
  it('starts with the default stage template, tiers, extras and hazard texts', async () => {
    const o = await signUp(sw, { email: 'fresh@studio.test', studioName: 'Fresh Studio' });
    const base = `/api/studios/${o.studioId}`;
    const template = (await o.caller.get(`${base}/stage-template`)).body;
    expect(template.map((t: { name: string }) => t.name)).toEqual([
      'Prep & clean',
      'Assembly',
      'Prime',
      'Basecoat',
      'Shade',
      'Layer & highlight',
      'Glaze',
      'Details',
      'Basing',
      'Weathering',
      'Varnish',
    ]);
    expect(template.find((t: { key: string }) => t.key === 'prime')).toMatchObject({ waitHours: 2, hazards: ['spray'] });
    expect(template.find((t: { key: string }) => t.key === 'varnish')).toMatchObject({ waitHours: 24, hazards: ['spray'] });
    const lists = (await o.caller.get(`${base}/lists`)).body;
    expect(lists.tiers.map((t: { label: string }) => t.label)).toEqual(['Tabletop', 'Enhanced', 'Display']);
    expect(lists.extras.map((t: { label: string }) => t.label)).toEqual([
      'Assembly',
      'Conversion',
      'Magnetising',
      'Freehand',
      'Non-metallic metal',
      'Light effects',
      'Weathering',
      'Display base',
    ]);
    const hazards = (await o.caller.get(`${base}/hazards`)).body;
    expect(hazards.map((h: { key: string }) => h.key)).toEqual(['spray', 'solvent', 'resin', 'pigment', 'superglue']);
    for (const h of hazards) expect(h.text.endsWith(SAFETY_FOOTER)).toBe(true);
    expect(hazards.find((h: { key: string }) => h.key === 'superglue').text).toMatch(/15 minutes/);
  });
});

describe('studio settings', () => {
  it('the owner edits the template; figures added later use it, earlier ones keep their copy', async () => {
    const before = await commission([], [fig('Early')]);
    const put = await s.a.owner.put(`${A}/stage-template`, {
      stages: [
        { name: 'Wash & prime', defaultHours: 0.5, waitHours: 2, hazards: ['spray', 'spray'] },
        { key: 'paint', name: 'Paint', defaultHours: 2, waitHours: 0, hazards: [] },
        { name: 'Varnish', defaultHours: 0.25, waitHours: 24, hazards: ['spray'] },
      ],
    });
    expect(put.status).toBe(200);
    expect(put.body.map((t: { key: string }) => t.key)).toEqual(['wash-prime', 'paint', 'varnish']);
    expect(put.body[0].hazards).toEqual(['spray']);
    const after = await s.a.owner.post(`${A}/commissions/${before.id}/figures`, fig('Late', { quantity: 3 }));
    expect(after.body.stages.map((x: Stage) => [x.name, x.estimateHours])).toEqual([
      ['Wash & prime', 1.5],
      ['Paint', 6],
      ['Varnish', 0.75],
    ]);
    const early = (await s.a.owner.get(`${A}/commissions/${before.id}`)).body.figures[0];
    expect(early.stages).toHaveLength(11);
    const dup = await s.a.owner.put(`${A}/stage-template`, { stages: [{ key: 'a', name: 'A', defaultHours: 1, waitHours: 0, hazards: [] }, { key: 'a', name: 'B', defaultHours: 1, waitHours: 0, hazards: [] }] });
    expect(dup.status).toBe(400);
    expect(dup.body.error.fields).toEqual({ 'stages.1.key': 'Another item in this list already uses this key.' });
    const bad = await s.a.owner.put(`${A}/stage-template`, { stages: [{ name: '', defaultHours: -1, waitHours: 'x', hazards: ['lava'] }] });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['stages.0.defaultHours', 'stages.0.hazards.0', 'stages.0.name', 'stages.0.waitHours']);
    expect((await s.a.painter.put(`${A}/stage-template`, { stages: [] })).status).toBe(403);
  });

  it('the owner edits tiers and extras; figures are checked against the new lists', async () => {
    const put = await s.a.owner.put(`${A}/lists`, { tiers: [{ key: 'tabletop', label: 'Table' }, { label: 'Showcase' }], extras: [{ label: 'Freehand banner' }] });
    expect(put.status).toBe(200);
    expect(put.body).toEqual({ tiers: [{ key: 'tabletop', label: 'Table' }, { key: 'showcase', label: 'Showcase' }], extras: [{ key: 'freehand-banner', label: 'Freehand banner' }] });
    expect((await s.a.client.get(`${A}/lists`)).body).toEqual(put.body);
    const c = await commission([], []);
    const ok = await s.a.owner.post(`${A}/commissions/${c.id}/figures`, fig('Banner', { tier: 'showcase', extras: ['freehand-banner'] }));
    expect(ok.status).toBe(201);
    const gone = await s.a.owner.post(`${A}/commissions/${c.id}/figures`, fig('Old', { tier: 'display', extras: ['magnetising'] }));
    expect(gone.status).toBe(400);
    expect(Object.keys(gone.body.error.fields).sort()).toEqual(['extras.0', 'tier']);
    expect((await s.a.owner.put(`${A}/lists`, { tiers: [], extras: [] })).body.error.fields).toEqual({ tiers: 'Keep at least one tier.' });
    // put the defaults back for the tests below
    await s.a.owner.put(`${A}/lists`, {
      tiers: [{ key: 'tabletop', label: 'Tabletop' }, { key: 'enhanced', label: 'Enhanced' }, { key: 'display', label: 'Display' }],
      extras: [{ key: 'magnetising', label: 'Magnetising' }],
    });
    // a tier or extra removed from the lists may stay on a figure that has it, but is not given anew
    const kept = await s.a.owner.patch(`${A}/figures/${ok.body.id}`, { name: 'Banner II', tier: 'showcase', extras: ['freehand-banner', 'magnetising'] });
    expect(kept.status).toBe(200);
    expect(kept.body).toMatchObject({ name: 'Banner II', tier: 'showcase', extras: ['freehand-banner', 'magnetising'] });
    const added = await s.a.owner.patch(`${A}/figures/${ok.body.id}`, { extras: ['freehand-banner', 'glitter'] });
    expect(added.status).toBe(400);
    expect(added.body.error.fields).toEqual({ 'extras.1': "“glitter” is not one of the studio's extras." });
  });

  it('the owner edits hazard texts; the closing sentence stays, once', async () => {
    const current = (await s.a.owner.get(`${A}/hazards`)).body;
    const spray = current.find((h: { key: string }) => h.key === 'spray');
    const put = await s.a.owner.put(`${A}/hazards`, [{ ...spray, title: 'Spraying', text: `Use the booth by the window. ${SAFETY_FOOTER}` }]);
    expect(put.status).toBe(200);
    expect(put.body.find((h: { key: string }) => h.key === 'spray')).toEqual({ key: 'spray', title: 'Spraying', text: `Use the booth by the window. ${SAFETY_FOOTER}` });
    expect(put.body).toHaveLength(5);
    expect((await s.a.owner.put(`${A}/hazards`, [{ key: 'lava', title: 'x', text: 'y' }])).status).toBe(400);
    expect((await s.a.owner.put(`${A}/hazards`, [{ key: 'spray', title: 'x', text: SAFETY_FOOTER }])).body.error.fields).toEqual({
      '0.text': 'Write the caution itself; the closing sentence is added for you.',
    });
    expect((await s.a.painter.put(`${A}/hazards`, current)).status).toBe(403);
    expect((await s.a.client.get(`${A}/hazards`)).status).toBe(200);
  });
});

describe('stage status', () => {
  it('done records who and when, starts the wait, and moves the current stage on; leaving done clears them', async () => {
    const c = await commission(['quoted', 'booked'], [fig('Marsh hag')]);
    const f = c.figures[0];
    const [first, second, third] = f.stages;
    const done = await s.a.painter.patch(`${A}/stages/${first.id}`, { status: 'done' });
    expect(done.status).toBe(200);
    expect(done.body).toMatchObject({ status: 'done', doneBy: { id: painterAId, name: 'Painter a' }, doneAt: sw.clock.now().toISOString() });
    // the first stage of the edited template waits 2 h
    expect(done.body.waitUntil).toBe(new Date(sw.clock.now().getTime() + 2 * HOUR).toISOString());
    const fview = (await s.a.owner.get(`${A}/commissions/${c.id}`)).body.figures[0];
    expect(fview.currentStageId).toBe(second.id);
    expect((await s.a.owner.patch(`${A}/stages/${second.id}`, { status: 'skipped' })).body.status).toBe('skipped');
    expect((await s.a.owner.get(`${A}/commissions/${c.id}`)).body.figures[0].currentStageId).toBe(third.id);
    const undone = await s.a.owner.patch(`${A}/stages/${first.id}`, { status: 'todo' });
    expect(undone.body).toMatchObject({ status: 'todo', doneBy: null, doneAt: null, waitUntil: null });
    const bad = await s.a.owner.patch(`${A}/stages/${first.id}`, { status: 'finished', estimateHours: -2 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toEqual({ status: 'Choose to do, working, done or skipped.', estimateHours: 'Hours cannot be negative.' });
    expect((await s.a.client.patch(`${A}/stages/${first.id}`, { status: 'done' })).status).toBe(403);
  });

  it('progress follows the estimated hours of done stages; skipped stages leave the total', async () => {
    const c = await commission(['quoted', 'booked'], [fig('Bog hound', { quantity: 2 })]);
    const [a, b, v] = c.figures[0].stages; // 1, 4 and 0.5 hours after the quantity of 2
    expect([a.estimateHours, b.estimateHours, v.estimateHours]).toEqual([1, 4, 0.5]);
    await s.a.owner.patch(`${A}/stages/${a.id}`, { status: 'done' });
    let f = (await s.a.owner.get(`${A}/commissions/${c.id}`)).body.figures[0] as Figure;
    expect(f.progress).toEqual({ stagesDone: 1, stagesTotal: 3, hoursDone: 1, hoursTotal: 5.5, share: 0.182 });
    await s.a.owner.patch(`${A}/stages/${b.id}`, { status: 'skipped', estimateHours: 3 });
    const detail = (await s.a.owner.get(`${A}/commissions/${c.id}`)).body;
    f = detail.figures[0];
    expect(f.progress).toEqual({ stagesDone: 1, stagesTotal: 2, hoursDone: 1, hoursTotal: 1.5, share: 0.667 });
    expect(detail.progress).toEqual(f.progress);
    const act = (await s.a.owner.get(`${A}/commissions/${c.id}/activity`)).body;
    expect(act.find((e: { action: string }) => e.action === 'stage.updated').summary).toBe('Test Person changed the estimate of Paint of “Bog hound” (4 h → 3 h).');
  });

  it('advance marks the current stage done until none is left', async () => {
    const c = await commission(['quoted', 'booked'], [fig('Wisp')]);
    const f = c.figures[0];
    let r = await s.a.painter.post(`${A}/figures/${f.id}/advance`);
    expect(r.status).toBe(200);
    expect(r.body.stages[0]).toMatchObject({ status: 'done', doneBy: { id: painterAId } });
    expect(r.body.currentStageId).toBe(f.stages[1].id);
    await s.a.painter.post(`${A}/figures/${f.id}/advance`);
    r = await s.a.owner.post(`${A}/figures/${f.id}/advance`);
    expect(r.body.currentStageId).toBeNull();
    expect(r.body.progress.share).toBe(1);
    expect(r.body.stages[2].doneBy.id).toBe(ownerAId);
    const none = await s.a.owner.post(`${A}/figures/${f.id}/advance`);
    expect(none.status).toBe(409);
    expect(none.body.error.code).toBe('no_stage_left');
  });
});

describe('bench board', () => {
  it('groups figures of booked and on-the-bench commissions by their current stage, with a done column last', async () => {
    const onBench = await commission(['quoted', 'booked', 'on_bench'], [fig('Board A', { painterId: painterAId }), fig('Board B')], { dueDate: '2026-04-01', title: 'Board bench' });
    const enquiry = await commission([], [fig('Board hidden')]);
    const [fa, fb] = onBench.figures;
    await s.a.painter.post(`${A}/figures/${fa.id}/advance`);
    for (let i = 0; i < 3; i++) await s.a.painter.post(`${A}/figures/${fb.id}/advance`);

    const board = await s.a.painter.get(`${A}/board?commissionId=${onBench.id}`);
    expect(board.status).toBe(200);
    const cols = board.body.columns as { key: string; name: string; cards: { figureId: number; stage: { id: number; waitUntil: string | null; hazards: string[] } | null; painter: { id: number } | null; progress: { share: number } }[] }[];
    expect(cols.map((c) => c.key)).toEqual(['wash-prime', 'paint', 'varnish', 'done']);
    expect(cols.map((c) => c.cards.map((k) => k.figureId))).toEqual([[], [fa.id], [], [fb.id]]);
    const card = cols[1].cards[0];
    expect(card).toMatchObject({ figureName: 'Board A', quantity: 1, commission: { id: onBench.id, title: 'Board bench', dueDate: '2026-04-01' }, painter: { id: painterAId } });
    // the figure is still drying from its 2 h wait after "Wash & prime"
    expect(card.stage).toMatchObject({ id: fa.stages[1].id, name: 'Paint', status: 'todo', hazards: [] });
    expect(card.stage!.waitUntil).toBe(new Date(sw.clock.now().getTime() + 2 * HOUR).toISOString());
    expect(cols[3].cards[0].stage).toBeNull();
    expect(cols[3].cards[0].progress.share).toBe(1);

    const all = await s.a.owner.get(`${A}/board`);
    const ids = all.body.columns.flatMap((c: { cards: { figureId: number }[] }) => c.cards.map((k) => k.figureId));
    expect(ids).not.toContain(enquiry.figures[0].id);

    const mine = await s.a.owner.get(`${A}/board?painterId=${painterAId}&commissionId=${onBench.id}`);
    expect(mine.body.columns.flatMap((c: { cards: { figureId: number }[] }) => c.cards.map((k) => k.figureId))).toEqual([fa.id]);
    const early = await s.a.owner.get(`${A}/board?dueBefore=2026-03-31&commissionId=${onBench.id}`);
    expect(early.body.columns.every((c: { cards: unknown[] }) => c.cards.length === 0)).toBe(true);
    const due = await s.a.owner.get(`${A}/board?dueBefore=2026-04-01&commissionId=${onBench.id}`);
    expect(due.body.columns.flatMap((c: { cards: unknown[] }) => c.cards)).toHaveLength(2);

    sw.clock.advance(3 * HOUR);
    const later = await s.a.owner.get(`${A}/board?commissionId=${onBench.id}`);
    expect(later.body.columns[1].cards[0].stage.waitUntil).toBeNull();

    expect((await s.a.owner.get(`${A}/board?dueBefore=soon`)).status).toBe(400);
    expect((await s.a.client.get(`${A}/board`)).status).toBe(403);
  });
});
