import { formatDate } from '../../../lib/format';

/** A calendar day (yyyy-mm-dd) with its weekday; read at UTC noon so no timezone moves it. */
export const formatDay = (date: string) => formatDate(`${date}T12:00:00Z`, 'UTC');

/** "Wed, 2 Dec" */
export const shortDay = (date: string) => new Intl.DateTimeFormat(undefined, { weekday: 'short', day: 'numeric', month: 'short', timeZone: 'UTC' }).format(new Date(`${date}T12:00:00Z`));

/** "09:30" in the studio's timezone. */
export function clock(instant: string, timeZone: string): string {
  try {
    return new Intl.DateTimeFormat(undefined, { hour: '2-digit', minute: '2-digit', timeZone }).format(new Date(instant));
  } catch {
    return instant.slice(11, 16);
  }
}

export const hoursText = (h: number) => `${new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 }).format(h)} h`;

const days = (n: number) => `${n} ${n === 1 ? 'day' : 'days'}`;
export function slackWords(slack: number | null): string | null {
  if (slack === null) return null;
  if (slack < 0) return `${days(-slack)} late`;
  if (slack === 0) return 'ready on its due date';
  return `${days(slack)} to spare`;
}


/** "30 Nov" */
export const dayMonth = (date: string) => new Intl.DateTimeFormat(undefined, { day: 'numeric', month: 'short', timeZone: 'UTC' }).format(new Date(`${date}T12:00:00Z`));
