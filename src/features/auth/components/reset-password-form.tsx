import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { resetConfirmInput, type MeResponse } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { isApiError } from '../../../lib/api-client';
import { useConfirmPasswordReset } from '../api/confirm-password-reset';

// The token comes from the link, not from the person.
const formSchema = resetConfirmInput.omit({ token: true });

export function ResetPasswordForm({ token, onDone }: { token: string; onDone: (me: MeResponse) => void }) {
  const confirm = useConfirmPasswordReset();
  const [expired, setExpired] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(formSchema), defaultValues: { password: '' } });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      onDone(await confirm.mutateAsync({ token, password: values.password }));
    } catch (err) {
      if (isApiError(err, 410) || isApiError(err, 404) || (isApiError(err, 400) && err.fields.token)) setExpired(true);
      else setFormError(applyServerErrors(err, setError, ['password']));
    }
  });

  if (expired) {
    return (
      <ErrorNote title="This reset link has been used or has expired" action={<Link to="/forgot-password">Ask for a new link</Link>}>
        Links work once and only for a while. Ask for a fresh one and use it soon.
      </ErrorNote>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        hint="At least 12 characters."
        error={errors.password?.message}
        {...register('password')}
      />
      <Button type="submit" loading={confirm.isPending} className="w-full">
        Save and sign in
      </Button>
    </form>
  );
}
