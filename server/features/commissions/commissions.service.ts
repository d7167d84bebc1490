import {
  allowedTransitions,
  minutesToHours,
  progressFromTotals,
  refusedTransitionMessage,
  type CommissionStatus,
  type ProgressTotals,
} from '../../../shared/commission-lifecycle';
import type { Page, PageParams } from '../../../shared/schemas/common';
import type {
  CommissionDetail,
  CommissionListQuery,
  CommissionSummary,
  CreateCommissionInput,
  SchemeNotesInput,
  TransitionInput,
  UpdateCommissionInput,
} from '../../../shared/schemas/commissions';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import { keptReads } from '../../lib/version-cache';
import type { ActivityService } from '../activity/activity.service';
import type { Actor, FiguresService } from '../figures/figures.service';
import type { CommissionListRow, CommissionRow, CommissionsRepository } from './commissions.repository';

const num = (v: number | string | null | undefined) => Number(v ?? 0);

/** Called inside the transaction of a status change, after it is written and logged. */
export type StatusChangeHook = (trx: Db, change: { studioId: number; commissionId: number; userId: number | null; from: CommissionStatus; to: CommissionStatus }) => Promise<void>;

/**
 * Called inside the transaction of a status change before it is written: throws to refuse the move
 * (e.g. shipping while the balance is unpaid). `override` is the owner's reason to go ahead anyway;
 * what the guard returns joins the status entry of the activity log.
 */
export type StatusChangeGuard = (
  trx: Db,
  change: { studioId: number; commissionId: number; userId: number | null; from: CommissionStatus; to: CommissionStatus; override: { reason: string } | null },
) => Promise<Record<string, unknown> | void>;

function summaryOf(r: Pick<CommissionRow, 'id' | 'title' | 'status' | 'priority' | 'due_date' | 'client_id' | 'client_name' | 'created_at' | 'updated_at'>, totals: ProgressTotals, figureCount: number, modelCount: number): CommissionSummary {
  return {
    id: r.id,
    title: r.title,
    status: r.status,
    priority: r.priority,
    dueDate: r.due_date,
    client: { id: r.client_id, name: r.client_name },
    figureCount,
    modelCount,
    progress: progressFromTotals(totals),
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

const listTotals = (r: CommissionListRow): ProgressTotals => ({
  stages: num(r.stage_count),
  skipped: num(r.stages_skipped),
  done: num(r.stages_done),
  minutesTotal: num(r.minutes_total),
  minutesDone: num(r.minutes_done),
});

/** A list query with its client scope (a client's own commissions), as the repository takes it. */
type ListQuery = CommissionListQuery & { onlyClientId?: number };
/** What the list read from the database for one studio, version and query, as answered, frozen. */
type KeptList = { items: readonly CommissionSummary[]; total: number };

/**
 * The cache key of a list query: every field that can change the answer, normalised so that queries the
 * database answers alike share an entry (the search is matched lower-cased, the statuses as a set).
 */
const listKeyOf = (q: ListQuery) =>
  JSON.stringify([q.limit, q.offset, q.q?.toLowerCase() ?? '', q.status?.length ? [...new Set(q.status)].sort() : [], q.clientId ?? null, q.onlyClientId ?? null]);

/**
 * `listCacheRows`: the commission list's page read is kept in memory per studio, `schedule_version` and
 * query (rows held across studios and queries, default 20,000; 0: no cache). Database triggers move the
 * version with every write to a row the list reads (migrations/20270204120000-commission-list-version.ts
 * lists them); while it stands, a request reads only the version. Nothing in a list row depends on the clock.
 */
export function commissionsService(deps: { db: Db; repo: CommissionsRepository; figures: FiguresService; activity: ActivityService; clock: Clock; listCacheRows?: number }) {
  const { db, repo, figures, activity, clock } = deps;
  const listRows = deps.listCacheRows ?? 20_000;
  const keptList = keptReads<KeptList>({ version: repo.version, maxWeight: listRows, weigh: (k) => k.items.length + 1 });

  async function readList(studioId: number, q: ListQuery): Promise<KeptList> {
    const { rows, total } = await repo.list(studioId, q);
    return { items: rows.map((r) => summaryOf(r, listTotals(r), num(r.figure_count), num(r.model_count))), total };
  }

  const now = () => iso(clock.now());
  const statusHooks: StatusChangeHook[] = [];
  const statusGuards: StatusChangeGuard[] = [];

  /** The commission if the actor may see it: the studio's team sees all, a client only their own (else 404). */
  async function visible(actor: Actor, id: number, trx: Db = db) {
    const row = await repo.get(actor.studioId, id, trx);
    if (!row || (actor.role === 'client' && row.client_id !== actor.clientId)) throw errors.notFound('That commission');
    return row;
  }

  async function transitionIn(trx: Db, by: { studioId: number; userId: number | null }, id: number, to: CommissionStatus, reason?: string, opts: { override?: { reason: string } } = {}) {
    const row = await repo.get(by.studioId, id, trx);
    if (!row) throw errors.notFound('That commission');
    const allowed = allowedTransitions(row.status, row.status_before_hold);
    if (!allowed.includes(to)) throw errors.conflict(refusedTransitionMessage(row.status, to, row.status_before_hold), 'invalid_transition', { allowed });
    if (to === 'cancelled' && !reason) throw errors.field('reason', 'Give a reason for cancelling.');
    const guarded: Record<string, unknown> = {};
    for (const guard of statusGuards) Object.assign(guarded, await guard(trx, { studioId: by.studioId, commissionId: id, userId: by.userId, from: row.status, to, override: opts.override ?? null }));
    await repo.update(trx, by.studioId, id, {
      status: to,
      // On hold remembers where it came from, so it can go back there.
      status_before_hold: to === 'on_hold' ? row.status : null,
      ...(to === 'cancelled' ? { cancel_reason: reason } : {}),
      updated_at: now(),
    });
    await activity.record(trx, {
      studioId: by.studioId,
      commissionId: id,
      userId: by.userId,
      action: 'commission.status',
      detail: { from: row.status, to, ...(reason ? { reason } : {}), ...guarded },
    });
    for (const hook of statusHooks) await hook(trx, { studioId: by.studioId, commissionId: id, userId: by.userId, from: row.status, to });
  }

  async function detail(actor: Actor, id: number): Promise<CommissionDetail> {
    const row = await visible(actor, id);
    const forClient = actor.role === 'client';
    const v = await figures.views(actor.studioId, { commissionIds: [id] }, forClient);
    return {
      ...summaryOf(row, v.totals, v.figures.length, v.figures.reduce((n, f) => n + f.quantity, 0)),
      brief: row.brief,
      schemeNotes: row.scheme_notes,
      cancelReason: row.cancel_reason,
      statusBeforeHold: row.status === 'on_hold' ? row.status_before_hold : null,
      allowedTransitions: allowedTransitions(row.status, row.status_before_hold),
      figures: v.figures,
      loggedHours: forClient ? null : minutesToHours(v.loggedMinutes),
    };
  }

  return {
    async list(actor: Actor, q: CommissionListQuery): Promise<Page<CommissionSummary>> {
      // A client sees only the commissions of their own client record; without one, none.
      const onlyClientId = actor.role === 'client' ? (actor.clientId ?? -1) : undefined;
      const scoped = { ...q, onlyClientId };
      const { items, total } = await keptList(actor.studioId, listKeyOf(scoped), () => readList(actor.studioId, scoped));
      return {
        items: items as CommissionSummary[],
        total,
        limit: q.limit,
        offset: q.offset,
      };
    },

    get: detail,

    async create(actor: Actor, input: CreateCommissionInput) {
      const { studioId } = actor;
      const client = await repo.client(studioId, input.clientId);
      if (!client) throw errors.field('clientId', 'Choose a client of this studio.');
      if (client.erased_at) throw errors.field('clientId', 'This client was erased; their placeholder only keeps old invoices. Choose another client or add them again.');
      const id = await db.transaction(async (trx) => {
        const t = now();
        const commissionId = await repo.insert(trx, {
          studio_id: studioId,
          client_id: input.clientId,
          title: input.title,
          brief: input.brief ?? null,
          due_date: input.dueDate ?? null,
          priority: input.priority ?? 'normal',
          status: 'enquiry',
          created_by: actor.userId,
          created_at: t,
          updated_at: t,
        });
        await activity.record(trx, { studioId, commissionId, userId: actor.userId, action: 'commission.created', detail: { title: input.title } });
        for (const [i, f] of (input.figures ?? []).entries()) await figures.addInTransaction(trx, actor, commissionId, f, { prefix: `figures.${i}.` });
        return commissionId;
      });
      return detail(actor, id);
    },

    async update(actor: Actor, id: number, input: UpdateCommissionInput) {
      await db.transaction(async (trx) => {
        const row = await visible(actor, id, trx);
        const patch: Record<string, unknown> = {};
        const changes: Record<string, { from: unknown; to: unknown }> = {};
        const set = (field: string, column: keyof CommissionRow, to: unknown) => {
          if (to === undefined || row[column] === to) return;
          patch[column] = to;
          changes[field] = field === 'brief' ? { from: null, to: null } : { from: row[column], to };
        };
        set('title', 'title', input.title);
        set('brief', 'brief', input.brief);
        set('dueDate', 'due_date', input.dueDate);
        set('priority', 'priority', input.priority);
        if (!Object.keys(patch).length) return;
        await repo.update(trx, actor.studioId, id, { ...patch, updated_at: now() });
        await activity.record(trx, { studioId: actor.studioId, commissionId: id, userId: actor.userId, action: 'commission.updated', detail: { changes } });
      });
      return detail(actor, id);
    },

    async setSchemeNotes(actor: Actor, id: number, input: SchemeNotesInput) {
      await db.transaction(async (trx) => {
        const row = await visible(actor, id, trx);
        const notes = input.schemeNotes || null;
        if (row.scheme_notes === notes) return;
        await repo.update(trx, actor.studioId, id, { scheme_notes: notes, updated_at: now() });
        await activity.record(trx, { studioId: actor.studioId, commissionId: id, userId: actor.userId, action: 'commission.scheme_notes' });
      });
      return detail(actor, id);
    },

    /** Moves a commission along its lifecycle; 409 invalid_transition (with `allowed`) when the move is not one of them. */
    async transition(actor: Actor, id: number, input: TransitionInput) {
      await db.transaction(async (trx) => {
        await visible(actor, id, trx);
        await transitionIn(trx, actor, id, input.to, input.reason);
      });
      return detail(actor, id);
    },

    /** The same move inside another feature's transaction (e.g. an approved "finished" → ready to ship). */
    transitionIn,

    /** Registers a hook run inside the transaction of every status change (e.g. invoicing on ready to ship). */
    onStatusChange(hook: StatusChangeHook) {
      statusHooks.push(hook);
    },

    /** Registers a guard every status change passes first, however it is asked for (the shipped-while-unpaid rule). */
    guardStatusChange(guard: StatusChangeGuard) {
      statusGuards.push(guard);
    },

    /** Quoted → booked at the end of the studio's queue (its deposit is paid), inside the caller's transaction; any other status stays. */
    async bookIfQuoted(trx: Db, by: { studioId: number; userId: number | null }, id: number) {
      const row = await repo.get(by.studioId, id, trx);
      if (row?.status !== 'quoted') return false;
      await transitionIn(trx, by, id, 'booked');
      await repo.update(trx, by.studioId, id, { queue_position: (await repo.lastQueuePosition(by.studioId, trx)) + 1 });
      return true;
    },

    /** The commission's log; the activity service checks who may see it, in the read that gives its kept pages' version. */
    activity: (actor: Actor, id: number, q: PageParams) => activity.listFor(actor, id, q),
  };
}

export type CommissionsService = ReturnType<typeof commissionsService>;
