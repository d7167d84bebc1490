import { ReportsRoute } from '../../features/reports/routes/reports';

export default function ReportsPage() {
  return <ReportsRoute />;
}
