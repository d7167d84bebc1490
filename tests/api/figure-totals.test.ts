import fc from 'fast-check';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { totalsOf, type StageStatus } from '../../shared/commission-lifecycle';
import { backfillFigureTotals, down, figureTotalColumns, up } from '../../migrations/20270202120000-figure-totals';
import { generate } from '../bench/support/generate';
import { startTestApp, type TestApp } from '../support/app';
import { acceptedQuote, commission, moneyStudios, type Side } from './money-flow';

/**
 * Each figure carries its stage totals and current stage in columns that triggers on `stages` keep
 * (migrations/20270202120000-figure-totals.ts); the bench board reads them. After every kind of change the
 * API makes, and changes made in SQL past it, the columns must equal what the figure's stages give afresh:
 * the totals as shared/commission-lifecycle.ts totalsOf sums them (the figure's own view uses it), and the
 * current stage by the board's rule (the lowest position among stages to do or in work, the lowest id if
 * two share a position; none when every stage is done or skipped). On PostgreSQL the API's writes run side
 * by side (up to 10 connections), so the concurrent cases test the triggers' locking there.
 */

let sw: TestApp;
let a: Side;
let b: Side;
let painterA: number;
const A = () => `/api/studios/${a.studioId}`;

beforeAll(async () => {
  sw = await startTestApp();
  ({ a, b } = await moneyStudios(sw));
  painterA = (await a.painter.get('/api/auth/me')).body.user.id;
});
afterAll(() => sw?.stop());

type Kept = { stage_count: number; stages_skipped: number; stages_done: number; minutes_total: number; minutes_done: number; current_stage_id: number | null };
type StageRow = { id: number; figure_id: number; status: StageStatus; estimate_minutes: number; position: number };

/** What the figure's stages give, computed here from the rows (not by the triggers' SQL). */
function fromStages(stages: StageRow[]): Kept {
  const t = totalsOf(stages.map((s) => ({ status: s.status, estimateMinutes: s.estimate_minutes })));
  const open = stages.filter((s) => s.status === 'todo' || s.status === 'working').sort((x, y) => x.position - y.position || x.id - y.id);
  return { stage_count: t.stages, stages_skipped: t.skipped, stages_done: t.done, minutes_total: t.minutesTotal, minutes_done: t.minutesDone, current_stage_id: open[0]?.id ?? null };
}

async function fresh(db: TestApp['db'], studioId?: number): Promise<Record<number, Kept>> {
  const fq = db('figures');
  const sq = db('stages').select('id', 'figure_id', 'status', 'estimate_minutes', 'position');
  if (studioId !== undefined) for (const q of [fq, sq]) q.where('studio_id', studioId);
  const figures = (await fq.pluck('id')).map(Number);
  const stages = (await sq) as StageRow[];
  const of = new Map<number, StageRow[]>();
  for (const s of stages) of.set(Number(s.figure_id), [...(of.get(Number(s.figure_id)) ?? []), { ...s, id: Number(s.id), position: Number(s.position), estimate_minutes: Number(s.estimate_minutes) }]);
  return Object.fromEntries(figures.map((id) => [id, fromStages(of.get(id) ?? [])]));
}

async function kept(db: TestApp['db'], studioId?: number): Promise<Record<number, Kept>> {
  const q = db('figures').select('id', ...figureTotalColumns);
  if (studioId !== undefined) q.where('studio_id', studioId);
  const rows = (await q) as Record<string, number | null>[];
  return Object.fromEntries(
    rows.map((r) => [Number(r.id), Object.fromEntries(figureTotalColumns.map((c) => [c, r[c] === null ? null : Number(r[c])])) as Kept]),
  );
}

/** The columns equal fresh values for every figure of both studios. */
async function expectFiguresRight(what = '') {
  for (const side of [a, b]) expect(await kept(sw.db, side.studioId), `studio ${side.studioId} ${what}`).toEqual(await fresh(sw.db, side.studioId));
}

type Stage = { id: number; key: string; status: string; estimateHours: number; position: number };
type Figure = { id: number; quantity: number; stages: Stage[]; progress: unknown; currentStageId: number | null };
type Card = { figureId: number; stage: { id: number } | null; progress: unknown };

function ok<T = Record<string, unknown>>(res: { status: number; body: unknown }, what: string): T {
  expect(res.status, `${what}: ${JSON.stringify(res.body)}`).toBeLessThan(300);
  return res.body as T;
}

const figuresOf = async (commissionId: number) => ok<{ figures: Figure[] }>(await a.owner.get(`${A()}/commissions/${commissionId}`), 'detail').figures;
const setStage = async (stageId: number, body: { status?: string; estimateHours?: number }) => ok(await a.painter.patch(`${A()}/stages/${stageId}`, body), `stage ${JSON.stringify(body)}`);
const toBench = async (commissionId: number) => {
  for (const to of ['quoted', 'booked', 'on_bench']) ok(await a.owner.post(`${A()}/commissions/${commissionId}/transitions`, { to }), to);
};

/** The board's cards of a commission show what each figure's own view (built from all its stages) shows. */
async function expectBoardAgrees(commissionId: number) {
  const board = ok<{ columns: { cards: Card[] }[] }>(await a.owner.get(`${A()}/board?commissionId=${commissionId}`), 'board');
  const cards = board.columns.flatMap((c) => c.cards);
  const figures = await figuresOf(commissionId);
  expect(cards.map((c) => c.figureId).sort((x, y) => x - y)).toEqual(figures.map((f) => f.id).sort((x, y) => x - y));
  for (const f of figures) {
    const card = cards.find((c) => c.figureId === f.id)!;
    expect({ stage: card.stage?.id ?? null, progress: card.progress }, `figure ${f.id}`).toEqual({ stage: f.currentStageId, progress: f.progress });
  }
}

describe('the figure columns follow every change through the API', () => {
  let main: number;
  let figures: Figure[];

  it('a new commission with figures: every figure counted, its first stage current', async () => {
    main = (await commission(a, 'Figure totals patrol')).id;
    await commission(b, 'Bystander in studio B');
    await expectFiguresRight();
    figures = await figuresOf(main);
    const k = (await kept(sw.db, a.studioId))[figures[0].id];
    // not trivial: the template's stages, estimates summed, the first stage the current one
    expect(k.stage_count).toBe(figures[0].stages.length);
    expect(k.stage_count).toBeGreaterThan(3);
    expect(k.minutes_total).toBeGreaterThan(0);
    expect(k.current_stage_id).toBe(figures[0].stages[0].id);
    await toBench(main);
    await expectBoardAgrees(main);
  });

  it('stages to do → working → done → skipped and back; estimates changed, of a skipped stage too; both in one request', async () => {
    const [s0, s1, s2, s3] = figures[0].stages;
    await setStage(s0.id, { status: 'working' });
    await expectFiguresRight('working');
    expect((await kept(sw.db))[figures[0].id].current_stage_id).toBe(s0.id); // working is still current
    await setStage(s0.id, { status: 'done' });
    await expectFiguresRight('done');
    expect((await kept(sw.db))[figures[0].id].current_stage_id).toBe(s1.id);
    await setStage(s1.id, { status: 'skipped' });
    await setStage(s2.id, { estimateHours: 6.25 });
    await expectFiguresRight('skipped, estimate');
    expect((await kept(sw.db))[figures[0].id].current_stage_id).toBe(s2.id);
    await setStage(s1.id, { estimateHours: 9 }); // a skipped stage's estimate counts nowhere
    await setStage(s3.id, { status: 'done', estimateHours: 2.5 });
    await expectFiguresRight('both at once');
    await setStage(s0.id, { status: 'todo' }); // done → to do: current again
    await setStage(s1.id, { status: 'done' }); // skipped → done: its 9 h now count
    await expectFiguresRight('back');
    expect((await kept(sw.db))[figures[0].id]).toMatchObject({ current_stage_id: s0.id, stages_done: 2, stages_skipped: 0 });
    await expectBoardAgrees(main);
  });

  it('a figure advanced, a timer started (to do → working), every stage done or skipped (no current stage)', async () => {
    const f = figures[1];
    ok(await a.painter.post(`${A()}/figures/${f.id}/advance`), 'advance');
    await expectFiguresRight('advance');
    expect((await kept(sw.db))[f.id].current_stage_id).toBe(f.stages[1].id);
    ok(await a.painter.post(`${A()}/stages/${f.stages[1].id}/timer`), 'timer');
    ok(await a.painter.post(`${A()}/timer/stop`), 'stop');
    expect((await figuresOf(main)).find((g) => g.id === f.id)!.stages[1].status).toBe('working');
    await expectFiguresRight('timer');
    for (const [i, s] of f.stages.entries()) await setStage(s.id, { status: i % 2 ? 'skipped' : 'done' });
    await expectFiguresRight('all closed');
    expect((await kept(sw.db))[f.id].current_stage_id).toBeNull();
    await expectBoardAgrees(main);
  });

  it('a figure added, its quantity changed (the estimates scale), renamed, a painter given; another figure removed', async () => {
    const added = ok<Figure>(await a.owner.post(`${A()}/commissions/${main}/figures`, { name: 'Standard bearer', quantity: 3, sizeClass: '32', tier: 'tabletop' }), 'add');
    await expectFiguresRight('added');
    expect((await kept(sw.db))[added.id].current_stage_id).toBe(added.stages[0].id);
    ok(await a.owner.patch(`${A()}/figures/${added.id}`, { quantity: 1 }), 'quantity');
    ok(await a.owner.patch(`${A()}/figures/${added.id}`, { name: 'Bearer', painterId: painterA }), 'rename, painter');
    await expectFiguresRight('quantity');
    ok(await a.owner.delete(`${A()}/figures/${figures[1].id}`), 'remove'); // its stages go by the cascade
    expect((await kept(sw.db))[figures[1].id]).toBeUndefined();
    await expectFiguresRight('removed');
    await expectBoardAgrees(main);
    figures = await figuresOf(main);
  });

  it('a figure on a shorter template: two stages', async () => {
    const template = ok<{ key: string; name: string; defaultHours: number; waitHours: number; hazards: string[] }[]>(await a.owner.get(`${A()}/stage-template`), 'template');
    ok(await a.owner.put(`${A()}/stage-template`, { stages: [{ name: 'Prime', defaultHours: 0.5, waitHours: 0, hazards: [] }, { name: 'Paint', defaultHours: 3, waitHours: 0, hazards: [] }] }), 'short');
    try {
      const small = ok<Figure>(await a.owner.post(`${A()}/commissions/${main}/figures`, { name: 'Familiar', quantity: 2, sizeClass: '25', tier: 'tabletop' }), 'figure');
      expect((await kept(sw.db))[small.id]).toMatchObject({ stage_count: 2, minutes_total: 2 * (30 + 180), current_stage_id: small.stages[0].id });
      await setStage(small.stages[0].id, { status: 'skipped' });
      await expectFiguresRight('short');
    } finally {
      ok(await a.owner.put(`${A()}/stage-template`, { stages: template }), 'template back');
    }
  });

  it('an accepted quote sets the stage estimates from its hours', async () => {
    const id = (await commission(a, 'Quoted figures')).id;
    const before = await kept(sw.db, a.studioId);
    await acceptedQuote(a, id);
    await expectFiguresRight('accepted');
    const after = await kept(sw.db, a.studioId);
    const changed = (await figuresOf(id)).filter((f) => after[f.id].minutes_total !== before[f.id].minutes_total);
    expect(changed.length).toBeGreaterThan(0); // the test price table's hours differ from the template's
  });

  it('a client erased: the open commission goes with its figures and stages (the cascade)', async () => {
    const other = ok<{ id: number }>(await a.owner.post(`${A()}/clients`, { name: 'Orrin Vale', email: 'orrin@demo.test' }), 'client');
    const gone = ok<{ id: number; figures: Figure[] }>(
      await a.owner.post(`${A()}/commissions`, { clientId: other.id, title: 'Gone', figures: [{ name: 'Wyrm', quantity: 1, sizeClass: '40', tier: 'tabletop' }] }),
      'commission',
    );
    await expectFiguresRight('before erase');
    ok(await a.owner.post(`${A()}/clients/${other.id}/erase`, { confirmName: 'Orrin Vale', deleteOpenCommissions: true }), 'erase');
    expect((await kept(sw.db))[gone.figures[0].id]).toBeUndefined();
    await expectFiguresRight('erased');
  });
});

describe('writes of one figure side by side (on PostgreSQL they run at once)', () => {
  it('stage ticks, estimates, a rename, a painter and a new quantity of the same figure all count, and none waits for another forever', async () => {
    const id = (await commission(a, 'Side by side')).id;
    await toBench(id);
    await setStage((await figuresOf(id))[0].stages[0].id, { status: 'todo' }); // the painter's CSRF token, fetched once before the burst
    for (let round = 0; round < 4; round++) {
      const [f, g] = await figuresOf(id);
      const statuses = ['done', 'working', 'skipped', 'todo'];
      const results = await Promise.all([
        ...f.stages.map((s, i) => a.painter.patch(`${A()}/stages/${s.id}`, { status: statuses[(i + round) % statuses.length] })),
        ...g.stages.map((s, i) => a.painter.patch(`${A()}/stages/${s.id}`, i % 2 ? { estimateHours: round + i / 4 } : { status: statuses[(i + round + 1) % statuses.length] })),
        a.owner.patch(`${A()}/figures/${f.id}`, { name: `Scouts, round ${round}` }),
        a.owner.patch(`${A()}/figures/${f.id}`, { painterId: round % 2 ? null : painterA }),
        a.owner.patch(`${A()}/figures/${g.id}`, { quantity: 1 + (round % 3) }),
        a.painter.post(`${A()}/figures/${g.id}/advance`),
        a.painter.post(`${A()}/stages/${f.stages[round].id}/timer`),
      ]);
      // 409: advance found every stage closed; anything else (a 500 from a deadlock) fails
      const failed = results.filter((r) => r.status >= 300 && r.status !== 409);
      expect(failed.map((r) => ({ status: r.status, body: r.body }))).toEqual([]);
      ok(await a.painter.post(`${A()}/timer/stop`), 'stop');
      await expectFiguresRight(`round ${round}`);
    }
    await expectBoardAgrees(id);
  }, 60_000);
});

describe('two transactions changing stages of one figure at once', () => {
  it('the second waits for the first, then counts its change too (PostgreSQL: the trigger locks the figure before it reads the stages)', async () => {
    const [f] = await figuresOf((await commission(a, 'Two at once')).id);
    const [, s1, s2] = f.stages;
    let release = () => {};
    const hold = new Promise<void>((r) => (release = r));
    let firstDone = false;
    let secondDone = false;
    // Positions only: the commission totals' trigger does not fire, so it cannot order the two by the commission row.
    const first = sw.db.transaction(async (trx) => {
      await trx('stages').where({ id: s2.id }).update({ position: -5 }); // s2 becomes current
      firstDone = true;
      await hold;
    });
    while (!firstDone) await new Promise((r) => setTimeout(r, 5));
    const second = sw.db
      .transaction(async (trx) => {
        await trx('stages').where({ id: s1.id }).update({ position: -1 }); // before the others, but after s2
      })
      .then(() => (secondDone = true));
    await new Promise((r) => setTimeout(r, 300));
    expect(secondDone, 'the second waits for the first (the figure row on PostgreSQL, the one connection on SQLite)').toBe(false);
    release();
    await Promise.all([first, second]);
    // A recomputation with a snapshot from before the first committed would see s1 at -1 and s2 where it was.
    expect((await kept(sw.db))[f.id].current_stage_id).toBe(s2.id);
    await expectFiguresRight('two at once');
  });
});

describe('the columns follow changes made past the API', () => {
  const rowId = (r: unknown) => (typeof r === 'object' && r !== null ? (r as { id: number }).id : (r as number));

  it('stages reordered (there is no API for it): the current stage follows the positions, the lowest id on a tie', async () => {
    const [f] = await figuresOf((await commission(a, 'Reordered')).id);
    const [s0, s1, s2] = f.stages;
    await sw.db('stages').where({ id: s2.id }).update({ position: -1 });
    expect((await kept(sw.db))[f.id].current_stage_id).toBe(s2.id);
    await sw.db('stages').where({ id: s1.id }).update({ position: -1 }); // a tie: the lower id wins
    expect((await kept(sw.db))[f.id].current_stage_id).toBe(Math.min(s1.id, s2.id));
    await sw.db('stages').where({ id: s0.id }).update({ position: -2, status: 'done' });
    expect((await kept(sw.db))[f.id].current_stage_id).toBe(Math.min(s1.id, s2.id));
    await expectFiguresRight('reordered');
  });

  it('a stage moved to another figure leaves one and joins the other', async () => {
    const [f, g] = await figuresOf((await commission(a, 'Moved stage')).id);
    await sw.db('stages').where({ id: f.stages[0].id }).update({ figure_id: g.id, position: -5 });
    const k = await kept(sw.db);
    expect(k[f.id].stage_count).toBe(f.stages.length - 1);
    expect(k[f.id].current_stage_id).toBe(f.stages[1].id);
    expect(k[g.id]).toMatchObject({ stage_count: g.stages.length + 1, current_stage_id: f.stages[0].id });
    await expectFiguresRight('moved');
  });

  it('a rolled-back change leaves the columns as they were', async () => {
    const [f] = await figuresOf((await commission(a, 'Rolled back')).id);
    const before = await kept(sw.db);
    await expect(
      sw.db.transaction(async (trx) => {
        await trx('stages').where({ figure_id: f.id }).update({ status: 'done' });
        expect((await trx('figures').where({ id: f.id }).first('stages_done', 'current_stage_id')) as Kept).toMatchObject({ stages_done: f.stages.length, current_stage_id: null }); // seen inside
        throw new Error('changed my mind');
      }),
    ).rejects.toThrow('changed my mind');
    expect(await kept(sw.db)).toEqual(before);
  });

  it('rows written straight into the tables (as the seeds do) are counted; stages deleted in SQL leave', async () => {
    const id = (await commission(a, 'Written by hand')).id;
    const t = sw.clock.now().toISOString();
    const [fr] = await sw.db('figures').insert({ studio_id: a.studioId, commission_id: id, name: 'Hand-made', quantity: 3, size_class: '28', tier: 'tabletop', created_at: t, updated_at: t }).returning('id');
    const fid = rowId(fr);
    expect((await kept(sw.db))[fid]).toEqual({ stage_count: 0, stages_skipped: 0, stages_done: 0, minutes_total: 0, minutes_done: 0, current_stage_id: null });
    const statuses = ['done', 'skipped', 'working', 'todo', 'done'];
    await sw.db('stages').insert(
      statuses.map((status, position) => ({ studio_id: a.studioId, commission_id: id, figure_id: fid, template_key: `k${position}`, name: `Step ${position}`, position, status, estimate_minutes: 10 * (position + 1), updated_at: t })),
    );
    // by hand: 5 stages, 1 skipped (20 min), 2 done (10 + 50 min); 10 + 30 + 40 + 50 min not skipped; "working" at position 2 is current
    const current = await sw.db('stages').where({ figure_id: fid, position: 2 }).first('id');
    expect((await kept(sw.db))[fid]).toEqual({ stage_count: 5, stages_skipped: 1, stages_done: 2, minutes_total: 130, minutes_done: 60, current_stage_id: rowId(current) });
    await sw.db('stages').where({ figure_id: fid }).whereIn('position', [2, 3]).delete();
    expect((await kept(sw.db))[fid]).toMatchObject({ stage_count: 3, current_stage_id: null });
    await expectFiguresRight('by hand');
  });
});

describe('any sequence of changes through the API', () => {
  type Op =
    | { kind: 'add'; quantity: number }
    | { kind: 'quantity'; figure: number; quantity: number }
    | { kind: 'remove'; figure: number }
    | { kind: 'status'; stage: number; status: StageStatus }
    | { kind: 'estimate'; stage: number; hours: number }
    | { kind: 'advance'; figure: number };
  const op: fc.Arbitrary<Op> = fc.oneof(
    fc.record({ kind: fc.constant('add' as const), quantity: fc.integer({ min: 1, max: 6 }) }),
    fc.record({ kind: fc.constant('quantity' as const), figure: fc.nat(), quantity: fc.integer({ min: 1, max: 9 }) }),
    fc.record({ kind: fc.constant('remove' as const), figure: fc.nat() }),
    fc.record({ kind: fc.constant('status' as const), stage: fc.nat(), status: fc.constantFrom<StageStatus>('todo', 'working', 'done', 'skipped') }),
    fc.record({ kind: fc.constant('estimate' as const), stage: fc.nat(), hours: fc.integer({ min: 0, max: 40 }).map((q) => q / 4) }),
    fc.record({ kind: fc.constant('advance' as const), figure: fc.nat() }),
  );

  it('keeps every figure equal to its stages after each step', async () => {
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
          else if (o.kind === 'advance' && fig) expect([200, 409]).toContain((await a.painter.post(`${A()}/figures/${fig.id}/advance`)).status);
          expect(await kept(sw.db, a.studioId), JSON.stringify(o)).toEqual(await fresh(sw.db, a.studioId));
        }
      }),
      { numRuns: 8 },
    );
  }, 120_000);
});

describe('the migration and the bulk loaders', () => {
  it('its backfill gives what the triggers give; down removes columns and triggers, up sums the figures already there', async () => {
    const byTriggers = await kept(sw.db);
    expect(Object.values(byTriggers).some((k) => k.stages_done > 0 && k.stages_skipped > 0 && k.current_stage_id !== null)).toBe(true);
    await sw.db('figures').update({ stage_count: 99, stages_done: 99, minutes_total: -1, current_stage_id: null });
    await backfillFigureTotals(sw.db);
    expect(await kept(sw.db)).toEqual(byTriggers);

    await down(sw.db);
    expect(await sw.db.schema.hasColumn('figures', 'stage_count')).toBe(false);
    // without the triggers a tick changes nothing but the stage; the migration's backfill must still see it
    const todo = await sw.db('stages').where({ studio_id: a.studioId, status: 'todo' }).orderBy('id').first('id', 'figure_id');
    await sw.db('stages').where({ id: todo.id }).update({ status: 'done' });
    await up(sw.db);
    expect((await kept(sw.db))[todo.figure_id].stages_done).toBe(byTriggers[todo.figure_id].stages_done + 1);
    await expectFiguresRight('after up');
    await setStage(todo.id, { status: 'skipped' }); // the triggers are back
    await expectFiguresRight('triggers back');
  });

  it('the bench generator, which sets the triggers aside while it fills the tables, leaves every figure as the triggers would', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sablework-figure-totals-'));
    try {
      const first = await startTestApp({ sqlite: true, dataDir: dir }); // migrates
      await first.close();
      generate(dir, { studios: 2, commissions: 6, figuresPerCommission: 3, stagesPerFigure: 4, clientsPerStudio: 2 });
      const gen = await startTestApp({ sqlite: true, dataDir: dir });
      try {
        const backfilled = await kept(gen.db);
        expect(Object.keys(backfilled)).toHaveLength(18);
        expect(backfilled).toEqual(await fresh(gen.db));
        expect(Object.values(backfilled).some((k) => k.stages_done > 0 && k.current_stage_id !== null)).toBe(true);
        // every stage rewritten with the triggers in place recomputes its figure: the same values
        await gen.db('stages').update({ position: gen.db.raw('position + 100') });
        await gen.db('stages').update({ position: gen.db.raw('position - 100') });
        expect(await kept(gen.db)).toEqual(backfilled);
        expect((await gen.db.raw("select count(*) as n from sqlite_master where type = 'trigger' and name glob 'figure_totals_*'"))[0].n).toBe(3);
      } finally {
        await gen.close();
      }
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
