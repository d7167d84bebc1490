import { Link } from 'react-router-dom';
import { formatMoney } from '../../../../shared/money';
import { Card } from '../../../components/ui/card';
import { useStudioScope } from '../../../lib/studio-scope';
import { useQuotes } from '../api/get-quotes';
import { formatDay } from './labels';

/** For the client's home: quotes waiting for their answer, and the way to all of them. */
export function ClientQuotesCard() {
  const { studioId } = useStudioScope();
  const waiting = useQuotes(studioId, { status: 'sent', limit: 10 });
  const items = waiting.data?.items ?? [];
  const base = `/studio/${studioId}/quotes`;
  return (
    <Card title="Quotes" actions={<Link to={base}>All your quotes</Link>}>
      {items.length === 0 ? (
        <p className="text-sm text-sable-600">No quote is waiting for your answer.</p>
      ) : (
        <ul className="flex flex-col gap-2 text-sm">
          {items.map((q) => (
            <li key={q.id} className="flex flex-wrap items-baseline justify-between gap-2">
              <Link to={`${base}/${q.id}`} className="font-medium">
                {q.commissionTitle}
              </Link>
              <span className="figures text-sable-600">
                {formatMoney(q.total, q.currency)} · answer by {formatDay(q.validUntil)}
              </span>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
