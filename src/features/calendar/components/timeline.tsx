import { Link } from 'react-router-dom';
import { parseLocalDate } from '../../../../shared/dates';
import type { ScheduledCommission, ScheduleView } from '../../../../shared/schemas/schedule';
import { unscheduledLabels } from '../../../../shared/schemas/schedule';
import { cn } from '../../../lib/cn';
import { formatDay, shortDay, slackWords } from './dates';

/** The narrowest a day may get before the chart scrolls sideways. */
const MIN_DAY_PX = 14;
const LABEL = 'w-32 sm:w-48';

/** Minutes after local midnight of an instant in a timezone (for the today line). */
function localMinutes(instant: string, timeZone: string): number {
  try {
    const parts = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).formatToParts(new Date(instant));
    const h = Number(parts.find((p) => p.type === 'hour')?.value ?? 0);
    const m = Number(parts.find((p) => p.type === 'minute')?.value ?? 0);
    return h * 60 + m;
  } catch {
    return 720;
  }
}

function barLabel(c: ScheduledCommission): string {
  const parts = [c.title];
  if (c.unscheduled) parts.push(`not scheduled: ${unscheduledLabels[c.unscheduled]}`);
  else {
    if (c.startDate) parts.push(`work from ${formatDay(c.startDate)}`);
    if (c.finishDate) parts.push(`ready to ship ${formatDay(c.finishDate)}`);
  }
  parts.push(c.dueDate ? `due ${formatDay(c.dueDate)}` : 'no due date');
  const slack = slackWords(c);
  if (slack) parts.push(slack);
  return parts.join(', ');
}

/**
 * Bars per commission in queue order over whole ISO weeks: from the first work to ready-to-ship (the last
 * wait included), a line for today and a marker on each due date. Every bar is a link to its commission,
 * so the chart is walked with Tab; each link's name reads the dates out in full.
 */
export function Timeline({ view, studioId }: { view: ScheduleView; studioId: number }) {
  const first = parseLocalDate(view.weeks[0].start);
  const days = view.weeks.length * 7;
  const index = (date: string) => parseLocalDate(date) - first;
  const pct = (d: number) => `${(d / days) * 100}%`;
  const todayIdx = index(view.today);
  const todayAt = todayIdx >= 0 && todayIdx < days ? todayIdx + localMinutes(view.now, view.timeZone) / 1440 : null;
  const track = { minWidth: days * MIN_DAY_PX };

  return (
    <div className="overflow-x-auto rounded-card border border-primer-300 bg-bone-50" role="region" aria-label="Timeline of the queue" tabIndex={0}>
      <div className="relative w-max min-w-full">
        {/* Axis: ISO 8601 weeks with their Monday, then the days */}
        <div className="sticky top-0 z-10 flex border-b border-primer-300 bg-bone-50 text-xs">
          <div className={cn('sticky left-0 z-20 shrink-0 border-r border-primer-300 bg-bone-50 px-3 py-2 font-semibold text-sable-600', LABEL)}>Commission</div>
          <div className="relative flex flex-1" style={track}>
            {todayAt !== null && (
              <span aria-hidden="true" className="absolute bottom-0 z-10 -translate-x-1/2 rounded-t-control bg-glaze-500 px-1 text-[11px] leading-4 font-semibold text-white" style={{ left: pct(todayAt) }}>
                Today
              </span>
            )}
            {view.weeks.map((w) => (
              <div key={w.start} className="truncate border-r border-primer-300 px-1.5 py-1" style={{ width: pct(7) }}>
                <abbr title={`ISO week ${w.week} of ${w.year}, ${formatDay(w.start)} to ${formatDay(w.end)}`} className="font-semibold no-underline">
                  {w.label}
                </abbr>
                <span className="ml-1 text-sable-600">{shortDay(w.start)}</span>
              </div>
            ))}
          </div>
        </div>

        <ol aria-label="Commissions in queue order" className="relative">
          {/* Week lines, weekend shading and the today line sit behind the rows. */}

          {view.commissions.map((c) => {
            const s = c.startDate ? index(c.startDate) : todayIdx;
            const e = c.finishDate ? index(c.finishDate) + 1 : null;
            const inWindow = e !== null && e > 0 && s < days;
            const left = Math.max(0, s);
            const right = e === null ? 0 : Math.min(days, e);
            const due = c.dueDate ? index(c.dueDate) : null;
            return (
              <li key={c.id} className="relative flex min-h-11 items-center border-b border-primer-300 last:border-b-0">
                <div className={cn('sticky left-0 z-10 flex shrink-0 flex-col self-stretch justify-center border-r border-primer-300 bg-bone-50 px-3 py-1', LABEL)}>
                  <span className="truncate text-sm font-medium" title={c.title}>
                    {c.queuePosition !== null && <span className="figures mr-1 text-sable-600">{c.queuePosition}.</span>}
                    {c.title}
                  </span>
                  <span className="truncate text-xs text-sable-600">{c.client.name}</span>
                </div>
                <div className="relative h-11 flex-1" style={track}>
                  {/* Weekends shaded, week ends ruled, the today line: behind the bar. */}
                  <div aria-hidden="true" className="pointer-events-none absolute inset-0 flex">
                    {Array.from({ length: days }, (_, d) => (
                      <div key={d} className={cn('h-full', d % 7 === 6 && 'border-r border-primer-300', d % 7 >= 5 && 'bg-primer-100')} style={{ width: pct(1) }} />
                    ))}
                  </div>
                  {todayAt !== null && <div aria-hidden="true" className="pointer-events-none absolute inset-y-0 z-[5] w-0.5 bg-glaze-500" style={{ left: pct(todayAt) }} />}
                  {inWindow ? (
                    <Link
                      to={`/studio/${studioId}/commissions/${c.id}`}
                      aria-label={barLabel(c)}
                      title={barLabel(c)}
                      className={cn(
                        'absolute top-2.5 flex h-6 items-center overflow-hidden rounded-control px-1.5 text-xs font-medium whitespace-nowrap text-white no-underline',
                        'focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-verdigris-600',
                        c.late ? 'bg-oxide-600' : 'bg-verdigris-600',
                        s < 0 && 'rounded-l-none',
                        e !== null && e > days && 'rounded-r-none',
                      )}
                      style={{ left: pct(left), width: `max(0.6rem, ${pct(right - left)})` }}
                    >
                      {s < 0 && <span aria-hidden="true">‹ </span>}
                      {c.finishDate ? `${c.late ? 'Late · ' : ''}${shortDay(c.finishDate)}` : ''}
                      {e !== null && e > days && <span aria-hidden="true"> ›</span>}
                    </Link>
                  ) : (
                    <Link to={`/studio/${studioId}/commissions/${c.id}`} aria-label={barLabel(c)} className="absolute top-3 left-2 text-xs text-sable-600">
                      {c.unscheduled ? `Not scheduled: ${unscheduledLabels[c.unscheduled]}` : e !== null && e <= 0 ? 'Ready before this window' : `Starts after this window (${c.startDate ? shortDay(c.startDate) : '—'})`}
                    </Link>
                  )}
                  {due !== null && due >= 0 && due < days && (
                    <span
                      aria-hidden="true"
                      title={`Due ${formatDay(c.dueDate!)}`}
                      className="absolute top-1 z-[6] h-9 w-0.5 bg-sable-900"
                      style={{ left: `calc(${pct(due + 1)} - 1px)` }}
                    >
                      <span className="absolute -top-0.5 -left-[5px] size-3 rotate-45 border-2 border-bone-50 bg-sable-900" />
                    </span>
                  )}
                </div>
              </li>
            );
          })}
        </ol>
      </div>
    </div>
  );
}

export function TimelineKey() {
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-sable-600" aria-label="Key to the timeline">
      <li className="flex items-center gap-1.5">
        <span aria-hidden="true" className="inline-block h-3 w-6 rounded-control bg-verdigris-600" /> On time: first work to ready to ship
      </li>
      <li className="flex items-center gap-1.5">
        <span aria-hidden="true" className="inline-block h-3 w-6 rounded-control bg-oxide-600" /> Ready after its due date
      </li>
      <li className="flex items-center gap-1.5">
        <span aria-hidden="true" className="inline-block size-2.5 rotate-45 bg-sable-900" /> Due date (end of the day)
      </li>
      <li className="flex items-center gap-1.5">
        <span aria-hidden="true" className="inline-block h-3 w-0.5 bg-glaze-500" /> Now
      </li>
      <li>Weeks are ISO 8601 weeks, Monday to Sunday.</li>
    </ul>
  );
}
