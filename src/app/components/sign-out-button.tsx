import { LogOut } from 'lucide-react';
import { useNavigate } from 'react-router-dom';
import { Button } from '../../components/ui/button';
import { useToast } from '../../components/ui/toast';
import { useLogout } from '../../features/auth/api/logout';

export function SignOutButton() {
  const logout = useLogout();
  const navigate = useNavigate();
  const toast = useToast();
  return (
    <Button
      variant="ghost"
      size="md"
      loading={logout.isPending}
      onClick={async () => {
        try {
          await logout.mutateAsync();
          navigate('/sign-in', { replace: true });
          toast.show('You are signed out. See you at the bench.');
        } catch (err) {
          toast.show(err instanceof Error ? err.message : 'Signing out did not work. Try again.', 'error');
        }
      }}
    >
      <LogOut aria-hidden="true" className="size-4" />
      <span className="sr-only sm:not-sr-only">Sign out</span>
    </Button>
  );
}
