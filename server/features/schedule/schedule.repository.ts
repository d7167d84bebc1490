import type { CommissionStatus, StageStatus } from '../../../shared/commission-lifecycle';
import type { Db } from '../../lib/db';
import { scheduleVersion } from '../../lib/version-cache';

export type QueueRow = {
  id: number;
  title: string;
  status: CommissionStatus;
  client_id: number;
  client_name: string;
  due_date: string | null;
  queue_position: number | null;
  created_at: string;
};
export type WorkFigureRow = { id: number; commission_id: number; name: string; quantity: number; painter_id: number | null; position: number };
export type WorkStageRow = { id: number; figure_id: number; name: string; position: number; status: StageStatus; estimate_minutes: number; wait_minutes: number; done_at: string | null };

/** The statuses whose commissions hold places in the queue. */
export const QUEUE_STATUSES: CommissionStatus[] = ['booked', 'on_bench'];

const insertedOrder = (a: QueueRow, b: QueueRow) =>
  (a.queue_position ?? Number.MAX_SAFE_INTEGER) - (b.queue_position ?? Number.MAX_SAFE_INTEGER) || a.created_at.localeCompare(b.created_at) || a.id - b.id;

/** The queue and the work left in it; every query takes the studio id first. */
export function scheduleRepository(db: Db) {
  return {
    /**
     * Booked and on-the-bench commissions in queue order. Those never placed (newly booked) follow the
     * placed ones, oldest first, until the owner moves them.
     */
    async queue(studioId: number, trx: Db = db): Promise<QueueRow[]> {
      const rows = (await trx('commissions as c')
        .join('clients as cl', 'cl.id', 'c.client_id')
        .where('c.studio_id', studioId)
        .whereIn('c.status', QUEUE_STATUSES)
        .select('c.id', 'c.title', 'c.status', 'c.client_id', 'cl.name as client_name', 'c.due_date', 'c.queue_position', 'c.created_at')) as QueueRow[];
      return rows.sort(insertedOrder);
    },
    /** One commission (any status) with its client, for "earliest delivery" of one being quoted. */
    commission: (studioId: number, id: number, trx: Db = db) =>
      trx('commissions as c')
        .join('clients as cl', 'cl.id', 'c.client_id')
        .where({ 'c.studio_id': studioId, 'c.id': id })
        .first('c.id', 'c.title', 'c.status', 'c.client_id', 'cl.name as client_name', 'c.due_date', 'c.queue_position', 'c.created_at') as Promise<QueueRow | undefined>,
    /** Figures, stages and closed logged minutes per stage of some commissions: three queries. */
    async work(studioId: number, commissionIds: number[], trx: Db = db) {
      if (commissionIds.length === 0) return { figures: [] as WorkFigureRow[], stages: [] as WorkStageRow[], logged: new Map<number, number>() };
      const [figures, stages, logged] = await Promise.all([
        trx('figures')
          .where('studio_id', studioId)
          .whereIn('commission_id', commissionIds)
          .orderBy([{ column: 'commission_id' }, { column: 'position' }, { column: 'id' }])
          .select('id', 'commission_id', 'name', 'quantity', 'painter_id', 'position'),
        trx('stages')
          .where('studio_id', studioId)
          .whereIn('commission_id', commissionIds)
          // By commission first, so the (studio_id, commission_id) index finds the rows (by figure alone the
          // planner walks every stage of the studio to skip the sort).
          .orderBy([{ column: 'commission_id' }, { column: 'figure_id' }, { column: 'position' }, { column: 'id' }])
          .select('id', 'figure_id', 'name', 'position', 'status', 'estimate_minutes', 'wait_minutes', 'done_at'),
        trx('time_entries')
          .where('studio_id', studioId)
          .whereIn('commission_id', commissionIds)
          .whereNotNull('ended_at')
          .groupBy(['commission_id', 'stage_id'])
          .select('stage_id')
          .sum({ minutes: 'minutes' }),
      ]);
      return {
        figures: figures as WorkFigureRow[],
        stages: stages as WorkStageRow[],
        logged: new Map((logged as { stage_id: number; minutes: number | string | null }[]).map((l) => [l.stage_id, Number(l.minutes ?? 0)])),
      };
    },
    /** Writes positions 1..n in the given order. */
    async setOrder(trx: Db, studioId: number, ids: number[]) {
      // updated_at stays: a place in the queue is the studio's plan, not a change to the commission.
      for (const [i, id] of ids.entries()) await trx('commissions').where({ studio_id: studioId, id }).update({ queue_position: i + 1 });
    },
    /**
     * The studio's schedule version: database triggers move it with every committed change to a row the
     * forecast reads (migrations/20270121120000-schedule-version.ts). Undefined when there is no such studio.
     */
    version: (studioId: number) => scheduleVersion(db, studioId),
    userNames: (ids: number[], trx: Db = db) =>
      ids.length ? (trx('users').whereIn('id', ids).select('id', 'name') as Promise<{ id: number; name: string }[]>) : Promise.resolve([]),
  };
}

export type ScheduleRepository = ReturnType<typeof scheduleRepository>;
