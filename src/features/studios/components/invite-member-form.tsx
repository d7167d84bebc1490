import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { inviteMemberInput } from '../../../../shared/schemas/studios';
import { Button } from '../../../components/ui/button';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { SelectField, TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { useToast } from '../../../components/ui/toast';
import { isApiError } from '../../../lib/api-client';
import { useCreateInvitation } from '../api/create-invitation';

export function InviteMemberForm({ studioId, devMail }: { studioId: number; devMail: boolean }) {
  const create = useCreateInvitation(studioId);
  const toast = useToast();
  const [formError, setFormError] = useState<string | null>(null);
  const [lastSent, setLastSent] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm({ resolver: zodResolver(inviteMemberInput), defaultValues: { email: '', role: 'painter' as const } });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await create.mutateAsync(values);
      toast.show(`Invitation sent to ${values.email}.`);
      setLastSent(values.email);
      reset({ email: '', role: values.role });
    } catch (err) {
      if (isApiError(err, 409) && !err.fields.email) setError('email', { type: 'server', message: err.message }, { shouldFocus: true });
      else setFormError(applyServerErrors(err, setError, ['email', 'role']));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <div className="grid gap-4 sm:grid-cols-[2fr_1fr]">
        <TextField label="E-mail" type="email" autoComplete="off" inputMode="email" error={errors.email?.message} {...register('email')} />
        <SelectField label="Role" error={errors.role?.message} {...register('role')}>
          <option value="painter">Painter</option>
          <option value="owner">Owner</option>
        </SelectField>
      </div>
      <p className="text-xs text-sable-600">Painters work the bench and see no money. Owners can do everything, including this screen.</p>
      <div>
        <Button type="submit" loading={create.isPending}>
          Send invitation
        </Button>
      </div>
      {devMail && lastSent && (
        <Note>
          Running locally: the invitation for {lastSent} is in the <a href="/dev/mail">local mail inbox</a>.
        </Note>
      )}
    </form>
  );
}
