import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { acceptInvitationInput, type InvitationPreview } from '../../../../shared/schemas/auth';
import { password, personName } from '../../../../shared/schemas/common';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { isApiError } from '../../../lib/api-client';
import { useAcceptInvitation, type AcceptInvitationResult } from '../api/accept-invitation';

// A new person must give a name and a proper password; an existing one confirms with theirs.
const newAccountSchema = acceptInvitationInput.extend({ name: personName, password });
const existingAccountSchema = acceptInvitationInput.omit({ name: true });

function throttled(retryAfter: number | null) {
  if (retryAfter === null) return 'Too many attempts — wait a few minutes and try again.';
  const minutes = Math.max(1, Math.ceil(retryAfter / 60));
  return `Too many attempts — try again in ${minutes} ${minutes === 1 ? 'minute' : 'minutes'}.`;
}

type Props = { token: string; invitation: InvitationPreview; onAccepted: (result: AcceptInvitationResult) => void; onGone: () => void };

export function NewAccountForm({ token, invitation, onAccepted, onGone }: Props) {
  const accept = useAcceptInvitation(token);
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(newAccountSchema), defaultValues: { name: '', password: '' } });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      onAccepted(await accept.mutateAsync(values));
    } catch (err) {
      if (isApiError(err, 410) || isApiError(err, 404)) onGone();
      else if (isApiError(err, 429)) setFormError(throttled(err.retryAfter));
      else setFormError(applyServerErrors(err, setError, ['name', 'password']));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <TextField label="E-mail" value={invitation.email} readOnly disabled hint="The invitation was sent to this address." />
      <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...register('name')} />
      <TextField
        label="Choose a password"
        type="password"
        autoComplete="new-password"
        hint="At least 12 characters."
        error={errors.password?.message}
        {...register('password')}
      />
      <Button type="submit" loading={accept.isPending} className="w-full">
        Accept and create my account
      </Button>
    </form>
  );
}

export function ExistingAccountForm({ token, invitation, onAccepted, onGone }: Props) {
  const accept = useAcceptInvitation(token);
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(existingAccountSchema), defaultValues: { password: '' } });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      onAccepted(await accept.mutateAsync(values));
    } catch (err) {
      if (isApiError(err, 410) || isApiError(err, 404)) onGone();
      else if (isApiError(err, 401)) setError('password', { type: 'server', message: 'That is not the password for this account. Try again.' }, { shouldFocus: true });
      else if (isApiError(err, 429)) setFormError(throttled(err.retryAfter));
      else setFormError(applyServerErrors(err, setError, ['password']));
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <p className="text-sm">
        You already have a Sablework account as <strong>{invitation.email}</strong>. Sign in with your password to add {invitation.studioName}.
      </p>
      {formError && <ErrorNote>{formError}</ErrorNote>}
      <input type="email" autoComplete="username" value={invitation.email} readOnly hidden />
      <TextField
        label="Your password"
        type="password"
        autoComplete="current-password"
        error={errors.password?.message}
        hint={<Link to="/forgot-password">Forgot your password?</Link>}
        {...register('password')}
      />
      <Button type="submit" loading={accept.isPending} className="w-full">
        Sign in and add {invitation.studioName}
      </Button>
    </form>
  );
}
