import type { CommissionStatus, Priority } from '../../../shared/commission-lifecycle';
import type { CommissionListQuery } from '../../../shared/schemas/commissions';
import type { Db } from '../../lib/db';
import { scheduleVersion } from '../../lib/version-cache';
import { pageRows } from '../../lib/page';

export type CommissionRow = {
  id: number;
  client_id: number;
  client_name: string;
  title: string;
  brief: string | null;
  scheme_notes: string | null;
  due_date: string | null;
  priority: Priority;
  status: CommissionStatus;
  status_before_hold: CommissionStatus | null;
  cancel_reason: string | null;
  created_at: string;
  updated_at: string;
};

/** A commission as its list shows it (no brief or notes), with the totals its row keeps (migrations/20270120120000-commission-totals.ts). */
export type CommissionListRow = Omit<CommissionRow, 'brief' | 'scheme_notes' | 'status_before_hold' | 'cancel_reason'> & {
  figure_count: number;
  model_count: number;
  stage_count: number;
  stages_skipped: number;
  stages_done: number;
  minutes_total: number;
  minutes_done: number;
};

const columns = [
  'c.id',
  'c.client_id',
  'cl.name as client_name',
  'c.title',
  'c.brief',
  'c.scheme_notes',
  'c.due_date',
  'c.priority',
  'c.status',
  'c.status_before_hold',
  'c.cancel_reason',
  'c.created_at',
  'c.updated_at',
];
/** What a list row shows: the long texts stay out of a page of fifty. */
const listColumns = ['c.id', 'c.client_id', 'cl.name as client_name', 'c.title', 'c.due_date', 'c.priority', 'c.status', 'c.created_at', 'c.updated_at'];
const totalColumns = ['c.figure_count', 'c.model_count', 'c.stage_count', 'c.stages_skipped', 'c.stages_done', 'c.minutes_total', 'c.minutes_done'];

const likeEscaped = (q: string) => `%${q.toLowerCase().replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;

/** Commissions of one studio; every query takes the studio id first. */
export function commissionsRepository(db: Db) {
  const base = (trx: Db, studioId: number) => trx('commissions as c').join('clients as cl', 'cl.id', 'c.client_id').where('c.studio_id', studioId);
  return {
    /** The studio's client, if it is one, and whether it was erased (a placeholder kept for invoices only). */
    client: (studioId: number, clientId: number, trx: Db = db) =>
      trx('clients').where({ studio_id: studioId, id: clientId }).first('id', 'erased_at') as Promise<{ id: number; erased_at: string | null } | undefined>,
    async insert(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('commissions').insert(row).returning('id');
      return typeof r === 'object' ? (r.id as number) : (r as number);
    },
    get: (studioId: number, id: number, trx: Db = db) => base(trx, studioId).where('c.id', id).first(columns) as Promise<CommissionRow | undefined>,
    update: (trx: Db, studioId: number, id: number, patch: Record<string, unknown>) => trx('commissions').where({ studio_id: studioId, id }).update(patch),
    /**
     * The studio's schedule version: database triggers move it with every committed change to a row the
     * list reads (migrations/20270204120000-commission-list-version.ts lists them). Undefined when there is
     * no such studio.
     */
    version: (studioId: number) => scheduleVersion(db, studioId),
    lastQueuePosition: (studioId: number, trx: Db = db) =>
      trx('commissions').where({ studio_id: studioId }).max({ p: 'queue_position' }).first().then((r) => Number(r?.p ?? 0)),

    /**
     * One page of commissions, newest first, with each one's figure count and stage totals: the page (one
     * query) and its count (one), however many stages the studio holds. The totals are columns of the
     * commission row, kept by triggers on `figures` and `stages` (migrations/20270120120000-commission-totals.ts)
     * rather than summed over the page's stages on every read (5,000 stage rows for a page of 50 on the
     * bench's generated database). They cannot drift from the rows they count: a trigger runs inside the statement that inserts,
     * updates or deletes a figure or stage, in its transaction, whichever code path or cascade wrote it, so
     * the totals commit or roll back with the change. tests/api/commission-totals.test.ts checks them
     * against fresh sums after each kind of change, on both engines.
     */
    async list(studioId: number, q: CommissionListQuery & { onlyClientId?: number }) {
      const filter = (qb: ReturnType<typeof base>) => {
        if (q.onlyClientId !== undefined) qb.where('c.client_id', q.onlyClientId);
        if (q.clientId) qb.where('c.client_id', q.clientId);
        if (q.status?.length) qb.whereIn('c.status', q.status);
        if (q.q) {
          const like = likeEscaped(q.q);
          qb.where((w) => w.whereRaw("lower(c.title) like ? escape '\\'", [like]).orWhereRaw("lower(cl.name) like ? escape '\\'", [like]));
        }
        return qb;
      };
      return pageRows<CommissionListRow>(
        filter(base(db, studioId))
          .select([...listColumns, ...totalColumns])
          .orderBy([
            { column: 'c.created_at', order: 'desc' },
            { column: 'c.id', order: 'desc' },
          ]),
        q,
      );
    },
  };
}

export type CommissionsRepository = ReturnType<typeof commissionsRepository>;
