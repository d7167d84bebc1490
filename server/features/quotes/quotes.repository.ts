import type { CommissionStatus } from '../../../shared/commission-lifecycle';
import type { QuoteResult } from '../../../shared/pricing';
import type { PriceTable } from '../../../shared/schemas/price-table';
import type { QuoteInput, QuoteListQuery, QuoteStatus } from '../../../shared/schemas/quotes';
import type { Db } from '../../lib/db';
import { listsVersion } from '../../lib/version-cache';

export type QuoteRow = {
  id: number;
  studio_id: number;
  commission_id: number;
  commission_title: string;
  client_id: number;
  client_name: string;
  version: number;
  status: QuoteStatus;
  input: QuoteInput;
  price_table: PriceTable;
  result: QuoteResult;
  currency: string;
  total: number;
  deposit: number;
  balance: number;
  quote_date: string;
  valid_until: string;
  show_hours: boolean;
  terms: string;
  sent_at: string | null;
  decided_at: string | null;
  decided_by: number | null;
  decided_by_name: string | null;
  accepted_name: string | null;
  accepted_ip: string | null;
  decision_comment: string | null;
  created_at: string;
  updated_at: string;
};

const columns = [
  'q.id',
  'q.studio_id',
  'q.commission_id',
  'c.title as commission_title',
  'q.client_id',
  'cl.name as client_name',
  'q.version',
  'q.status',
  'q.input_json',
  'q.price_table_json',
  'q.result_json',
  'q.currency',
  'q.total',
  'q.deposit',
  'q.balance',
  'q.quote_date',
  'q.valid_until',
  'q.show_hours',
  'q.terms',
  'q.sent_at',
  'q.decided_at',
  'q.decided_by',
  'u.name as decided_by_name',
  'q.accepted_name',
  'q.accepted_ip',
  'q.decision_comment',
  'q.created_at',
  'q.updated_at',
];

/** What a list row shows: no input, table or result (the priced JSON stays unread in lists), terms or decision. */
export type QuoteListRow = Pick<
  QuoteRow,
  'id' | 'commission_id' | 'commission_title' | 'client_id' | 'client_name' | 'version' | 'status' | 'currency' | 'total' | 'deposit' | 'balance' | 'valid_until' | 'sent_at' | 'decided_at' | 'created_at'
>;
const listColumns = [
  'q.id',
  'q.commission_id',
  'c.title as commission_title',
  'q.client_id',
  'cl.name as client_name',
  'q.version',
  'q.status',
  'q.currency',
  'q.total',
  'q.deposit',
  'q.balance',
  'q.valid_until',
  'q.sent_at',
  'q.decided_at',
  'q.created_at',
];
/** Built key by key: a spread copy of a driver's row object is slow. */
const toListRow = (r: Record<string, unknown>): QuoteListRow => ({
  id: r.id as number,
  commission_id: r.commission_id as number,
  commission_title: r.commission_title as string,
  client_id: r.client_id as number,
  client_name: r.client_name as string,
  version: r.version as number,
  status: r.status as QuoteStatus,
  currency: r.currency as string,
  total: Number(r.total),
  deposit: Number(r.deposit),
  balance: Number(r.balance),
  valid_until: r.valid_until as string,
  sent_at: r.sent_at as string | null,
  decided_at: r.decided_at as string | null,
  created_at: r.created_at as string,
});

function toRow(r: Record<string, unknown>): QuoteRow {
  const { input_json, price_table_json, result_json, ...rest } = r;
  return {
    ...(rest as Omit<QuoteRow, 'input' | 'price_table' | 'result'>),
    input: JSON.parse(String(input_json)),
    price_table: JSON.parse(String(price_table_json)),
    result: JSON.parse(String(result_json)),
    total: Number(r.total),
    deposit: Number(r.deposit),
    balance: Number(r.balance),
    show_hours: Boolean(r.show_hours),
  };
}

/** Quotes of one studio; every query takes the studio id first. */
export function quotesRepository(db: Db) {
  const base = (trx: Db, studioId: number) =>
    trx('quotes as q')
      .join('commissions as c', 'c.id', 'q.commission_id')
      .join('clients as cl', 'cl.id', 'q.client_id')
      .leftJoin('users as u', 'u.id', 'q.decided_by')
      .where('q.studio_id', studioId);

  return {
    /** The version the kept quote list is read under, with the studio's zone (server/lib/version-cache.ts). */
    listsVersion: (studioId: number) => listsVersion(db, studioId),
    commission: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('commissions').where({ studio_id: studioId, id: commissionId }).first('id', 'title', 'status', 'client_id', 'due_date') as Promise<
        { id: number; title: string; status: CommissionStatus; client_id: number; due_date: string | null } | undefined
      >,
    clientContact: (studioId: number, clientId: number, trx: Db = db) =>
      trx('clients as cl')
        .leftJoin('users as u', 'u.id', 'cl.user_id')
        .where({ 'cl.studio_id': studioId, 'cl.id': clientId })
        .first('cl.name', trx.raw('coalesce(cl.email, u.email) as email')) as Promise<{ name: string; email: string | null } | undefined>,
    owners: (studioId: number, trx: Db = db) =>
      trx('memberships as m')
        .join('users as u', 'u.id', 'm.user_id')
        .where({ 'm.studio_id': studioId, 'm.role': 'owner', 'u.email_notices': true })
        .orderBy('u.id')
        .select('u.id', 'u.email', 'u.name') as Promise<{ id: number; email: string; name: string }[]>,
    studio: (studioId: number, trx: Db = db) => trx('studios').where({ id: studioId }).first('name') as Promise<{ name: string } | undefined>,

    async get(studioId: number, id: number, trx: Db = db) {
      const r = await base(trx, studioId).where('q.id', id).first(columns);
      return r ? toRow(r) : undefined;
    },
    async accepted(studioId: number, commissionId: number, trx: Db = db) {
      const r = await base(trx, studioId).where({ 'q.commission_id': commissionId, 'q.status': 'accepted' }).orderBy('q.version', 'desc').first(columns);
      return r ? toRow(r) : undefined;
    },
    nextVersion: (studioId: number, commissionId: number, trx: Db = db) =>
      trx('quotes').where({ studio_id: studioId, commission_id: commissionId }).max({ v: 'version' }).first().then((r) => Number(r?.v ?? 0) + 1),
    async insert(trx: Db, row: Record<string, unknown>) {
      const [r] = await trx('quotes').insert(row).returning('id');
      return typeof r === 'object' ? (r.id as number) : (r as number);
    },
    /** Updates when the quote is still in one of `from` (a guard against two decisions at once); returns whether it did. */
    async update(trx: Db, studioId: number, id: number, patch: Record<string, unknown>, from?: QuoteStatus[]) {
      const qb = trx('quotes').where({ studio_id: studioId, id });
      if (from) qb.whereIn('status', from);
      return (await qb.update(patch)) > 0;
    },
    /** Sent quotes among `ids` become expired (the list's page expires what ran out, in one update). */
    expire: (trx: Db, studioId: number, ids: number[], at: string) =>
      trx('quotes').where({ studio_id: studioId, status: 'sent' }).whereIn('id', ids).update({ status: 'expired', updated_at: at }),
    supersedeOthers: (trx: Db, studioId: number, commissionId: number, exceptId: number, statuses: QuoteStatus[], at: string) =>
      trx('quotes').where({ studio_id: studioId, commission_id: commissionId }).whereNot('id', exceptId).whereIn('status', statuses).update({ status: 'superseded', updated_at: at }),

    async list(studioId: number, q: QuoteListQuery & { onlyClientId?: number; hideDrafts?: boolean }) {
      // The list names no decider: its rows and count need no users join.
      const listBase = () => db('quotes as q').join('commissions as c', 'c.id', 'q.commission_id').join('clients as cl', 'cl.id', 'q.client_id').where('q.studio_id', studioId);
      const filter = (qb: ReturnType<typeof listBase>) => {
        if (q.onlyClientId !== undefined) qb.where('q.client_id', q.onlyClientId);
        if (q.hideDrafts) qb.whereNot('q.status', 'draft');
        if (q.commissionId) qb.where('q.commission_id', q.commissionId);
        if (q.status) qb.where('q.status', q.status);
        if (q.q) {
          const like = `%${q.q.toLowerCase().replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
          qb.where((w) => w.whereRaw("lower(c.title) like ? escape '\\'", [like]).orWhereRaw("lower(cl.name) like ? escape '\\'", [like]));
        }
        return qb;
      };
      const [rows, count] = await Promise.all([
        filter(listBase())
          .select(listColumns)
          .orderBy([{ column: 'q.created_at', order: 'desc' }, { column: 'q.id', order: 'desc' }])
          .limit(q.limit)
          .offset(q.offset),
        // Without a search the count needs no names: every quote has its commission and client (foreign keys, not null).
        (q.q ? filter(listBase()) : filter(db('quotes as q').where('q.studio_id', studioId) as ReturnType<typeof listBase>)).count({ n: '*' }).first(),
      ]);
      return { rows: rows.map(toListRow), total: Number(count?.n ?? 0) };
    },

    /** Sent quotes past their validity in any studio, with the studio's zone (the expiry job). */
    sentBefore: (cutoff: string, trx: Db = db) =>
      trx('quotes as q').join('studios as s', 's.id', 'q.studio_id').where('q.status', 'sent').where('q.valid_until', '<', cutoff).select('q.id', 'q.studio_id', 'q.valid_until', 's.timezone') as Promise<
        { id: number; studio_id: number; valid_until: string; timezone: string }[]
      >,
  };
}

export type QuotesRepository = ReturnType<typeof quotesRepository>;
