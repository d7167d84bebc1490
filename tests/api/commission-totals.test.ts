import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { progressFromTotals } from '../../shared/commission-lifecycle';
import { down, up } from '../../migrations/20270120120000-commission-totals';
import { startTestApp, type TestApp } from '../support/app';
import { acceptedQuote, commission, invoicesOf, moneyStudios, type Side } from './money-flow';

/**
 * The commission list reads each commission's figure and stage totals from columns that triggers on
 * `figures` and `stages` keep (migrations/20270120120000-commission-totals.ts). After every kind of change
 * the API makes, and after changes made in SQL past the API, the columns must equal the totals summed
 * afresh from the rows, and the list (owner's and client's) must show them.
 */

let sw: TestApp;
let a: Side;
let b: Side;
const A = () => `/api/studios/${a.studioId}`;

beforeAll(async () => {
  sw = await startTestApp();
  ({ a, b } = await moneyStudios(sw));
});
afterAll(() => sw?.stop());

type Totals = { figure_count: number; model_count: number; stage_count: number; stages_skipped: number; stages_done: number; minutes_total: number; minutes_done: number };
const zero = (): Totals => ({ figure_count: 0, model_count: 0, stage_count: 0, stages_skipped: 0, stages_done: 0, minutes_total: 0, minutes_done: 0 });
const totalColumns = Object.keys(zero()) as (keyof Totals)[];

type Stage = { id: number; key: string; status: string; estimateHours: number };
type Figure = { id: number; quantity: number; stages: Stage[] };
type Summary = { id: number; figureCount: number; modelCount: number; progress: unknown; client: { id: number } };

/** Every commission of the studio with its totals summed from its figures and stages as they are now. */
async function summed(studioId: number): Promise<Record<number, Totals>> {
  const db = sw.db;
  const out: Record<number, Totals> = {};
  for (const id of await db('commissions').where({ studio_id: studioId }).pluck('id')) out[Number(id)] = zero();
  type Row = Record<string, number | string>;
  const stages: Row[] = await db('stages')
    .where({ studio_id: studioId })
    .groupBy('commission_id')
    .select('commission_id')
    .count({ n: '*' })
    .select(
      db.raw("sum(case when status = 'skipped' then 1 else 0 end) as skipped"),
      db.raw("sum(case when status = 'done' then 1 else 0 end) as done"),
      db.raw("sum(case when status <> 'skipped' then estimate_minutes else 0 end) as minutes_total"),
      db.raw("sum(case when status = 'done' then estimate_minutes else 0 end) as minutes_done"),
    );
  for (const s of stages) {
    Object.assign(out[Number(s.commission_id)], {
      stage_count: Number(s.n),
      stages_skipped: Number(s.skipped),
      stages_done: Number(s.done),
      minutes_total: Number(s.minutes_total),
      minutes_done: Number(s.minutes_done),
    });
  }
  const figures: Row[] = await db('figures').where({ studio_id: studioId }).groupBy('commission_id').select('commission_id').count({ n: '*' }).sum({ q: 'quantity' });
  for (const f of figures) Object.assign(out[Number(f.commission_id)], { figure_count: Number(f.n), model_count: Number(f.q) });
  return out;
}

/** The totals the commission rows carry. */
async function kept(studioId: number): Promise<Record<number, Totals>> {
  const rows = await sw.db('commissions').where({ studio_id: studioId }).select('id', ...totalColumns);
  return Object.fromEntries(rows.map((r) => [Number(r.id), Object.fromEntries(totalColumns.map((c) => [c, Number(r[c])])) as Totals]));
}

const shown = (t: Totals) => ({
  figureCount: t.figure_count,
  modelCount: t.model_count,
  progress: progressFromTotals({ stages: t.stage_count, skipped: t.stages_skipped, done: t.stages_done, minutesTotal: t.minutes_total, minutesDone: t.minutes_done }),
});

async function listOf(side: Side, as: 'owner' | 'client') {
  const res = await side[as].get(`/api/studios/${side.studioId}/commissions?limit=200`);
  expect(res.status).toBe(200);
  return res.body.items as Summary[];
}

/** Columns = fresh sums for every commission of both studios; both lists show them; the detail agrees. */
async function expectTotalsRight(detailOf: number[] = []) {
  for (const side of [a, b]) {
    const want = await summed(side.studioId);
    expect(await kept(side.studioId), `studio ${side.studioId}: kept totals against fresh sums`).toEqual(want);
    const owner = await listOf(side, 'owner');
    expect(owner.map((c) => c.id).sort((x, y) => x - y)).toEqual(Object.keys(want).map(Number));
    expect(Object.fromEntries(owner.map((c) => [c.id, { figureCount: c.figureCount, modelCount: c.modelCount, progress: c.progress }]))).toEqual(
      Object.fromEntries(Object.entries(want).map(([id, t]) => [id, shown(t)])),
    );
    const client = await listOf(side, 'client');
    for (const c of client) expect(c.client.id).toBe(side.clientId);
    expect(client.map((c) => ({ id: c.id, ...shown(want[c.id]) }))).toEqual(client.map((c) => ({ id: c.id, figureCount: c.figureCount, modelCount: c.modelCount, progress: c.progress })));
  }
  // The detail sums the figures' own stages (figures.views): an independent reading of the same numbers.
  for (const id of detailOf) {
    const detail = (await a.owner.get(`${A()}/commissions/${id}`)).body;
    const inList = (await listOf(a, 'owner')).find((c) => c.id === id)!;
    expect({ figureCount: detail.figureCount, modelCount: detail.modelCount, progress: detail.progress }).toEqual({ figureCount: inList.figureCount, modelCount: inList.modelCount, progress: inList.progress });
  }
}

function ok<T = Record<string, unknown>>(res: { status: number; body: unknown }, what: string): T {
  expect(res.status, `${what}: ${JSON.stringify(res.body)}`).toBeLessThan(300);
  return res.body as T;
}

const figuresOf = async (commissionId: number) => ok<{ figures: Figure[] }>(await a.owner.get(`${A()}/commissions/${commissionId}`), 'detail').figures;
const setStage = async (stageId: number, body: { status?: string; estimateHours?: number }) => ok(await a.painter.patch(`${A()}/stages/${stageId}`, body), `stage ${JSON.stringify(body)}`);

describe('the commission list totals follow every change through the API', () => {
  let main: number;
  let figures: Figure[];

  it('a new commission with figures, and one without any', async () => {
    await expectTotalsRight();
    main = (await commission(a, 'Totals patrol')).id;
    const empty = ok<{ id: number }>(await a.owner.post(`${A()}/commissions`, { clientId: a.clientId, title: 'Nothing yet' }), 'empty commission');
    await commission(b, 'Bystander in studio B');
    figures = await figuresOf(main);
    expect(figures.length).toBe(2);
    await expectTotalsRight([main, empty.id]);
    // The generated numbers are not trivial: two figures (2 + 1 models), each with the template's stages.
    expect((await kept(a.studioId))[main]).toMatchObject({ figure_count: 2, model_count: 3, stage_count: figures.reduce((n, f) => n + f.stages.length, 0) });
    expect((await kept(a.studioId))[main].minutes_total).toBeGreaterThan(0);
  });

  it('a figure added, its quantity changed (estimates scale), another added', async () => {
    const added = ok<Figure>(await a.owner.post(`${A()}/commissions/${main}/figures`, { name: 'Banner bearer', quantity: 4, sizeClass: '32', tier: 'tabletop' }), 'add figure');
    await expectTotalsRight([main]);
    ok(await a.owner.patch(`${A()}/figures/${added.id}`, { quantity: 1 }), 'quantity down');
    await expectTotalsRight([main]);
    ok(await a.owner.patch(`${A()}/figures/${figures[0].id}`, { quantity: 5, name: 'Scouts, more' }), 'quantity up');
    ok(await a.owner.patch(`${A()}/figures/${figures[1].id}`, { name: 'Captain, renamed' }), 'rename only');
    await expectTotalsRight([main]);
    figures = await figuresOf(main);
    expect(figures.map((f) => f.quantity)).toEqual([5, 1, 1]);
  });

  it('stages ticked, set working, skipped, reset, re-estimated; a figure advanced', async () => {
    const [s0, s1, s2, s3] = figures[0].stages;
    await setStage(s0.id, { status: 'done' });
    await expectTotalsRight([main]);
    await setStage(s1.id, { status: 'working' });
    await setStage(s2.id, { status: 'skipped' });
    await expectTotalsRight([main]);
    await setStage(s2.id, { estimateHours: 7.5 }); // a skipped stage's estimate counts nowhere
    await setStage(s3.id, { status: 'done', estimateHours: 3.25 }); // both in one request
    await expectTotalsRight([main]);
    await setStage(s0.id, { status: 'todo' }); // done → to do
    await setStage(s2.id, { status: 'done' }); // skipped → done: its 7.5 h now count, in both totals
    await expectTotalsRight([main]);
    ok(await a.painter.post(`${A()}/figures/${figures[1].id}/advance`), 'advance');
    ok(await a.painter.post(`${A()}/figures/${figures[1].id}/advance`), 'advance');
    await expectTotalsRight([main]);
    const t = (await kept(a.studioId))[main];
    expect(t.stages_done).toBe(4);
    expect(t.stages_skipped).toBe(0);
  });

  it('stages added and removed with their figures: a shorter template for a new figure, a figure removed', async () => {
    const template = ok<{ key: string; name: string; defaultHours: number; waitHours: number; hazards: string[] }[]>(await a.owner.get(`${A()}/stage-template`), 'template');
    ok(await a.owner.put(`${A()}/stage-template`, { stages: [{ name: 'Prime', defaultHours: 0.5, waitHours: 0, hazards: [] }, { name: 'Paint', defaultHours: 3, waitHours: 0, hazards: [] }] }), 'short template');
    try {
      const small = ok<Figure>(await a.owner.post(`${A()}/commissions/${main}/figures`, { name: 'Familiar', quantity: 2, sizeClass: '25', tier: 'tabletop' }), 'figure on the short template');
      expect(small.stages.length).toBe(2);
      await expectTotalsRight([main]);
      await setStage(small.stages[1].id, { status: 'skipped' });
      await expectTotalsRight([main]);
    } finally {
      ok(await a.owner.put(`${A()}/stage-template`, { stages: template }), 'template back');
    }
    // Removing a figure removes its stages by the foreign key's cascade: its done and skipped stages leave the totals.
    ok(await a.owner.delete(`${A()}/figures/${figures[0].id}`), 'remove figure');
    await expectTotalsRight([main]);
    figures = await figuresOf(main);
  });

  it('an accepted quote sets the stage estimates from its hours', async () => {
    const before = (await kept(a.studioId))[main];
    await acceptedQuote(a, main);
    await expectTotalsRight([main]);
    // The test price table prices other hours than the stage template: the accepted quote really changed them.
    expect((await kept(a.studioId))[main].minutes_total).not.toBe(before.minutes_total);
    expect((await kept(a.studioId))[main].stage_count).toBe(before.stage_count);
  });

  it('ticks of many stages of one commission at once all count (on PostgreSQL they run side by side)', async () => {
    const stages = (await figuresOf(main)).flatMap((f) => f.stages).filter((s) => s.status === 'todo');
    expect(stages.length).toBeGreaterThan(4);
    const results = await Promise.all(stages.map((s, i) => a.painter.patch(`${A()}/stages/${s.id}`, { status: i % 3 === 2 ? 'skipped' : 'done' })));
    expect(results.map((r) => r.status)).toEqual(stages.map(() => 200));
    await expectTotalsRight([main]);
  });

  it('a client erased: an open commission is deleted with its figures and stages (the cascade), an invoiced one keeps its figures and totals', async () => {
    const other = ok<{ id: number; name: string }>(await a.owner.post(`${A()}/clients`, { name: 'Ysolde Fernwick', email: 'ysolde@demo.test' }), 'client');
    const mk = async (title: string) =>
      ok<{ id: number }>(
        await a.owner.post(`${A()}/commissions`, {
          clientId: other.id,
          title,
          figures: [
            { name: 'Wyvern', quantity: 1, sizeClass: 'large', footprint: '120 × 80 mm', tier: 'tabletop' },
            { name: 'Rider', quantity: 2, sizeClass: '28', tier: 'tabletop' },
          ],
        }),
        title,
      ).id;
    const gone = await mk('Wyvern rider');
    const keptId = await mk('Invoiced wyvern');
    const inv = ok<{ id: number; total: number }>(
      await a.owner.post(`${A()}/invoices`, { commissionId: keptId, kind: 'custom', lines: [{ description: 'Painting', quantity: 1, unitMinor: 4000 }] }),
      'invoice',
    );
    ok(await a.owner.post(`${A()}/invoices/${inv.id}/issue`), 'issue');
    const issued = (await invoicesOf(a.owner, a.studioId, keptId))[0];
    ok(await a.owner.post(`${A()}/invoices/${inv.id}/payments`, { method: 'bank', amountMinor: issued.balanceDue }), 'pay');
    await sw.db('commissions').where({ id: keptId }).update({ status: 'closed' }); // finished (the lifecycle is tested elsewhere)
    await expectTotalsRight([gone, keptId]);
    const before = (await kept(a.studioId))[keptId];
    expect(before).toMatchObject({ figure_count: 2, model_count: 3 });

    const res = ok<{ kept: { commissions: number } }>(await a.owner.post(`${A()}/clients/${other.id}/erase`, { confirmName: 'Ysolde Fernwick', deleteOpenCommissions: true }), 'erase');
    expect(res.kept.commissions).toBe(1);
    expect(await sw.db('commissions').where({ id: gone }).first('id')).toBeUndefined();
    expect(await sw.db('stages').where({ commission_id: gone }).first('id')).toBeUndefined();
    expect((await kept(a.studioId))[keptId]).toEqual(before);
    await expectTotalsRight([keptId]);
  });
});

describe('the totals follow changes made past the API', () => {
  const rowId = (r: unknown) => (typeof r === 'object' && r !== null ? (r as { id: number }).id : (r as number));

  it('a stage and a figure moved to another commission leave one and join the other', async () => {
    const from = (await commission(a, 'Moved from')).id;
    const to = (await commission(a, 'Moved to')).id;
    const [f] = await figuresOf(from);
    const t = sw.clock.now().toISOString();
    await sw.db('stages').where({ id: f.stages[0].id }).update({ commission_id: to, status: 'done', updated_at: t });
    await expectTotalsRight(); // (the details would disagree: the stage's figure is still the other commission's)
    await sw.db.transaction(async (trx) => {
      await trx('figures').where({ id: f.id }).update({ commission_id: to, quantity: 7 });
      await trx('stages').where({ figure_id: f.id }).update({ commission_id: to });
    });
    await expectTotalsRight([from, to]);
  });

  it('a rolled-back change leaves the totals as they were', async () => {
    const id = (await commission(a, 'Rolled back')).id;
    const before = await kept(a.studioId);
    const [f, g] = await figuresOf(id);
    await expect(
      sw.db.transaction(async (trx) => {
        await trx('stages').where({ figure_id: f.id }).update({ status: 'done' });
        await trx('figures').where({ id: f.id }).update({ quantity: 40 });
        await trx('figures').where({ id: g.id }).delete();
        expect((await trx('commissions').where({ id }).first('stages_done')).stages_done).toBe(f.stages.length); // seen inside
        throw new Error('changed my mind');
      }),
    ).rejects.toThrow('changed my mind');
    expect(await kept(a.studioId)).toEqual(before);
    await expectTotalsRight([id]);
  });

  it('rows written straight into the tables (as the seeds and the bench generator do) are counted, and a commission deleted in SQL takes its rows along', async () => {
    const id = (await commission(a, 'Written by hand')).id;
    const t = sw.clock.now().toISOString();
    const [fr] = await sw.db('figures').insert({ studio_id: a.studioId, commission_id: id, name: 'Hand-made', quantity: 3, size_class: '28', tier: 'tabletop', created_at: t, updated_at: t }).returning('id');
    const statuses = ['todo', 'done', 'skipped', 'working', 'done'];
    await sw.db('stages').insert(
      statuses.map((status, position) => ({ studio_id: a.studioId, commission_id: id, figure_id: rowId(fr), template_key: `k${position}`, name: `Step ${position}`, position, status, estimate_minutes: 10 * (position + 1), updated_at: t })),
    );
    await expectTotalsRight([id]);
    expect((await kept(a.studioId))[id]).toMatchObject({ figure_count: 3, model_count: 6 });
    await sw.db('stages').where({ figure_id: rowId(fr) }).delete();
    await expectTotalsRight([id]);
    await sw.db('activity').where({ commission_id: id }).delete();
    await sw.db('commissions').where({ id }).delete(); // figures and stages go by the foreign keys' cascade
    expect(await sw.db('figures').where({ commission_id: id }).count({ n: '*' }).first()).toMatchObject({ n: 0 });
    await expectTotalsRight();
  });
});

describe('any sequence of changes through the API', () => {
  type Op =
    | { kind: 'add'; quantity: number }
    | { kind: 'quantity'; figure: number; quantity: number }
    | { kind: 'remove'; figure: number }
    | { kind: 'status'; stage: number; status: 'todo' | 'working' | 'done' | 'skipped' }
    | { kind: 'estimate'; stage: number; hours: number }
    | { kind: 'advance'; figure: number };
  const op: fc.Arbitrary<Op> = fc.oneof(
    fc.record({ kind: fc.constant('add' as const), quantity: fc.integer({ min: 1, max: 6 }) }),
    fc.record({ kind: fc.constant('quantity' as const), figure: fc.nat(), quantity: fc.integer({ min: 1, max: 9 }) }),
    fc.record({ kind: fc.constant('remove' as const), figure: fc.nat() }),
    fc.record({ kind: fc.constant('status' as const), stage: fc.nat(), status: fc.constantFrom('todo' as const, 'working' as const, 'done' as const, 'skipped' as const) }),
    fc.record({ kind: fc.constant('estimate' as const), stage: fc.nat(), hours: fc.integer({ min: 0, max: 40 }).map((q) => q / 4) }),
    fc.record({ kind: fc.constant('advance' as const), figure: fc.nat() }),
  );

  it('keeps the list totals equal to fresh sums after each step', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(op, { minLength: 1, maxLength: 8 }), async (ops) => {
        const id = (await commission(a, 'Property')).id;
        for (const o of ops) {
          const figs = await figuresOf(id);
          const stages = figs.flatMap((f) => f.stages);
          const fig = 'figure' in o && figs.length ? figs[o.figure % figs.length] : undefined;
          const stage = 'stage' in o && stages.length ? stages[o.stage % stages.length] : undefined;
          if (o.kind === 'add') ok(await a.owner.post(`${A()}/commissions/${id}/figures`, { name: 'Random', quantity: o.quantity, sizeClass: '28', tier: 'tabletop' }), 'add');
          else if (o.kind === 'quantity' && fig) ok(await a.owner.patch(`${A()}/figures/${fig.id}`, { quantity: o.quantity }), 'quantity');
          else if (o.kind === 'remove' && fig) ok(await a.owner.delete(`${A()}/figures/${fig.id}`), 'remove');
          else if (o.kind === 'status' && stage) await setStage(stage.id, { status: o.status });
          else if (o.kind === 'estimate' && stage) await setStage(stage.id, { estimateHours: o.hours });
          else if (o.kind === 'advance' && fig) {
            const res = await a.painter.post(`${A()}/figures/${fig.id}/advance`);
            expect([200, 409]).toContain(res.status); // 409 when every stage is done or skipped
          }
          const want = (await summed(a.studioId))[id];
          expect((await kept(a.studioId))[id], JSON.stringify(o)).toEqual(want);
          const inList = (await listOf(a, 'owner')).find((c) => c.id === id)!;
          expect({ figureCount: inList.figureCount, modelCount: inList.modelCount, progress: inList.progress }).toEqual(shown(want));
        }
      }),
      { numRuns: 10 },
    );
    await expectTotalsRight();
  }, 120_000);
});

describe('the migration', () => {
  it('sums the totals of the commissions already there, and its down removes columns and triggers', async () => {
    const before = { a: await summed(a.studioId), b: await summed(b.studioId) };
    expect(Object.values(before.a).some((t) => t.stages_done > 0 && t.stages_skipped > 0 && t.minutes_done > 0)).toBe(true);
    await down(sw.db);
    expect(await sw.db.schema.hasColumn('commissions', 'stage_count')).toBe(false);
    // Without the triggers, a tick changes nothing but the stage; the migration's sums must still see it.
    const open = sw.db('commissions').where({ studio_id: a.studioId, status: 'enquiry' }).select('id');
    const todo = await sw.db('stages').where({ studio_id: a.studioId, status: 'todo' }).whereIn('commission_id', open).orderBy('id').first('id', 'commission_id');
    await sw.db('stages').where({ id: todo.id }).update({ status: 'done' });
    await up(sw.db);
    const after = { a: await summed(a.studioId), b: await summed(b.studioId) };
    expect(after.a[todo.commission_id].stages_done).toBe(before.a[todo.commission_id].stages_done + 1);
    expect({ a: await kept(a.studioId), b: await kept(b.studioId) }).toEqual(after);
    await expectTotalsRight();
    // and the triggers are back
    await setStage(todo.id, { status: 'skipped' });
    await expectTotalsRight([todo.commission_id]);
  });
});
