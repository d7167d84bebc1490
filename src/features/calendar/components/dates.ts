import type { ScheduledCommission } from '../../../../shared/schemas/schedule';
import { formatDate } from '../../../lib/format';

/** A calendar day (yyyy-mm-dd) with its weekday, "Tue, 5 Jan 2027"; read at UTC noon so no timezone moves it. */
export const formatDay = (date: string) => formatDate(`${date}T12:00:00Z`, 'UTC');

/** "5 Jan" for axis labels and bars. */
export function shortDay(date: string): string {
  return new Intl.DateTimeFormat(undefined, { day: 'numeric', month: 'short', timeZone: 'UTC' }).format(new Date(`${date}T12:00:00Z`));
}

const days = (n: number) => `${n} ${n === 1 ? 'day' : 'days'}`;

/** "3 days late", "on its due date", "5 days to spare"; null without a due date or a forecast. */
export function slackWords(c: Pick<ScheduledCommission, 'slackDays'>): string | null {
  if (c.slackDays === null) return null;
  if (c.slackDays < 0) return `${days(-c.slackDays)} late`;
  if (c.slackDays === 0) return 'ready on its due date';
  return `${days(c.slackDays)} to spare`;
}
