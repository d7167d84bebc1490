import type { Studio } from '../../../../shared/schemas/studios';
import { Card } from '../../../components/ui/card';
import { ErrorNote } from '../../../components/ui/error-note';
import { PageTitle } from '../../../components/ui/page-title';
import { LoadingBlock } from '../../../components/ui/spinner';
import { useStudioScope } from '../../../lib/studio-scope';
import { useStudio } from '../api/get-studio';
import { StudioSettingsForm } from '../components/studio-settings-form';

export function StudioSettingsRoute({ onSaved }: { onSaved?: (studio: Studio) => void }) {
  const { studioId } = useStudioScope();
  const studio = useStudio(studioId);
  return (
    <>
      <PageTitle title="Settings" description="How your studio appears to clients, and how it counts money and time." />
      {studio.isPending ? (
        <LoadingBlock />
      ) : studio.error ? (
        <ErrorNote title="The settings did not load">{studio.error.message}</ErrorNote>
      ) : (
        <Card title="Studio">
          <StudioSettingsForm key={studio.data.id} studio={studio.data} onSaved={onSaved} />
        </Card>
      )}
    </>
  );
}
