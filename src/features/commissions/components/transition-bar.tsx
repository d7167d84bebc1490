import { useState } from 'react';
import { commissionStatusLabels, type CommissionStatus } from '../../../../shared/commission-lifecycle';
import type { CommissionDetail } from '../../../../shared/schemas/commissions';
import { Button, ButtonLink } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { useToast } from '../../../components/ui/toast';
import { useTransitionCommission } from '../api/transition-commission';

/** The words on the button for each move: what the owner does, in the trade's words. */
const moveWords: Record<CommissionStatus, string> = {
  enquiry: 'Back to enquiry',
  quoted: 'Mark as quoted',
  booked: 'Book it in',
  on_bench: 'Put on the bench',
  ready_to_ship: 'Ready to ship',
  shipped: 'Mark as shipped',
  closed: 'Close',
  on_hold: 'Put on hold',
  cancelled: 'Cancel commission',
};

export function TransitionBar({ studioId, commission }: { studioId: number; commission: CommissionDetail }) {
  const move = useTransitionCommission(studioId, commission.id);
  const toast = useToast();
  const [error, setError] = useState<string | null>(null);
  const moves = commission.allowedTransitions;

  async function go(to: CommissionStatus) {
    setError(null);
    try {
      await move.mutateAsync({ to });
      toast.show(`Now ${commissionStatusLabels[to].toLowerCase()}.`);
      return true;
    } catch (err) {
      // A 409 says which moves are allowed now (someone else may have moved it first).
      setError(err instanceof Error ? err.message : 'That did not work. Try again.');
      return false;
    }
  }

  if (moves.length === 0) {
    return <p className="text-sm text-sable-600">{commissionStatusLabels[commission.status]} is final; nothing more to move.</p>;
  }

  const forward = moves.filter((m) => m !== 'cancelled' && m !== 'on_hold');
  return (
    <div className="flex flex-col gap-3">
      <div role="group" aria-label="Move the commission" className="flex flex-wrap gap-2">
        {forward.map((to, i) => (
          <Button key={to} variant={i === 0 ? 'primary' : 'secondary'} size="sm" loading={move.isPending && move.variables?.to === to} onClick={() => go(to)}>
            {commission.status === 'on_hold' && to === commission.statusBeforeHold ? `Resume (${commissionStatusLabels[to].toLowerCase()})` : moveWords[to]}
          </Button>
        ))}
        {moves.includes('on_hold') && (
          <Button variant="secondary" size="sm" loading={move.isPending && move.variables?.to === 'on_hold'} onClick={() => go('on_hold')}>
            {moveWords.on_hold}
          </Button>
        )}
        {moves.includes('cancelled') && (
          // Cancelling goes through its own screen: it shows what the studio's terms keep and refund first.
          <ButtonLink to={`/studio/${studioId}/commissions/${commission.id}/cancel`} variant="ghost" size="sm" className="text-oxide-600">
            {moveWords.cancelled}…
          </ButtonLink>
        )}
      </div>
      {error && <ErrorNote title="The status did not change">{error}</ErrorNote>}
    </div>
  );
}
