import { boardStatuses, type StageStatus } from '../../../shared/commission-lifecycle';
import type { BoardQuery } from '../../../shared/schemas/commissions';
import type { Db } from '../../lib/db';
import { scheduleVersion } from '../../lib/version-cache';

/**
 * A figure of the page with its commission, its painter and what the figure row keeps of its stages
 * (totals and current stage: triggers of migrations/20270202120000-figure-totals.ts keep them).
 */
export type BoardFigureRow = {
  figure_id: number;
  name: string;
  quantity: number;
  painter_id: number | null;
  painter_name: string | null;
  commission_id: number;
  title: string;
  due_date: string | null;
  stage_count: number;
  stages_skipped: number;
  stages_done: number;
  minutes_total: number;
  minutes_done: number;
  /** The current stage (null when every stage is done or skipped). */
  stage_id: number | null;
  template_key: string | null;
  stage_name: string | null;
  stage_position: number | null;
  stage_status: StageStatus | null;
  stage_hazards: string | null;
};
/** A stage that makes the next one wait (drying, curing) once done. */
export type BoardWaitRow = { figure_id: number; position: number; status: StageStatus; done_at: string | null; wait_minutes: number };

/** The board's order of commissions: due date with undated last, then priority (high, normal, low), then id. */
const undatedLast = 'case when c.due_date is null then 1 else 0 end';
const priorityRank = "case c.priority when 'high' then 0 when 'normal' then 1 else 2 end";

export function boardRepository(db: Db) {
  /** The studio's booked and on-the-bench commissions that pass the commission filters (the (studio, status) index). */
  const commissions = (studioId: number, q: BoardQuery) => {
    const qb = db('commissions as c').where('c.studio_id', studioId).whereIn('c.status', boardStatuses);
    if (q.commissionId) qb.where('c.id', q.commissionId);
    if (q.dueBefore) qb.whereNotNull('c.due_date').where('c.due_date', '<=', q.dueBefore);
    return qb;
  };

  return {
    /**
     * The studio's schedule version: database triggers move it with every committed change to a row the
     * board reads (migrations/20270121120000-schedule-version.ts, 20270203120000-board-version.ts).
     * Undefined when there is no such studio.
     */
    version: (studioId: number) => scheduleVersion(db, studioId),
    /**
     * One page of the figures of the board's commissions, in the board's order (the commission order, then
     * figure id), with their painters. The commissions (a hundred or so rows, narrow) are sorted first, in a
     * materialized CTE; the figures are then read commission by commission through the
     * (studio_id, commission_id) index, which hands them out in id order, so only the figures of a
     * commission need sorting (SQLite: "USE TEMP B-TREE FOR LAST TERM OF ORDER BY") and the scan stops once
     * the page is full, instead of joining and sorting every figure of the board with all its columns.
     */
    page(studioId: number, q: BoardQuery): Promise<BoardFigureRow[]> {
      const sorted = commissions(studioId, q)
        .select('c.id', 'c.studio_id', 'c.title', 'c.due_date', db.raw(`${undatedLast} as undated`), db.raw(`${priorityRank} as rank`))
        .orderBy([{ column: 'undated' }, { column: 'c.due_date' }, { column: 'rank' }, { column: 'c.id' }]);
      const qb = db
        .withMaterialized('c', sorted)
        .from('c')
        .join('figures as f', (j) => j.on('f.studio_id', '=', 'c.studio_id').andOn('f.commission_id', '=', 'c.id'))
        .leftJoin('users as p', 'p.id', 'f.painter_id')
        // by its primary key, for the page's rows only
        .leftJoin('stages as s', (j) => j.on('s.id', '=', 'f.current_stage_id').andOn('s.studio_id', '=', 'f.studio_id'))
        .select(
          'f.id as figure_id',
          'f.name',
          'f.quantity',
          'f.painter_id',
          'p.name as painter_name',
          'c.id as commission_id',
          'c.title',
          'c.due_date',
          'f.stage_count',
          'f.stages_skipped',
          'f.stages_done',
          'f.minutes_total',
          'f.minutes_done',
          's.id as stage_id',
          's.template_key',
          's.name as stage_name',
          's.position as stage_position',
          's.status as stage_status',
          's.hazards as stage_hazards',
        )
        .orderBy([{ column: 'c.undated' }, { column: 'c.due_date' }, { column: 'c.rank' }, { column: 'c.id' }, { column: 'f.id' }])
        .limit(q.limit)
        .offset(q.offset);
      if (q.painterId) qb.where('f.painter_id', q.painterId);
      return qb as unknown as Promise<BoardFigureRow[]>;
    },
    /**
     * How many figures the board holds with these filters: without a painter, the sum of the commissions'
     * own figure counts (kept by triggers, migrations/20270120120000-commission-totals.ts), read from the
     * commission rows alone; with one, the figures counted.
     */
    async count(studioId: number, q: BoardQuery): Promise<number> {
      const qb = commissions(studioId, q);
      if (q.painterId) qb.join('figures as f', (j) => j.on('f.studio_id', '=', 'c.studio_id').andOn('f.commission_id', '=', 'c.id')).where('f.painter_id', q.painterId).count({ n: '*' });
      else qb.sum({ n: 'c.figure_count' });
      const r = (await qb.first()) as { n: number | string | null } | undefined;
      return Number(r?.n ?? 0);
    },
    // Only wait_minutes is filtered in SQL: a filter on status as well lets SQLite pick the (studio, status)
    // index and walk every done stage of the studio instead of the page's figures. Written out, not bound,
    // so SQLite can use the partial index on stages that have a wait (20270202120000-figure-totals.ts).
    waits: (studioId: number, figureIds: number[]) =>
      db('stages')
        .where('studio_id', studioId)
        .whereIn('figure_id', figureIds)
        .whereRaw('wait_minutes > 0')
        .select('figure_id', 'position', 'status', 'done_at', 'wait_minutes') as Promise<BoardWaitRow[]>,
  };
}

export type BoardRepository = ReturnType<typeof boardRepository>;
