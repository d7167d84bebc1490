import { useState } from 'react';
import { commissionStatusLabels, type CommissionStatus } from '../../../../shared/commission-lifecycle';
import type { CommissionDetail } from '../../../../shared/schemas/commissions';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextArea } from '../../../components/ui/field';
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
  const [cancelling, setCancelling] = useState(false);
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string | undefined>();
  const moves = commission.allowedTransitions;

  async function go(to: CommissionStatus, why?: string) {
    setError(null);
    try {
      await move.mutateAsync({ to, reason: why });
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
          <Button variant="ghost" size="sm" className="text-oxide-600" onClick={() => setCancelling(true)}>
            {moveWords.cancelled}…
          </Button>
        )}
      </div>
      {error && <ErrorNote title="The status did not change">{error}</ErrorNote>}
      <Dialog
        open={cancelling}
        onClose={() => setCancelling(false)}
        title="Cancel this commission?"
        description="The client sees it as cancelled. Figures and time stay on record but can no longer change."
        footer={
          <>
            <Button variant="secondary" onClick={() => setCancelling(false)}>
              Keep it
            </Button>
            <Button
              variant="danger"
              loading={move.isPending}
              onClick={async () => {
                if (!reason.trim()) {
                  setReasonError('Give a reason for cancelling.');
                  return;
                }
                if (await go('cancelled', reason.trim())) {
                  setCancelling(false);
                  setReason('');
                } else setCancelling(false);
              }}
            >
              Cancel commission
            </Button>
          </>
        }
      >
        <TextArea
          label="Reason"
          rows={3}
          value={reason}
          error={reasonError}
          hint="Kept in the activity log."
          onChange={(e) => {
            setReason(e.target.value);
            setReasonError(undefined);
          }}
        />
      </Dialog>
    </div>
  );
}
