import type { ReactNode } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ChevronLeft } from 'lucide-react';
import type { CommissionDetail } from '../../../../shared/schemas/commissions';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { isApiError } from '../../../lib/api-client';
import { lockedStatuses } from '../../../../shared/commission-lifecycle';
import { useStudioScope } from '../../../lib/studio-scope';
import { useCommission } from '../api/get-commission';
import { ClientApprovals } from '../components/approvals-panel';
import { ClientTimeline } from '../components/client-timeline';
import { CommentsThread } from '../components/comments-thread';
import { DueDate } from '../components/due-date';
import { ProgressBar } from '../components/progress-bar';
import { SchemeNotes } from '../components/scheme-notes';
import { SchemeSection } from '../../schemes/components/scheme-section';
import { StatusBadge } from '../components/status-badge';
import { Section } from './commission-detail';
import { ClientParcel } from '../../shipments/components/client-parcel';

function Back() {
  return (
    <Link to="../.." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
      <ChevronLeft aria-hidden="true" className="size-4" />
      My commissions
    </Link>
  );
}

/**
 * A client's own commission. Photos come from the photos feature, handed in by the app's route:
 * `photosFor` shows the shared photos of a figure (stage null) or stage, `references` the client's
 * own reference photos with their upload, `finished` the full-size downloads.
 */
export function ClientCommissionRoute({
  photosFor,
  loosePhotos,
  references,
  finished,
}: {
  photosFor?: (figureId: number, stageId: number | null) => ReactNode;
  loosePhotos?: (c: CommissionDetail) => ReactNode;
  references?: (c: CommissionDetail) => ReactNode;
  finished?: (c: CommissionDetail) => ReactNode;
}) {
  const { studioId, timezone, userId, studioName } = useStudioScope();
  const commissionId = Number(useParams().commissionId);
  const commission = useCommission(studioId, commissionId);

  if (commission.isPending) return <LoadingBlock label="Loading your commission…" />;
  if (commission.error) {
    return (
      <>
        <Back />
        <PageTitle title={isApiError(commission.error, 404) ? 'Commission not found' : 'This commission did not load'} />
        <ErrorNote>{isApiError(commission.error, 404) ? 'The link may be wrong, or it belongs to another account.' : commission.error.message}</ErrorNote>
      </>
    );
  }
  const c = commission.data;
  const done = ['ready_to_ship', 'shipped', 'closed'].includes(c.status);
  return (
    <>
      <Back />
      <PageTitle title={c.title} description={`With ${studioName}`} />
      <div className="flex flex-col gap-8">
        <Card>
          <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2">
            <div>
              <dt className="text-sable-600">Status</dt>
              <dd className="mt-0.5">
                <StatusBadge status={c.status} />
              </dd>
            </div>
            <div>
              <dt className="text-sable-600">Due</dt>
              <dd className="mt-0.5">
                <DueDate date={c.dueDate} status={c.status} timezone={timezone} />
              </dd>
            </div>
            <div className="sm:col-span-2">
              <dt className="sr-only">Progress</dt>
              <dd>
                <ProgressBar progress={c.progress} label={`Progress of ${c.title}`} hours={false} />
              </dd>
            </div>
            {c.brief && (
              <div className="sm:col-span-2">
                <dt className="text-sable-600">Your brief</dt>
                <dd className="mt-0.5 whitespace-pre-line">{c.brief}</dd>
              </div>
            )}
            {c.cancelReason && (
              <div className="sm:col-span-2">
                <dt className="text-sable-600">Why it was cancelled</dt>
                <dd className="mt-0.5 whitespace-pre-line">{c.cancelReason}</dd>
              </div>
            )}
          </dl>
        </Card>

        <ClientParcel studioId={studioId} commissionId={c.id} commissionStatus={c.status} timezone={timezone} />

        <Section id="approvals" title="Approvals">
          <ClientApprovals studioId={studioId} commissionId={c.id} timezone={timezone} />
        </Section>

        {done && finished && (
          <Section id="finished" title="The finished work">
            {finished(c)}
          </Section>
        )}

        <Section id="timeline" title="Progress, figure by figure">
          {c.figures.length === 0 ? (
            <p className="text-sm text-sable-600">The studio has not listed the figures yet.</p>
          ) : (
            c.figures.map((f) => <ClientTimeline key={f.id} figure={f} timezone={timezone} photosFor={photosFor} />)
          )}
          {loosePhotos?.(c)}
        </Section>

        <Section id="scheme" title="Colour scheme">
          <SchemeNotes
            studioId={studioId}
            commissionId={c.id}
            notes={c.schemeNotes}
            canEdit={!lockedStatuses.includes(c.status)}
            hint="Colours you want, what to avoid, what the figures should feel like. The studio reads these."
          />
          <SchemeSection commissionId={c.id} />
          {references?.(c)}
        </Section>

        <Section id="comments" title="Talk with the studio">
          <CommentsThread studioId={studioId} commissionId={c.id} userId={userId} timezone={timezone} />
        </Section>
      </div>
    </>
  );
}
