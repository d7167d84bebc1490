import { pipeline } from 'node:stream/promises';
import type { Request, RequestHandler } from 'express';
import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import { acceptEnquiryInput, declineEnquiryInput, enquiryListQuery, type EnquiryListQuery } from '../../../shared/schemas/enquiries';
import { photoSizes, type PhotoSize } from '../../../shared/schemas/photos';
import { errors } from '../../lib/errors';
import { PHOTO_FILE_CSP } from '../../lib/images/photos';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { EnquiriesService } from './enquiries.service';

const enquiryParams = z.object({ studioId: id, enquiryId: id });
const photoParams = enquiryParams.extend({ enquiryPhotoId: id, size: z.enum(photoSizes) });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function enquiriesRoutes(r: RouteTable, deps: { allow: Allow; enquiries: EnquiriesService }) {
  const { allow, enquiries } = deps;

  const servePhoto: RequestHandler = async (req, res) => {
    const p = params<{ enquiryId: number; enquiryPhotoId: number; size: PhotoSize }>(res);
    const f = await enquiries.photoFile(actor(req), p.enquiryId, p.enquiryPhotoId, p.size);
    res.set({ ETag: f.etag, 'Cache-Control': 'private, max-age=3600', 'Content-Type': f.contentType, 'Content-Disposition': `inline; filename="${f.filename}"`, 'Content-Security-Policy': PHOTO_FILE_CSP });
    if (req.fresh) {
      res.status(304).end();
      return;
    }
    const file = await f.open();
    if (!file) throw errors.notFound('That photo');
    res.set('Content-Length', String(file.size));
    await pipeline(file.stream, res).catch((err) => req.log.warn({ err }, 'enquiry photo download cut off'));
  };

  r.get('/studios/:studioId/enquiries', allow('owner'), validate({ query: enquiryListQuery }), json((req, res) => enquiries.list(actor(req), query<EnquiryListQuery>(res))));
  r.get('/studios/:studioId/enquiries/:enquiryId', allow('owner'), validate({ params: enquiryParams }), json((req, res) => enquiries.view(actor(req), params(res).enquiryId)));
  r.get('/studios/:studioId/enquiries/:enquiryId/photos/:enquiryPhotoId/:size', allow('owner'), validate({ params: photoParams }), servePhoto);
  r.post('/studios/:studioId/enquiries/:enquiryId/accept', allow('owner'), validate({ params: enquiryParams, body: acceptEnquiryInput }), json((req, res) => enquiries.accept(actor(req), params(res).enquiryId, req.body), 201));
  r.post('/studios/:studioId/enquiries/:enquiryId/decline', allow('owner'), validate({ params: enquiryParams, body: declineEnquiryInput }), json((req, res) => enquiries.decline(actor(req), params(res).enquiryId, req.body)));
}
