import { pipeline } from 'node:stream/promises';
import type { RequestHandler } from 'express';
import { z } from 'zod';
import { arrayPageParams, id, type PageParams } from '../../../shared/schemas/common';
import { photoFileQuery, photoSizes, updatePhotoInput, uploadPhotosFields, type PhotoSize } from '../../../shared/schemas/photos';
import { errors } from '../../lib/errors';
import { PHOTO_FILE_CSP } from '../../lib/images/photos';
import { arrayPage } from '../../lib/page';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { photoUpload } from '../../lib/upload';
import { validate } from '../../lib/validate';
import type { PhotosService } from './photos.service';

const commissionParams = z.object({ studioId: id, commissionId: id });
const photoParams = z.object({ studioId: id, photoId: id });
const fileParams = photoParams.extend({ size: z.enum(photoSizes) });

/** Files may sit in the browser's own cache for an hour; after that, or on reload, the ETag answers 304. */
const CACHE_CONTROL = 'private, max-age=3600';

export function photosRoutes(r: RouteTable, deps: { allow: Allow; photos: PhotosService }) {
  const { allow, photos } = deps;

  // Checked before the body is read, so a caller who may not upload here never gets 25 MB × 10 parsed.
  const commissionGate: RequestHandler = async (req, res, next) => {
    await photos.commissionFor(member(req), params(res).commissionId);
    next();
  };

  const serve: RequestHandler = async (req, res) => {
    const p = params<{ photoId: number; size: PhotoSize }>(res);
    const f = await photos.file(member(req), user(req).id, p.photoId, p.size);
    const disposition = query<{ download?: string }>(res).download === '1' ? 'attachment' : 'inline';
    res.set({ ETag: f.etag, 'Cache-Control': CACHE_CONTROL, 'Content-Type': f.contentType, 'Content-Disposition': `${disposition}; filename="${f.filename}"`, 'Content-Security-Policy': PHOTO_FILE_CSP });
    if (req.fresh) {
      res.status(304).end();
      return;
    }
    const file = await f.open();
    if (!file) {
      req.log.error({ photoId: p.photoId, size: p.size }, 'photo file missing from storage');
      throw errors.notFound('That photo');
    }
    res.set('Content-Length', String(file.size));
    await pipeline(file.stream, res).catch((err) => req.log.warn({ err }, 'photo download cut off'));
  };

  r.get('/studios/:studioId/commissions/:commissionId/photos', allow('owner', 'painter', 'client'), validate({ params: commissionParams, query: arrayPageParams }), json(async (req, res) => arrayPage(res, await photos.list(member(req), user(req).id, params(res).commissionId, query<PageParams>(res)))));
  r.post('/studios/:studioId/commissions/:commissionId/photos', allow('owner', 'painter', 'client'), validate({ params: commissionParams }), commissionGate, photoUpload('photos'), validate({ body: uploadPhotosFields }), json((req, res) => photos.upload(member(req), user(req), params(res).commissionId, req.body, (req.files as Express.Multer.File[] | undefined) ?? []), 201));
  r.get('/studios/:studioId/photos/:photoId/:size', allow('owner', 'painter', 'client'), validate({ params: fileParams, query: photoFileQuery }), serve);
  r.patch('/studios/:studioId/photos/:photoId', allow('owner', 'painter'), validate({ params: photoParams, body: updatePhotoInput }), json((req, res) => photos.update(member(req), user(req), params(res).photoId, req.body)));
  r.delete('/studios/:studioId/photos/:photoId', allow('owner', 'painter'), validate({ params: photoParams }), json((req, res) => photos.remove(member(req), user(req).id, params(res).photoId)));
}
