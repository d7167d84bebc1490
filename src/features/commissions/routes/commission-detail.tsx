import { useState, type ReactNode } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Plus } from 'lucide-react';
import { lockedStatuses, priorityLabels } from '../../../../shared/commission-lifecycle';
import type { CommissionDetail } from '../../../../shared/schemas/commissions';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Dialog } from '../../../components/ui/dialog';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useStudioScope } from '../../../lib/studio-scope';
import { useCommission } from '../api/get-commission';
import { useHazards } from '../api/get-hazards';
import { useLists } from '../api/get-lists';
import { useRemoveFigure } from '../api/remove-figure';
import { ActivityLog } from '../components/activity-log';
import { AddFigureDialog } from '../components/add-figure-dialog';
import { StudioApprovals } from '../components/approvals-panel';
import { CommentsThread } from '../components/comments-thread';
import { DueDate } from '../components/due-date';
import { FigureCard, type StageSlots } from '../components/figure-card';
import type { PersonOption } from '../components/figure-fields';
import { ProgressBar } from '../components/progress-bar';
import { SchemeNotes } from '../components/scheme-notes';
import { SchemeSection } from '../../schemes/components/scheme-section';
import { StatusBadge } from '../components/status-badge';
import { TransitionBar } from '../components/transition-bar';
import { BackToCommissions } from './commission-new';
import { ModelsInSection } from '../../models-in/components/models-in-section';
import { ShippingSection } from '../../shipments/components/shipping-section';

export function Section({ id, title, actions, children }: { id: string; title: string; actions?: ReactNode; children: ReactNode }) {
  return (
    <section id={id} aria-labelledby={`${id}-title`} className="flex scroll-mt-20 flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id={`${id}-title`} className="text-lg font-semibold">
          {title}
        </h2>
        {actions}
      </div>
      {children}
    </section>
  );
}

const h = (n: number) => new Intl.NumberFormat(undefined, { maximumFractionDigits: 1 }).format(n);

/**
 * The studio's view of one commission. Photos and time come from their own features, handed in by the
 * app's route as slots.
 */
export function CommissionDetailRoute({
  painters = [],
  stageSlots,
  photos,
}: {
  painters?: PersonOption[];
  stageSlots?: StageSlots;
  photos?: (c: CommissionDetail) => ReactNode;
}) {
  const { studioId, role, timezone, userId } = useStudioScope();
  const commissionId = Number(useParams().commissionId);
  const commission = useCommission(studioId, commissionId);
  const lists = useLists(studioId);
  const hazards = useHazards(studioId);
  const removeFigure = useRemoveFigure(studioId);
  const toast = useToast();
  const [adding, setAdding] = useState(false);
  const [removing, setRemoving] = useState<{ id: number; name: string } | null>(null);
  const isOwner = role === 'owner';

  if (commission.isPending) return <LoadingBlock label="Loading the commission…" />;
  if (commission.error) {
    return (
      <>
        <BackToCommissions />
        <PageTitle title={isApiError(commission.error, 404) ? 'Commission not found' : 'This commission did not load'} />
        <ErrorNote>{isApiError(commission.error, 404) ? 'It may have been removed, or the link is wrong.' : commission.error.message}</ErrorNote>
      </>
    );
  }
  const c = commission.data;
  const locked = lockedStatuses.includes(c.status);

  return (
    <>
      <BackToCommissions />
      <PageTitle title={c.title} description={`For ${c.client.name}`} />
      <nav aria-label="On this page" className="-mt-3 mb-5 flex flex-wrap gap-x-4 gap-y-1 text-sm">
        {[
          ['figures', 'Figures'],
          ...(photos ? [['photos', 'Photos']] : []),
          ['scheme', 'Scheme'],
          ['approvals', 'Approvals'],
          ['comments', 'Comments'],
          ['activity', 'Activity'],
        ].map(([id, label]) => (
          <a key={id} href={`#${id}`}>
            {label}
          </a>
        ))}
      </nav>
      <div className="flex flex-col gap-8">
        <Card>
          <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-3">
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
            <div>
              <dt className="text-sable-600">Priority</dt>
              <dd className="mt-0.5">{priorityLabels[c.priority]}</dd>
            </div>
            <div className="sm:col-span-3">
              <dt className="sr-only">Progress</dt>
              <dd>
                <ProgressBar progress={c.progress} label={`Progress of ${c.title}`} />
                {c.loggedHours !== null && <p className="figures mt-1 text-sm text-sable-600">{h(c.loggedHours)} h logged in all</p>}
              </dd>
            </div>
            {c.brief && (
              <div className="sm:col-span-3">
                <dt className="text-sable-600">Brief</dt>
                <dd className="mt-0.5 whitespace-pre-line">{c.brief}</dd>
              </div>
            )}
            {c.cancelReason && (
              <div className="sm:col-span-3">
                <dt className="text-sable-600">Why it was cancelled</dt>
                <dd className="mt-0.5 whitespace-pre-line">{c.cancelReason}</dd>
              </div>
            )}
          </dl>
          {isOwner && (
            <div className="mt-4 border-t border-primer-300 pt-4">
              <TransitionBar studioId={studioId} commission={c} />
              <p className="mt-3 flex flex-wrap gap-x-4 gap-y-1 text-sm">
                <Link to={`/studio/${studioId}/commissions/${c.id}/quotes`}>Quotes for this commission</Link>
                <Link to={`/studio/${studioId}/invoices?commission=${c.id}`}>Its invoices</Link>
              </p>
            </div>
          )}
        </Card>

        <Section
          id="figures"
          title="Figures and stages"
          actions={
            isOwner &&
            !locked && (
              <Button variant="secondary" size="sm" onClick={() => setAdding(true)}>
                <Plus aria-hidden="true" className="size-4" />
                Add a figure
              </Button>
            )
          }
        >
          {c.figures.length === 0 ? (
            <EmptyState title="No figures yet">{isOwner ? 'Add the figures the client sent; each gets its stage checklist.' : 'The owner adds the figures.'}</EmptyState>
          ) : (
            c.figures.map((f) => (
              <FigureCard
                key={f.id}
                studioId={studioId}
                figure={f}
                lists={lists.data}
                hazards={hazards.data}
                timezone={timezone}
                locked={locked}
                canRemove={isOwner}
                onRemove={() => setRemoving({ id: f.id, name: f.name })}
                slots={stageSlots}
              />
            ))
          )}
        </Section>

        <ModelsInSection studioId={studioId} commissionId={c.id} canNotify={isOwner} timezone={timezone} locked={locked} />

        {photos && (
          <Section id="photos" title="Photos">
            {photos(c)}
          </Section>
        )}

        <Section id="scheme" title="Colour scheme">
          <SchemeNotes
            studioId={studioId}
            commissionId={c.id}
            notes={c.schemeNotes}
            canEdit={isOwner && !locked}
            hint="The client sees and edits these notes too."
          />
          <SchemeSection commissionId={c.id} figures={c.figures} />
        </Section>

        <Section id="approvals" title="Approvals">
          <StudioApprovals studioId={studioId} commissionId={c.id} timezone={timezone} locked={locked} />
        </Section>

        <ShippingSection studioId={studioId} commissionId={c.id} commissionStatus={c.status} isOwner={isOwner} timezone={timezone} />

        <Section id="comments" title="Comments with the client">
          <CommentsThread studioId={studioId} commissionId={c.id} userId={userId} timezone={timezone} />
        </Section>

        <Section id="activity" title="Activity">
          <ActivityLog studioId={studioId} commissionId={c.id} timezone={timezone} />
        </Section>
      </div>

      {isOwner && <AddFigureDialog open={adding} onClose={() => setAdding(false)} studioId={studioId} commissionId={c.id} lists={lists.data} painters={painters} />}
      <Dialog
        open={removing !== null}
        onClose={() => setRemoving(null)}
        title={`Remove ${removing?.name ?? 'this figure'}?`}
        description="Its stages and logged time go with it. This cannot be undone."
        footer={
          <>
            <Button variant="secondary" onClick={() => setRemoving(null)}>
              Keep it
            </Button>
            <Button
              variant="danger"
              loading={removeFigure.isPending}
              onClick={async () => {
                if (!removing) return;
                try {
                  await removeFigure.mutateAsync(removing.id);
                  toast.show(`${removing.name} removed.`);
                } catch (err) {
                  toast.show(err instanceof Error ? err.message : 'That did not work. Try again.', 'error');
                }
                setRemoving(null);
              }}
            >
              Remove figure
            </Button>
          </>
        }
      />
    </>
  );
}
