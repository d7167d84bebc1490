import { useState } from 'react';
import { Pencil, Trash2 } from 'lucide-react';
import { photoKindLabels, type Photo } from '../../../../shared/schemas/photos';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { useToast } from '../../../components/ui/toast';
import { useRemovePhoto } from '../api/remove-photo';
import { useUpdatePhoto } from '../api/update-photo';
import { Lightbox, photoAlt } from './lightbox';
import { Switch } from './switch';

function StudioControls({ studioId, photo, label }: { studioId: number; photo: Photo; label: string }) {
  const fromClient = photo.kind === 'reference';
  const update = useUpdatePhoto(studioId);
  const remove = useRemovePhoto(studioId);
  const toast = useToast();
  const [editing, setEditing] = useState(false);
  const [caption, setCaption] = useState(photo.caption ?? '');
  const fail = (err: unknown) => toast.show(err instanceof Error ? err.message : 'That did not work. Try again.', 'error');

  return (
    <div className="flex flex-col gap-2">
      {fromClient ? (
        <p className="text-xs text-sable-600">From the client{photo.uploadedBy ? ` (${photo.uploadedBy.name})` : ''}</p>
      ) : (
      <Switch
        checked={photo.shared}
        disabled={update.isPending}
        label="Shared with client"
        onChange={(v) =>
          update.mutateAsync({ photoId: photo.id, shared: v }).then(() => toast.show(v ? 'The client can see this photo now.' : 'Only the studio sees this photo now.'), fail)
        }
      />
      )}
      {editing ? (
        <form
          className="flex flex-col gap-1"
          onSubmit={(e) => {
            e.preventDefault();
            update.mutateAsync({ photoId: photo.id, caption }).then(() => setEditing(false), fail);
          }}
        >
          <label className="text-xs font-medium" htmlFor={`caption-${photo.id}`}>
            Caption
          </label>
          <input
            id={`caption-${photo.id}`}
            value={caption}
            maxLength={300}
            onChange={(e) => setCaption(e.target.value)}
            className="min-h-8 rounded-control border border-sable-600 bg-white px-2 text-sm"
          />
          <div className="flex gap-1">
            <Button type="submit" size="sm" loading={update.isPending}>
              Save
            </Button>
            <Button variant="secondary" size="sm" onClick={() => setEditing(false)}>
              Cancel
            </Button>
          </div>
        </form>
      ) : (
        <div className="flex flex-wrap gap-1">
          <Button variant="ghost" size="sm" className="px-2" aria-label={`Change the caption of ${label}`} onClick={() => setEditing(true)}>
            <Pencil aria-hidden="true" className="size-4" />
            Caption
          </Button>
          <Button
            variant="ghost"
            size="sm"
            className="px-2 text-oxide-600"
            aria-label={`Delete ${label}`}
            loading={remove.isPending}
            onClick={() => {
              if (window.confirm('Delete this photo? The client will no longer see it either.')) remove.mutateAsync(photo.id).then(() => toast.show('Photo deleted.'), fail);
            }}
          >
            <Trash2 aria-hidden="true" className="size-4" />
            Delete
          </Button>
        </div>
      )}
    </div>
  );
}

/** Thumbnails that open the lightbox; the studio also shares, captions and deletes here. */
export function PhotoGallery({
  studioId,
  photos,
  timezone,
  label,
  manage = false,
  download = false,
  describe,
}: {
  studioId: number;
  photos: Photo[];
  timezone: string;
  /** Names the list for assistive technology, e.g. "Photos of Prime". */
  label: string;
  manage?: boolean;
  download?: boolean;
  /** Extra words under a thumbnail (the figure or stage it shows). */
  describe?: (p: Photo) => string | null;
}) {
  const [open, setOpen] = useState<number | null>(null);
  if (photos.length === 0) return null;
  return (
    <>
      <ul aria-label={label} className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-4">
        {photos.map((p, i) => {
          const alt = photoAlt(p, i, photos.length);
          const extra = describe?.(p);
          return (
            <li key={p.id} className="flex flex-col gap-2 rounded-card border border-primer-300 bg-white p-2">
              <button type="button" onClick={() => setOpen(i)} className="overflow-hidden rounded-control" aria-label={`Open ${alt} larger`}>
                <img src={p.urls.thumb} alt="" loading="lazy" width={320} height={Math.round((320 * p.height) / Math.max(1, p.width))} className="aspect-[4/3] w-full bg-primer-100 object-cover" />
              </button>
              <div className="flex flex-wrap gap-1">
                {(manage || p.kind !== 'progress') && <Badge>{photoKindLabels[p.kind]}</Badge>}
                {!manage && p.kind === 'reference' && p.uploadedBy && <Badge tone="info">From {p.uploadedBy.name}</Badge>}
              </div>
              {p.caption && <p className="text-sm break-words">{p.caption}</p>}
              {extra && <p className="text-xs text-sable-600">{extra}</p>}
              {manage && <StudioControls studioId={studioId} photo={p} label={alt} />}
            </li>
          );
        })}
      </ul>
      <Lightbox photos={photos} index={open} onIndex={setOpen} onClose={() => setOpen(null)} timezone={timezone} download={download} />
    </>
  );
}
