import { useQuery } from '@tanstack/react-query';
import { BenchBoardRoute } from '../../features/bench/routes/bench-board';
import { AddPhotoButton } from '../../features/photos/components/add-photo-button';
import { membersQueryOptions } from '../../features/studios/api/get-members';
import { StageTimer } from '../../features/time/components/stage-timer';
import { useStudioScope } from '../../lib/studio-scope';

export default function BenchPage() {
  const { studioId, role } = useStudioScope();
  const members = useQuery({ ...membersQueryOptions(studioId), enabled: role === 'owner' });
  return (
    <BenchBoardRoute
      painters={(members.data ?? []).filter((m) => m.role !== 'client').map((m) => ({ id: m.userId, name: m.name }))}
      cardTools={(card) =>
        card.stage && (
          <>
            <StageTimer studioId={studioId} stageId={card.stage.id} stageName={card.stage.name} figureName={card.figureName} short />
            <AddPhotoButton
              studioId={studioId}
              commissionId={card.commission.id}
              figureId={card.figureId}
              stageId={card.stage.id}
              figureName={card.figureName}
              stageName={card.stage.name}
            />
          </>
        )
      }
    />
  );
}
