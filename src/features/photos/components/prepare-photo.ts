import { MAX_PHOTO_BYTES, MAX_PHOTO_PIXELS } from '../../../../shared/schemas/photos';

export class PhotoProblem extends Error {}

const TYPES = ['image/jpeg', 'image/png', 'image/webp'];
const MB = (n: number) => `${Math.round(n / 1024 / 1024)} MB`;

function encode(bitmap: ImageBitmap, width: number, height: number, type: string, quality: number): Promise<Blob> {
  const canvas = document.createElement('canvas');
  canvas.width = width;
  canvas.height = height;
  const ctx = canvas.getContext('2d');
  if (!ctx) return Promise.reject(new PhotoProblem('This browser cannot scale photos down. Make it smaller than 40 megapixels and try again.'));
  ctx.imageSmoothingQuality = 'high';
  ctx.drawImage(bitmap, 0, 0, width, height);
  return new Promise((resolve, reject) =>
    canvas.toBlob((b) => (b ? resolve(b) : reject(new PhotoProblem('The photo could not be scaled down here. Try a smaller copy.'))), type, quality),
  );
}

const rename = (name: string, type: string) => name.replace(/\.[^.]+$/, '') + (type === 'image/png' ? '.png' : type === 'image/webp' ? '.webp' : '.jpg');

/**
 * What goes up for one chosen file. The server refuses photos over 40 megapixels (422) and files over
 * 25 MB (413), so a bigger photo is scaled down here first (createImageBitmap + canvas, turned upright
 * by its EXIF orientation); a file still too large is re-encoded as JPEG.
 */
export async function preparePhoto(file: File): Promise<{ blob: Blob; name: string; scaled: boolean }> {
  if (file.type && !TYPES.includes(file.type)) {
    throw new PhotoProblem('That file is not a photo we can read — use JPEG, PNG or WebP.');
  }
  let bitmap: ImageBitmap;
  try {
    bitmap = await createImageBitmap(file, { imageOrientation: 'from-image' });
  } catch {
    // The server has the last word on what the file is.
    if (file.size > MAX_PHOTO_BYTES) throw new PhotoProblem(`That file is ${MB(file.size)}; photos can be up to 25 MB.`);
    return { blob: file, name: file.name, scaled: false };
  }
  try {
    const pixels = bitmap.width * bitmap.height;
    if (pixels <= MAX_PHOTO_PIXELS && file.size <= MAX_PHOTO_BYTES) return { blob: file, name: file.name, scaled: false };
    const scale = pixels > MAX_PHOTO_PIXELS ? Math.sqrt((MAX_PHOTO_PIXELS * 0.98) / pixels) : 1;
    const w = Math.max(1, Math.floor(bitmap.width * scale));
    const h = Math.max(1, Math.floor(bitmap.height * scale));
    const type = TYPES.includes(file.type) ? file.type : 'image/jpeg';
    let blob = await encode(bitmap, w, h, type, 0.92);
    if (blob.size > MAX_PHOTO_BYTES) blob = await encode(bitmap, w, h, 'image/jpeg', 0.88);
    if (blob.size > MAX_PHOTO_BYTES) throw new PhotoProblem('Even scaled down, that photo is over 25 MB. Save a smaller copy and try again.');
    return { blob, name: rename(file.name, blob.type || 'image/jpeg'), scaled: true };
  } finally {
    bitmap.close();
  }
}
