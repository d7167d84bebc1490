import { useMe } from '../../features/auth/api/get-me';
import { ClientCommissionsRoute } from '../../features/commissions/routes/client-commissions';
import { StudioHomeRoute } from '../../features/dashboard/routes/studio-home';
import { useStudioScope } from '../../lib/studio-scope';

export default function StudioHomePage() {
  const { role, studioName } = useStudioScope();
  const name = useMe().data?.user.name ?? '';
  const first = name.trim().split(/\s+/)[0] ?? name;
  return role === 'client' ? <ClientCommissionsRoute greeting={`Hello, ${first} — this is your corner of ${studioName}.`} /> : <StudioHomeRoute userName={name} />;
}
