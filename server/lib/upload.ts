import type { RequestHandler } from 'express';
import multer from 'multer';
import { MAX_PHOTO_BYTES, MAX_PHOTOS_PER_UPLOAD } from '../../shared/schemas/photos';
import { AppError, errors } from './errors';

/**
 * Multipart photo uploads, field `photos`, kept in memory (they go straight to sharp; nothing touches
 * the disk until the processed files are written). Limits: 25 MB per file, 10 files, a few small text
 * fields. The route's policy and commission check run before this, so strangers never get a body read.
 */
export function photoUpload(field = 'photos'): RequestHandler {
  const parse = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: MAX_PHOTO_BYTES, files: MAX_PHOTOS_PER_UPLOAD, fields: 20, fieldSize: 8 * 1024, parts: MAX_PHOTOS_PER_UPLOAD + 20 },
  }).array(field, MAX_PHOTOS_PER_UPLOAD);
  return (req, res, next) => {
    parse(req, res, (err?: unknown) => next(err ? uploadError(err, field) : undefined));
  };
}

function uploadError(err: unknown, field: string): unknown {
  // busboy reports a malformed body (cut off, bad boundary) with plain Errors.
  if (!(err instanceof multer.MulterError)) return err instanceof Error && err.constructor === Error ? errors.invalid('The upload could not be read.') : err;
  switch (err.code) {
    case 'LIMIT_FILE_SIZE':
      return new AppError(413, 'too_large', `A photo is over ${MAX_PHOTO_BYTES / 1024 / 1024} MB; send a smaller one.`, { [field]: `At most ${MAX_PHOTO_BYTES / 1024 / 1024} MB per photo.` });
    case 'LIMIT_FILE_COUNT':
      return errors.field(field, `Send at most ${MAX_PHOTOS_PER_UPLOAD} photos at once.`);
    case 'LIMIT_UNEXPECTED_FILE':
      return errors.field(err.field ?? field, `Send the photos in the field "${field}".`);
    default:
      return errors.invalid('The upload has too many or too large fields.');
  }
}

/**
 * At most `concurrency` jobs run at once; the rest wait in order. Image decoding holds the whole
 * picture in memory (a 24-megapixel photo is about 70 MB of pixels), so this bounds the memory that
 * uploads can take however many arrive together. A queue longer than `maxQueue` is refused with 429
 * rather than piling up more uploaded bytes.
 */
export function createLimiter(concurrency: number, maxQueue = 100) {
  let active = 0;
  const waiting: (() => void)[] = [];
  return {
    async run<T>(job: () => Promise<T>): Promise<T> {
      if (active < concurrency) active++;
      else {
        if (waiting.length >= maxQueue) throw errors.throttled(10);
        // The finishing job hands its slot straight to the first in line, so `active` never overshoots.
        await new Promise<void>((resolve) => waiting.push(resolve));
      }
      try {
        return await job();
      } finally {
        const next = waiting.shift();
        if (next) next();
        else active--;
      }
    },
    get active() {
      return active;
    },
    get waiting() {
      return waiting.length;
    },
  };
}

export type Limiter = ReturnType<typeof createLimiter>;
