import type { Photo, PhotoKind } from '../../../../shared/schemas/photos';
import { upload, type UploadProgress } from '../../../lib/api-client';

export type UploadMeta = { kind: PhotoKind; figureId?: number | null; stageId?: number | null; caption?: string; shared?: boolean };

/** One request per file, so each file has its own progress bar and its own error. */
export function uploadPhoto(
  studioId: number,
  commissionId: number,
  file: Blob,
  name: string,
  meta: UploadMeta,
  opts: { onProgress?: (p: UploadProgress) => void; signal?: AbortSignal } = {},
): Promise<Photo[]> {
  const form = new FormData();
  form.set('kind', meta.kind);
  if (meta.figureId) form.set('figureId', String(meta.figureId));
  if (meta.stageId) form.set('stageId', String(meta.stageId));
  if (meta.caption) form.set('caption', meta.caption);
  if (meta.shared !== undefined) form.set('shared', meta.shared ? 'true' : 'false');
  form.append('photos', file, name);
  return upload<Photo[]>(`/api/studios/${studioId}/commissions/${commissionId}/photos`, form, opts);
}
