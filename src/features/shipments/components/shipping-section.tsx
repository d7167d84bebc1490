import { useState } from 'react';
import { PackagePlus, Settings2, Truck } from 'lucide-react';
import type { CommissionStatus } from '../../../../shared/commission-lifecycle';
import { shipmentStatusLabels, type Shipment } from '../../../../shared/schemas/shipments';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { formatDate, formatDateTime, formatMoney } from '../../../lib/format';
import { useShipments } from '../api/get-shipments';
import { useCreateShipment, useRecordDelivery } from '../api/shipment-actions';
import { useShippingSettings } from '../api/shipping-settings';
import { PackingChecklist } from './packing-checklist';
import { ParcelForm } from './parcel-form';
import { ShipDialog } from './ship-dialog';
import { ShippingSettingsDialog } from './shipping-settings-dialog';

const day = (d: string) => formatDate(`${d}T12:00:00Z`, 'UTC');
const todayIn = (timezone: string) => {
  try {
    return new Intl.DateTimeFormat('en-CA', { timeZone: timezone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
  } catch {
    return new Date().toISOString().slice(0, 10);
  }
};

export function ShipToLines({ s }: { s: Shipment }) {
  const a = s.shipTo;
  const lines = [a.name, a.line1, a.line2, [a.postalCode, a.city].filter(Boolean).join(' '), [a.region, a.country].filter(Boolean).join(', ')].filter(Boolean);
  return (
    <address className="not-italic">
      {lines.map((l, i) => (
        <span key={i} className="block">
          {l}
        </span>
      ))}
    </address>
  );
}

function DeliveryForm({ studioId, shipment, timezone }: { studioId: number; shipment: Shipment; timezone: string }) {
  const record = useRecordDelivery(studioId, shipment.commissionId, shipment.id);
  const toast = useToast();
  const [date, setDate] = useState(todayIn(timezone));
  const [error, setError] = useState<string | undefined>();
  return (
    <form
      className="flex flex-wrap items-end gap-3"
      onSubmit={async (e) => {
        e.preventDefault();
        setError(undefined);
        try {
          await record.mutateAsync({ deliveredOn: date });
          toast.show('Delivery recorded; the commission is closed.');
        } catch (err) {
          setError(isApiError(err) && err.fields.deliveredOn ? err.fields.deliveredOn : err instanceof Error ? err.message : 'That did not save.');
        }
      }}
    >
      <TextField label="Delivered on" type="date" value={date} onChange={(e) => setDate(e.target.value)} error={error} />
      <Button type="submit" variant="secondary" loading={record.isPending}>
        Record the delivery
      </Button>
    </form>
  );
}

function ShippedSummary({ s, timezone }: { s: Shipment; timezone: string }) {
  return (
    <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2">
      <div>
        <dt className="text-sable-600">Sent</dt>
        <dd className="mt-0.5">
          {s.shippedAt ? formatDateTime(s.shippedAt, timezone) : '—'}
          {s.shippedBy ? ` by ${s.shippedBy.name}` : ''}
        </dd>
      </div>
      <div>
        <dt className="text-sable-600">Carrier and tracking</dt>
        <dd className="mt-0.5">
          {s.carrier}
          {s.service ? ` (${s.service})` : ''} · <span className="font-medium break-all">{s.tracking}</span>
        </dd>
      </div>
      <div>
        <dt className="text-sable-600">To</dt>
        <dd className="mt-0.5">
          <ShipToLines s={s} />
        </dd>
      </div>
      <div>
        <dt className="text-sable-600">Insured for</dt>
        <dd className="figures mt-0.5">{s.insuredMinor !== null ? formatMoney(s.insuredMinor, s.currency) : 'Not insured'}</dd>
      </div>
      {s.overrideReason && (
        <div className="sm:col-span-2">
          <dt className="text-sable-600">Sent before the balance was paid, because</dt>
          <dd className="mt-0.5">{s.overrideReason}</dd>
        </div>
      )}
      {s.status === 'delivered' && s.deliveredOn && (
        <div className="sm:col-span-2">
          <dt className="text-sable-600">Delivered</dt>
          <dd className="mt-0.5">
            {day(s.deliveredOn)} · {s.receivedBy === 'client' ? 'confirmed by the client' : 'recorded by the studio'}
          </dd>
        </div>
      )}
      {s.autoClosedAt && (
        <div className="sm:col-span-2">
          <dt className="text-sable-600">Closed by itself</dt>
          <dd className="mt-0.5">{formatDateTime(s.autoClosedAt, timezone)}, as nobody marked the parcel received</dd>
        </div>
      )}
    </dl>
  );
}

/**
 * "Shipping" on the studio's commission page: start packing, tick the checklist, fill in the parcel and
 * customs, ship (the balance rule applies), then delivery.
 */
export function ShippingSection({ studioId, commissionId, commissionStatus, isOwner, timezone }: { studioId: number; commissionId: number; commissionStatus: CommissionStatus; isOwner: boolean; timezone: string }) {
  const shipments = useShipments(studioId, commissionId);
  const settings = useShippingSettings(studioId);
  const create = useCreateShipment(studioId, commissionId);
  const toast = useToast();
  const [shipping, setShipping] = useState(false);
  const [editingDefaults, setEditingDefaults] = useState(false);
  const s = shipments.data?.[0];
  const finished = commissionStatus === 'cancelled' || (commissionStatus === 'closed' && !s);
  const canShip = commissionStatus === 'ready_to_ship' || commissionStatus === 'shipped';

  return (
    <section aria-labelledby="shipping-title" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <div className="flex items-center gap-2">
          <h2 id="shipping-title" className="text-lg font-semibold">
            Shipping
          </h2>
          {s && <Badge tone={s.status === 'preparing' ? 'attention' : s.status === 'shipped' ? 'info' : 'success'}>{shipmentStatusLabels[s.status]}</Badge>}
        </div>
        {isOwner && settings.data && (
          <Button variant="ghost" size="sm" onClick={() => setEditingDefaults(true)}>
            <Settings2 aria-hidden="true" className="size-4" />
            Shipping defaults
          </Button>
        )}
      </div>
      {shipments.isPending ? (
        <LoadingBlock label="Loading the parcel…" />
      ) : shipments.error ? (
        <ErrorNote>{shipments.error.message}</ErrorNote>
      ) : !s ? (
        <Card>
          <div className="flex flex-col gap-3 text-sm">
            <p className="text-sable-600">
              {finished ? 'No parcel was sent for this commission.' : 'No parcel yet. Start packing when the work is done: the address comes from the client record, the checklist from your defaults.'}
            </p>
            {isOwner && !finished && (
              <div>
                <Button
                  variant="secondary"
                  loading={create.isPending}
                  onClick={async () => {
                    try {
                      await create.mutateAsync();
                    } catch (err) {
                      toast.show(err instanceof Error ? err.message : 'That did not work. Try again.', 'error');
                    }
                  }}
                >
                  <PackagePlus aria-hidden="true" className="size-4" />
                  Start packing
                </Button>
              </div>
            )}
          </div>
        </Card>
      ) : s.status === 'preparing' ? (
        <Card>
          <div className="flex flex-col gap-6">
            <PackingChecklist studioId={studioId} shipment={s} />
            <p className="-mt-3 text-xs text-sable-600">
              Photos of the packed box go in <a href="#photos-title">Photos</a>: choose “Packing”.
            </p>
            {isOwner ? <ParcelForm key={s.id} studioId={studioId} shipment={s} /> : <p className="text-sm text-sable-600">The owner fills in the parcel’s details and sends it.</p>}
            {isOwner && (
              <div className="flex flex-col gap-3 border-t border-primer-300 pt-4">
                {s.balance && (
                  <Note className={s.balance.unpaid ? 'border-varnish-500' : 'border-verdigris-600'}>
                    <span className="font-medium">Balance: </span>
                    {s.balance.summary}
                  </Note>
                )}
                {!canShip && <p className="text-sm text-sable-600">The parcel can leave once the commission is ready to ship (the client approved the finished work).</p>}
                <div>
                  <Button disabled={!canShip} onClick={() => setShipping(true)}>
                    <Truck aria-hidden="true" className="size-4" />
                    Mark as shipped…
                  </Button>
                </div>
              </div>
            )}
          </div>
        </Card>
      ) : (
        <Card>
          <div className="flex flex-col gap-4">
            <ShippedSummary s={s} timezone={timezone} />
            {s.status === 'shipped' && (
              <div className="flex flex-col gap-3 border-t border-primer-300 pt-4 text-sm">
                <p className="text-sable-600">
                  Waiting for the client to confirm it arrived
                  {s.autoCloseOn ? `; the commission closes by itself on ${day(s.autoCloseOn)} if nobody does.` : '.'}
                </p>
                {isOwner && <DeliveryForm studioId={studioId} shipment={s} timezone={timezone} />}
              </div>
            )}
          </div>
        </Card>
      )}
      {s && shipping && <ShipDialog studioId={studioId} shipment={s} open={shipping} onClose={() => setShipping(false)} />}
      {settings.data && editingDefaults && <ShippingSettingsDialog studioId={studioId} settings={settings.data} open={editingDefaults} onClose={() => setEditingDefaults(false)} />}
    </section>
  );
}
