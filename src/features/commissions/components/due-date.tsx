import type { CommissionStatus } from '../../../../shared/commission-lifecycle';
import { Badge } from '../../../components/ui/badge';
import { formatDate } from '../../../lib/format';

const DONE: CommissionStatus[] = ['shipped', 'closed', 'cancelled'];

/** Today's date (yyyy-mm-dd) in the studio's timezone. */
export function todayIn(timezone: string): string {
  try {
    return new Intl.DateTimeFormat('en-CA', { timeZone: timezone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
  } catch {
    return new Date().toISOString().slice(0, 10);
  }
}

/** A calendar day (yyyy-mm-dd) with its weekday; formatted at UTC noon so no timezone moves it. */
export function formatDay(date: string): string {
  return formatDate(`${date}T12:00:00Z`, 'UTC');
}

/**
 * A due date is a calendar day, not an instant: shown as that day (formatted at UTC noon so no
 * timezone moves it), with a word when it is past or close.
 */
export function DueDate({ date, status, timezone }: { date: string | null; status?: CommissionStatus; timezone: string }) {
  if (!date) return <span className="text-sable-600">—</span>;
  const shown = formatDay(date);
  if (status && DONE.includes(status)) return <span className="figures">{shown}</span>;
  const today = todayIn(timezone);
  const days = Math.round((Date.parse(date) - Date.parse(today)) / 86_400_000);
  return (
    <span className="inline-flex flex-wrap items-center gap-1">
      <span className="figures">{shown}</span>
      {days < 0 ? <Badge tone="danger">Overdue</Badge> : days <= 7 ? <Badge tone="attention">Due soon</Badge> : null}
    </span>
  );
}
