import { useState } from 'react';
import type { ShippingSettings } from '../../../../shared/schemas/shipments';
import { Button } from '../../../components/ui/button';
import { Dialog } from '../../../components/ui/dialog';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextArea, TextField } from '../../../components/ui/field';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useSaveShippingSettings } from '../api/shipping-settings';

/** The studio's shipping defaults: the packing checklist new parcels start with, the home country, auto-close. */
export function ShippingSettingsDialog({ studioId, settings, open, onClose }: { studioId: number; settings: ShippingSettings; open: boolean; onClose: () => void }) {
  const save = useSaveShippingSettings(studioId);
  const toast = useToast();
  const [items, setItems] = useState(settings.packingItems.join('\n'));
  const [days, setDays] = useState(settings.autoCloseDays === null ? '' : String(settings.autoCloseDays));
  const [country, setCountry] = useState(settings.fromCountry ?? '');
  const [fields, setFields] = useState<Record<string, string>>({});
  const [error, setError] = useState<string | null>(null);

  async function go() {
    setFields({});
    setError(null);
    // Anything that is not a number goes as typed, so the server can say what is wrong with it.
    const n = days.trim() === '' ? null : Number.isFinite(Number(days)) ? Number(days) : (days as unknown as number);
    try {
      await save.mutateAsync({
        packingItems: items.split('\n').map((l) => l.trim()).filter(Boolean),
        autoCloseDays: n,
        fromCountry: country,
      });
      toast.show('Shipping defaults saved.');
      onClose();
    } catch (err) {
      if (isApiError(err) && Object.keys(err.fields).length) {
        const f: Record<string, string> = {};
        for (const [k, v] of Object.entries(err.fields)) f[k.startsWith('packingItems') ? 'packingItems' : k] ??= v;
        setFields(f);
      } else setError(err instanceof Error ? err.message : 'That did not save. Try again.');
    }
  }

  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Shipping defaults"
      description="For parcels started from now on; a parcel already being packed keeps its own checklist."
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button loading={save.isPending} onClick={go}>
            Save defaults
          </Button>
        </>
      }
    >
      <div className="flex flex-col gap-4">
        {error && <ErrorNote>{error}</ErrorNote>}
        <TextArea label="Packing checklist" hint="One step per line." rows={6} value={items} onChange={(e) => setItems(e.target.value)} error={fields.packingItems} />
        <TextField
          label="Close a commission by itself after (days)"
          optional
          inputMode="numeric"
          hint="Days after shipping, when neither the client nor you marked the parcel received. Leave empty to never close by itself."
          value={days}
          onChange={(e) => setDays(e.target.value)}
          error={fields.autoCloseDays}
        />
        <TextField
          label="The studio ships from (country code)"
          optional
          maxLength={2}
          hint="Two letters, e.g. DE. Parcels to another country get the customs wording."
          value={country}
          onChange={(e) => setCountry(e.target.value)}
          error={fields.fromCountry}
        />
      </div>
    </Dialog>
  );
}
