import type { CommissionStatus, Priority } from '../../../shared/commission-lifecycle';
import type { CommissionListQuery } from '../../../shared/schemas/commissions';
import type { Db } from '../../lib/db';
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

export type CommissionListRow = CommissionRow & {
  figure_count: number | string | null;
  model_count: number | string | null;
  stages: number | string | null;
  skipped: number | string | null;
  done: number | string | null;
  minutes_total: number | string | null;
  minutes_done: number | string | null;
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

const likeEscaped = (q: string) => `%${q.toLowerCase().replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;

/** Commissions of one studio; every query takes the studio id first. */
export function commissionsRepository(db: Db) {
  const base = (trx: Db, studioId: number) => trx('commissions as c').join('clients as cl', 'cl.id', 'c.client_id').where('c.studio_id', studioId);
  return {
    clientExists: (studioId: number, clientId: number, trx: Db = db) => trx('clients').where({ studio_id: studioId, id: clientId }).first('id').then(Boolean),
    async insert(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('commissions').insert(row).returning('id');
      return typeof r === 'object' ? (r.id as number) : (r as number);
    },
    get: (studioId: number, id: number, trx: Db = db) => base(trx, studioId).where('c.id', id).first(columns) as Promise<CommissionRow | undefined>,
    update: (trx: Db, studioId: number, id: number, patch: Record<string, unknown>) => trx('commissions').where({ studio_id: studioId, id }).update(patch),
    lastQueuePosition: (studioId: number, trx: Db = db) =>
      trx('commissions').where({ studio_id: studioId }).max({ p: 'queue_position' }).first().then((r) => Number(r?.p ?? 0)),

    /**
     * One page of commissions, newest first, with each one's figure count and stage totals: the page (one
     * query), its count (one), then the figures and the stages of the page's commissions only, summed by
     * commission (one grouped query each), so a request costs four queries however many stages the studio
     * holds. The totals are summed on every read rather than kept as counters on the commission: stages
     * change in many places (figures, quotes, the bench, time), and a sum over the page's own stages,
     * read from the (studio_id, commission_id, status, estimate_minutes) index, cannot drift from them.
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
      const { rows, total } = await pageRows<CommissionRow>(
        filter(base(db, studioId))
          .select(columns)
          .orderBy([
            { column: 'c.created_at', order: 'desc' },
            { column: 'c.id', order: 'desc' },
          ]),
        q,
      );
      const ids = rows.map((r) => r.id);
      const [stageRows, figureRows] = ids.length
        ? await Promise.all([
            db('stages')
              .where('studio_id', studioId)
              .whereIn('commission_id', ids)
              .groupBy('commission_id')
              .select('commission_id')
              .count({ stages: '*' })
              .select(
                db.raw("sum(case when status = 'skipped' then 1 else 0 end) as skipped"),
                db.raw("sum(case when status = 'done' then 1 else 0 end) as done"),
                db.raw("sum(case when status <> 'skipped' then estimate_minutes else 0 end) as minutes_total"),
                db.raw("sum(case when status = 'done' then estimate_minutes else 0 end) as minutes_done"),
              ),
            db('figures').where('studio_id', studioId).whereIn('commission_id', ids).groupBy('commission_id').select('commission_id').count({ figure_count: '*' }).sum({ model_count: 'quantity' }),
          ])
        : [[], []];
      const stagesOf = new Map((stageRows as Record<string, number | string | null>[]).map((r) => [Number(r.commission_id), r]));
      const figuresOf = new Map((figureRows as Record<string, number | string | null>[]).map((r) => [Number(r.commission_id), r]));
      const listRows = rows.map((r): CommissionListRow => {
        const st = stagesOf.get(r.id);
        const ft = figuresOf.get(r.id);
        return {
          ...r,
          figure_count: ft?.figure_count ?? 0,
          model_count: ft?.model_count ?? 0,
          stages: st?.stages ?? 0,
          skipped: st?.skipped ?? 0,
          done: st?.done ?? 0,
          minutes_total: st?.minutes_total ?? 0,
          minutes_done: st?.minutes_done ?? 0,
        };
      });
      return { rows: listRows, total };
    },
  };
}

export type CommissionsRepository = ReturnType<typeof commissionsRepository>;
