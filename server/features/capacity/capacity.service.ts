import { formatDayNumber, localDateOf, parseLocalDate } from '../../../shared/dates';
import { weeklyHours, type PainterCapacity, type WeeklyHours as ForecastHours } from '../../../shared/schedule';
import type { CapacityView, DayOff, DayOffInput, PainterCapacityView, SetHoursInput, WeeklyHours } from '../../../shared/schemas/capacity';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { Member } from '../../lib/policy';
import type { CapacityRepository, DayOffRow, HoursRow } from './capacity.repository';

export type Actor = Member & { userId: number };

const toDayOff = (r: DayOffRow): DayOff => ({ id: r.id, userId: r.user_id, kind: r.kind, from: r.date_from, to: r.date_to, note: r.note });

function hoursOf(rows: HoursRow[]): WeeklyHours {
  const out: WeeklyHours = {};
  for (const r of rows) {
    const key = String(r.weekday) as keyof WeeklyHours;
    (out[key] ??= []).push({ start: r.start_time, end: r.end_time });
  }
  return out;
}

/** Every local date of the ranges, from `from` on (earlier days do not matter to a forecast). */
function expand(rows: DayOffRow[], from: string): string[] {
  const first = parseLocalDate(from);
  const out = new Set<string>();
  for (const r of rows) {
    for (let d = Math.max(first, parseLocalDate(r.date_from)), last = parseLocalDate(r.date_to); d <= last; d++) out.add(formatDayNumber(d));
  }
  return [...out].sort();
}

export function capacityService(deps: { db: Db; repo: CapacityRepository; clock: Clock }) {
  const { db, repo, clock } = deps;

  /** A painter may change only their own hours and days off; an owner anyone's on the team. */
  async function teamMember(actor: Actor, userId: number, trx: Db = db) {
    if (actor.role !== 'owner' && userId !== actor.userId) throw errors.forbidden('Painters set their own hours and days off; ask an owner to change someone else’s.');
    const person = (await repo.team(actor.studioId, trx)).find((t) => t.user_id === userId);
    if (!person) throw errors.notFound('That painter');
    return person;
  }

  async function view(studioId: number): Promise<CapacityView> {
    const [timeZone, team, hours, off] = await Promise.all([repo.timeZone(studioId), repo.team(studioId), repo.hours(studioId), repo.daysOff(studioId)]);
    const today = localDateOf(clock.now().getTime(), timeZone);
    // Past entries stay out of the way; the forecast never looks back.
    const current = off.filter((d) => d.date_to >= today);
    const painters: PainterCapacityView[] = team.map((t) => {
      const h = hoursOf(hours.filter((r) => r.user_id === t.user_id));
      return {
        userId: t.user_id,
        name: t.name,
        role: t.role,
        hours: h,
        weeklyHours: Math.round(weeklyHours({ id: t.user_id, hours: h as ForecastHours }) * 100) / 100,
        daysOff: current.filter((d) => d.user_id === t.user_id).map(toDayOff),
      };
    });
    return { timeZone, painters, closedDays: current.filter((d) => d.user_id === null).map(toDayOff) };
  }

  return {
    view: (actor: Actor) => view(actor.studioId),

    async setHours(actor: Actor, userId: number, input: SetHoursInput) {
      await db.transaction(async (trx) => {
        await teamMember(actor, userId, trx);
        const rows = Object.entries(input.hours).flatMap(([weekday, ranges]) =>
          (ranges ?? []).map((r) => ({ weekday: Number(weekday), start_time: r.start, end_time: r.end })),
        );
        await repo.replaceHours(trx, actor.studioId, userId, rows, iso(clock.now()));
      });
      return view(actor.studioId);
    },

    async addDayOff(actor: Actor, input: DayOffInput) {
      if (input.userId === null) {
        if (actor.role !== 'owner') throw errors.forbidden('Only an owner can close the whole studio.');
      } else {
        await teamMember(actor, input.userId);
      }
      const id = await repo.insertDayOff(db, {
        studio_id: actor.studioId,
        user_id: input.userId,
        kind: input.kind,
        date_from: input.from,
        date_to: input.to,
        note: input.note ?? null,
        created_by: actor.userId,
        created_at: iso(clock.now()),
      });
      return toDayOff((await repo.dayOff(actor.studioId, id))!);
    },

    async removeDayOff(actor: Actor, id: number) {
      const row = await repo.dayOff(actor.studioId, id);
      if (!row) throw errors.notFound('That day off');
      if (actor.role !== 'owner' && row.user_id !== actor.userId) throw errors.forbidden('Painters remove only their own days off.');
      await repo.deleteDayOff(db, actor.studioId, id);
    },

    /** What the forecast needs: the zone, each painter's hours and days off, the closed days (from `from` on). */
    async forForecast(studioId: number, from?: string) {
      const [timeZone, team, hours, off] = await Promise.all([repo.timeZone(studioId), repo.team(studioId), repo.hours(studioId), repo.daysOff(studioId)]);
      const start = from ?? formatDayNumber(parseLocalDate(localDateOf(clock.now().getTime(), timeZone)) - 1);
      const painters: (PainterCapacity & { id: number; name: string })[] = team.map((t) => ({
        id: t.user_id,
        name: t.name,
        hours: hoursOf(hours.filter((r) => r.user_id === t.user_id)) as ForecastHours,
        daysOff: expand(off.filter((d) => d.user_id === t.user_id), start),
      }));
      return { timeZone, painters, closedDays: expand(off.filter((d) => d.user_id === null), start) };
    },
  };
}

export type CapacityService = ReturnType<typeof capacityService>;
