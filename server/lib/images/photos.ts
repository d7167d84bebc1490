// Uploaded photos: sharp checks what the bytes really are, decodes once, turns the picture upright by
// its EXIF orientation and writes new files that carry no metadata at all (no EXIF, GPS, XMP, IPTC or
// ICC profile: the pixels are converted to sRGB first). The uploaded bytes themselves are never kept.
import sharp, { type Metadata, type OutputInfo, type Sharp } from 'sharp';
import { MAX_PHOTO_PIXELS, renditionSides, type PhotoSize, type RenditionName } from '../../../shared/schemas/photos';
import { errors } from '../errors';

export const PHOTO_FORMATS = ['jpeg', 'png', 'webp'] as const;
export type PhotoFormat = (typeof PHOTO_FORMATS)[number];

export const contentTypes: Record<PhotoFormat, string> = { jpeg: 'image/jpeg', png: 'image/png', webp: 'image/webp' };
export const extensions: Record<PhotoFormat, string> = { jpeg: 'jpg', png: 'png', webp: 'webp' };

export type ProcessedPhoto = {
  /** Format of the stored original (the upload's own); renditions are WebP. */
  format: PhotoFormat;
  /** Size of the upright original. */
  width: number;
  height: number;
  files: Record<PhotoSize, Buffer>;
};

/** Encoder settings, kept together so the benchmark measures exactly what uploads do. */
export const encoders = {
  original: {
    jpeg: (s: Sharp) => s.jpeg({ quality: 90 }),
    png: (s: Sharp) => s.png({ compressionLevel: 6 }),
    webp: (s: Sharp) => s.webp({ quality: 90 }),
  } satisfies Record<PhotoFormat, (s: Sharp) => Sharp>,
  rendition: (s: Sharp) => s.webp({ quality: 80, effort: 2 }),
};

const unsupported = () => errors.unsupported('That file is not a JPEG, PNG or WebP photo.');
const tooManyPixels = () =>
  errors.unprocessable(`That photo is over ${MAX_PHOTO_PIXELS / 1_000_000} megapixels; scale it down and send it again.`, {
    photos: `At most ${MAX_PHOTO_PIXELS / 1_000_000} megapixels.`,
  });

/**
 * Checks the content (not the name or the declared type) and the pixel count, from the header alone,
 * before anything is decoded.
 */
export async function inspectPhoto(input: Buffer): Promise<{ format: PhotoFormat; width: number; height: number }> {
  let meta: Metadata;
  try {
    meta = await sharp(input).metadata();
  } catch {
    throw unsupported();
  }
  const format = meta.format as PhotoFormat;
  if (!PHOTO_FORMATS.includes(format) || !meta.width || !meta.height) throw unsupported();
  if (meta.width * meta.height > MAX_PHOTO_PIXELS) throw tooManyPixels();
  return { format, width: meta.width, height: meta.height };
}

/**
 * The upright original plus WebP renditions (320, 1280, 2560 px on the longest side, never enlarged).
 * One decode: the upload is decoded once to raw sRGB pixels, and every output is a clone() of one
 * pipeline on those pixels. The larger renditions are made first and the smaller ones from them, so
 * no resize starts from the full-size picture twice.
 */
export async function processPhoto(input: Buffer): Promise<ProcessedPhoto> {
  const { format } = await inspectPhoto(input);
  let decoded: { data: Buffer; info: OutputInfo };
  try {
    decoded = await sharp(input, { limitInputPixels: MAX_PHOTO_PIXELS, failOn: 'error' })
      .autoOrient()
      .toColourspace('srgb')
      .raw({ depth: 'uchar' })
      .toBuffer({ resolveWithObject: true });
  } catch (err) {
    if (/pixel limit/i.test(String((err as Error)?.message))) throw tooManyPixels();
    throw errors.unsupported('That photo is damaged or incomplete; try saving it again.');
  }
  const { width, height, channels } = decoded.info;
  const pixels = sharp(decoded.data, { raw: { width, height, channels: channels as 1 | 2 | 3 | 4 } });
  const fit = (side: number) => ({ width: side, height: side, fit: 'inside' as const, withoutEnlargement: true });

  const original = encoders.original[format](pixels.clone()).toBuffer();
  const renditions = Promise.all(
    (Object.keys(renditionSides) as RenditionName[]).map(async (name) => {
      const side = renditionSides[name];
      return [name, await encoders.rendition(pixels.clone().resize(fit(side))).toBuffer()] as const;
    }),
  );
  const [orig, made] = await Promise.all([original, renditions]);
  return { format, width, height, files: { original: orig, ...Object.fromEntries(made) } as Record<PhotoSize, Buffer> };
}

/**
 * Process-wide sharp settings for a server that decodes uploads: no operation cache (an upload is
 * never processed twice, and the cache would keep up to 50 MB of pixels alive) and one libvips worker
 * thread per pipeline, so that two photos at once (the upload limit) keep both cores busy through
 * their parallel outputs without oversubscribing them.
 */
export function tuneSharpForUploads() {
  sharp.cache(false);
  sharp.concurrency(1);
}
