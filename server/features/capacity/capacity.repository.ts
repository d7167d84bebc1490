import type { DayOffKind } from '../../../shared/schemas/capacity';
import type { Db } from '../../lib/db';

export type HoursRow = { user_id: number; weekday: number; start_time: string; end_time: string };
export type DayOffRow = { id: number; user_id: number | null; kind: DayOffKind; date_from: string; date_to: string; note: string | null };
export type TeamRow = { user_id: number; name: string; role: 'owner' | 'painter' };

const insertedId = (row: unknown) => (typeof row === 'object' && row !== null ? (row as { id: number }).id : (row as number));

/** Working hours and days off; every query takes the studio id first. */
export function capacityRepository(db: Db) {
  return {
    timeZone: (studioId: number, trx: Db = db) => trx('studios').where({ id: studioId }).first('timezone').then((r) => (r?.timezone as string | undefined) ?? 'UTC'),
    /** Owners and painters of the studio: the people who paint. Owners first, then by name. */
    team: (studioId: number, trx: Db = db) =>
      trx('memberships as m')
        .join('users as u', 'u.id', 'm.user_id')
        .where('m.studio_id', studioId)
        .whereIn('m.role', ['owner', 'painter'])
        .orderBy([{ column: 'm.role' }, { column: 'u.name' }, { column: 'u.id' }])
        .select('u.id as user_id', 'u.name', 'm.role') as Promise<TeamRow[]>,
    hours: (studioId: number, trx: Db = db) =>
      trx('capacity_hours').where({ studio_id: studioId }).orderBy([{ column: 'user_id' }, { column: 'weekday' }, { column: 'start_time' }]).select('user_id', 'weekday', 'start_time', 'end_time') as Promise<HoursRow[]>,
    async replaceHours(trx: Db, studioId: number, userId: number, rows: { weekday: number; start_time: string; end_time: string }[], now: string) {
      await trx('capacity_hours').where({ studio_id: studioId, user_id: userId }).delete();
      if (rows.length) await trx('capacity_hours').insert(rows.map((r) => ({ ...r, studio_id: studioId, user_id: userId, updated_at: now })));
    },
    /** Days off that end on or after `fromDate` (all when not given), earliest first. */
    daysOff: (studioId: number, fromDate?: string, trx: Db = db) => {
      const q = trx('capacity_days_off').where({ studio_id: studioId });
      if (fromDate) q.where('date_to', '>=', fromDate);
      return q.orderBy([{ column: 'date_from' }, { column: 'id' }]).select('id', 'user_id', 'kind', 'date_from', 'date_to', 'note') as Promise<DayOffRow[]>;
    },
    dayOff: (studioId: number, id: number, trx: Db = db) =>
      trx('capacity_days_off').where({ studio_id: studioId, id }).first('id', 'user_id', 'kind', 'date_from', 'date_to', 'note') as Promise<DayOffRow | undefined>,
    async insertDayOff(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('capacity_days_off').insert(row).returning('id');
      return insertedId(r);
    },
    deleteDayOff: (trx: Db, studioId: number, id: number) => trx('capacity_days_off').where({ studio_id: studioId, id }).delete(),
  };
}

export type CapacityRepository = ReturnType<typeof capacityRepository>;
