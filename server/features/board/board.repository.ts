import { boardStatuses, type Priority, type StageStatus } from '../../../shared/commission-lifecycle';
import type { BoardQuery } from '../../../shared/schemas/commissions';
import type { Db } from '../../lib/db';
import { pageRows } from '../../lib/page';

export type BoardFigureRow = {
  figure_id: number;
  name: string;
  quantity: number;
  painter_id: number | null;
  painter_name: string | null;
  commission_id: number;
  title: string;
  due_date: string | null;
  priority: Priority;
};

/** Each figure's stage totals and the position of its current stage (the first to do or in work), summed in the database. */
export type BoardTotalsRow = {
  figure_id: number;
  stages: number;
  skipped: number | string | null;
  done: number | string | null;
  minutes_total: number | string | null;
  minutes_done: number | string | null;
  current_position: number | null;
};
/** A figure's current stage, as its card shows it. */
export type BoardStageRow = { id: number; figure_id: number; template_key: string; name: string; position: number; status: StageStatus; hazards: string | null };
/** A stage that makes the next one wait (drying, curing) once done. */
export type BoardWaitRow = { figure_id: number; position: number; status: StageStatus; done_at: string | null; wait_minutes: number };

export function boardRepository(db: Db) {
  return {
    /**
     * One page of the figures of the studio's booked and on-the-bench commissions, filtered, in the board's
     * order (due date with undated last, then priority, commission and figure), with their painters, and how
     * many there are.
     */
    figures(studioId: number, q: BoardQuery): Promise<{ rows: BoardFigureRow[]; total: number }> {
      // Read from the studio's board commissions (the (studio, status) index) to their figures: starting from
      // the figures walks every figure the studio ever had.
      const qb = db('commissions as c')
        .join('figures as f', (j) => j.on('f.commission_id', '=', 'c.id').andOn('f.studio_id', '=', 'c.studio_id'))
        .leftJoin('users as p', 'p.id', 'f.painter_id')
        .where('c.studio_id', studioId)
        .whereIn('c.status', boardStatuses)
        .select('f.id as figure_id', 'f.name', 'f.quantity', 'f.painter_id', 'p.name as painter_name', 'c.id as commission_id', 'c.title', 'c.due_date', 'c.priority')
        .orderByRaw("case when c.due_date is null then 1 else 0 end, c.due_date, case c.priority when 'high' then 0 when 'normal' then 1 else 2 end, c.id, f.id");
      if (q.painterId) qb.where('f.painter_id', q.painterId);
      if (q.commissionId) qb.where('c.id', q.commissionId);
      if (q.dueBefore) qb.whereNotNull('c.due_date').where('c.due_date', '<=', q.dueBefore);
      return pageRows<BoardFigureRow>(qb, q);
    },
    /**
     * What the cards need of the page's stages, in three small answers instead of every stage (a page of 100
     * figures holds about 1,000): totals and the current stage's place per figure, grouped in the database;
     * each figure's current stage; the stages with a wait after them. Building a thousand rows into objects
     * cost more than everything else the board does.
     */
    totals: (studioId: number, figureIds: number[]) =>
      db('stages')
        .where('studio_id', studioId)
        .whereIn('figure_id', figureIds)
        .groupBy('figure_id')
        .select('figure_id')
        .count({ stages: '*' })
        .select(
          db.raw("sum(case when status = 'skipped' then 1 else 0 end) as skipped"),
          db.raw("sum(case when status = 'done' then 1 else 0 end) as done"),
          db.raw("sum(case when status <> 'skipped' then estimate_minutes else 0 end) as minutes_total"),
          db.raw("sum(case when status = 'done' then estimate_minutes else 0 end) as minutes_done"),
          db.raw("min(case when status in ('todo', 'working') then position end) as current_position"),
        ) as unknown as Promise<BoardTotalsRow[]>,
    current: (studioId: number, figureIds: number[]) =>
      db('stages as s')
        .join(
          db('stages')
            .where('studio_id', studioId)
            .whereIn('figure_id', figureIds)
            .whereIn('status', ['todo', 'working'])
            .groupBy('figure_id')
            .select('figure_id', db.raw('min(position) as position'))
            .as('cur'),
          (j) => j.on('cur.figure_id', '=', 's.figure_id').andOn('cur.position', '=', 's.position'),
        )
        .where('s.studio_id', studioId)
        .whereIn('s.status', ['todo', 'working'])
        .select('s.id', 's.figure_id', 's.template_key', 's.name', 's.position', 's.status', 's.hazards')
        .orderBy('s.id') as Promise<BoardStageRow[]>,
    // Only wait_minutes is filtered in SQL: a filter on status as well lets SQLite pick the (studio, status)
    // index and walk every done stage of the studio instead of the page's figures.
    waits: (studioId: number, figureIds: number[]) =>
      db('stages')
        .where('studio_id', studioId)
        .whereIn('figure_id', figureIds)
        .where('wait_minutes', '>', 0)
        .select('figure_id', 'position', 'status', 'done_at', 'wait_minutes') as Promise<BoardWaitRow[]>,
  };
}

export type BoardRepository = ReturnType<typeof boardRepository>;
