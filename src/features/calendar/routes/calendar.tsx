import { Link, useSearchParams } from 'react-router-dom';
import { CalendarDays, ChevronLeft, ChevronRight, Clock } from 'lucide-react';
import { addDays } from '../../../../shared/dates';
import { Button, ButtonLink } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { useSchedule } from '../api/get-schedule';
import { BookedTodayCard } from '../components/booked-today-card';
import { CalendarFeedCard } from '../components/calendar-feed-card';
import { formatDay } from '../components/dates';
import { QueueList } from '../components/queue-list';
import { Timeline, TimelineKey } from '../components/timeline';

const WEEK_CHOICES = [4, 8, 13, 26];

/** The studio's calendar: the queue over the coming weeks, its order, and the person's calendar feed. */
export function CalendarRoute() {
  const { studioId, role, timezone } = useStudioScope();
  const [params, setParams] = useSearchParams();
  const from = params.get('from') ?? undefined;
  const weeks = WEEK_CHOICES.includes(Number(params.get('weeks'))) ? Number(params.get('weeks')) : 8;
  const schedule = useSchedule(studioId, { from, weeks });
  const view = schedule.data;

  const set = (next: { from?: string | null; weeks?: number }) =>
    setParams(
      (p) => {
        const n = new URLSearchParams(p);
        if (next.from === null) n.delete('from');
        else if (next.from) n.set('from', next.from);
        if (next.weeks) n.set('weeks', String(next.weeks));
        return n;
      },
      { replace: true },
    );
  const shift = (w: number) => view && set({ from: addDays(view.weeks[0].start, 7 * w) });

  const late = view?.commissions.filter((c) => c.late).length ?? 0;
  const unscheduled = view?.commissions.filter((c) => c.unscheduled).length ?? 0;
  const lastReady = view?.commissions.map((c) => c.finishDate).filter((d): d is string => d !== null).sort().at(-1);
  const noHours = view && view.painters.every((p) => p.weeklyHours === 0);

  return (
    <>
      <PageTitle
        title="Calendar"
        description={view ? `Forecast from the queue, the painters’ hours and the drying times · today is ${formatDay(view.today)} (${timezone})` : undefined}
        actions={
          <ButtonLink to="capacity" variant="secondary">
            <Clock aria-hidden="true" className="size-4" />
            Working hours and days off
          </ButtonLink>
        }
      />
      {schedule.isPending ? (
        <LoadingBlock label="Working out the forecast…" />
      ) : schedule.error || !view ? (
        <ErrorNote title="The forecast did not load">{schedule.error?.message}</ErrorNote>
      ) : (
        <div className="flex flex-col gap-8">
          {noHours && role !== 'client' && (
            <Note>
              Nobody has working hours yet, so nothing can be scheduled. <Link to="capacity">Set the painters’ hours</Link> to see when the queue will be ready.
            </Note>
          )}
          <section aria-labelledby="timeline-title" className="flex flex-col gap-3">
            <div className="flex flex-wrap items-end justify-between gap-3">
              <div>
                <h2 id="timeline-title" className="text-lg font-semibold">
                  Timeline
                </h2>
                <p className="text-sm text-sable-600">
                  {view.commissions.length === 0
                    ? 'The queue is empty.'
                    : `${view.commissions.length} in the queue · ${late === 0 ? 'none late' : `${late} late`}${unscheduled ? ` · ${unscheduled} not scheduled` : ''}${lastReady ? ` · all ready by ${formatDay(lastReady)}` : ''}`}
                </p>
              </div>
              <div className="flex flex-wrap items-center gap-2">
                <Button variant="secondary" size="sm" onClick={() => shift(-Math.max(1, Math.floor(weeks / 2)))}>
                  <ChevronLeft aria-hidden="true" className="size-4" />
                  Earlier
                </Button>
                {/* aria-disabled, not disabled: pressing it must not drop keyboard focus to the page. */}
                <Button variant="secondary" size="sm" onClick={() => from && set({ from: null })} aria-disabled={!from}>
                  This week
                </Button>
                <Button variant="secondary" size="sm" onClick={() => shift(Math.max(1, Math.floor(weeks / 2)))}>
                  Later
                  <ChevronRight aria-hidden="true" className="size-4" />
                </Button>
                <label className="flex items-center gap-2 text-sm">
                  <span>Show</span>
                  <select value={weeks} onChange={(e) => set({ weeks: Number(e.target.value) })} className="min-h-8 rounded-control border border-sable-600 bg-white px-2 text-sm">
                    {WEEK_CHOICES.map((w) => (
                      <option key={w} value={w}>
                        {w} weeks
                      </option>
                    ))}
                  </select>
                </label>
              </div>
            </div>
            {view.commissions.length === 0 ? (
              <EmptyState icon={<CalendarDays className="size-8" />} title="Nothing booked yet">
                Booked and on-the-bench commissions show here with the date they will be ready, worked out from the painters’ hours.
              </EmptyState>
            ) : (
              <>
                <Timeline view={view} studioId={studioId} />
                <TimelineKey />
              </>
            )}
          </section>

          {view.commissions.length > 0 && (
            <section aria-labelledby="queue-title" className="flex flex-col gap-3">
              <div>
                <h2 id="queue-title" className="text-lg font-semibold">
                  Queue
                </h2>
                <p className="text-sm text-sable-600">
                  {role === 'owner'
                    ? 'The order is the priority: the forecast books each commission into the hours the ones above it leave free. Drag a commission by its handle, or use Up and Down.'
                    : 'The order is the priority: the forecast books each commission into the hours the ones above it leave free. Owners arrange it.'}
                </p>
              </div>
              <QueueList studioId={studioId} commissions={view.commissions} canMove={role === 'owner'} />
            </section>
          )}

          <div className="grid gap-6 lg:grid-cols-2">
            {role === 'owner' && <BookedTodayCard studioId={studioId} />}
            {(role === 'owner' || role === 'painter') && <CalendarFeedCard studioId={studioId} timezone={timezone} role={role} />}
          </div>
        </div>
      )}
    </>
  );
}
