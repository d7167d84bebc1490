import { z } from 'zod';
import { id } from './common';

// Limits both sides share: the browser scales photos down before sending, the server refuses the rest.
/** Largest file accepted per photo (413 above). */
export const MAX_PHOTO_BYTES = 25 * 1024 * 1024;
/** Most photos in one upload. */
export const MAX_PHOTOS_PER_UPLOAD = 10;
/** Largest photo in pixels (422 above); the browser scales down anything bigger before sending. */
export const MAX_PHOTO_PIXELS = 40_000_000;

export const photoKinds = ['progress', 'reference', 'condition', 'packing'] as const;
export type PhotoKind = (typeof photoKinds)[number];
export const photoKindLabels: Record<PhotoKind, string> = {
  progress: 'Progress',
  reference: 'Reference',
  condition: 'As received',
  packing: 'Packing',
};

/** Renditions by their longest side in pixels (never enlarged); "original" is the full-size upright copy. */
export const renditionSides = { thumb: 320, medium: 1280, large: 2560 } as const;
export type RenditionName = keyof typeof renditionSides;
export const photoSizes = ['thumb', 'medium', 'large', 'original'] as const;
export type PhotoSize = (typeof photoSizes)[number];

/** Multipart text fields arrive as strings; an empty field means "not given". */
const emptyToUndefined = (v: unknown) => (v === '' ? undefined : v);
const optionalId = z.preprocess(emptyToUndefined, id.optional());

/** The text fields that travel with the files (field `photos`) of an upload. */
export const uploadPhotosFields = z.object({
  kind: z.enum(photoKinds, { error: 'Choose what the photos show: progress, reference, condition or packing.' }),
  figureId: optionalId,
  stageId: optionalId,
  caption: z.preprocess(emptyToUndefined, z.string().trim().max(300, 'Use at most 300 characters.').optional()),
  shared: z.preprocess(emptyToUndefined, z.enum(['true', 'false'], { error: 'Use true or false.' }).optional()).transform((v) => v === 'true'),
});
export type UploadPhotosFields = z.infer<typeof uploadPhotosFields>;

export const updatePhotoInput = z.object({
  caption: z
    .string()
    .trim()
    .max(300, 'Use at most 300 characters.')
    .nullable()
    .optional()
    .transform((v) => (v === '' ? null : v)),
  shared: z.boolean({ error: 'Use true or false.' }).optional(),
});
export type UpdatePhotoInput = z.infer<typeof updatePhotoInput>;

export type Photo = {
  id: number;
  commissionId: number;
  figureId: number | null;
  stageId: number | null;
  kind: PhotoKind;
  caption: string | null;
  shared: boolean;
  width: number;
  height: number;
  uploadedBy: { id: number; name: string } | null;
  createdAt: string;
  urls: Record<PhotoSize, string>;
};

/** `?download=1` serves the file as an attachment (the client's "download full size"). */
export const photoFileQuery = z.object({ download: z.enum(['0', '1']).optional() });
