import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { updateStudioInput, type Studio } from '../../../../shared/schemas/studios';
import { CurrencyField } from '../../../components/form/currency-field';
import { TimezoneField } from '../../../components/form/timezone-field';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextArea, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useUpdateStudio } from '../api/update-studio';

// Everything but the about text must stay filled in on this screen.
const formSchema = updateStudioInput.required({ name: true, currency: true, timezone: true, slug: true });
const FIELDS = ['name', 'currency', 'timezone', 'slug', 'about'] as const;

export function StudioSettingsForm({ studio, onSaved }: { studio: Studio; onSaved?: (studio: Studio) => void }) {
  const update = useUpdateStudio(studio.id);
  const toast = useToast();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    getValues,
    setError,
    reset,
    formState: { errors, isDirty },
  } = useForm({
    resolver: zodResolver(formSchema),
    defaultValues: { name: studio.name, currency: studio.currency, timezone: studio.timezone, slug: studio.slug, about: studio.about ?? '' },
  });

  const onSubmit = handleSubmit(async () => {
    setFormError(null);
    try {
      // Send what was typed (an emptied "about" included); the server applies the same schema.
      const saved = await update.mutateAsync(getValues());
      reset({ name: saved.name, currency: saved.currency, timezone: saved.timezone, slug: saved.slug, about: saved.about ?? '' });
      toast.show('Studio settings saved.');
      onSaved?.(saved);
    } catch (err) {
      if (isApiError(err, 409) && !err.fields.slug) setError('slug', { type: 'server', message: 'Another studio already uses this address. Try a different one.' }, { shouldFocus: true });
      else setFormError(applyServerErrors(err, setError, FIELDS));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-xl flex-col gap-5">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <TextField label="Studio name" autoComplete="organization" error={errors.name?.message} {...register('name')} />
      <TextField
        label="Public page address"
        hint="The last part of your studio's public link: lower-case letters, digits and dashes, such as bramble-minis."
        autoCapitalize="none"
        spellCheck={false}
        error={errors.slug?.message}
        {...register('slug')}
      />
      <Controller
        control={control}
        name="currency"
        render={({ field, fieldState }) => (
          <CurrencyField
            value={field.value}
            onChange={field.onChange}
            onBlur={field.onBlur}
            error={fieldState.error?.message}
            hint="New quotes and invoices use this currency; ones already sent keep theirs."
          />
        )}
      />
      <Controller
        control={control}
        name="timezone"
        render={({ field, fieldState }) => (
          <TimezoneField name={field.name} ref={field.ref} value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={fieldState.error?.message} />
        )}
      />
      <TextArea
        label="About the studio"
        optional
        rows={5}
        hint="A few lines for clients: what you paint, how you work. Up to 2000 characters."
        error={errors.about?.message}
        {...register('about')}
      />
      <div>
        <Button type="submit" loading={update.isPending} disabled={!isDirty && !update.isPending}>
          Save settings
        </Button>
      </div>
    </form>
  );
}
