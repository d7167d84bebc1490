import { TZDate } from '@date-fns/tz';
import { hoursToMinutes, minutesToHours } from '../../../shared/commission-lifecycle';
import type { ManualTimeInput, RunningTimer, TimeEntry, UpdateTimeInput } from '../../../shared/schemas/commissions';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import type { Page, PageParams } from '../../../shared/schemas/common';
import { pageOf } from '../../lib/page';
import { errors } from '../../lib/errors';
import { keptAtVersion } from '../../lib/version-cache';
import type { ActivityService } from '../activity/activity.service';
import { assertOpen, type Actor, type FiguresService } from '../figures/figures.service';
import type { TimeRepository, TimeRow } from './time.repository';

const MINUTE = 60_000;

function toEntry(r: TimeRow): TimeEntry {
  return {
    id: r.id,
    stageId: r.stage_id,
    user: { id: r.user_id, name: r.user_name },
    source: r.source,
    startedAt: r.started_at,
    endedAt: r.ended_at,
    hours: r.minutes === null ? null : minutesToHours(r.minutes),
    note: r.note,
  };
}

const toRunning = (r: TimeRow): RunningTimer => ({
  ...toEntry(r),
  stage: { id: r.stage_id, name: r.stage_name },
  figure: { id: r.figure_id, name: r.figure_name },
  commission: { id: r.commission_id, title: r.commission_title },
});

/** The local date (yyyy-mm-dd) of an instant in a timezone. */
const localDate = (d: Date, timeZone: string) => new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(d);

/** Time entries the kept stage pages may hold across commissions, stages and queries. */
export const TIME_LIST_CACHE_ROWS = 20_000;

/**
 * Time logged on stages: timers and manual entries. A stage's page of time is kept per commission, thread
 * version, stage and page (`cacheRows` entries at most; 0 turns it off); the stage is looked up on every
 * request, in the read that gives the version.
 */
export function timeService(deps: { db: Db; repo: TimeRepository; figures: FiguresService; activity: ActivityService; clock: Clock; cacheRows?: number }) {
  const { db, repo, figures, activity, clock } = deps;
  const kept = keptAtVersion<Page<TimeEntry>>({ maxWeight: deps.cacheRows ?? TIME_LIST_CACHE_ROWS, weigh: (p) => p.items.length + 1 });

  const where = (r: Pick<TimeRow, 'stage_id' | 'stage_name' | 'figure_id' | 'figure_name'>) => ({
    stageId: r.stage_id,
    stageName: r.stage_name,
    figureId: r.figure_id,
    figureName: r.figure_name,
  });

  /** Closes a running timer at the clock's now; logged as time added, in the timer's own studio. */
  async function stopEntry(trx: Db, r: TimeRow) {
    const end = clock.now();
    const minutes = Math.max(0, Math.round((end.getTime() - new Date(r.started_at).getTime()) / MINUTE));
    await repo.update(trx, r.studio_id, r.id, { ended_at: iso(end), minutes, updated_at: iso(end) });
    await activity.record(trx, {
      studioId: r.studio_id,
      commissionId: r.commission_id,
      userId: r.user_id,
      action: 'time.added',
      detail: { entryId: r.id, ...where(r), hours: minutesToHours(minutes), source: 'timer' },
    });
  }

  async function entryFor(actor: Actor, entryId: number, trx: Db) {
    const r = await repo.get(actor.studioId, entryId, trx);
    if (!r) throw errors.notFound('That time entry');
    if (actor.role !== 'owner' && r.user_id !== actor.userId) throw errors.forbidden('Only the person who logged this time, or an owner, can change it.');
    assertOpen(r.commission_status);
    return r;
  }

  async function entry(studioId: number, id: number, trx: Db = db) {
    const r = await repo.get(studioId, id, trx);
    if (!r) throw errors.notFound('That time entry');
    return r;
  }

  return {
    async listForStage(actor: Actor, stageId: number, q: PageParams) {
      const t = await repo.stageThread(actor.studioId, stageId);
      if (!t) throw errors.notFound('That stage');
      return kept(Number(t.commission_id), Number(t.thread_version), `${stageId} ${q.limit} ${q.offset}`, async () => {
        const { rows, total } = await repo.listForStage(actor.studioId, stageId, q);
        return pageOf(rows.map(toEntry), total, q);
      });
    },

    async addManual(actor: Actor, stageId: number, input: ManualTimeInput) {
      const { studioId } = actor;
      const minutes = Math.max(1, hoursToMinutes(input.hours));
      const now = clock.now();
      let start: Date;
      if (input.date) {
        const tz = await repo.studioTimezone(studioId);
        const today = localDate(now, tz);
        if (input.date > today) throw errors.field('date', 'Time cannot be logged on a future date.');
        if (input.date === today) start = new Date(now.getTime() - minutes * MINUTE);
        else {
          // An entry on a past day is placed at noon of that day in the studio's timezone.
          const [y, m, d] = input.date.split('-').map(Number);
          start = new Date(new TZDate(y, m - 1, d, 12, 0, 0, tz).getTime());
        }
      } else start = new Date(now.getTime() - minutes * MINUTE);
      const id = await db.transaction(async (trx) => {
        const ctx = await figures.stageContext(studioId, stageId, trx);
        assertOpen(ctx.commission_status);
        const entryId = await repo.insert(trx, {
          studio_id: studioId,
          commission_id: ctx.commission_id,
          figure_id: ctx.figure_id,
          stage_id: stageId,
          user_id: actor.userId,
          source: 'manual',
          started_at: iso(start),
          ended_at: iso(new Date(start.getTime() + minutes * MINUTE)),
          minutes,
          note: input.note ?? null,
          created_at: iso(now),
          updated_at: iso(now),
        });
        await activity.record(trx, {
          studioId,
          commissionId: ctx.commission_id,
          userId: actor.userId,
          action: 'time.added',
          detail: { entryId, stageId, stageName: ctx.name, figureId: ctx.figure_id, figureName: ctx.figure_name, hours: minutesToHours(minutes), source: 'manual' },
        });
        return entryId;
      });
      return toEntry(await entry(studioId, id));
    },

    /** Starts the person's timer on a stage; a timer they run elsewhere stops first. A stage still to do becomes working. */
    async start(actor: Actor, stageId: number) {
      const { studioId } = actor;
      const id = await db.transaction(async (trx) => {
        await figures.lockCommission(trx, studioId, { stageId }); // it may set the stage working: first (figures.repository.ts)
        const ctx = await figures.stageContext(studioId, stageId, trx);
        assertOpen(ctx.commission_status);
        await repo.lockPerson(trx, actor.userId);
        const running = await repo.runningOf(actor.userId, trx);
        const same = running.find((r) => r.studio_id === studioId && r.stage_id === stageId);
        for (const r of running) if (r !== same) await stopEntry(trx, r);
        if (same) return same.id;
        const t = iso(clock.now());
        const entryId = await repo.insert(trx, {
          studio_id: studioId,
          commission_id: ctx.commission_id,
          figure_id: ctx.figure_id,
          stage_id: stageId,
          user_id: actor.userId,
          source: 'timer',
          started_at: t,
          ended_at: null,
          minutes: null,
          created_at: t,
          updated_at: t,
        });
        if (ctx.status === 'todo') await figures.setStageStatus(trx, actor, ctx, 'working');
        return entryId;
      });
      return toRunning(await entry(studioId, id));
    },

    async running(actor: Actor) {
      const r = await repo.runningIn(actor.studioId, actor.userId);
      return { running: r ? toRunning(r) : null };
    },

    async stop(actor: Actor) {
      const id = await db.transaction(async (trx) => {
        await repo.lockPerson(trx, actor.userId);
        const r = await repo.runningIn(actor.studioId, actor.userId, trx);
        if (!r) throw errors.conflict('No timer of yours is running in this studio.', 'no_timer');
        await stopEntry(trx, r);
        return r.id;
      });
      return toEntry(await entry(actor.studioId, id));
    },

    async update(actor: Actor, entryId: number, input: UpdateTimeInput) {
      const { studioId } = actor;
      await db.transaction(async (trx) => {
        const r = await entryFor(actor, entryId, trx);
        const patch: Record<string, unknown> = {};
        const changes: Record<string, { from: unknown; to: unknown }> = {};
        if (input.hours !== undefined) {
          if (r.ended_at === null) throw errors.conflict('Stop the timer before changing its hours.', 'timer_running');
          const minutes = Math.max(1, hoursToMinutes(input.hours));
          if (minutes !== r.minutes) {
            patch.minutes = minutes;
            patch.ended_at = iso(new Date(new Date(r.started_at).getTime() + minutes * MINUTE));
            changes.hours = { from: minutesToHours(r.minutes ?? 0), to: minutesToHours(minutes) };
          }
        }
        if (input.note !== undefined && input.note !== r.note) {
          patch.note = input.note;
          changes.note = { from: r.note, to: input.note };
        }
        if (!Object.keys(patch).length) return;
        await repo.update(trx, studioId, entryId, { ...patch, updated_at: iso(clock.now()) });
        await activity.record(trx, {
          studioId,
          commissionId: r.commission_id,
          userId: actor.userId,
          action: 'time.updated',
          detail: { entryId, ...where(r), author: r.user_name, changes },
        });
      });
      return toEntry(await entry(studioId, entryId));
    },

    async remove(actor: Actor, entryId: number) {
      await db.transaction(async (trx) => {
        const r = await entryFor(actor, entryId, trx);
        await repo.delete(trx, actor.studioId, entryId);
        await activity.record(trx, {
          studioId: actor.studioId,
          commissionId: r.commission_id,
          userId: actor.userId,
          action: 'time.deleted',
          detail: { entryId, ...where(r), author: r.user_name, hours: minutesToHours(r.minutes ?? 0), running: r.ended_at === null },
        });
      });
    },
  };
}

export type TimeService = ReturnType<typeof timeService>;
