import { photoKinds } from '../../../../shared/schemas/photos';
import { ErrorNote } from '../../../components/ui/error-note';
import { LoadingBlock } from '../../../components/ui/spinner';
import { usePhotos } from '../api/get-photos';
import { PhotoGallery } from './photo-gallery';
import { PhotoUploader, type FigureChoice } from './photo-uploader';

/** The studio's photos of a commission: upload, then share, caption or delete. */
export function PhotosSection({ studioId, commissionId, figures, timezone, locked }: { studioId: number; commissionId: number; figures: FigureChoice[]; timezone: string; locked: boolean }) {
  const photos = usePhotos(studioId, commissionId);
  const where = (figureId: number | null, stageId: number | null) => {
    const f = figures.find((x) => x.id === figureId);
    if (!f) return null;
    const s = f.stages.find((x) => x.id === stageId);
    return s ? `${f.name} · ${s.name}` : f.name;
  };
  return (
    <div className="flex flex-col gap-4">
      {!locked && <PhotoUploader studioId={studioId} commissionId={commissionId} kinds={[...photoKinds]} figures={figures} />}
      {photos.isPending ? (
        <LoadingBlock label="Loading photos…" />
      ) : photos.error ? (
        <ErrorNote>{photos.error.message}</ErrorNote>
      ) : photos.data.length === 0 ? (
        <p className="text-sm text-sable-600">No photos yet. Photos of the models as received, progress and packing go here.</p>
      ) : (
        <PhotoGallery studioId={studioId} photos={photos.data} timezone={timezone} label="Photos of this commission" manage download describe={(p) => where(p.figureId, p.stageId)} />
      )}
    </div>
  );
}
