import type { CommissionStatus, StageStatus } from '../../../shared/commission-lifecycle';
import type { Db } from '../../lib/db';

export type FigureRow = {
  id: number;
  commission_id: number;
  name: string;
  quantity: number;
  size_class: string;
  footprint: string | null;
  tier: string;
  extras: string;
  sub_assemblies: string;
  light_source: string | null;
  painter_id: number | null;
  painter_name: string | null;
  position: number;
};

export type StageRow = {
  id: number;
  figure_id: number;
  commission_id: number;
  template_key: string;
  name: string;
  position: number;
  status: StageStatus;
  estimate_minutes: number;
  wait_minutes: number;
  hazards: string;
  done_by: number | null;
  done_by_name: string | null;
  done_at: string | null;
};

/** A stage with the figure and commission it belongs to, for rules that look at both. */
export type StageContext = StageRow & { figure_name: string; commission_title: string; commission_status: CommissionStatus; client_id: number };

const insertedId = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));

const figureColumns = [
  'f.id',
  'f.commission_id',
  'f.name',
  'f.quantity',
  'f.size_class',
  'f.footprint',
  'f.tier',
  'f.extras',
  'f.sub_assemblies',
  'f.light_source',
  'f.painter_id',
  'p.name as painter_name',
  'f.position',
];
const stageColumns = [
  's.id',
  's.figure_id',
  's.commission_id',
  's.template_key',
  's.name',
  's.position',
  's.status',
  's.estimate_minutes',
  's.wait_minutes',
  's.hazards',
  's.done_by',
  'd.name as done_by_name',
  's.done_at',
];

/** Figures and their stages; every query takes the studio id first. */
export function figuresRepository(db: Db) {
  const figures = (trx: Db, studioId: number) => trx('figures as f').leftJoin('users as p', 'p.id', 'f.painter_id').where('f.studio_id', studioId).select(figureColumns);
  const stages = (trx: Db, studioId: number) => trx('stages as s').leftJoin('users as d', 'd.id', 's.done_by').where('s.studio_id', studioId).select(stageColumns);

  return {
    commission: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('commissions').where({ studio_id: studioId, id: commissionId }).first('id', 'status', 'client_id', 'title') as Promise<
        { id: number; status: CommissionStatus; client_id: number; title: string } | undefined
      >,
    /** An owner or painter of the studio (who may be assigned a figure), with their name. */
    teamMember: (studioId: number, userId: number, trx: Db = db) =>
      trx('memberships as m')
        .join('users as u', 'u.id', 'm.user_id')
        .where({ 'm.studio_id': studioId, 'm.user_id': userId })
        .whereIn('m.role', ['owner', 'painter'])
        .first('u.id', 'u.name') as Promise<{ id: number; name: string } | undefined>,
    /**
     * Takes the lock of the commission row (PostgreSQL's FOR NO KEY UPDATE, the lock an UPDATE of it takes;
     * SQLite writes one transaction at a time and Knex leaves the clause out), found by itself, a figure or
     * a stage of it. Every transaction that writes a commission's figures or stages takes it first, before
     * any stage or figure row: the totals' triggers lock stage, commission, figure in that order, and a
     * transaction writing several stages, or a figure and then its commission, would otherwise wait for
     * another that holds one and wants the next (a deadlock; migrations/20270202120000-figure-totals.ts).
     */
    lockCommission: (trx: Db, studioId: number, of: { commissionId: number } | { figureId: number } | { stageId: number }) =>
      trx('commissions')
        .where('studio_id', studioId)
        .whereIn(
          'id',
          'commissionId' in of
            ? [of.commissionId]
            : trx('figureId' in of ? 'figures' : 'stages')
                .where({ studio_id: studioId, id: 'figureId' in of ? of.figureId : of.stageId })
                .select('commission_id'),
        )
        .forNoKeyUpdate()
        .first('id'),
    touchCommission: (trx: Db, studioId: number, commissionId: number, now: string) => trx('commissions').where({ studio_id: studioId, id: commissionId }).update({ updated_at: now }),
    nextPosition: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('figures').where({ studio_id: studioId, commission_id: commissionId }).max({ p: 'position' }).first().then((r) => Number(r?.p ?? 0) + 1),
    async insertFigure(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('figures').insert(row).returning('id');
      return insertedId(r);
    },
    insertStages: (trx: Db, rows: Record<string, unknown>[]) => (rows.length ? trx('stages').insert(rows) : Promise.resolve()),
    figure: (studioId: number, figureId: number, trx: Db = db) => figures(trx, studioId).where('f.id', figureId).first() as Promise<FigureRow | undefined>,
    updateFigure: (trx: Db, studioId: number, figureId: number, patch: Record<string, unknown>) => trx('figures').where({ studio_id: studioId, id: figureId }).update(patch),
    deleteFigure: (trx: Db, studioId: number, figureId: number) => trx('figures').where({ studio_id: studioId, id: figureId }).delete(),
    stagesOfFigure: (studioId: number, figureId: number, trx: Db = db) =>
      stages(trx, studioId).where('s.figure_id', figureId).orderBy('s.position') as Promise<StageRow[]>,
    stageContext: (studioId: number, stageId: number, trx: Db = db) =>
      stages(trx, studioId)
        .join('figures as f', 'f.id', 's.figure_id')
        .join('commissions as c', 'c.id', 's.commission_id')
        .where('s.id', stageId)
        .first('f.name as figure_name', 'c.title as commission_title', 'c.status as commission_status', 'c.client_id') as Promise<StageContext | undefined>,
    updateStage: (trx: Db, studioId: number, stageId: number, patch: Record<string, unknown>) => trx('stages').where({ studio_id: studioId, id: stageId }).update(patch),

    /** Figures of some commissions (or some figures), their stages and the minutes logged per stage: three queries in all. */
    async load(studioId: number, by: { commissionIds?: number[]; figureIds?: number[] }, trx: Db = db) {
      const fq = figures(trx, studioId).orderBy([{ column: 'f.commission_id' }, { column: 'f.position' }, { column: 'f.id' }]);
      const sq = stages(trx, studioId).orderBy([{ column: 's.figure_id' }, { column: 's.position' }]);
      const lq = trx('time_entries').where('studio_id', studioId).whereNotNull('ended_at').groupBy('stage_id').select('stage_id').sum({ minutes: 'minutes' });
      if (by.commissionIds) {
        fq.whereIn('f.commission_id', by.commissionIds);
        // Commission first in the order and the grouping, so the (studio_id, commission_id) indexes answer
        // even before the planner has statistics (by figure alone it walks every stage of the studio).
        sq.whereIn('s.commission_id', by.commissionIds).clearOrder().orderBy([{ column: 's.commission_id' }, { column: 's.figure_id' }, { column: 's.position' }]);
        lq.whereIn('commission_id', by.commissionIds).clearGroup().groupBy(['commission_id', 'stage_id']);
      }
      if (by.figureIds) {
        fq.whereIn('f.id', by.figureIds);
        sq.whereIn('s.figure_id', by.figureIds);
        lq.whereIn('figure_id', by.figureIds);
      }
      // In a transaction the three go one after another: a PostgreSQL connection runs one query at a time
      // (node-postgres queues the rest, which it deprecates); outside one, the pool runs them side by side.
      const [figureRows, stageRows, logged] = trx.isTransaction ? [await fq, await sq, await lq] : await Promise.all([fq, sq, lq]);
      return {
        figures: figureRows as FigureRow[],
        stages: stageRows as StageRow[],
        logged: new Map((logged as { stage_id: number; minutes: number | string | null }[]).map((l) => [l.stage_id, Number(l.minutes ?? 0)])),
      };
    },
  };
}

export type FiguresRepository = ReturnType<typeof figuresRepository>;
