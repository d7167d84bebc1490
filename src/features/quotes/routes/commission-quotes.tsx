import { Link, useParams } from 'react-router-dom';
import { ChevronLeft, FileText } from 'lucide-react';
import { Card } from '../../../components/ui/card';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { useQuotes } from '../api/get-quotes';
import { NewVersionButton } from '../components/new-version-button';
import { QuoteVersions } from '../components/quote-versions';

/** /commissions/:commissionId/quotes — the owner's way in from a commission: its versions, and a new one. */
export function CommissionQuotesRoute() {
  const { studioId, timezone } = useStudioScope();
  const commissionId = Number(useParams().commissionId);
  const valid = Number.isInteger(commissionId) && commissionId > 0;
  const versions = useQuotes(studioId, { commissionId, limit: 200 }, { enabled: valid });
  const items = versions.data?.items ?? [];
  const title = items[0]?.commissionTitle;

  return (
    <>
      <Link to=".." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
        <ChevronLeft aria-hidden="true" className="size-4" />
        Back to the commission
      </Link>
      <PageTitle title={title ? `Quotes: ${title}` : 'Quotes for this commission'} description="Each change after sending makes a new version; the newest one sent is the one that counts." />
      {!valid ? (
        <ErrorNote>That link does not point to a commission.</ErrorNote>
      ) : versions.isPending ? (
        <LoadingBlock label="Loading quotes…" />
      ) : versions.error ? (
        <ErrorNote title="The quotes did not load">{versions.error.message}</ErrorNote>
      ) : (
        <div className="flex flex-col gap-6">
          {items.length === 0 ? (
            <EmptyState icon={<FileText className="size-8" />} title="No quote yet" action={<NewVersionButton studioId={studioId} commissionId={commissionId} versions={items} quotesPath="../../../quotes" variant="primary" />}>
              The quote starts from the commission’s figures and your price table; you can adjust it before sending.
            </EmptyState>
          ) : (
            <>
              <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
                <NewVersionButton studioId={studioId} commissionId={commissionId} versions={items} quotesPath="../../../quotes" variant="primary" />
                <Link to={`../../../invoices?commission=${commissionId}`} relative="path" className="text-sm">
                  Invoices of this commission
                </Link>
                <Link to="../cancel" relative="path" className="text-sm">
                  Cancel the commission…
                </Link>
              </div>
              <Card title="Versions">
                <QuoteVersions versions={items} timezone={timezone} forClient={false} linkBase="../../../quotes" />
              </Card>
            </>
          )}
        </div>
      )}
    </>
  );
}
