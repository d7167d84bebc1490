import type { CommissionStatus } from '../../../shared/commission-lifecycle';
import { readFirst, type Db } from '../../lib/db';
import type { PageParams } from '../../../shared/schemas/common';
import { pageRows } from '../../lib/page';

export type TimeRow = {
  id: number;
  studio_id: number;
  commission_id: number;
  figure_id: number;
  stage_id: number;
  user_id: number;
  user_name: string;
  source: 'timer' | 'manual';
  started_at: string;
  ended_at: string | null;
  minutes: number | null;
  note: string | null;
  stage_name: string;
  figure_name: string;
  commission_title: string;
  commission_status: CommissionStatus;
};

const columns = [
  't.id',
  't.studio_id',
  't.commission_id',
  't.figure_id',
  't.stage_id',
  't.user_id',
  'u.name as user_name',
  't.source',
  't.started_at',
  't.ended_at',
  't.minutes',
  't.note',
  's.name as stage_name',
  'f.name as figure_name',
  'c.title as commission_title',
  'c.status as commission_status',
];

/** Time entries; queries take the studio id first, except the per-person timer look-up, which is the person's own across studios. */
export function timeRepository(db: Db) {
  const base = (trx: Db) =>
    trx('time_entries as t')
      .join('users as u', 'u.id', 't.user_id')
      .join('stages as s', 's.id', 't.stage_id')
      .join('figures as f', 'f.id', 't.figure_id')
      .join('commissions as c', 'c.id', 't.commission_id')
      .select(columns);
  return {
    /**
     * The stage's commission and its thread version (migrations/20270209120000-thread-version.ts), in one read
     * on the read-only connection: the access check (the stage, its figure and its commission in this studio,
     * as figures' stageContext joins them) and the kept time list's key. Undefined when there is no such stage.
     */
    stageThread: (studioId: number, stageId: number) =>
      readFirst<{ commission_id: number; thread_version: number | string }>(
        db,
        db('stages as s')
          .join('figures as f', 'f.id', 's.figure_id')
          .join('commissions as c', 'c.id', 's.commission_id')
          .where({ 's.studio_id': studioId, 's.id': stageId })
          .select('c.id as commission_id', 'c.thread_version'),
      ),
    /** One page of a stage's time, oldest first. */
    listForStage: (studioId: number, stageId: number, q: PageParams) =>
      pageRows<TimeRow>(base(db).where({ 't.studio_id': studioId, 't.stage_id': stageId }).orderBy([{ column: 't.started_at' }, { column: 't.id' }]), q),
    get: (studioId: number, id: number, trx: Db = db) => base(trx).where({ 't.studio_id': studioId, 't.id': id }).first() as Promise<TimeRow | undefined>,
    /**
     * Holds the person's row until the transaction ends, so that their timer starts and stops take turns:
     * on PostgreSQL two devices' requests would otherwise both find no timer running and both start one.
     * (SQLite runs one transaction at a time; Knex leaves FOR UPDATE out there.)
     */
    lockPerson: (trx: Db, userId: number) => trx('users').where({ id: userId }).forUpdate().first('id'),
    /** Every running timer of a person, in any studio (one runs at a time; starting another stops these). */
    runningOf: (userId: number, trx: Db = db) => base(trx).where('t.user_id', userId).whereNull('t.ended_at') as Promise<TimeRow[]>,
    runningIn: (studioId: number, userId: number, trx: Db = db) =>
      base(trx).where({ 't.studio_id': studioId, 't.user_id': userId }).whereNull('t.ended_at').orderBy('t.started_at', 'desc').first() as Promise<TimeRow | undefined>,
    async insert(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('time_entries').insert(row).returning('id');
      return typeof r === 'object' ? (r.id as number) : (r as number);
    },
    update: (trx: Db, studioId: number, id: number, patch: Record<string, unknown>) => trx('time_entries').where({ studio_id: studioId, id }).update(patch),
    delete: (trx: Db, studioId: number, id: number) => trx('time_entries').where({ studio_id: studioId, id }).delete(),
    studioTimezone: (studioId: number) => db('studios').where({ id: studioId }).first('timezone').then((r) => (r?.timezone as string | undefined) ?? 'UTC'),
  };
}

export type TimeRepository = ReturnType<typeof timeRepository>;
