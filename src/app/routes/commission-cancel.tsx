import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { useStudioScope } from '../../lib/studio-scope';
import { commissionQueryOptions } from '../../features/commissions/api/get-commission';
import { CancelCommissionRoute } from '../../features/invoices/routes/cancel-commission';

export default function CommissionCancelPage() {
  const { studioId } = useStudioScope();
  const commissionId = Number(useParams().commissionId);
  const commission = useQuery({ ...commissionQueryOptions(studioId, commissionId), enabled: Number.isInteger(commissionId) && commissionId > 0 });
  return <CancelCommissionRoute title={commission.data?.title} />;
}
