import { useMeta } from '../../features/auth/api/get-meta';
import { TeamRoute } from '../../features/studios/routes/team';

export default function TeamPage() {
  const meta = useMeta();
  return <TeamRoute devMail={meta.data?.devMail ?? false} />;
}
