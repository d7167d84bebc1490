import type { ReactNode } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ChevronLeft } from 'lucide-react';
import type { PriceTable } from '../../../../shared/schemas/price-table';
import type { Quote } from '../../../../shared/schemas/quotes';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { PageTitle, useDocumentTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { isApiError } from '../../../lib/api-client';
import { formatDate } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useQuote } from '../api/get-quote';
import { useQuotes } from '../api/get-quotes';
import { ClientDecision } from '../components/client-decision';
import { formatDay, QuoteStatusBadge } from '../components/labels';
import { NewVersionButton } from '../components/new-version-button';
import { QuoteBreakdown } from '../components/quote-breakdown';
import { QuoteEditor } from '../components/quote-editor';
import { QuoteVersions } from '../components/quote-versions';

export function BackToQuotes() {
  return (
    <Link to=".." relative="path" className="mb-3 inline-flex items-center gap-1 text-sm">
      <ChevronLeft aria-hidden="true" className="size-4" />
      All quotes
    </Link>
  );
}

function DecisionNote({ quote, timezone, forClient }: { quote: Quote; timezone: string; forClient: boolean }) {
  const when = quote.decidedAt ? formatDate(quote.decidedAt, timezone) : null;
  const who = forClient ? 'You' : (quote.decidedBy?.name ?? quote.client.name);
  switch (quote.status) {
    case 'accepted':
      return (
        <Note>
          Accepted{when ? ` on ${when}` : ''}, signed “{quote.acceptedName}”{forClient ? '' : ` by ${who}`}.
        </Note>
      );
    case 'changes_requested':
      return (
        <Note>
          <p>
            {who} asked for changes{when ? ` on ${when}` : ''}
            {quote.decisionComment ? ':' : '.'}
          </p>
          {quote.decisionComment && <blockquote className="mt-2 border-l-2 border-primer-300 pl-3 whitespace-pre-line">{quote.decisionComment}</blockquote>}
          {forClient && <p className="mt-2 text-sable-600">The studio will send you a new version.</p>}
        </Note>
      );
    case 'declined':
      return (
        <Note>
          <p>
            {who} declined this quote{when ? ` on ${when}` : ''}
            {quote.decisionComment ? ':' : '.'}
          </p>
          {quote.decisionComment && <blockquote className="mt-2 border-l-2 border-primer-300 pl-3 whitespace-pre-line">{quote.decisionComment}</blockquote>}
        </Note>
      );
    case 'expired':
      return <Note>This quote expired on {formatDay(quote.validUntil)}. {forClient ? 'Ask the studio for a new one if you would still like to go ahead.' : ''}</Note>;
    case 'superseded':
      return <Note>A newer version replaces this quote; see the versions below.</Note>;
    case 'sent':
      return forClient ? null : <Note>Sent{quote.sentAt ? ` on ${formatDate(quote.sentAt, timezone)}` : ''}; waiting for {quote.client.name} to answer.</Note>;
    default:
      return null;
  }
}

/**
 * One quote. The owner edits a draft with a live preview; everyone else reads it. A client
 * answers a sent quote here. `afterAccept` shows what follows an acceptance (the deposit invoice).
 */
export function QuoteDetailRoute({
  priceTable,
  priceTableError,
  afterAccept,
}: {
  priceTable?: PriceTable;
  priceTableError?: Error | null;
  afterAccept?: (quote: Quote) => ReactNode;
}) {
  const { studioId, role, timezone, studioName } = useStudioScope();
  const params = useParams();
  const quoteId = Number(params.quoteId);
  const valid = Number.isInteger(quoteId) && quoteId > 0;
  const quote = useQuote(studioId, quoteId, { enabled: valid });
  const q = quote.data;
  const versions = useQuotes(studioId, { commissionId: q?.commissionId, limit: 200 }, { enabled: !!q });
  const forClient = role === 'client';
  useDocumentTitle(q ? (forClient ? `Quote for ${q.commissionTitle}` : `Quote v${q.version}: ${q.commissionTitle}`) : 'Quote');

  if (!valid || isApiError(quote.error, 404)) {
    return (
      <>
        <BackToQuotes />
        <PageTitle title="Quote not found" />
        <ErrorNote>We could not find this quote. The link may be wrong, or it is not one of yours.</ErrorNote>
      </>
    );
  }
  if (quote.isPending) return <LoadingBlock label="Loading quote…" />;
  if (quote.error || !q) {
    return (
      <>
        <BackToQuotes />
        <ErrorNote title="This quote did not load">{quote.error?.message}</ErrorNote>
      </>
    );
  }

  const editing = !forClient && q.allowedActions.includes('edit');
  const result = q.result;
  const ownerMinutes = forClient ? undefined : result.lines.map((l) => ('batchMinutes' in l ? l.batchMinutes : null));

  const header = (
    <PageTitle
      title={forClient ? `Quote for ${q.commissionTitle}` : `Quote v${q.version}: ${q.commissionTitle}`}
      description={
        <span className="flex flex-wrap items-center gap-x-3 gap-y-1">
          <QuoteStatusBadge status={q.status} forClient={forClient} />
          {forClient ? <span>From {studioName}</span> : <span>For {q.client.name}</span>}
          {!forClient && (
            <Link to={`../../commissions/${q.commissionId}`} relative="path">
              Open the commission
            </Link>
          )}
          {q.status === 'sent' && <span className="figures">Valid until {formatDay(q.validUntil)}</span>}
        </span>
      }
      actions={
        !forClient && !editing && versions.data ? (
          <NewVersionButton studioId={studioId} commissionId={q.commissionId} versions={versions.data.items} quotesPath=".." variant={q.status === 'changes_requested' ? 'primary' : 'secondary'} />
        ) : undefined
      }
    />
  );

  const versionList = versions.data && versions.data.items.length > 1 && (
    <Card title="Versions">
      <QuoteVersions versions={versions.data.items} currentId={q.id} timezone={timezone} forClient={forClient} />
    </Card>
  );

  if (editing) {
    return (
      <>
        <BackToQuotes />
        {header}
        {priceTableError ? (
          <ErrorNote title="The price table did not load, so the quote cannot be priced here">{priceTableError.message}</ErrorNote>
        ) : !priceTable ? (
          <LoadingBlock label="Loading prices…" />
        ) : (
          <QuoteEditor key={q.id} quote={q} table={priceTable} />
        )}
        <div className="mt-6">{versionList}</div>
      </>
    );
  }

  return (
    <>
      <BackToQuotes />
      {header}
      <div className="flex flex-col gap-6">
        <DecisionNote quote={q} timezone={timezone} forClient={forClient} />
        {q.status === 'accepted' && afterAccept?.(q)}
        <Card title={forClient ? 'What it comes to' : 'The quote'} description={forClient ? undefined : q.showHoursToClient ? 'The client sees these hours too.' : 'The client sees the prices, not the hours.'}>
          <QuoteBreakdown breakdown={result.clientBreakdown} minutes={ownerMinutes} />
          {result.dueDate && <p className="mt-3 text-sm">Wanted by <span className="figures">{formatDay(result.dueDate)}</span>.</p>}
        </Card>
        <Card title="Terms" description={forClient ? (q.allowedActions.includes('accept') ? 'Please read these before you accept.' : undefined) : 'As they were when this version was priced.'}>
          {q.terms.trim() ? <div className="max-w-prose text-sm whitespace-pre-line">{q.terms}</div> : <p className="text-sm text-sable-600">No terms were set.</p>}
        </Card>
        {forClient && <ClientDecision studioId={studioId} quote={q} studioName={studioName} />}
        {versionList}
        {versions.error && (
          <Button variant="ghost" onClick={() => versions.refetch()}>
            Load the other versions again
          </Button>
        )}
      </div>
    </>
  );
}
