import { quoteStatusLabels, type QuoteStatus } from '../../../../shared/schemas/quotes';
import { Badge, type BadgeTone } from '../../../components/ui/badge';
import { formatDate } from '../../../lib/format';

const tones: Record<QuoteStatus, BadgeTone> = {
  draft: 'neutral',
  sent: 'info',
  accepted: 'success',
  changes_requested: 'attention',
  declined: 'danger',
  expired: 'neutral',
  superseded: 'neutral',
};

/** Clients read "Sent" as "waiting for you". */
const clientLabels: Partial<Record<QuoteStatus, string>> = { sent: 'Waiting for your answer' };

export function QuoteStatusBadge({ status, forClient = false }: { status: QuoteStatus; forClient?: boolean }) {
  return <Badge tone={tones[status]}>{(forClient && clientLabels[status]) || quoteStatusLabels[status]}</Badge>;
}

/** A calendar day (yyyy-mm-dd) with its weekday, formatted at UTC noon so no timezone moves it. */
export function formatDay(date: string): string {
  return formatDate(`${date}T12:00:00Z`, 'UTC');
}

/** Today in the studio's timezone, as yyyy-mm-dd: the quote date the server prices with. */
export function todayIn(timezone: string): string {
  try {
    return new Intl.DateTimeFormat('en-CA', { timeZone: timezone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
  } catch {
    return new Date().toISOString().slice(0, 10);
  }
}
