import { useMe } from '../../features/auth/api/get-me';
import { ClientHomeRoute, StudioHomeRoute } from '../../features/dashboard/routes/studio-home';
import { useStudioScope } from '../../lib/studio-scope';

export default function StudioHomePage() {
  const { role } = useStudioScope();
  const name = useMe().data?.user.name ?? '';
  // The client's home lists their commissions with the date each should be ready (the forecast's).
  return role === 'client' ? <ClientHomeRoute userName={name} /> : <StudioHomeRoute userName={name} />;
}
