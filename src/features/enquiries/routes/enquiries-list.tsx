import type { ReactNode } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { Inbox } from 'lucide-react';
import { enquiryStatusLabels, enquiryStatuses, type EnquiryStatus } from '../../../../shared/schemas/enquiries';
import { Button } from '../../../components/ui/button';
import { EmptyState } from '../../../components/ui/empty-state';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { cn } from '../../../lib/cn';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useEnquiries } from '../api/get-enquiries';
import { EnquiriesTable } from '../components/enquiries-table';

const PAGE_SIZE = 50;
const FILTERS: { key: EnquiryStatus | 'all'; label: string }[] = [...enquiryStatuses.map((s) => ({ key: s, label: enquiryStatusLabels[s] })), { key: 'all', label: 'All' }];

/** The owner's inbox of enquiries from the public page; `settings` is the public page's own card, handed in by the app. */
export function EnquiriesListRoute({ settings }: { settings?: ReactNode }) {
  const { studioId, timezone } = useStudioScope();
  const [params, setParams] = useSearchParams();
  const raw = params.get('status');
  const status: EnquiryStatus | 'all' = raw === 'all' || enquiryStatuses.includes(raw as EnquiryStatus) ? (raw as EnquiryStatus | 'all') : 'new';
  const offset = Math.max(0, Number(params.get('from') ?? 0) || 0);
  const list = useEnquiries(studioId, { status: status === 'all' ? undefined : status, limit: PAGE_SIZE, offset });
  const page = list.data;

  const goTo = (next: Record<string, string | null>) =>
    setParams((p) => {
      const n = new URLSearchParams(p);
      for (const [k, v] of Object.entries(next)) {
        if (v === null) n.delete(k);
        else n.set(k, v);
      }
      return n;
    });

  return (
    <>
      <PageTitle title="Enquiries" description="What people sent through your public page. Accept one to make it a client and a commission, or decline it kindly." />
      <div className="flex flex-col gap-6">
        {settings}
        <nav aria-label="Enquiries by status" className="flex flex-wrap gap-2">
          {FILTERS.map((f) => (
            <Link
              key={f.key}
              to={f.key === 'new' ? '?' : `?status=${f.key}`}
              aria-current={status === f.key ? 'page' : undefined}
              className={cn(
                'inline-flex min-h-9 items-center gap-2 rounded-control border px-3 text-sm no-underline',
                status === f.key ? 'border-verdigris-600 bg-verdigris-100 font-semibold text-sable-900' : 'border-primer-300 bg-bone-50 text-sable-900 hover:bg-primer-100',
              )}
            >
              {f.label}
              {f.key === 'new' && page && page.newCount > 0 && <span className="figures rounded-full bg-verdigris-600 px-1.5 text-xs text-white">{page.newCount}</span>}
            </Link>
          ))}
        </nav>

        {list.isPending ? (
          <LoadingBlock label="Loading enquiries…" />
        ) : list.error ? (
          <ErrorNote
            title="The enquiries did not load"
            action={
              <Button variant="secondary" size="sm" onClick={() => list.refetch()}>
                Try again
              </Button>
            }
          >
            {list.error.message}
          </ErrorNote>
        ) : page && page.items.length === 0 ? (
          <EmptyState icon={<Inbox className="size-8" />} title={status === 'new' ? 'No new enquiries' : `No ${status === 'all' ? '' : enquiryStatusLabels[status as EnquiryStatus].toLowerCase() + ' '}enquiries`}>
            {status === 'new' ? 'When someone sends the form on your public page, it arrives here and you get an e-mail.' : 'Nothing here yet.'}
          </EmptyState>
        ) : page ? (
          <>
            <EnquiriesTable enquiries={page.items} timezone={timezone} caption={`${status === 'all' ? 'All' : enquiryStatusLabels[status as EnquiryStatus]} enquiries, newest first (${pluralize(page.total, 'enquiry', 'enquiries')})`} />
            {page.total > page.limit && (
              <nav aria-label="Pages of enquiries" className="flex flex-wrap items-center justify-between gap-2 text-sm">
                <span className="figures text-sable-600">
                  {page.offset + 1}–{Math.min(page.offset + page.items.length, page.total)} of {page.total}
                </span>
                <span className="flex gap-2">
                  <Button variant="secondary" size="sm" disabled={page.offset === 0} onClick={() => goTo({ from: page.offset - page.limit > 0 ? String(page.offset - page.limit) : null })}>
                    Previous
                  </Button>
                  <Button variant="secondary" size="sm" disabled={page.offset + page.limit >= page.total} onClick={() => goTo({ from: String(page.offset + page.limit) })}>
                    Next
                  </Button>
                </span>
              </nav>
            )}
          </>
        ) : null}
      </div>
    </>
  );
}
