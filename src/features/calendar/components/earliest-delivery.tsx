import { CalendarClock } from 'lucide-react';
import { unscheduledLabels } from '../../../../shared/schemas/schedule';
import { Spinner } from '../../../components/ui/spinner';
import { cn } from '../../../lib/cn';
import { useEarliestDelivery, type DeliveryWork } from '../api/get-earliest-delivery';
import { formatDay } from './dates';

/**
 * "If booked today": the earliest delivery date the studio can honestly promise for some work, placed at
 * the end of the queue now in the painters' real hours (days off and drying waits included). For the
 * quote screen: pass the commission being quoted (its stage estimates are used), or the quote's hours and
 * the wait after its last stage. Owners only (the endpoint answers 403 to others).
 */
export function EarliestDelivery({ studioId, className, ...work }: DeliveryWork & { studioId: number; className?: string }) {
  const q = useEarliestDelivery(studioId, work);
  const frame = cn('flex items-start gap-2 rounded-control border border-primer-300 bg-bone-50 p-3 text-sm', className);
  if (work.commissionId === undefined && !(work.hours && work.hours > 0)) return null;
  if (q.isPending) {
    return (
      <div className={frame}>
        <Spinner label="Working out the earliest delivery…" />
        <span aria-hidden="true">Working out the earliest delivery…</span>
      </div>
    );
  }
  if (q.error) return <div className={frame}>The earliest delivery could not be worked out: {q.error.message}</div>;
  const d = q.data;
  return (
    <div className={frame} role="status">
      <CalendarClock aria-hidden="true" className="mt-0.5 size-4 shrink-0 text-verdigris-600" />
      {d.date ? (
        <p>
          If booked today, the earliest delivery is <strong className="figures">{formatDay(d.date)}</strong>
          <span className="block text-xs text-sable-600">
            {d.hours} h of bench work after {d.queueLength === 1 ? '1 commission' : `${d.queueLength} commissions`} in the queue, in the painters’ working
            hours, drying included.
          </span>
        </p>
      ) : (
        <p>
          No delivery date yet: {d.unscheduled ? unscheduledLabels[d.unscheduled].toLowerCase() : 'the queue has no room'}. Set the painters’ working hours under
          Calendar.
        </p>
      )}
    </div>
  );
}
