import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { resetRequestInput } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { isApiError } from '../../../lib/api-client';
import { useRequestPasswordReset } from '../api/request-password-reset';
import { throttledMessage } from './sign-in-form';

export function ForgotPasswordForm({ devMail }: { devMail: boolean }) {
  const request = useRequestPasswordReset();
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(resetRequestInput), defaultValues: { email: '' } });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await request.mutateAsync(values);
      setSentTo(values.email);
    } catch (err) {
      if (isApiError(err, 429)) setFormError(throttledMessage(err.retryAfter));
      else setFormError(applyServerErrors(err, setError, ['email']));
    }
  });

  if (sentTo) {
    return (
      <div role="status" className="flex flex-col gap-3 text-sm">
        <p>
          If an account uses <strong>{sentTo}</strong>, a link to choose a new password is on its way. It can take a minute or two — check the spam
          folder too.
        </p>
        {devMail && (
          <Note>
            Running locally: the message lands in the <a href="/dev/mail">local mail inbox</a>.
          </Note>
        )}
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <TextField label="E-mail" type="email" autoComplete="email" inputMode="email" error={errors.email?.message} {...register('email')} />
      <Button type="submit" loading={request.isPending} className="w-full">
        Send me a reset link
      </Button>
    </form>
  );
}
