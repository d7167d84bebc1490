import { Link, Navigate, useNavigate } from 'react-router-dom';
import { AuthShell } from '../../../components/layout/auth-shell';
import { useDocumentTitle } from '../../../components/ui/page-title';
import { useMe } from '../api/get-me';
import { SignUpForm } from '../components/sign-up-form';
import { homePathFor } from '../home-path';

export function SignUpRoute() {
  useDocumentTitle('Set up your studio');
  const navigate = useNavigate();
  const me = useMe();
  if (me.data) return <Navigate to={homePathFor(me.data)} replace />;

  return (
    <AuthShell
      aside={
        <p className="text-center text-sm text-sable-600">
          Already have an account? <Link to="/sign-in">Sign in</Link>
        </p>
      }
    >
      <h1 className="mb-1 text-xl font-semibold">Set up your studio</h1>
      <p className="mb-6 text-sm text-sable-600">A few details and your bench is ready. You can change the studio ones later.</p>
      <SignUpForm onSignedUp={(me) => navigate(homePathFor(me), { replace: true })} />
    </AuthShell>
  );
}
