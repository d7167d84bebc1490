import { Link, Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { AuthShell } from '../../../components/layout/auth-shell';
import { useDocumentTitle } from '../../../components/ui/page-title';
import { useMe } from '../api/get-me';
import { useMeta } from '../api/get-meta';
import { SignInForm } from '../components/sign-in-form';
import { homePathFor, safeNext } from '../home-path';

export function SignInRoute() {
  useDocumentTitle('Sign in');
  const [params] = useSearchParams();
  const next = safeNext(params.get('next'));
  const navigate = useNavigate();
  const me = useMe();
  const meta = useMeta();

  if (me.data) return <Navigate to={next ?? homePathFor(me.data)} replace />;

  return (
    <AuthShell
      aside={
        <p className="text-center text-sm text-sable-600">
          New to Sablework? <Link to="/sign-up">Set up your studio</Link>
        </p>
      }
    >
      <h1 id="sign-in-title" className="mb-1 text-xl font-semibold">
        Sign in
      </h1>
      <p className="mb-6 text-sm text-sable-600">Welcome back to the bench.</p>
      <SignInForm
        demoPassword={meta.data?.demo ? meta.data.demoPassword : undefined}
        onSignedIn={(signedIn) => navigate(next ?? homePathFor(signedIn), { replace: true })}
      />
    </AuthShell>
  );
}
