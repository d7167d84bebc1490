import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { Check, ChevronLeft, CircleCheck, X } from 'lucide-react';
import { sizeClassLabels } from '../../../../shared/schemas/commissions';
import type { AcceptEnquiryResult } from '../../../../shared/schemas/enquiries';
import { Button, ButtonLink } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { formatDate, formatDateTime, formatMoney, pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useEnquiry } from '../api/get-enquiry';
import { AcceptDialog, DeclineDialog } from '../components/decide-dialogs';
import { EnquiryStatusBadge } from '../components/enquiry-status';

function Back() {
  return (
    <Link to=".." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
      <ChevronLeft aria-hidden="true" className="size-4" />
      Enquiries
    </Link>
  );
}

const day = (d: string) => formatDate(`${d}T12:00:00Z`, 'UTC');

/** One enquiry with everything the visitor sent, and the owner's two ways forward. */
export function EnquiryDetailRoute() {
  const { studioId, timezone } = useStudioScope();
  const enquiryId = Number(useParams().enquiryId);
  const enquiry = useEnquiry(studioId, enquiryId);
  const toast = useToast();
  const [dialog, setDialog] = useState<'accept' | 'decline' | null>(null);
  const [accepted, setAccepted] = useState<AcceptEnquiryResult | null>(null);

  if (enquiry.isPending) return <LoadingBlock label="Loading the enquiry…" />;
  if (enquiry.error) {
    return (
      <>
        <Back />
        <PageTitle title={isApiError(enquiry.error, 404) ? 'Enquiry not found' : 'This enquiry did not load'} />
        <ErrorNote>{isApiError(enquiry.error, 404) ? 'The link may be wrong.' : enquiry.error.message}</ErrorNote>
      </>
    );
  }
  const e = enquiry.data;
  const commissionPath = e.commissionId ? `../../commissions/${e.commissionId}` : null;

  return (
    <>
      <Back />
      <PageTitle
        title={`Enquiry from ${e.name}`}
        description={`Received ${formatDateTime(e.createdAt, timezone)}`}
        actions={
          e.status === 'new' && (
            <>
              <Button onClick={() => setDialog('accept')}>
                <Check aria-hidden="true" className="size-4" />
                Accept as commission
              </Button>
              <Button variant="secondary" onClick={() => setDialog('decline')}>
                <X aria-hidden="true" className="size-4" />
                Decline
              </Button>
            </>
          )
        }
      />
      <div className="flex flex-col gap-6">
        {accepted && (
          <div role="status" className="flex gap-3 rounded-control border border-verdigris-600 bg-bone-50 p-3 text-sm">
            <CircleCheck aria-hidden="true" className="mt-0.5 size-5 shrink-0 text-verdigris-600" />
            <div className="flex flex-col gap-1">
              <p className="font-semibold">
                Accepted: the commission is made {accepted.client.matched ? `for your client ${accepted.client.name}` : `and ${accepted.client.name} is a new client`}.
              </p>
              <p>{accepted.invitation.note}</p>
            </div>
          </div>
        )}
        {e.status !== 'new' && (
          <Note>
            <div className="flex flex-wrap items-center gap-2">
              <EnquiryStatusBadge status={e.status} />
              <span>
                {e.status === 'accepted' ? 'Accepted' : 'Declined'}
                {e.decidedBy ? ` by ${e.decidedBy.name}` : ''}
                {e.decidedAt ? ` on ${formatDate(e.decidedAt, timezone)}` : ''}.
              </span>
              {commissionPath && (
                <ButtonLink to={commissionPath} relative="path" size="sm" variant="secondary">
                  Open the commission
                </ButtonLink>
              )}
            </div>
            {e.declineMessage && (
              <details className="mt-2">
                <summary className="cursor-pointer text-sm font-medium">The message that was sent</summary>
                <p className="mt-2 whitespace-pre-line">{e.declineMessage}</p>
              </details>
            )}
          </Note>
        )}

        <Card>
          <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2">
            <div>
              <dt className="text-sable-600">E-mail</dt>
              <dd className="mt-0.5 break-all">
                <a href={`mailto:${e.email}`}>{e.email}</a>
                {e.existingClient && e.status === 'new' && (
                  <span className="mt-1 block text-xs text-sable-600">
                    Already your client: {e.existingClient.name}
                    {e.existingClient.hasAccount ? ' (has an account)' : ''}
                  </span>
                )}
              </dd>
            </div>
            <div>
              <dt className="text-sable-600">Tier</dt>
              <dd className="mt-0.5">{e.tier?.label ?? 'No preference'}</dd>
            </div>
            <div>
              <dt className="text-sable-600">Wished by</dt>
              <dd className="figures mt-0.5">{e.dueDate ? day(e.dueDate) : '—'}</dd>
            </div>
            <div>
              <dt className="text-sable-600">Budget</dt>
              <dd className="figures mt-0.5">{e.budgetMinor !== null ? formatMoney(e.budgetMinor, e.currency) : '—'}</dd>
            </div>
            <div className="sm:col-span-2">
              <dt className="text-sable-600">Extras</dt>
              <dd className="mt-0.5">{e.extras.length ? e.extras.map((x) => x.label).join(', ') : 'None'}</dd>
            </div>
            {e.notes && (
              <div className="sm:col-span-2">
                <dt className="text-sable-600">Notes</dt>
                <dd className="mt-0.5 whitespace-pre-line">{e.notes}</dd>
              </div>
            )}
          </dl>
        </Card>

        <section aria-labelledby="enquiry-figures-title" className="flex flex-col gap-3">
          <h2 id="enquiry-figures-title" className="text-lg font-semibold">
            Figures ({pluralize(e.modelCount, 'figure')})
          </h2>
          <Table caption="The figure list as sent" captionHidden>
            <THead>
              <Tr>
                <Th>Figure</Th>
                <Th className="text-right">How many</Th>
                <Th>Base size</Th>
              </Tr>
            </THead>
            <TBody>
              {e.figures.map((f, i) => (
                <Tr key={i}>
                  <Td>{f.name}</Td>
                  <Td className="figures text-right">{f.quantity}</Td>
                  <Td>{sizeClassLabels[f.sizeClass] ?? f.sizeClass}</Td>
                </Tr>
              ))}
            </TBody>
          </Table>
        </section>

        <section aria-labelledby="enquiry-photos-title" className="flex flex-col gap-3">
          <h2 id="enquiry-photos-title" className="text-lg font-semibold">
            Reference photos
          </h2>
          {e.photos.length === 0 ? (
            <p className="text-sm text-sable-600">No photos were sent.</p>
          ) : (
            <>
              <ul className="grid grid-cols-2 gap-3 sm:grid-cols-4">
                {e.photos.map((p, i) => (
                  <li key={p.id}>
                    <a href={p.urls.large} target="_blank" rel="noreferrer" className="block overflow-hidden rounded-card border border-primer-300 bg-white">
                      <img src={p.urls.thumb} alt={`Reference photo ${i + 1} from ${e.name} (opens full size in a new tab)`} className="aspect-square w-full object-cover" loading="lazy" />
                    </a>
                  </li>
                ))}
              </ul>
              {e.status === 'new' && <p className="text-xs text-sable-600">Accepting the enquiry adds these photos to the commission as reference photos the client can see.</p>}
            </>
          )}
        </section>
      </div>

      {e.status === 'new' && (
        <>
          <AcceptDialog
            studioId={studioId}
            enquiry={e}
            open={dialog === 'accept'}
            onClose={() => setDialog(null)}
            onAccepted={(r) => {
              setDialog(null);
              setAccepted(r);
              toast.show('Enquiry accepted; the commission is made.');
            }}
          />
          <DeclineDialog
            studioId={studioId}
            enquiry={e}
            open={dialog === 'decline'}
            onClose={() => setDialog(null)}
            onDeclined={() => {
              setDialog(null);
              toast.show(`Declined; your message is on its way to ${e.email}.`);
            }}
          />
        </>
      )}
    </>
  );
}
