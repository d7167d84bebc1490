import type { UtilisationWeek } from '../../../../shared/schemas/dashboard';
import { cn } from '../../../lib/cn';
import { dayMonth, hoursText } from './dates';

/** Booked hours against the painters' working hours, week by week (ISO weeks). */
export function Utilisation({ weeks }: { weeks: UtilisationWeek[] }) {
  return (
    <ul className="flex flex-col gap-2" aria-label="Booked hours against capacity by week">
      {weeks.map((w) => {
        const pct = Math.round(w.share * 100);
        return (
          <li key={w.start} className="grid grid-cols-[6.5rem_1fr_auto] items-center gap-2 text-sm">
            <span className="whitespace-nowrap">
              <abbr title={`ISO week ${w.week} of ${w.year}`} className="font-semibold no-underline">
                {w.label}
              </abbr>{' '}
              <span className="text-xs text-sable-600">{dayMonth(w.start)}</span>
            </span>
            <span aria-hidden="true" className="h-2.5 overflow-hidden rounded-full bg-primer-300">
              <span className={cn('block h-full rounded-full', w.share >= 0.95 ? 'bg-varnish-500' : 'bg-verdigris-600')} style={{ width: `${Math.min(100, pct)}%` }} />
            </span>
            <span className="figures w-36 text-right text-xs sm:text-sm">
              {w.capacityHours === 0 ? 'no hours' : `${hoursText(w.bookedHours)} of ${hoursText(w.capacityHours)} · ${pct} %`}
            </span>
          </li>
        );
      })}
    </ul>
  );
}
