import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link } from 'react-router-dom';
import { loginInput, type MeResponse } from '../../../../shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { ErrorNote } from '../../../components/ui/error-note';
import { TextField } from '../../../components/ui/field';
import { applyServerErrors } from '../../../components/ui/form-errors';
import { isApiError } from '../../../lib/api-client';
import { minutesFromSeconds, pluralize } from '../../../lib/format';
import { useLogin } from '../api/login';
import { DemoAccounts } from './demo-accounts';

export function throttledMessage(retryAfter: number | null): string {
  if (retryAfter === null) return 'Too many attempts — wait a few minutes and try again.';
  return `Too many attempts — try again in ${pluralize(minutesFromSeconds(retryAfter), 'minute')}.`;
}

export function SignInForm({ demoPassword, onSignedIn }: { demoPassword?: string; onSignedIn: (me: MeResponse) => void }) {
  const login = useLogin();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    setFocus,
    formState: { errors },
  } = useForm({ resolver: zodResolver(loginInput), defaultValues: { email: '', password: '' } });

  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      onSignedIn(await login.mutateAsync(values));
    } catch (err) {
      if (isApiError(err, 429)) setFormError(throttledMessage(err.retryAfter));
      else if (isApiError(err, 401)) setFormError('That e-mail and password do not match an account. Check both and try again.');
      else setFormError(applyServerErrors(err, setError, ['email', 'password']));
    }
  });

  return (
    <div className="flex flex-col gap-6">
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-labelledby="sign-in-title">
        {formError && <ErrorNote>{formError}</ErrorNote>}
        <TextField label="E-mail" type="email" autoComplete="email" inputMode="email" error={errors.email?.message} {...register('email')} />
        <TextField
          label="Password"
          type="password"
          autoComplete="current-password"
          error={errors.password?.message}
          hint={<Link to="/forgot-password">Forgot your password?</Link>}
          {...register('password')}
        />
        <Button type="submit" loading={login.isPending} className="w-full">
          Sign in
        </Button>
      </form>
      {demoPassword && (
        <DemoAccounts
          password={demoPassword}
          onPick={(email, password) => {
            setValue('email', email, { shouldValidate: false });
            setValue('password', password, { shouldValidate: false });
            setFocus('password');
          }}
        />
      )}
    </div>
  );
}
