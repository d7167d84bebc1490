import { useState } from 'react';
import type { Shipment } from '../../../../shared/schemas/shipments';
import { useToast } from '../../../components/ui/toast';
import { useUpdateShipment } from '../api/shipment-actions';

/** Ticks save at once; everyone packing the parcel sees the same list. */
export function PackingChecklist({ studioId, shipment }: { studioId: number; shipment: Shipment }) {
  const update = useUpdateShipment(studioId, shipment.commissionId, shipment.id);
  const toast = useToast();
  // A tick shows at once; the server's answer then replaces it (or the tick goes back when it fails).
  const [ticking, setTicking] = useState<Record<number, boolean>>({});
  const items = (shipment.checklist ?? []).map((x, i) => ({ ...x, done: ticking[i] ?? x.done }));
  const done = items.filter((i) => i.done).length;
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="mb-1 flex flex-wrap items-baseline gap-2 text-sm font-medium">
        Packing checklist
        <span className="figures text-xs font-normal text-sable-600">
          {done} of {items.length} done
        </span>
      </legend>
      <ul className="flex flex-col gap-1">
        {items.map((item, i) => (
          <li key={`${i}-${item.label}`}>
            <label className="flex min-h-9 items-start gap-3 text-sm">
              <input
                type="checkbox"
                className="mt-0.5 size-5 shrink-0 accent-verdigris-600"
                checked={item.done}
                disabled={shipment.status === 'delivered'}
                onChange={async (e) => {
                  const checked = e.target.checked;
                  setTicking((t) => ({ ...t, [i]: checked }));
                  const checklist = items.map((x, j) => (j === i ? { ...x, done: checked } : x));
                  try {
                    await update.mutateAsync({ checklist });
                  } catch (err) {
                    toast.show(err instanceof Error ? err.message : 'That tick did not save. Try again.', 'error');
                  } finally {
                    setTicking(({ [i]: _, ...rest }) => rest);
                  }
                }}
              />
              <span className={item.done ? 'text-sable-600 line-through' : undefined}>{item.label}</span>
            </label>
          </li>
        ))}
      </ul>
    </fieldset>
  );
}
