import { useState } from 'react';
import type { Shipment } from '../../../../shared/schemas/shipments';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { TextArea } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useShip } from '../api/shipment-actions';

const FIELD_NAMES: Record<string, string> = {
  carrier: 'the carrier',
  tracking: 'the tracking number',
  'shipTo.line1': 'the street address',
  'shipTo.city': 'the town or city',
  'shipTo.country': 'the country code',
};

/**
 * The parcel leaves: the commission moves to shipped and the client gets the tracking number. While the
 * balance is unpaid the lifecycle refuses, unless the owner ships anyway and says why (it is logged).
 */
export function ShipDialog({ studioId, shipment, open, onClose }: { studioId: number; shipment: Shipment; open: boolean; onClose: () => void }) {
  const ship = useShip(studioId, shipment.commissionId, shipment.id);
  const toast = useToast();
  const unpaid = shipment.balance?.unpaid ?? false;
  const [override, setOverride] = useState(false);
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [reasonError, setReasonError] = useState<string | undefined>();

  async function go() {
    setError(null);
    setReasonError(undefined);
    try {
      await ship.mutateAsync(unpaid && override ? { overrideUnpaid: true, overrideReason: reason } : {});
      toast.show('Shipped. The client has the tracking number.');
      onClose();
    } catch (err) {
      if (isApiError(err) && err.fields.overrideReason) setReasonError(err.fields.overrideReason);
      else if (isApiError(err, 400) && Object.keys(err.fields).length) {
        const missing = Object.keys(err.fields).map((k) => FIELD_NAMES[k] ?? k);
        setError(`Fill in ${missing.join(', ')} and save the parcel details first.`);
      } else setError(err instanceof Error ? err.message : 'That did not work. Try again.');
    }
  }

  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Mark the parcel as shipped"
      description={`The commission moves to shipped and the client gets an e-mail with the tracking number ${shipment.tracking ?? '(none yet)'}.`}
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Not yet
          </Button>
          <Button loading={ship.isPending} disabled={unpaid && !override} onClick={go}>
            {unpaid && override ? 'Ship before payment' : 'Mark as shipped'}
          </Button>
        </>
      }
    >
      <div className="flex flex-col gap-4">
        {error && <ErrorNote>{error}</ErrorNote>}
        {unpaid ? (
          <>
            <Note className="border-varnish-500">
              <p className="font-medium">The balance is not paid yet.</p>
              <p>{shipment.balance?.summary} Parcels usually leave once the balance is in.</p>
            </Note>
            <label className="flex items-start gap-3 text-sm">
              <input type="checkbox" className="mt-0.5 size-5 accent-verdigris-600" checked={override} onChange={(e) => setOverride(e.target.checked)} />
              <span>Ship anyway — I have a reason, and it goes into the commission’s log</span>
            </label>
            {override && <TextArea label="Why the parcel leaves before payment" rows={3} maxLength={500} value={reason} onChange={(e) => { setReason(e.target.value); setReasonError(undefined); }} error={reasonError} />}
          </>
        ) : (
          <p className="text-sm">The balance is paid.</p>
        )}
      </div>
    </Dialog>
  );
}
