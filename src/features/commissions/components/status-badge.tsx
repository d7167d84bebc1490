import { commissionStatusLabels, type CommissionStatus } from '../../../../shared/commission-lifecycle';
import { Badge, type BadgeTone } from '../../../components/ui/badge';

const tones: Record<CommissionStatus, BadgeTone> = {
  enquiry: 'neutral',
  quoted: 'neutral',
  booked: 'info',
  on_bench: 'success',
  ready_to_ship: 'attention',
  shipped: 'info',
  closed: 'neutral',
  on_hold: 'attention',
  cancelled: 'danger',
};

export function StatusBadge({ status }: { status: CommissionStatus }) {
  return <Badge tone={tones[status]}>{commissionStatusLabels[status]}</Badge>;
}
