import { Link } from 'react-router-dom';
import { Brush } from 'lucide-react';
import { commissionStatusLabels } from '../../../../shared/commission-lifecycle';
import type { ClientDashboard } from '../../../../shared/schemas/dashboard';
import { Badge } from '../../../components/ui/badge';
import { EmptyState } from '../../../components/ui/empty-state';
import { formatDay } from './dates';

function expected(c: ClientDashboard['commissions'][number]): string {
  if (c.status === 'ready_to_ship') return 'Ready to ship';
  if (c.status === 'shipped') return 'On its way to you';
  if (c.status === 'on_hold') return 'Paused for now';
  if (c.projectedDate) return `Expected ready ${formatDay(c.projectedDate)}`;
  if (c.status === 'enquiry' || c.status === 'quoted') return 'A date follows once it is booked';
  return 'Date to follow';
}

/** The client's home: their commissions with this studio and when each should be ready. */
export function ClientHome({ studioId, studioName, d }: { studioId: number; studioName: string; d: ClientDashboard }) {
  if (d.commissions.length === 0) {
    return (
      <EmptyState icon={<Brush className="size-8" />} title="Nothing on the bench for you yet">
        Once {studioName} books your figures, you can follow them here from primer to varnish, with the date they should be ready.
      </EmptyState>
    );
  }
  return (
    <div className="flex flex-col gap-3">
      <ul aria-label="My commissions" className="flex flex-col gap-3">
        {d.commissions.map((c) => (
          <li key={c.id} className="rounded-card border border-primer-300 bg-bone-50 p-4 shadow-raised">
            <div className="flex flex-wrap items-start justify-between gap-2">
              <h2 className="text-lg font-semibold">
                <Link to={`/studio/${studioId}/commissions/${c.id}`}>{c.title}</Link>
              </h2>
              <Badge tone={c.status === 'ready_to_ship' ? 'attention' : c.status === 'on_bench' ? 'success' : c.status === 'booked' ? 'info' : 'neutral'}>
                {commissionStatusLabels[c.status]}
              </Badge>
            </div>
            <p className="mt-1 text-base">{expected(c)}</p>
            <p className="text-sm text-sable-600">
              {c.dueDate ? `You asked for ${formatDay(c.dueDate)}` : 'No date asked for'}
              {c.late && c.projectedDate ? ' · the forecast is after that date' : ''}
            </p>
          </li>
        ))}
      </ul>
      <p className="text-xs text-sable-600">Dates are the studio’s forecast from its queue and working hours; they move as the work goes on.</p>
    </div>
  );
}
