import type { ReactNode } from 'react';
import { CalendarDays } from 'lucide-react';
import { ButtonLink } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { formatDate } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useDashboard } from '../api/get-dashboard';
import { BenchSummaryCards } from '../components/bench-summary';
import { ClientHome } from '../components/client-home';
import { OwnerHome } from '../components/owner-home';

function firstName(name: string): string {
  return name.trim().split(/\s+/)[0] ?? name;
}

/** Owners and painters land here: the owner's overview, or the painter's bench for today and this week. */
export function StudioHomeRoute({ userName }: { userName: string }) {
  const { studioId, studioName, role, timezone } = useStudioScope();
  const d = useDashboard(studioId);
  const today = formatDate(new Date(), timezone);
  return (
    <>
      <PageTitle
        title={`Hello, ${firstName(userName)}`}
        description={`${studioName} · ${today}`}
        actions={
          <ButtonLink to="calendar" variant="secondary">
            <CalendarDays aria-hidden="true" className="size-4" />
            Calendar
          </ButtonLink>
        }
      />
      {d.isPending ? (
        <LoadingBlock />
      ) : d.error ? (
        <ErrorNote title="This page did not load">{d.error.message}</ErrorNote>
      ) : d.data.role === 'owner' ? (
        <OwnerHome studioId={studioId} d={d.data} />
      ) : d.data.role === 'painter' ? (
        <BenchSummaryCards studioId={studioId} bench={d.data} />
      ) : (
        <ErrorNote>{role === 'client' ? 'This page is for the studio team.' : 'This page did not load.'}</ErrorNote>
      )}
    </>
  );
}

/** The client's portal home: their commissions with the date each should be ready; `aside` holds other features' cards (quotes, invoices). */
export function ClientHomeRoute({ userName, aside }: { userName: string; aside?: ReactNode }) {
  const { studioId, studioName } = useStudioScope();
  const d = useDashboard(studioId);
  return (
    <>
      <PageTitle title="My commissions" description={`Hello, ${firstName(userName)} — this is your corner of ${studioName}.`} />
      {d.isPending ? (
        <LoadingBlock label="Loading your commissions…" />
      ) : d.error ? (
        <ErrorNote title="Your commissions did not load">{d.error.message}</ErrorNote>
      ) : d.data.role === 'client' ? (
        <div className="flex flex-col gap-6">
          <ClientHome studioId={studioId} studioName={studioName} d={d.data} />
          {aside && <div className="grid gap-4 sm:grid-cols-2">{aside}</div>}
        </div>
      ) : null}
    </>
  );
}
