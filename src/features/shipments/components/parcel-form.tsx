import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { fromMinor, toMinor } from '../../../../shared/money';
import { CUSTOMS_CAUTION, type Shipment } from '../../../../shared/schemas/shipments';
import { Button } from '../../../components/ui/button';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useUpdateShipment, type UpdateShipmentBody } from '../api/shipment-actions';

type Values = {
  shipTo: { name: string; line1: string; line2: string; city: string; region: string; postalCode: string; country: string };
  carrier: string;
  service: string;
  tracking: string;
  weightGrams: string;
  lengthCm: string;
  widthCm: string;
  heightCm: string;
  insured: string;
  customsText: string;
};

const FIELDS = [
  'shipTo.name',
  'shipTo.line1',
  'shipTo.line2',
  'shipTo.city',
  'shipTo.region',
  'shipTo.postalCode',
  'shipTo.country',
  'carrier',
  'service',
  'tracking',
  'weightGrams',
  'lengthCm',
  'widthCm',
  'heightCm',
  'insured',
  // The server's name for the insured value; its message is shown on the insured field.
  'insuredMinor',
  'customsText',
];

const text = (v: number | null) => (v === null ? '' : String(v));
/** Empty clears; a number goes as a number; anything else goes as typed, so the server can say what is wrong. */
const numberOrNull = (v: string): number | null => (v.trim() === '' ? null : Number.isFinite(Number(v)) ? Number(v) : (v as unknown as number));

function valuesOf(s: Shipment): Values {
  const a = s.shipTo;
  return {
    shipTo: { name: a.name ?? '', line1: a.line1 ?? '', line2: a.line2 ?? '', city: a.city ?? '', region: a.region ?? '', postalCode: a.postalCode ?? '', country: a.country ?? '' },
    carrier: s.carrier ?? '',
    service: s.service ?? '',
    tracking: s.tracking ?? '',
    weightGrams: text(s.weightGrams),
    lengthCm: text(s.lengthCm),
    widthCm: text(s.widthCm),
    heightCm: text(s.heightCm),
    insured: s.insuredMinor === null ? '' : fromMinor(s.insuredMinor, s.currency),
    customsText: s.customsText ?? (s.abroad ? (s.suggestedCustomsText ?? '') : ''),
  };
}

/** The parcel's details: where it goes, how, its size and weight, insurance and the customs wording. */
export function ParcelForm({ studioId, shipment }: { studioId: number; shipment: Shipment }) {
  const update = useUpdateShipment(studioId, shipment.commissionId, shipment.id);
  const toast = useToast();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    formState: { errors, isDirty },
    reset,
  } = useForm<Values>({ defaultValues: valuesOf(shipment) });

  const onSubmit = handleSubmit(async (v) => {
    setFormError(null);
    let insuredMinor: number | null = null;
    if (v.insured.trim()) {
      try {
        insuredMinor = toMinor(v.insured, shipment.currency);
      } catch (err) {
        setError('insured', { message: err instanceof Error ? err.message : 'Write the amount such as 120.00.' }, { shouldFocus: true });
        return;
      }
    }
    const body: UpdateShipmentBody = {
      shipTo: v.shipTo,
      carrier: v.carrier,
      service: v.service,
      tracking: v.tracking,
      weightGrams: numberOrNull(v.weightGrams),
      lengthCm: numberOrNull(v.lengthCm),
      widthCm: numberOrNull(v.widthCm),
      heightCm: numberOrNull(v.heightCm),
      insuredMinor,
      customsText: v.customsText,
    };
    try {
      const saved = await update.mutateAsync(body);
      reset(valuesOf(saved));
      toast.show('Parcel details saved.');
    } catch (err) {
      setFormError(applyServerErrors(err, setError, FIELDS));
      if (isApiError(err) && err.fields.insuredMinor) setError('insured', { message: err.fields.insuredMinor });
    }
  });

  const e = errors.shipTo;
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-sm font-medium">Ship to</legend>
        <p className="-mt-2 text-xs text-sable-600">Taken from the client record; changes here are for this parcel only.</p>
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Name" className="sm:col-span-2" maxLength={120} error={e?.name?.message} {...register('shipTo.name')} />
          <TextField label="Address line 1" className="sm:col-span-2" maxLength={200} error={e?.line1?.message} {...register('shipTo.line1')} />
          <TextField label="Address line 2" optional className="sm:col-span-2" maxLength={200} error={e?.line2?.message} {...register('shipTo.line2')} />
          <TextField label="Town or city" maxLength={100} error={e?.city?.message} {...register('shipTo.city')} />
          <TextField label="Region or state" optional maxLength={100} error={e?.region?.message} {...register('shipTo.region')} />
          <TextField label="Postcode" optional maxLength={20} error={e?.postalCode?.message} {...register('shipTo.postalCode')} />
          <TextField label="Country code" hint="Two letters, e.g. DE or US." maxLength={2} autoCapitalize="characters" spellCheck={false} error={e?.country?.message} {...register('shipTo.country')} />
        </div>
      </fieldset>

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-sm font-medium">The parcel</legend>
        <div className="grid gap-3 sm:grid-cols-3">
          <TextField label="Carrier" maxLength={80} error={errors.carrier?.message} {...register('carrier')} />
          <TextField label="Service" optional maxLength={80} placeholder="e.g. tracked, signed for" error={errors.service?.message} {...register('service')} />
          <TextField label="Tracking number" maxLength={80} spellCheck={false} hint="Goes to the client in the shipped e-mail." error={errors.tracking?.message} {...register('tracking')} />
        </div>
        <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
          <TextField label="Weight (g)" optional inputMode="numeric" error={errors.weightGrams?.message} {...register('weightGrams')} />
          <TextField label="Length (cm)" optional inputMode="numeric" error={errors.lengthCm?.message} {...register('lengthCm')} />
          <TextField label="Width (cm)" optional inputMode="numeric" error={errors.widthCm?.message} {...register('widthCm')} />
          <TextField label="Height (cm)" optional inputMode="numeric" error={errors.heightCm?.message} {...register('heightCm')} />
        </div>
        <TextField label={`Insured value (${shipment.currency})`} optional inputMode="decimal" className="sm:max-w-xs" error={errors.insured?.message} {...register('insured')} />
      </fieldset>

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-sm font-medium">Customs {shipment.abroad ? '(this parcel goes abroad)' : '(for parcels abroad)'}</legend>
        <TextArea
          label="What the customs form says is in the parcel"
          optional={!shipment.abroad}
          rows={5}
          maxLength={2000}
          error={errors.customsText?.message}
          {...register('customsText')}
        />
        {shipment.suggestedCustomsText && (
          <div>
            <Button variant="ghost" size="sm" onClick={() => setValue('customsText', shipment.suggestedCustomsText ?? '', { shouldDirty: true })}>
              Use the suggested wording
            </Button>
          </div>
        )}
        <Note>
          <span className="font-medium">Customs:</span> {CUSTOMS_CAUTION} Declare the painting service and the client’s own models truthfully.
        </Note>
      </fieldset>

      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" variant={isDirty ? 'primary' : 'secondary'} loading={update.isPending}>
          Save parcel details
        </Button>
        {isDirty && <span className="text-xs text-sable-600">Unsaved changes</span>}
      </div>
    </form>
  );
}
