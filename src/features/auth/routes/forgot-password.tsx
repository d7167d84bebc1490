import { Link } from 'react-router-dom';
import { AuthShell } from '../../../components/layout/auth-shell';
import { useDocumentTitle } from '../../../components/ui/page-title';
import { useMeta } from '../api/get-meta';
import { ForgotPasswordForm } from '../components/forgot-password-form';

export function ForgotPasswordRoute() {
  useDocumentTitle('Forgot password');
  const meta = useMeta();
  return (
    <AuthShell
      aside={
        <p className="text-center text-sm text-sable-600">
          Remembered it? <Link to="/sign-in">Back to sign in</Link>
        </p>
      }
    >
      <h1 className="mb-1 text-xl font-semibold">Forgot your password?</h1>
      <p className="mb-6 text-sm text-sable-600">Tell us the e-mail you sign in with and we will send a link to choose a new one.</p>
      <ForgotPasswordForm devMail={meta.data?.devMail ?? false} />
    </AuthShell>
  );
}
