import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { createClientInput, type Client } from '../../../../shared/schemas/clients';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import type { CreateClientBody } from '../api/create-client';

const FIELDS = [
  'name',
  'email',
  'phone',
  'notes',
  'address.line1',
  'address.line2',
  'address.city',
  'address.region',
  'address.postalCode',
  'address.country',
] as const;

type FormValues = {
  name: string;
  email: string;
  phone: string;
  notes: string;
  address: { line1: string; line2: string; city: string; region: string; postalCode: string; country: string };
};

export function clientFormValues(client?: Client): FormValues {
  const a = client?.address ?? {};
  return {
    name: client?.name ?? '',
    email: client?.email ?? '',
    phone: client?.phone ?? '',
    notes: client?.notes ?? '',
    address: {
      line1: a.line1 ?? '',
      line2: a.line2 ?? '',
      city: a.city ?? '',
      region: a.region ?? '',
      postalCode: a.postalCode ?? '',
      country: a.country ?? '',
    },
  };
}

/**
 * One form for adding and editing. It sends the fields as typed, emptied ones included, so the
 * server can tell "cleared" from "not sent".
 */
export function ClientForm({
  client,
  submitLabel,
  pending,
  onSave,
  onCancel,
}: {
  client?: Client;
  submitLabel: string;
  pending: boolean;
  onSave: (body: CreateClientBody) => Promise<unknown>;
  onCancel?: () => void;
}) {
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    getValues,
    setError,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(createClientInput),
    defaultValues: clientFormValues(client),
  });

  const onSubmit = handleSubmit(async () => {
    setFormError(null);
    try {
      await onSave(getValues());
    } catch (err) {
      setFormError(applyServerErrors(err, setError, FIELDS));
    }
  });

  const a = errors.address;

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-5">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Name" autoComplete="off" className="sm:col-span-2" error={errors.name?.message} {...register('name')} />
        <TextField
          label="E-mail"
          type="email"
          optional
          inputMode="email"
          autoComplete="off"
          hint="Needed to invite them to the client portal."
          error={errors.email?.message}
          {...register('email')}
        />
        <TextField label="Phone" type="tel" optional autoComplete="off" error={errors.phone?.message} {...register('phone')} />
      </div>

      <fieldset className="flex flex-col gap-4">
        <legend className="mb-2 text-sm font-semibold text-sable-600">Shipping address</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Address line 1" optional className="sm:col-span-2" error={a?.line1?.message} {...register('address.line1')} />
          <TextField label="Address line 2" optional className="sm:col-span-2" error={a?.line2?.message} {...register('address.line2')} />
          <TextField label="Town or city" optional error={a?.city?.message} {...register('address.city')} />
          <TextField label="Region or state" optional error={a?.region?.message} {...register('address.region')} />
          <TextField label="Postcode" optional error={a?.postalCode?.message} {...register('address.postalCode')} />
          <TextField
            label="Country code"
            optional
            hint="Two letters, for example DE, GB or US."
            maxLength={2}
            autoCapitalize="characters"
            spellCheck={false}
            error={a?.country?.message}
            {...register('address.country')}
          />
        </div>
      </fieldset>

      <TextArea
        label="Notes"
        optional
        rows={4}
        hint="Only the studio sees these: preferences, past orders, how they like to be kept posted."
        error={errors.notes?.message}
        {...register('notes')}
      />

      <div className="flex flex-wrap gap-2">
        <Button type="submit" loading={pending}>
          {submitLabel}
        </Button>
        {onCancel && (
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        )}
      </div>
    </form>
  );
}
