import { useMe } from '../../features/auth/api/get-me';
import { ClientCommissionsRoute } from '../../features/commissions/routes/client-commissions';
import { CommissionsListRoute } from '../../features/commissions/routes/commissions-list';
import { useStudioScope } from '../../lib/studio-scope';

export default function CommissionsPage() {
  const { role, studioName } = useStudioScope();
  const name = useMe().data?.user.name ?? '';
  if (role === 'client') return <ClientCommissionsRoute greeting={`Hello, ${name.trim().split(/\s+/)[0] ?? name} — your figures at ${studioName}.`} />;
  return <CommissionsListRoute />;
}
