import { useNavigate } from 'react-router-dom';
import { FilePlus2 } from 'lucide-react';
import { Button, ButtonLink } from '../../../components/ui/button';
import { useToast } from '../../../components/ui/toast';
import type { QuoteSummary } from '../../../../shared/schemas/quotes';
import { useCreateQuote } from '../api/quote-mutations';

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
  const create = useCreateQuote(studioId, commissionId);
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
      loading={create.isPending}
      onClick={async () => {
        try {
          const q = await create.mutateAsync({});
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
