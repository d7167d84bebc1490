import { useNavigate, useParams } from 'react-router-dom';
import { AuthShell } from '../../../components/layout/auth-shell';
import { useDocumentTitle } from '../../../components/ui/page-title';
import { useToast } from '../../../components/ui/toast';
import { ResetPasswordForm } from '../components/reset-password-form';
import { homePathFor } from '../home-path';

export function ResetPasswordRoute() {
  useDocumentTitle('Choose a new password');
  const { token = '' } = useParams();
  const navigate = useNavigate();
  const toast = useToast();
  return (
    <AuthShell>
      <h1 className="mb-1 text-xl font-semibold">Choose a new password</h1>
      <p className="mb-6 text-sm text-sable-600">Once saved, you are signed in and the old password stops working.</p>
      <ResetPasswordForm
        token={token}
        onDone={(me) => {
          toast.show('New password saved. You are signed in.');
          navigate(homePathFor(me), { replace: true });
        }}
      />
    </AuthShell>
  );
}
