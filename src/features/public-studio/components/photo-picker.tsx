import { useEffect, useId, useRef, useState } from 'react';
import { CircleAlert, ImagePlus, X } from 'lucide-react';
import { Button } from '../../../components/ui/button';

export type PickedPhoto = { key: number; file: File; url: string };

/**
 * Reference photos for the enquiry: up to `max`, shown as small previews that can be taken out again.
 * The files are only read when the form is sent.
 */
export function PhotoPicker({ photos, onChange, max, error }: { photos: PickedPhoto[]; onChange: (p: PickedPhoto[]) => void; max: number; error?: string }) {
  const inputId = useId();
  const input = useRef<HTMLInputElement>(null);
  const nextKey = useRef(1);
  const [note, setNote] = useState<string | null>(null);
  const latest = useRef(photos);
  useEffect(() => {
    latest.current = photos;
  }, [photos]);

  // Preview addresses are released when the form goes away.
  useEffect(() => () => latest.current.forEach((p) => URL.revokeObjectURL(p.url)), []);

  function add(files: FileList | null) {
    if (!files?.length) return;
    const room = max - photos.length;
    const chosen = Array.from(files);
    const fits = chosen.slice(0, Math.max(0, room));
    setNote(chosen.length > room ? `At most ${max} photos; ${room > 0 ? `the first ${room} were added` : 'take one out to add another'}.` : null);
    onChange([...photos, ...fits.map((file) => ({ key: nextKey.current++, file, url: URL.createObjectURL(file) }))]);
    if (input.current) input.current.value = '';
  }

  function remove(key: number) {
    const p = photos.find((x) => x.key === key);
    if (p) URL.revokeObjectURL(p.url);
    onChange(photos.filter((x) => x.key !== key));
    setNote(null);
  }

  const message = error ?? note;
  return (
    <fieldset className="flex flex-col gap-2" aria-describedby={`${inputId}-hint${message ? ` ${inputId}-error` : ''}`}>
      <legend className="text-sm font-medium text-sable-900">
        Reference photos <span className="font-normal text-sable-600">(optional)</span>
      </legend>
      <p id={`${inputId}-hint`} className="text-xs text-sable-600">
        Up to {max} photos of the models or of schemes you like: JPEG, PNG or WebP. Large photos are scaled down before they are sent.
      </p>
      {photos.length > 0 && (
        <ul className="grid grid-cols-3 gap-2 sm:grid-cols-5" aria-label="Chosen photos">
          {photos.map((p, i) => (
            <li key={p.key} className="relative overflow-hidden rounded-control border border-primer-300 bg-white">
              <img src={p.url} alt={`Photo ${i + 1}: ${p.file.name}`} className="aspect-square w-full object-cover" />
              <button
                type="button"
                onClick={() => remove(p.key)}
                className="absolute top-1 right-1 rounded-full bg-bone-50 p-1 text-sable-900 shadow-raised hover:bg-primer-100"
                aria-label={`Remove photo ${i + 1} (${p.file.name})`}
              >
                <X aria-hidden="true" className="size-4" />
              </button>
            </li>
          ))}
        </ul>
      )}
      <div>
        <input
          ref={input}
          id={inputId}
          type="file"
          accept="image/jpeg,image/png,image/webp"
          multiple
          className="sr-only"
          onChange={(e) => add(e.target.files)}
          aria-label="Choose reference photos"
        />
        <Button variant="secondary" onClick={() => input.current?.click()} disabled={photos.length >= max}>
          <ImagePlus aria-hidden="true" className="size-4" />
          {photos.length ? 'Add more photos' : 'Choose photos'}
        </Button>
        <span className="ml-3 text-xs text-sable-600">
          {photos.length} of {max}
        </span>
      </div>
      {message && (
        <p id={`${inputId}-error`} className="flex items-start gap-1 text-sm text-oxide-600" role={error ? undefined : 'status'}>
          <CircleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0" />
          <span>{message}</span>
        </p>
      )}
    </fieldset>
  );
}
