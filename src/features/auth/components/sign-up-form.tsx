import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { signupInput, type MeResponse } from '../../../../shared/schemas/auth';
import { CurrencyField } from '../../../components/form/currency-field';
import { TimezoneField } from '../../../components/form/timezone-field';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { isApiError } from '../../../lib/api-client';
import { browserTimeZone } from '../../../lib/format';
import { useSignup } from '../api/signup';
import { throttledMessage } from './sign-in-form';

const FIELDS = ['name', 'email', 'password', 'studioName', 'currency', 'timezone'] as const;

export function SignUpForm({ onSignedUp }: { onSignedUp: (me: MeResponse) => void }) {
  const signup = useSignup();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(signupInput),
    defaultValues: { name: '', email: '', password: '', studioName: '', currency: '', timezone: browserTimeZone() },
  });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      onSignedUp(await signup.mutateAsync(values));
    } catch (err) {
      if (isApiError(err, 409)) setError('email', { type: 'server', message: err.fields.email ?? 'An account already uses this e-mail. Sign in instead, or use another address.' }, { shouldFocus: true });
      else if (isApiError(err, 429)) setFormError(throttledMessage(err.retryAfter));
      else setFormError(applyServerErrors(err, setError, FIELDS));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <fieldset className="flex flex-col gap-4">
        <legend className="mb-2 text-sm font-semibold text-sable-600">You</legend>
        <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...register('name')} />
        <TextField label="E-mail" type="email" autoComplete="email" inputMode="email" error={errors.email?.message} {...register('email')} />
        <TextField
          label="Password"
          type="password"
          autoComplete="new-password"
          hint="At least 12 characters. A short sentence is easy to remember."
          error={errors.password?.message}
          {...register('password')}
        />
      </fieldset>
      <fieldset className="flex flex-col gap-4 border-t border-primer-300 pt-4">
        <legend className="float-left mb-2 w-full text-sm font-semibold text-sable-600">Your studio</legend>
        <TextField label="Studio name" autoComplete="organization" error={errors.studioName?.message} {...register('studioName')} />
        <Controller
          control={control}
          name="currency"
          render={({ field, fieldState }) => (
            <CurrencyField value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={fieldState.error?.message} />
          )}
        />
        <Controller
          control={control}
          name="timezone"
          render={({ field, fieldState }) => (
            <TimezoneField
              name={field.name}
              ref={field.ref}
              value={field.value}
              onChange={field.onChange}
              onBlur={field.onBlur}
              error={fieldState.error?.message}
              hint="We picked the one your device uses. Dates and deadlines show in this timezone."
            />
          )}
        />
      </fieldset>
      <Button type="submit" loading={signup.isPending} className="w-full">
        Create my studio
      </Button>
    </form>
  );
}
