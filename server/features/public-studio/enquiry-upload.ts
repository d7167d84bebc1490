import type { RequestHandler } from 'express';
import multer from 'multer';
import { ENQUIRY_MAX_PHOTO_BYTES, ENQUIRY_MAX_PHOTOS } from '../../../shared/schemas/enquiries';
import { AppError, errors } from '../../lib/errors';

const MB = ENQUIRY_MAX_PHOTO_BYTES / 1024 / 1024;

/**
 * The public enquiry form's multipart body: photos in field `photos`, kept in memory for sharp, with
 * the smaller caps for visitors who are not signed in (5 photos of 8 MB, a few short text fields).
 * A JSON body (no photos) passes through untouched.
 */
export function enquiryUpload(): RequestHandler {
  const parse = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: ENQUIRY_MAX_PHOTO_BYTES, files: ENQUIRY_MAX_PHOTOS, fields: 16, fieldSize: 16 * 1024, parts: ENQUIRY_MAX_PHOTOS + 16 },
  }).array('photos', ENQUIRY_MAX_PHOTOS);
  return (req, res, next) => {
    parse(req, res, (err?: unknown) => next(err ? uploadError(err) : undefined));
  };
}

function uploadError(err: unknown): unknown {
  if (!(err instanceof multer.MulterError)) return err instanceof Error && err.constructor === Error ? errors.invalid('The form could not be read; send it again.') : err;
  switch (err.code) {
    case 'LIMIT_FILE_SIZE':
      return new AppError(413, 'too_large', `A photo is over ${MB} MB; send a smaller one.`, { photos: `At most ${MB} MB per photo.` });
    case 'LIMIT_FILE_COUNT':
    case 'LIMIT_UNEXPECTED_FILE':
      return err.field && err.field !== 'photos'
        ? errors.field(err.field, 'Send photos in the photo field only.')
        : errors.field('photos', `Send at most ${ENQUIRY_MAX_PHOTOS} photos.`);
    case 'LIMIT_FIELD_VALUE':
      return errors.field(err.field ?? '_', 'That is far longer than the form allows.');
    default:
      return errors.invalid('The form has too many or too long fields.');
  }
}
