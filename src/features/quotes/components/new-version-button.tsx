import { useNavigate } from 'react-router-dom';
import { FilePlus2 } from 'lucide-react';
import { Button, ButtonLink } from '../../../components/ui/button';
import { useToast } from '../../../components/ui/toast';
import type { QuoteInput, QuoteSummary } from '../../../../shared/schemas/quotes';
import { useStudioScope } from '../../../lib/studio-scope';
import { useQuote } from '../api/get-quote';
import { useCreateQuote, type CreateQuoteBody } from '../api/quote-mutations';
import { todayIn } from './labels';

/** A new version keeps what the owner added to the last one: extra lines, the due date, adjusted hours. */
function carriedOver(input: QuoteInput | null | undefined, today: string): CreateQuoteBody {
  if (!input) return {};
  const figureOverrides = input.figures
    .filter((f) => typeof f.id === 'number' && (Object.keys(f.stageHours ?? {}).length > 0 || (f.omitStages ?? []).length > 0))
    .map((f) => ({ figureId: f.id as number, stageHours: f.stageHours, omitStages: f.omitStages }));
  return {
    extraLines: input.extraLines,
    // a date already past would make the quote unpriceable; the commission's own date is used instead
    ...(input.dueDate && input.dueDate >= today ? { dueDate: input.dueDate } : {}),
    ...(figureOverrides.length ? { figureOverrides } : {}),
  };
}

/**
 * Opens the commission's draft if there is one, or starts the next version from its figures and
 * the current prices. `quotesPath` is where the quotes live, relative to the current URL.
 */
export function NewVersionButton({
  studioId,
  commissionId,
  versions,
  quotesPath,
  variant = 'secondary',
}: {
  studioId: number;
  commissionId: number;
  versions: QuoteSummary[];
  quotesPath: string;
  variant?: 'primary' | 'secondary';
}) {
  const { timezone } = useStudioScope();
  const create = useCreateQuote(studioId, commissionId);
  const latest = versions.reduce<QuoteSummary | null>((best, v) => (best === null || v.version > best.version ? v : best), null);
  const last = useQuote(studioId, latest?.id ?? 0, { enabled: !!latest && latest.status !== 'draft' });
  const navigate = useNavigate();
  const toast = useToast();
  const draft = versions.find((v) => v.status === 'draft');
  if (draft) {
    return (
      <ButtonLink to={`${quotesPath}/${draft.id}`} relative="path" variant={variant}>
        Open the draft (version {draft.version})
      </ButtonLink>
    );
  }
  const next = versions.reduce((n, v) => Math.max(n, v.version), 0) + 1;
  return (
    <Button
      variant={variant}
      loading={create.isPending || (!!latest && last.isPending)}
      onClick={async () => {
        try {
          const q = await create.mutateAsync(carriedOver(last.data?.input, todayIn(timezone)));
          navigate(`${quotesPath}/${q.id}`, { relative: 'path' });
        } catch (err) {
          toast.show(err instanceof Error ? err.message : 'The quote was not started. Try again.', 'error');
        }
      }}
    >
      <FilePlus2 aria-hidden="true" className="size-4" />
      {next === 1 ? 'Prepare a quote' : `Start version ${next}`}
    </Button>
  );
}
