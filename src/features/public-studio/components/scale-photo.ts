import { ENQUIRY_MAX_PHOTO_BYTES } from '../../../../shared/schemas/enquiries';

const TYPES = ['image/jpeg', 'image/png', 'image/webp'];
/** Reference photos need no more than this on their longest side; smaller files send faster from a phone. */
const LONGEST_SIDE = 2560;

export class PhotoPickError extends Error {}

/**
 * A visitor's photo, made ready to send: turned upright and scaled to 2560 px on the longest side as a
 * JPEG when it is larger than that (or than the 8 MB cap). The server checks it again either way.
 */
export async function scalePhoto(file: File): Promise<{ blob: Blob; name: string }> {
  if (file.type && !TYPES.includes(file.type)) throw new PhotoPickError(`“${file.name}” is not a photo we can read — use JPEG, PNG or WebP.`);
  let bitmap: ImageBitmap;
  try {
    bitmap = await createImageBitmap(file, { imageOrientation: 'from-image' });
  } catch {
    if (file.size > ENQUIRY_MAX_PHOTO_BYTES) throw new PhotoPickError(`“${file.name}” is larger than 8 MB; send a smaller copy.`);
    return { blob: file, name: file.name };
  }
  try {
    const longest = Math.max(bitmap.width, bitmap.height);
    if (longest <= LONGEST_SIDE && file.size <= ENQUIRY_MAX_PHOTO_BYTES) return { blob: file, name: file.name };
    const scale = Math.min(1, LONGEST_SIDE / longest);
    const canvas = document.createElement('canvas');
    canvas.width = Math.max(1, Math.round(bitmap.width * scale));
    canvas.height = Math.max(1, Math.round(bitmap.height * scale));
    const ctx = canvas.getContext('2d');
    if (!ctx) return { blob: file, name: file.name };
    ctx.imageSmoothingQuality = 'high';
    ctx.drawImage(bitmap, 0, 0, canvas.width, canvas.height);
    const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, 'image/jpeg', 0.88));
    if (!blob) return { blob: file, name: file.name };
    return { blob, name: file.name.replace(/\.[^.]+$/, '') + '.jpg' };
  } finally {
    bitmap.close();
  }
}
