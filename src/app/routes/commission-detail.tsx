import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { lockedStatuses } from '../../../shared/commission-lifecycle';
import { ClientCommissionRoute } from '../../features/commissions/routes/client-commission';
import { CommissionDetailRoute } from '../../features/commissions/routes/commission-detail';
import { CommissionPhotos, FinishedPhotos, PhotosAt, ReferencePhotos } from '../../features/photos/components/client-photos';
import { PhotosSection } from '../../features/photos/components/photos-section';
import { membersQueryOptions } from '../../features/studios/api/get-members';
import { StageTimeLog } from '../../features/time/components/stage-time-log';
import { StageTimer } from '../../features/time/components/stage-timer';
import { useStudioScope } from '../../lib/studio-scope';

function StudioView() {
  const { studioId, role, userId, timezone } = useStudioScope();
  const members = useQuery({ ...membersQueryOptions(studioId), enabled: role === 'owner' });
  return (
    <CommissionDetailRoute
      painters={(members.data ?? []).filter((m) => m.role !== 'client').map((m) => ({ id: m.userId, name: m.name }))}
      stageSlots={{
        timer: (s, f) => <StageTimer studioId={studioId} stageId={s.id} stageName={s.name} figureName={f.name} />,
        timeLog: (s) => <StageTimeLog studioId={studioId} stageId={s.id} stageName={s.name} userId={userId} isOwner={role === 'owner'} locked={false} timezone={timezone} />,
      }}
      photos={(c) => (
        <PhotosSection
          studioId={studioId}
          commissionId={c.id}
          timezone={timezone}
          locked={lockedStatuses.includes(c.status)}
          figures={c.figures.map((f) => ({ id: f.id, name: f.name, stages: f.stages.map((s) => ({ id: s.id, name: s.name })) }))}
        />
      )}
    />
  );
}

function ClientView() {
  const { studioId, timezone } = useStudioScope();
  const commissionId = Number(useParams().commissionId);
  return (
    <ClientCommissionRoute
      photosFor={(figureId, stageId) => (
        <PhotosAt studioId={studioId} commissionId={commissionId} timezone={timezone} figureId={figureId} stageId={stageId} label={stageId ? 'Photos of this stage' : 'Photos of this figure'} />
      )}
      loosePhotos={(c) => <CommissionPhotos studioId={studioId} commissionId={c.id} timezone={timezone} />}
      references={(c) => <ReferencePhotos studioId={studioId} commissionId={c.id} timezone={timezone} canUpload={!lockedStatuses.includes(c.status)} />}
      finished={(c) => <FinishedPhotos studioId={studioId} commissionId={c.id} timezone={timezone} />}
    />
  );
}

/** One address for everyone (e-mail links point here); the role picks the view. */
export default function CommissionDetailPage() {
  const { role } = useStudioScope();
  return role === 'client' ? <ClientView /> : <StudioView />;
}
