import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { changePasswordInput } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { useChangePassword } from '../api/change-password';

// The new password typed twice, so a slip of the finger does not lock the person out.
const formSchema = changePasswordInput.extend({ repeatPassword: z.string() }).refine((v) => v.newPassword === v.repeatPassword, {
  path: ['repeatPassword'],
  message: 'The two new passwords differ.',
});

export function ChangePasswordForm({ onDone }: { onDone: () => void }) {
  const change = useChangePassword();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm({ resolver: zodResolver(formSchema), defaultValues: { currentPassword: '', newPassword: '', repeatPassword: '' } });

  const onSubmit = handleSubmit(async ({ currentPassword, newPassword }) => {
    setFormError(null);
    try {
      await change.mutateAsync({ currentPassword, newPassword });
      reset();
      onDone();
    } catch (err) {
      setFormError(applyServerErrors(err, setError, ['currentPassword', 'newPassword']));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-md flex-col gap-4">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <TextField label="Current password" type="password" autoComplete="current-password" error={errors.currentPassword?.message} {...register('currentPassword')} />
      <TextField label="New password" type="password" autoComplete="new-password" hint="At least 12 characters." error={errors.newPassword?.message} {...register('newPassword')} />
      <TextField label="New password again" type="password" autoComplete="new-password" error={errors.repeatPassword?.message} {...register('repeatPassword')} />
      <div>
        <Button type="submit" loading={change.isPending}>
          Change password
        </Button>
      </div>
    </form>
  );
}
