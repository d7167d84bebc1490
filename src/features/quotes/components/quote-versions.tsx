import { Link } from 'react-router-dom';
import { formatMoney } from '../../../../shared/money';
import type { QuoteSummary } from '../../../../shared/schemas/quotes';
import { formatDate } from '../../../lib/format';
import { QuoteStatusBadge } from './labels';

/** Every version of one commission's quote, newest first; the one on screen is marked. */
export function QuoteVersions({
  versions,
  currentId,
  timezone,
  forClient,
  linkBase = '..',
}: {
  versions: QuoteSummary[];
  currentId?: number;
  timezone: string;
  forClient: boolean;
  /** where the quotes' pages are, relative to the current URL */
  linkBase?: string;
}) {
  const sorted = [...versions].sort((a, b) => b.version - a.version);
  return (
    <ol className="flex flex-col divide-y divide-primer-300">
      {sorted.map((q) => {
        const here = q.id === currentId;
        return (
          <li key={q.id} className="flex flex-wrap items-center justify-between gap-2 py-2 text-sm">
            <span className="flex flex-wrap items-center gap-2">
              {here ? (
                <span className="font-semibold" aria-current="page">
                  Version {q.version} (this one)
                </span>
              ) : (
                <Link to={`${linkBase}/${q.id}`} relative="path" className="font-medium">
                  Version {q.version}
                </Link>
              )}
              <QuoteStatusBadge status={q.status} forClient={forClient} />
            </span>
            <span className="figures text-sable-600">
              {formatMoney(q.total, q.currency)} · {q.sentAt ? `sent ${formatDate(q.sentAt, timezone)}` : `started ${formatDate(q.createdAt, timezone)}`}
            </span>
          </li>
        );
      })}
    </ol>
  );
}
