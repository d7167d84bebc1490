import { useEffect, useRef, type KeyboardEvent } from 'react';
import { ChevronLeft, ChevronRight, Download, X } from 'lucide-react';
import type { Photo } from '../../../../shared/schemas/photos';
import { formatDateTime } from '../../../lib/format';

export function photoAlt(p: Photo, index: number, count: number): string {
  return p.caption ? p.caption : `Photo ${index + 1} of ${count}`;
}

/**
 * A full-screen viewer on the native <dialog>: arrow keys step through, Escape closes, and the opener
 * (the thumbnail) gets the focus back.
 */
export function Lightbox({
  photos,
  index,
  onIndex,
  onClose,
  timezone,
  download,
}: {
  photos: Photo[];
  index: number | null;
  onIndex: (i: number) => void;
  onClose: () => void;
  timezone: string;
  /** Offer the full-size original as a download. */
  download?: boolean;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const opener = useRef<HTMLElement | null>(null);
  const open = index !== null;

  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) {
      opener.current = document.activeElement instanceof HTMLElement ? document.activeElement : null;
      d.showModal();
    } else if (!open && d.open) {
      d.close();
    }
  }, [open]);

  const count = photos.length;
  const photo = index !== null ? photos[index] : null;

  function onKey(e: KeyboardEvent<HTMLDialogElement>) {
    if (index === null) return;
    if (e.key === 'ArrowRight' && count > 1) {
      e.preventDefault();
      onIndex((index + 1) % count);
    } else if (e.key === 'ArrowLeft' && count > 1) {
      e.preventDefault();
      onIndex((index - 1 + count) % count);
    }
  }

  return (
    <dialog
      ref={ref}
      aria-label={photo ? `Photo ${index! + 1} of ${count}` : 'Photo'}
      onKeyDown={onKey}
      onCancel={(e) => {
        e.preventDefault();
        onClose();
      }}
      onClose={() => {
        if (open) onClose();
        opener.current?.focus();
      }}
      onClick={(e) => {
        if (e.target === ref.current) onClose();
      }}
      className="m-auto h-dvh max-h-none w-dvw max-w-none bg-sable-900/95 p-0 text-white backdrop:bg-sable-900/80 [&_*:focus-visible]:outline-white"
    >
      {photo && (
        <div className="flex h-full flex-col">
          <div className="flex items-center justify-between gap-2 p-2 sm:p-3">
            <p className="figures text-sm">
              {index! + 1} / {count}
            </p>
            <div className="flex items-center gap-2">
              {download && (
                <a
                  href={`${photo.urls.original}?download=1`}
                  className="inline-flex min-h-10 items-center gap-2 rounded-control border border-white/60 px-3 text-sm text-white no-underline hover:bg-white/10"
                >
                  <Download aria-hidden="true" className="size-4" />
                  Download full size
                </a>
              )}
              <button type="button" onClick={onClose} aria-label="Close" autoFocus className="rounded-control p-2 hover:bg-white/10">
                <X aria-hidden="true" className="size-6" />
              </button>
            </div>
          </div>
          <div className="relative flex min-h-0 flex-1 items-center justify-center px-2">
            <img
              key={photo.id}
              src={photo.urls.medium}
              srcSet={`${photo.urls.thumb} 320w, ${photo.urls.medium} 1280w, ${photo.urls.large} 2560w`}
              sizes="100vw"
              alt={photoAlt(photo, index!, count)}
              className="max-h-full max-w-full object-contain"
            />
            {count > 1 && (
              <>
                <button
                  type="button"
                  aria-label="Previous photo"
                  onClick={() => onIndex((index! - 1 + count) % count)}
                  className="absolute top-1/2 left-2 -translate-y-1/2 rounded-full bg-sable-900/70 p-2 hover:bg-sable-900"
                >
                  <ChevronLeft aria-hidden="true" className="size-6" />
                </button>
                <button
                  type="button"
                  aria-label="Next photo"
                  onClick={() => onIndex((index! + 1) % count)}
                  className="absolute top-1/2 right-2 -translate-y-1/2 rounded-full bg-sable-900/70 p-2 hover:bg-sable-900"
                >
                  <ChevronRight aria-hidden="true" className="size-6" />
                </button>
              </>
            )}
          </div>
          <div className="p-3 text-center text-sm">
            {photo.caption && <p>{photo.caption}</p>}
            <p className="text-xs text-primer-300">
              {photo.uploadedBy ? `${photo.uploadedBy.name} · ` : ''}
              {formatDateTime(photo.createdAt, timezone)}
              {count > 1 && ' · use the arrow keys to move through the photos'}
            </p>
          </div>
        </div>
      )}
    </dialog>
  );
}
