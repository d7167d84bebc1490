import { useState, type ReactNode } from 'react';
import { useParams } from 'react-router-dom';
import { CalendarClock, CircleCheck } from 'lucide-react';
import type { EnquiryReceived, PublicStudio } from '../../../../shared/schemas/enquiries';
import { BrandLink } from '../../../components/layout/brand';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { useDocumentTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { isApiError } from '../../../lib/api-client';
import { formatDate, formatMoney, pluralize } from '../../../lib/format';
import { usePublicStudio } from '../api/get-public-studio';
import { EnquiryForm } from '../components/enquiry-form';

function Turnaround({ t }: { t: PublicStudio['turnaround'] }) {
  if (!t) return null;
  const text =
    t.source === 'forecast'
      ? t.queueLength === 0
        ? `The queue is clear: new work can start around ${formatDate(`${t.startDate}T12:00:00Z`, 'UTC')}.`
        : `With ${pluralize(t.queueLength, 'commission')} in the queue, new work can start around ${formatDate(`${t.startDate}T12:00:00Z`, 'UTC')}.`
      : t.text;
  return (
    <p className="flex items-start gap-2 text-sm">
      <CalendarClock aria-hidden="true" className="mt-0.5 size-4 shrink-0 text-verdigris-600" />
      <span>
        <span className="font-medium">Turnaround: </span>
        {text}
      </span>
    </p>
  );
}

function Shell({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col">
      <main id="main" className="mx-auto w-full max-w-3xl flex-1 px-4 py-6 sm:py-10">
        {children}
      </main>
      <footer className="flex items-center justify-center gap-2 px-4 py-6 text-xs text-sable-600">
        <span>Enquiry page made with</span>
        <BrandLink />
      </footer>
    </div>
  );
}

/** The studio's own page for people who are not clients yet: who they are, what they charge from, and the enquiry form. */
export function PublicStudioRoute() {
  const slug = useParams().slug ?? '';
  const studio = usePublicStudio(slug);
  const [sent, setSent] = useState<{ received: EnquiryReceived; email: string } | null>(null);
  useDocumentTitle(studio.data ? `${studio.data.name} — enquiries` : 'Studio page');

  if (studio.isPending) {
    return (
      <Shell>
        <LoadingBlock label="Loading the studio’s page…" />
      </Shell>
    );
  }
  if (studio.error) {
    return (
      <Shell>
        <h1 className="mb-4 text-2xl font-semibold">{isApiError(studio.error, 404) ? 'No studio page here' : 'This page did not load'}</h1>
        <ErrorNote
          action={
            !isApiError(studio.error, 404) && (
              <Button variant="secondary" size="sm" onClick={() => studio.refetch()}>
                Try again
              </Button>
            )
          }
        >
          {isApiError(studio.error, 404) ? 'The link may be wrong, or the studio is not taking enquiries through its page right now.' : studio.error.message}
        </ErrorNote>
      </Shell>
    );
  }
  const s = studio.data;
  const priced = s.tiers.filter((t) => t.fromMinor !== null);

  return (
    <Shell>
      <header className="mb-8 flex flex-col gap-3">
        <p className="text-sm font-medium tracking-wide text-sable-600 uppercase">Commission painting</p>
        <h1 className="text-2xl font-semibold break-words sm:text-3xl">{s.name}</h1>
        {s.intro && <p className="max-w-prose whitespace-pre-line text-base">{s.intro}</p>}
        <Turnaround t={s.turnaround} />
      </header>

      {s.tiers.length > 0 && (
        <section aria-labelledby="tiers-title" className="mb-8">
          <h2 id="tiers-title" className="mb-3 text-lg font-semibold">
            Tiers
          </h2>
          <ul className="grid grid-cols-[repeat(auto-fit,minmax(6.5rem,1fr))] gap-2 sm:gap-3">
            {s.tiers.map((t) => (
              <li key={t.key} className="rounded-card border border-primer-300 bg-bone-50 p-3 shadow-raised sm:p-4">
                <p className="font-semibold break-words">{t.label}</p>
                {t.fromMinor !== null ? (
                  <p className="mt-1 text-sm">
                    from <span className="figures block font-semibold sm:inline sm:text-lg">{formatMoney(t.fromMinor, s.currency)}</span>
                  </p>
                ) : (
                  <p className="mt-1 text-sm text-sable-600">Priced on request</p>
                )}
              </li>
            ))}
          </ul>
          {priced.length > 0 && (
            <p className="mt-2 text-xs text-sable-600">“From” is one figure on a 28 mm base with no extras, before any tax. Your quote is worked out from your own list.</p>
          )}
        </section>
      )}

      <section aria-labelledby="enquiry-title" className="rounded-card border border-primer-300 bg-bone-50 p-4 shadow-raised sm:p-6">
        {sent ? (
          <div className="flex flex-col gap-3" role="status">
            <h2 id="enquiry-title" tabIndex={-1} ref={(h) => h?.focus()} className="flex items-center gap-2 text-lg font-semibold outline-none">
              <CircleCheck aria-hidden="true" className="size-5 text-verdigris-600" />
              Enquiry sent
            </h2>
            <p>{sent.received.message}</p>
            <p className="text-sm text-sable-600">
              Nothing is booked or charged yet. {s.name} reads your list and answers by e-mail, usually with questions or a quote.
            </p>
            <div>
              <Button variant="secondary" onClick={() => setSent(null)}>
                Send another enquiry
              </Button>
            </div>
          </div>
        ) : (
          <>
            <h2 id="enquiry-title" className="mb-1 text-lg font-semibold">
              Ask about a commission
            </h2>
            <p className="mb-6 text-sm text-sable-600">Tell {s.name} what you would like painted. Fields are required unless they say optional.</p>
            <EnquiryForm slug={slug} studio={s} onSent={(received, email) => setSent({ received, email })} />
          </>
        )}
      </section>
    </Shell>
  );
}
