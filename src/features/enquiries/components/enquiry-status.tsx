import { enquiryStatusLabels, type EnquiryStatus } from '../../../../shared/schemas/enquiries';
import { Badge, type BadgeTone } from '../../../components/ui/badge';

const tones: Record<EnquiryStatus, BadgeTone> = { new: 'attention', accepted: 'success', declined: 'neutral' };

export function EnquiryStatusBadge({ status }: { status: EnquiryStatus }) {
  return <Badge tone={tones[status]}>{enquiryStatusLabels[status]}</Badge>;
}
