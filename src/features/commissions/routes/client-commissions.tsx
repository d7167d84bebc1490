import { Link } from 'react-router-dom';
import { Brush } from 'lucide-react';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { useCommissions } from '../api/get-commissions';
import { DueDate } from '../components/due-date';
import { ProgressBar } from '../components/progress-bar';
import { StatusBadge } from '../components/status-badge';

/** The client's portal home: their own commissions with this studio. */
export function ClientCommissionsRoute({ greeting }: { greeting: string }) {
  const { studioId, studioName, timezone } = useStudioScope();
  const list = useCommissions(studioId, { limit: 100 });
  return (
    <>
      <PageTitle title="My commissions" description={greeting} />
      {list.isPending ? (
        <LoadingBlock label="Loading your commissions…" />
      ) : list.error ? (
        <ErrorNote title="Your commissions did not load">{list.error.message}</ErrorNote>
      ) : list.data.items.length === 0 ? (
        <EmptyState icon={<Brush className="size-8" />} title="Nothing on the bench for you yet">
          Once {studioName} books your figures, you can follow them here from primer to varnish: progress photos, the colour scheme to approve, and the finished
          work.
        </EmptyState>
      ) : (
        <ul aria-label="My commissions" className="flex flex-col gap-3">
          {list.data.items.map((c) => (
            <li key={c.id} className="rounded-card border border-primer-300 bg-bone-50 p-4 shadow-raised">
              <div className="flex flex-wrap items-start justify-between gap-2">
                <h2 className="text-lg font-semibold">
                  <Link to={`/studio/${studioId}/commissions/${c.id}`}>{c.title}</Link>
                </h2>
                <StatusBadge status={c.status} />
              </div>
              <p className="mt-1 text-sm text-sable-600">
                {c.modelCount} {c.modelCount === 1 ? 'figure' : 'figures'} ·{' '}
                {c.dueDate ? (
                  <>
                    due <DueDate date={c.dueDate} status={c.status} timezone={timezone} />
                  </>
                ) : (
                  'no due date yet'
                )}
              </p>
              <ProgressBar progress={c.progress} label={`Progress of ${c.title}`} className="mt-2" hours={false} />
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
