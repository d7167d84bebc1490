import { useId, useRef, useState, type DragEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { ImageUp } from 'lucide-react';
import { MAX_PHOTOS_PER_UPLOAD, photoKindLabels, type PhotoKind } from '../../../../shared/schemas/photos';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { cn } from '../../../lib/cn';
import { photosQueryOptions } from '../api/get-photos';
import { uploadPhoto } from '../api/upload-photos';
import { preparePhoto } from './prepare-photo';
import { Switch } from './switch';

export type FigureChoice = { id: number; name: string; stages: { id: number; name: string }[] };

type Item = { key: number; name: string; state: 'waiting' | 'scaling' | 'uploading' | 'done' | 'failed'; percent: number; message?: string };

/** Several large photos at once must not all decode and send together. */
const PARALLEL = 2;

export function PhotoUploader({
  studioId,
  commissionId,
  kinds,
  figures = [],
  fixed,
  defaultShared = false,
  allowShare = true,
  onUploaded,
  compact = false,
}: {
  studioId: number;
  commissionId: number;
  kinds: PhotoKind[];
  figures?: FigureChoice[];
  /** Figure and stage already known (from a bench card). */
  fixed?: { figureId: number; stageId?: number | null };
  defaultShared?: boolean;
  allowShare?: boolean;
  onUploaded?: (count: number) => void;
  compact?: boolean;
}) {
  const queryClient = useQueryClient();
  const inputId = useId();
  const input = useRef<HTMLInputElement>(null);
  const nextKey = useRef(1);
  const [kind, setKind] = useState<PhotoKind>(kinds[0]);
  const [figureId, setFigureId] = useState<number | ''>('');
  const [stageId, setStageId] = useState<number | ''>('');
  const [caption, setCaption] = useState('');
  const [shared, setShared] = useState(defaultShared);
  const [items, setItems] = useState<Item[]>([]);
  const [over, setOver] = useState(false);
  const [note, setNote] = useState<string | null>(null);

  const patch = (key: number, p: Partial<Item>) => setItems((all) => all.map((i) => (i.key === key ? { ...i, ...p } : i)));
  const stages = figures.find((f) => f.id === figureId)?.stages ?? [];

  async function send(files: File[]) {
    setNote(files.length > MAX_PHOTOS_PER_UPLOAD ? `The first ${MAX_PHOTOS_PER_UPLOAD} photos are going up; add the rest after.` : null);
    const batch = files.slice(0, MAX_PHOTOS_PER_UPLOAD).map((f) => ({ file: f, key: nextKey.current++ }));
    setItems((all) => [...all.filter((i) => i.state !== 'done'), ...batch.map((b) => ({ key: b.key, name: b.file.name, state: 'waiting' as const, percent: 0 }))]);
    const meta = {
      kind,
      figureId: fixed?.figureId ?? (figureId || null),
      stageId: fixed ? fixed.stageId : stageId || null,
      caption: caption.trim() || undefined,
      shared: allowShare ? shared : undefined,
    };
    let ok = 0;
    const queue = [...batch];
    async function worker() {
      for (let next = queue.shift(); next; next = queue.shift()) {
        const { file, key } = next;
        try {
          patch(key, { state: 'scaling' });
          const prepared = await preparePhoto(file);
          patch(key, { state: 'uploading', message: prepared.scaled ? 'Scaled down to 40 megapixels' : undefined });
          await uploadPhoto(studioId, commissionId, prepared.blob, prepared.name, meta, {
            onProgress: (p) => patch(key, { percent: Math.round((p.loaded / p.total) * 100) }),
          });
          patch(key, { state: 'done', percent: 100 });
          ok++;
        } catch (err) {
          patch(key, { state: 'failed', message: err instanceof Error ? err.message : 'That photo did not go up. Try again.' });
        }
      }
    }
    await Promise.all(Array.from({ length: PARALLEL }, worker));
    if (ok) {
      setCaption('');
      await queryClient.invalidateQueries({ queryKey: photosQueryOptions(studioId, commissionId).queryKey });
      onUploaded?.(ok);
    }
  }

  function onDrop(e: DragEvent) {
    e.preventDefault();
    setOver(false);
    const files = Array.from(e.dataTransfer.files);
    if (files.length) void send(files);
  }

  const busy = items.some((i) => i.state === 'waiting' || i.state === 'scaling' || i.state === 'uploading');

  return (
    <div className="flex flex-col gap-3">
      {!compact && (
        <div className="grid gap-3 sm:grid-cols-2">
          {kinds.length > 1 && (
            <SelectField label="What the photos show" value={kind} onChange={(e) => setKind(e.target.value as PhotoKind)}>
              {kinds.map((k) => (
                <option key={k} value={k}>
                  {photoKindLabels[k]}
                </option>
              ))}
            </SelectField>
          )}
          {!fixed && figures.length > 0 && (
            <SelectField
              label="Figure"
              optional
              value={figureId}
              onChange={(e) => {
                setFigureId(e.target.value ? Number(e.target.value) : '');
                setStageId('');
              }}
            >
              <option value="">The whole commission</option>
              {figures.map((f) => (
                <option key={f.id} value={f.id}>
                  {f.name}
                </option>
              ))}
            </SelectField>
          )}
          {!fixed && stages.length > 0 && (
            <SelectField label="Stage" optional value={stageId} onChange={(e) => setStageId(e.target.value ? Number(e.target.value) : '')}>
              <option value="">No particular stage</option>
              {stages.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </SelectField>
          )}
          <TextField label="Caption" optional maxLength={300} value={caption} onChange={(e) => setCaption(e.target.value)} />
          {allowShare && (
            <div className="flex items-end pb-2 sm:col-span-2">
              <Switch checked={shared} onChange={setShared} label="Shared with client" hint={shared ? 'The client sees these photos and gets an e-mail.' : 'Only the studio sees these photos.'} />
            </div>
          )}
        </div>
      )}
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={onDrop}
        className={cn(
          'flex flex-col items-center gap-2 rounded-card border-2 border-dashed p-4 text-center text-sm sm:p-6',
          over ? 'border-verdigris-600 bg-verdigris-100' : 'border-primer-300 bg-white',
        )}
      >
        <ImageUp aria-hidden="true" className="size-6 text-sable-600" />
        <p className="hidden sm:block">Drop photos here, or</p>
        <input
          ref={input}
          id={inputId}
          type="file"
          accept="image/jpeg,image/png,image/webp"
          multiple
          className="sr-only"
          onChange={(e) => {
            const files = Array.from(e.target.files ?? []);
            e.target.value = '';
            if (files.length) void send(files);
          }}
        />
        <label htmlFor={inputId} className="sr-only">
          Choose photos
        </label>
        <Button variant="secondary" size="sm" onClick={() => input.current?.click()} aria-describedby={`${inputId}-hint`}>
          Choose photos
        </Button>
        <p id={`${inputId}-hint`} className="text-xs text-sable-600">
          JPEG, PNG or WebP, up to 25 MB each, {MAX_PHOTOS_PER_UPLOAD} at a time. Very large photos are scaled down first.
        </p>
      </div>
      {note && <p className="text-sm">{note}</p>}
      {items.length > 0 && (
        <ul aria-label="Uploads" aria-busy={busy} className="flex flex-col gap-2">
          {items.map((i) => (
            <li key={i.key} className="flex flex-col gap-1 text-sm">
              <div className="flex flex-wrap justify-between gap-2">
                <span className="min-w-0 truncate">{i.name}</span>
                <span className={cn('figures', i.state === 'failed' ? 'text-oxide-600' : 'text-sable-600')}>
                  {i.state === 'waiting' && 'Waiting'}
                  {i.state === 'scaling' && 'Getting ready'}
                  {i.state === 'uploading' && `${i.percent} %`}
                  {i.state === 'done' && 'Uploaded'}
                  {i.state === 'failed' && 'Not uploaded'}
                </span>
              </div>
              <progress
                aria-label={`Upload of ${i.name}`}
                max={100}
                value={i.percent}
                className={cn(
                  'h-1.5 w-full overflow-hidden rounded-full [&::-webkit-progress-bar]:bg-primer-300',
                  i.state === 'failed' ? '[&::-moz-progress-bar]:bg-oxide-600 [&::-webkit-progress-value]:bg-oxide-600' : '[&::-moz-progress-bar]:bg-verdigris-600 [&::-webkit-progress-value]:bg-verdigris-600',
                )}
              />
              {i.message && <span className={cn('text-xs', i.state === 'failed' ? 'text-oxide-600' : 'text-sable-600')}>{i.message}</span>}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
