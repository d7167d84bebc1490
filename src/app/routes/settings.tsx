import { useQueryClient } from '@tanstack/react-query';
import { meQueryOptions } from '../../features/auth/api/get-me';
import { StudioSettingsRoute } from '../../features/studios/routes/settings';

export default function SettingsPage() {
  const queryClient = useQueryClient();
  // The studio's name also shows in the switcher, which reads the memberships.
  return <StudioSettingsRoute onSaved={() => queryClient.invalidateQueries({ queryKey: meQueryOptions().queryKey })} />;
}
