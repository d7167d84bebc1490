import { CircleCheck, PackageCheck, Truck } from 'lucide-react';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { useToast } from '../../../components/ui/toast';
import { formatDate, formatDateTime } from '../../../lib/format';
import { useShipments } from '../api/get-shipments';
import { useConfirmReceipt } from '../api/shipment-actions';
import { ShipToLines } from './shipping-section';

const day = (d: string) => formatDate(`${d}T12:00:00Z`, 'UTC');

function Parcel({ studioId, commissionId, timezone }: { studioId: number; commissionId: number; timezone: string }) {
  const shipments = useShipments(studioId, commissionId);
  const s = shipments.data?.[0];
  const confirm = useConfirmReceipt(studioId, commissionId, s?.id ?? 0);
  const toast = useToast();
  if (shipments.error) return <ErrorNote>{shipments.error.message}</ErrorNote>;
  if (!s) return null;
  return (
    <section aria-labelledby="parcel-title" className="flex flex-col gap-3">
      <h2 id="parcel-title" className="flex items-center gap-2 text-lg font-semibold">
        {s.status === 'delivered' ? <PackageCheck aria-hidden="true" className="size-5 text-verdigris-600" /> : <Truck aria-hidden="true" className="size-5 text-glaze-500" />}
        {s.status === 'delivered' ? 'Your parcel arrived' : 'Your parcel is on its way'}
      </h2>
      <Card>
        <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2">
          <div>
            <dt className="text-sable-600">Sent</dt>
            <dd className="mt-0.5">{s.shippedAt ? formatDateTime(s.shippedAt, timezone) : '—'}</dd>
          </div>
          <div>
            <dt className="text-sable-600">Carrier and tracking number</dt>
            <dd className="mt-0.5">
              {s.carrier}
              {s.service ? ` (${s.service})` : ''}
              <span className="block font-medium break-all">{s.tracking}</span>
            </dd>
          </div>
          <div className="sm:col-span-2">
            <dt className="text-sable-600">To</dt>
            <dd className="mt-0.5">
              <ShipToLines s={s} />
            </dd>
          </div>
        </dl>
        <div className="mt-4 border-t border-primer-300 pt-4 text-sm">
          {s.status === 'delivered' ? (
            <p className="flex items-center gap-2">
              <CircleCheck aria-hidden="true" className="size-4 text-verdigris-600" />
              Arrived {s.deliveredOn ? day(s.deliveredOn) : ''}. Thank you{s.receivedBy === 'client' ? ' for letting the studio know' : ''}.
            </p>
          ) : (
            <div className="flex flex-col gap-2">
              <p>When the parcel is with you, let the studio know it arrived safely.</p>
              <div>
                <Button
                  loading={confirm.isPending}
                  onClick={async () => {
                    try {
                      await confirm.mutateAsync();
                      toast.show('Thank you — the studio knows your figures arrived.');
                    } catch (err) {
                      toast.show(err instanceof Error ? err.message : 'That did not work. Try again.', 'error');
                    }
                  }}
                >
                  <PackageCheck aria-hidden="true" className="size-4" />
                  I have received it
                </Button>
              </div>
            </div>
          )}
        </div>
      </Card>
    </section>
  );
}

/** The client's parcel on their commission page, once it has left the studio; nothing before that. */
export function ClientParcel({ studioId, commissionId, commissionStatus, timezone }: { studioId: number; commissionId: number; commissionStatus: string; timezone: string }) {
  if (!['shipped', 'closed'].includes(commissionStatus)) return null;
  return <Parcel studioId={studioId} commissionId={commissionId} timezone={timezone} />;
}
