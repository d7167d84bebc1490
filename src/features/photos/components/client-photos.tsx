import { Download } from 'lucide-react';
import { usePhotos } from '../api/get-photos';
import { PhotoGallery } from './photo-gallery';
import { PhotoUploader } from './photo-uploader';

type Where = { studioId: number; commissionId: number; timezone: string };

/** Shared photos of one figure (stageId null: those not filed under a stage) or one stage. */
export function PhotosAt({ studioId, commissionId, timezone, figureId, stageId, label }: Where & { figureId: number | null; stageId: number | null; label: string }) {
  const photos = usePhotos(studioId, commissionId);
  const here = (photos.data ?? []).filter((p) => p.kind !== 'reference' && p.figureId === figureId && p.stageId === stageId);
  if (here.length === 0) return null;
  return (
    <div className="mt-2">
      <PhotoGallery studioId={studioId} photos={here} timezone={timezone} label={label} download />
    </div>
  );
}

/** The client's reference photos, and the upload for more. */
export function ReferencePhotos({ studioId, commissionId, timezone, canUpload }: Where & { canUpload: boolean }) {
  const photos = usePhotos(studioId, commissionId);
  const refs = (photos.data ?? []).filter((p) => p.kind === 'reference');
  return (
    <div className="flex flex-col gap-3">
      <h3 className="text-base font-semibold">Reference photos</h3>
      <p className="text-sm text-sable-600">Pictures that show the look you are after: other figures, art, colours you like.</p>
      {refs.length > 0 && <PhotoGallery studioId={studioId} photos={refs} timezone={timezone} label="Reference photos" />}
      {canUpload && <PhotoUploader studioId={studioId} commissionId={commissionId} kinds={['reference']} allowShare={false} />}
    </div>
  );
}

/** Full-size downloads of the shared photos, once the work is finished. */
export function FinishedPhotos({ studioId, commissionId, timezone }: Where) {
  const photos = usePhotos(studioId, commissionId);
  const shared = (photos.data ?? []).filter((p) => p.kind !== 'reference' && p.shared);
  if (photos.isPending) return null;
  if (shared.length === 0) return <p className="text-sm text-sable-600">The final photos will show here.</p>;
  const latest = [...shared].sort((a, b) => b.createdAt.localeCompare(a.createdAt));
  return (
    <div className="flex flex-col gap-3">
      <PhotoGallery studioId={studioId} photos={latest} timezone={timezone} label="Photos of the finished work" download />
      <ul aria-label="Full-size downloads" className="flex flex-col gap-1 text-sm">
        {latest.map((p, i) => (
          <li key={p.id}>
            <a href={`${p.urls.original}?download=1`} className="inline-flex items-center gap-1">
              <Download aria-hidden="true" className="size-4" />
              Download {p.caption ? `“${p.caption}”` : `photo ${i + 1}`} at full size
            </a>{' '}
            <span className="figures text-sable-600">
              ({p.width} × {p.height} px)
            </span>
          </li>
        ))}
      </ul>
    </div>
  );
}

/** Shared photos of the whole commission (not of one figure). */
export function CommissionPhotos({ studioId, commissionId, timezone }: Where) {
  const photos = usePhotos(studioId, commissionId);
  const loose = (photos.data ?? []).filter((p) => p.kind !== 'reference' && p.figureId === null);
  if (loose.length === 0) return null;
  return (
    <div className="flex flex-col gap-2">
      <h3 className="text-base font-semibold">Photos of the whole commission</h3>
      <PhotoGallery studioId={studioId} photos={loose} timezone={timezone} label="Photos of the whole commission" download />
    </div>
  );
}
