// Uploaded photos: sharp checks what the bytes really are, turns the picture upright by its EXIF
// orientation and writes new files that carry no metadata at all (no EXIF, GPS, XMP, IPTC or ICC
// profile: the pixels are converted to sRGB first). The uploaded bytes themselves are never kept.
import sharp, { type Metadata, type Sharp } from 'sharp';
import { MAX_PHOTO_PIXELS, renditionSides, type PhotoSize, type RenditionName } from '../../../shared/schemas/photos';
import { errors } from '../errors';

export const PHOTO_FORMATS = ['jpeg', 'png', 'webp'] as const;
export type PhotoFormat = (typeof PHOTO_FORMATS)[number];

export const contentTypes: Record<PhotoFormat, string> = { jpeg: 'image/jpeg', png: 'image/png', webp: 'image/webp' };
export const extensions: Record<PhotoFormat, string> = { jpeg: 'jpg', png: 'png', webp: 'webp' };

/**
 * For every response that sends a stored photo file. The bytes are always our own re-encoding, served as
 * image/* with nosniff; should a browser still open one as a document, it gets no script, plugin, form or
 * frame, and a unique origin (sandbox), so it can never act as the app.
 */
export const PHOTO_FILE_CSP = "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox";

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
  // Huffman-table optimisation makes a 24-megapixel JPEG about 4 × slower to write for a few per cent of size.
  original: {
    jpeg: (s: Sharp) => s.jpeg({ quality: 90, optimiseCoding: false }),
    png: (s: Sharp) => s.png({ compressionLevel: 6 }),
    webp: (s: Sharp) => s.webp({ quality: 90 }),
  } satisfies Record<PhotoFormat, (s: Sharp) => Sharp>,
  // Effort 2 of 6: well over twice as fast as the default 4 at 2560 px, for files a few per cent larger.
  rendition: (s: Sharp) => s.webp({ quality: 80, effort: 2 }),
};

const unsupported = () => errors.unsupported('That file is not a JPEG, PNG or WebP photo.');
const tooManyPixels = () =>
  errors.unprocessable(`That photo is over ${MAX_PHOTO_PIXELS / 1_000_000} megapixels; scale it down and send it again.`, {
    photos: `At most ${MAX_PHOTO_PIXELS / 1_000_000} megapixels.`,
  });

const isPixelLimit = (err: unknown) => /pixel limit/i.test(String((err as Error)?.message));

/**
 * Checks the content (not the name or the declared type) and the pixel count, from the header alone,
 * before anything is decoded.
 */
export async function inspectPhoto(input: Buffer): Promise<{ format: PhotoFormat; width: number; height: number }> {
  let meta: Metadata;
  try {
    // The limit here too: sharp's own default (about 268 megapixels) would otherwise fail a bigger
    // header first, and a decompression bomb would be called "not a photo" instead of "too large".
    meta = await sharp(input, { limitInputPixels: MAX_PHOTO_PIXELS }).metadata();
  } catch (err) {
    if (isPixelLimit(err)) throw tooManyPixels();
    throw unsupported();
  }
  const format = meta.format as PhotoFormat;
  if (!PHOTO_FORMATS.includes(format) || !meta.width || !meta.height) throw unsupported();
  if (meta.width * meta.height > MAX_PHOTO_PIXELS) throw tooManyPixels();
  const upright = meta.autoOrient ?? meta; // width and height after the EXIF turn
  return { format, width: upright.width, height: upright.height };
}

/**
 * The upright original plus WebP renditions (320, 1280, 2560 px on the longest side, never enlarged).
 * One sharp pipeline on the upload, with two clone()s running side by side: one writes the full-size
 * original, the other makes the 2560 px pixels, from which the three renditions are encoded in turn
 * (1280 and 320 px scaled from those, not from the upload). libvips decodes per clone, so the upload
 * is decoded twice, once in each branch, at the same time on the two cores (JPEG shrink-on-load does
 * not apply at these ratios). Decoding once into a full-size pixel buffer and making every output
 * from it was measured too: about a quarter less CPU in all, but the outputs can only start after
 * the decode, so one photo takes longer, and the buffer holds 70 MB more per 24-megapixel photo.
 */
export async function processPhoto(input: Buffer): Promise<ProcessedPhoto> {
  const { format, width, height } = await inspectPhoto(input);
  // Each rendition's size comes from the original's, so scaling 1280 and 320 from 2560 adds no rounding drift.
  const fit = (side: number) => {
    const k = Math.min(1, side / Math.max(width, height));
    return { width: Math.max(1, Math.round(width * k)), height: Math.max(1, Math.round(height * k)), fit: 'fill' as const };
  };
  const upright = sharp(input, { limitInputPixels: MAX_PHOTO_PIXELS, failOn: 'error' }).autoOrient().toColourspace('srgb');
  // The renditions one after another: three WebP encoders at once would hold their buffers (and, with
  // glibc, their threads' arenas) together for no gain on a machine the upload limit already keeps busy.
  const renditions = async () => {
    const large = await upright.clone().resize(fit(renditionSides.large)).raw({ depth: 'uchar' }).toBuffer({ resolveWithObject: true });
    const { channels } = large.info;
    const pixels = sharp(large.data, { raw: { width: large.info.width, height: large.info.height, channels: channels as 1 | 2 | 3 | 4 } });
    const out: Partial<Record<RenditionName, Buffer>> = {};
    for (const name of Object.keys(renditionSides) as RenditionName[]) {
      out[name] = await encoders.rendition(name === 'large' ? pixels.clone() : pixels.clone().resize(fit(renditionSides[name]))).toBuffer();
    }
    return out as Record<RenditionName, Buffer>;
  };
  try {
    const [original, made] = await Promise.all([encoders.original[format](upright.clone()).toBuffer({ resolveWithObject: true }), renditions()]);
    return { format, width: original.info.width, height: original.info.height, files: { original: original.data, ...made } };
  } catch (err) {
    if (isPixelLimit(err)) throw tooManyPixels();
    throw errors.unsupported('That photo is damaged or incomplete; try saving it again.');
  }
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
