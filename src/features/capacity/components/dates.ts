import { formatDate } from '../../../lib/format';

/** A calendar day (yyyy-mm-dd) with its weekday; read at UTC noon so no timezone moves it. */
export const formatDay = (date: string) => formatDate(`${date}T12:00:00Z`, 'UTC');

export const dayRange = (from: string, to: string) => (from === to ? formatDay(from) : `${formatDay(from)} – ${formatDay(to)}`);
