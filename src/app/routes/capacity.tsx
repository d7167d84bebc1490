import { CapacityRoute } from '../../features/capacity/routes/capacity';

export default function CapacityPage() {
  return <CapacityRoute />;
}
