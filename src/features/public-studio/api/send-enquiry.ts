import { useMutation } from '@tanstack/react-query';
import type { EnquiryFormValues, EnquiryReceived } from '../../../../shared/schemas/enquiries';
import { upload, type UploadProgress } from '../../../lib/api-client';

export type EnquiryPhotoFile = { blob: Blob; name: string };

/** The form as multipart: the lists travel as JSON text, the photos in field `photos`. */
export function sendEnquiry(slug: string, values: EnquiryFormValues, photos: EnquiryPhotoFile[], opts: { onProgress?: (p: UploadProgress) => void } = {}): Promise<EnquiryReceived> {
  const form = new FormData();
  form.set('name', values.name ?? '');
  form.set('email', values.email ?? '');
  form.set('figures', JSON.stringify(values.figures ?? []));
  if (values.tier) form.set('tier', String(values.tier));
  form.set('extras', JSON.stringify(values.extras ?? []));
  if (values.dueDate) form.set('dueDate', String(values.dueDate));
  if (values.budget) form.set('budget', String(values.budget));
  if (values.notes) form.set('notes', String(values.notes));
  form.set('consent', values.consent === true ? 'true' : 'false');
  if (values.website) form.set('website', String(values.website));
  for (const p of photos) form.append('photos', p.blob, p.name);
  return upload<EnquiryReceived>(`/api/public/studios/${encodeURIComponent(slug)}/enquiries`, form, opts);
}

export function useSendEnquiry(slug: string) {
  return useMutation({
    mutationFn: (input: { values: EnquiryFormValues; photos: EnquiryPhotoFile[]; onProgress?: (p: UploadProgress) => void }) =>
      sendEnquiry(slug, input.values, input.photos, { onProgress: input.onProgress }),
  });
}
