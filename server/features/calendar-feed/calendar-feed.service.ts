import { createEvents, type DateArray, type EventAttributes } from 'ics';
import { commissionStatusLabels } from '../../../shared/commission-lifecycle';
import { addDays } from '../../../shared/dates';
import type { CalendarFeedView, ScheduledCommission } from '../../../shared/schemas/schedule';
import { iso, type Clock } from '../../lib/clock';
import type { Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import { hashToken, newToken } from '../../lib/tokens';
import type { Actor } from '../capacity/capacity.service';
import type { ScheduleService } from '../schedule/schedule.service';
import type { CalendarFeedRepository, FeedRow } from './calendar-feed.repository';

const TOKEN_RE = /^[A-Za-z0-9_-]{43}$/;
const dateArray = (d: string): DateArray => d.split('-').map(Number) as DateArray;

/**
 * Text for an iCalendar value. ics escapes backslash, semicolon and comma and writes LF and CRLF as an
 * escaped n, but passes a bare CR (or any other control character) through, and some readers end a line
 * at a bare CR: a title typed with one could then add properties of its own. Every line break becomes
 * LF, other control characters go.
 */
export const icsText = (s: string) => s.replace(/\r\n?/g, '\n').replace(/[^\P{Cc}\n\t]/gu, '');

function allDay(uid: string, date: string, title: string, description: string, stamp: number): EventAttributes {
  // `timestamp` (DTSTAMP) is read by ics but missing from its types; it comes from our clock, not the machine's.
  return { uid, start: dateArray(date), end: dateArray(addDays(date, 1)), title: icsText(title), description: icsText(description), transp: 'TRANSPARENT', status: 'CONFIRMED', timestamp: stamp } as EventAttributes;
}

/** Due dates and projected ready-to-ship dates of the queue as all-day events in the studio's calendar days. */
export function feedEvents(studioId: number, commissions: ScheduledCommission[], stamp: number): EventAttributes[] {
  const out: EventAttributes[] = [];
  for (const c of commissions) {
    const about = `${c.client.name} · ${commissionStatusLabels[c.status]} · ${c.remainingHours} h of bench work left`;
    if (c.dueDate) out.push(allDay(`sablework-${studioId}-${c.id}-due@sablework`, c.dueDate, `Due: ${c.title}`, `${about}.`, stamp));
    if (c.finishDate) {
      const late = c.late ? ' (after its due date)' : '';
      out.push(allDay(`sablework-${studioId}-${c.id}-ready@sablework`, c.finishDate, `Ready to ship (forecast): ${c.title}${late}`, `${about}. Forecast from the queue and the painters' hours; it moves as work is logged.`, stamp));
    }
  }
  return out;
}

export function calendarFeedService(deps: { db: Db; repo: CalendarFeedRepository; schedule: ScheduleService; clock: Clock; publicUrl: string }) {
  const { db, repo, schedule, clock, publicUrl } = deps;
  const urlOf = (token: string) => `${publicUrl.replace(/\/$/, '')}/api/calendar/${token}.ics`;
  const viewOf = (row: FeedRow | undefined, url?: string): CalendarFeedView => ({
    active: Boolean(row),
    createdAt: row?.created_at ?? null,
    lastUsedAt: row?.last_used_at ?? null,
    ...(url ? { url } : {}),
  });

  return {
    status: async (actor: Actor) => viewOf(await repo.get(actor.studioId, actor.userId)),

    /** A new secret address (the old one, if any, stops working). The address is shown only in this answer. */
    async create(actor: Actor): Promise<CalendarFeedView> {
      const token = newToken();
      await db.transaction((trx) => repo.replace(trx, actor.studioId, actor.userId, hashToken(token), iso(clock.now())));
      return viewOf(await repo.get(actor.studioId, actor.userId), urlOf(token));
    },

    async remove(actor: Actor) {
      await repo.remove(actor.studioId, actor.userId);
    },

    /**
     * The feed behind a token. Unknown tokens and people who have left the studio (or became clients) get
     * 404. Owners see the whole queue; painters the commissions with figures on their bench.
     */
    async ics(token: string): Promise<string> {
      if (!TOKEN_RE.test(token)) throw errors.notFound('That calendar');
      const feed = await repo.byHash(hashToken(token));
      if (!feed || (feed.role !== 'owner' && feed.role !== 'painter')) throw errors.notFound('That calendar');
      const sf = await schedule.run(feed.studio_id);
      const now = clock.now();
      // Written once per forecast kept (a studio's version and minute) for each person's view: ics checks every
      // event against its schema, which for a whole queue costs far more than the rest of the request.
      const value = schedule.derived(sf, `ics:${feed.role}:${feed.user_id}:${feed.studio_name}`, () => {
        let commissions = schedule.describe(sf, false);
        if (feed.role === 'painter') commissions = commissions.filter((c) => c.figures.some((f) => f.painter?.id === feed.user_id));
        // stamped with the moment the forecast is worked out as of (the start of the minute), like everything in it
        const events = createEvents(feedEvents(feed.studio_id, commissions, new Date(sf.input.now).getTime()), {
          productId: '-//Sablework//Studio calendar//EN',
          calName: icsText(`${feed.studio_name} · Sablework`),
        });
        if (events.error || events.value === null) throw events.error ?? new Error('The calendar could not be written.');
        return events.value;
      });
      await repo.touch(feed.id, iso(now));
      return value;
    },
  };
}

export type CalendarFeedService = ReturnType<typeof calendarFeedService>;
