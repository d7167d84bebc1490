import { useMemo, useState } from 'react';
import { Send } from 'lucide-react';
import { formatMoney } from '../../../../shared/money';
import { unscheduledLabels } from '../../../../shared/schemas/schedule';
import { formatBasisPoints, QuoteInputError, quoteFigures, type FigureQuoteLine, type QuoteResult } from '../../../../shared/pricing';
import type { PriceTable } from '../../../../shared/schemas/price-table';
import type { Quote } from '../../../../shared/schemas/quotes';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useStudioScope } from '../../../lib/studio-scope';
import { useEarliestDelivery } from '../api/get-earliest-delivery';
import { useSaveAndSendQuote, useUpdateQuote } from '../api/quote-mutations';
import { draftFrom, inputFrom, sameInput, type DraftErrors, type EditorDraft } from './editor-draft';
import { ExtraLinesEditor } from './extra-lines-editor';
import { FigureLinesEditor } from './figure-lines-editor';
import { LeaveGuard } from '../../../components/ui/leave-guard';
import { formatDay, todayIn } from './labels';
import { QuoteBreakdown } from './quote-breakdown';

type Preview = { result: QuoteResult | null; issues: DraftErrors; general: string[] };

function pricePreview(table: PriceTable, input: ReturnType<typeof inputFrom>['input'], today: string): Preview {
  try {
    return { result: quoteFigures({ priceTable: table, ...input, today }), issues: {}, general: [] };
  } catch (err) {
    if (!(err instanceof QuoteInputError)) return { result: null, issues: {}, general: ['This quote cannot be priced with the current price table.'] };
    const issues: DraftErrors = {};
    const general: string[] = [];
    for (const i of err.issues) {
      const path = i.path.join('.');
      if (path.startsWith('figures.') || path.startsWith('extraLines.') || path === 'dueDate') issues[path] = i.message;
      else general.push(i.message);
    }
    return { result: null, issues, general };
  }
}

function EarliestDelivery({ minutes }: { minutes: number }) {
  const { studioId } = useStudioScope();
  // whole quarter hours, so typing does not ask the server at every key
  const hours = minutes > 0 ? Math.ceil(minutes / 15) / 4 : null;
  const q = useEarliestDelivery(studioId, hours);
  if (hours === null || q.isError) return null;
  if (q.isPending) return <p className="text-sm text-sable-600">Working out the earliest delivery…</p>;
  const v = q.data;
  if (v.unscheduled) return <p className="text-sm text-sable-600">Earliest delivery unknown: {unscheduledLabels[v.unscheduled].toLowerCase()}.</p>;
  if (!v.date) return null;
  return (
    <p className="text-sm">
      If booked today: ready by <span className="figures font-semibold">{formatDay(v.date)}</span>
      <span className="text-sable-600">
        {' '}
        ({v.queueLength === 0 ? 'nothing ahead in the queue' : `${v.queueLength} commission${v.queueLength === 1 ? '' : 's'} ahead in the queue`})
      </span>
    </p>
  );
}

/** The owner's draft: figures from the commission, extra lines and a due date, priced live by the shared engine. */
export function QuoteEditor({ quote, table }: { quote: Quote; table: PriceTable }) {
  const { studioId, timezone } = useStudioScope();
  const toast = useToast();
  const saved = quote.input ?? { figures: [], extraLines: [], dueDate: null };
  const [draft, setDraft] = useState<EditorDraft>(() => draftFrom(saved, table.currency));
  const [serverErrors, setServerErrors] = useState<DraftErrors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [confirmSend, setConfirmSend] = useState(false);
  const update = useUpdateQuote(studioId, quote.id);
  const saveAndSend = useSaveAndSendQuote(studioId, quote.id);
  const today = todayIn(timezone);

  const { input, errors: readErrors } = useMemo(() => inputFrom(draft, table.currency), [draft, table.currency]);
  const preview = useMemo(() => (Object.keys(readErrors).length ? null : pricePreview(table, input, today)), [readErrors, table, input, today]);
  const errors: DraftErrors = { ...serverErrors, ...(preview?.issues ?? {}), ...readErrors };
  const result = preview?.result ?? null;
  const dirty = Object.keys(readErrors).length > 0 || !sameInput(input, saved);
  const canSave = Object.keys(readErrors).length === 0 && !!result;

  function change(next: EditorDraft) {
    setDraft(next);
    setServerErrors({});
    setFormError(null);
  }

  function failed(err: unknown) {
    if (isApiError(err) && Object.keys(err.fields).length) {
      setServerErrors(err.fields);
      setFormError('Some of the quote did not look right to the server. The boxes are marked.');
    } else setFormError(err instanceof Error ? err.message : 'That did not work. Try again.');
  }

  async function save() {
    try {
      await update.mutateAsync(input);
      toast.show('Draft saved.');
    } catch (err) {
      failed(err);
    }
  }

  async function send() {
    try {
      await saveAndSend.mutateAsync(input);
      setConfirmSend(false);
      toast.show(`Quote sent to ${quote.client.name}.`);
    } catch (err) {
      setConfirmSend(false);
      failed(err);
    }
  }

  const rushHint =
    table.rush.weeks > 0 && table.rush.surchargeBp > 0
      ? `Due sooner than ${table.rush.weeks} week${table.rush.weeks === 1 ? '' : 's'} from today adds a rush surcharge of ${formatBasisPoints(table.rush.surchargeBp)}.`
      : 'No rush surcharge is set in the price table.';

  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem] lg:items-start">
      <LeaveGuard dirty={dirty && !update.isPending && !saveAndSend.isPending && quote.status === 'draft'} />
      <div className="flex flex-col gap-6">
        {formError && <ErrorNote>{formError}</ErrorNote>}
        <Card title="Figures" description="From the commission. Change the figures themselves on the commission; here you can adjust hours for this quote.">
          <FigureLinesEditor
            figures={draft.figures}
            table={table}
            lines={(result?.lines.filter((l) => l.type === 'figure') ?? []) as FigureQuoteLine[]}
            errors={errors}
            onChange={(i, next) => change({ ...draft, figures: draft.figures.map((f, k) => (k === i ? next : f)) })}
          />
        </Card>
        <Card title="Extra lines" description="Not discounted; priced as typed.">
          <ExtraLinesEditor lines={draft.lines} table={table} errors={errors} onChange={(lines) => change({ ...draft, lines })} />
        </Card>
        <Card title="Due date">
          <TextField
            label="The client wants it by"
            type="date"
            optional
            min={today}
            className="max-w-xs"
            value={draft.dueDate}
            onChange={(e) => change({ ...draft, dueDate: e.target.value })}
            hint={rushHint}
            error={errors.dueDate}
          />
        </Card>
      </div>

      <div className="flex flex-col gap-4 lg:sticky lg:top-20">
        <section aria-labelledby="quote-preview-title" className="rounded-card border border-primer-300 bg-bone-50 p-4 shadow-raised">
          <h2 id="quote-preview-title" className="text-lg font-semibold">
            Preview
          </h2>
          <p className="mb-3 text-xs text-sable-600">Updates as you type: the same sums the saved quote will show.</p>
          <p className="sr-only" aria-live="polite">
            {result ? `Total ${formatMoney(result.total, result.currency)}, deposit ${formatMoney(result.deposit.amount, result.currency)}.` : 'The preview waits for the marked boxes.'}
          </p>
          <div>
            {result ? (
              <div className="flex flex-col gap-3">
                <QuoteBreakdown
                  breakdown={result.clientBreakdown}
                  minutes={result.lines.map((l) => (l.type === 'figure' ? l.batchMinutes : null))}
                  caption="Preview of the quote"
                  compact
                />
                <p className="text-xs text-sable-600">
                  Valid until <span className="figures">{formatDay(result.validUntil)}</span> once sent today.
                  {table.showHoursToClient ? ' The client sees the hours.' : ' The client sees prices, not hours.'}
                </p>
                <EarliestDelivery minutes={result.totalMinutes} />
              </div>
            ) : (
              <div className="flex flex-col gap-2 text-sm">
                <p className="text-sable-600">Fix the boxes marked in red to see the sums.</p>
                {preview?.general.map((g) => (
                  <p key={g} className="text-oxide-600">
                    {g}
                  </p>
                ))}
              </div>
            )}
          </div>
        </section>
        {/* On a phone the preview sits below the form, so the total and the buttons stay in view at the bottom. */}
        <div className="sticky bottom-16 z-20 -mx-2 flex flex-wrap items-center gap-2 rounded-card border border-primer-300 bg-bone-50 p-3 shadow-raised sm:bottom-4 lg:static lg:mx-0 lg:border-0 lg:bg-transparent lg:p-0 lg:shadow-none">
          {result && (
            <span className="figures w-full text-sm lg:hidden">
              Total <span className="font-semibold">{formatMoney(result.total, result.currency)}</span> · deposit {formatMoney(result.deposit.amount, result.currency)}
            </span>
          )}
          <Button variant="secondary" onClick={save} loading={update.isPending} disabled={!canSave || !dirty}>
            Save draft
          </Button>
          <Button onClick={() => setConfirmSend(true)} disabled={!canSave || draft.figures.length + draft.lines.length === 0}>
            <Send aria-hidden="true" className="size-4" />
            Send to client
          </Button>
          <span className="text-xs text-sable-600" aria-live="polite">
            {dirty ? 'Not saved yet.' : 'Saved.'}
          </span>
        </div>
        {result && result.minimumTopUp > 0 && <Note>This order is below your minimum, so it is topped up to it.</Note>}
      </div>

      <Dialog
        open={confirmSend}
        onClose={() => setConfirmSend(false)}
        title={`Send this quote to ${quote.client.name}?`}
        description="They get an e-mail with a link to read it and answer. Once sent the quote is frozen; a change later makes a new version."
        footer={
          <>
            <Button variant="secondary" onClick={() => setConfirmSend(false)}>
              Not yet
            </Button>
            <Button onClick={send} loading={saveAndSend.isPending}>
              Send quote
            </Button>
          </>
        }
      />
    </div>
  );
}
