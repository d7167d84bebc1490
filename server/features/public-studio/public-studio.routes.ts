import type { RequestHandler } from 'express';
import { z } from 'zod';
import { enquiryMultipartFields, publicPageInput } from '../../../shared/schemas/enquiries';
import { member, publicRoute, type Allow } from '../../lib/policy';
import { json, params, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { PublicStudioRow } from './public-studio.repository';
import type { PublicStudioService } from './public-studio.service';
import { enquiryUpload } from './enquiry-upload';

const slugParams = z.object({ slug: z.string().trim().toLowerCase().regex(/^[a-z0-9-]{1,48}$/) });

export function publicStudioRoutes(r: RouteTable, deps: { allow: Allow; publicStudio: PublicStudioService }) {
  const { allow, publicStudio } = deps;
  const address = (req: Parameters<RequestHandler>[0]) => req.ip ?? req.socket.remoteAddress ?? 'unknown';

  // The page must be on and the address within its limits before any upload is read.
  const gate: RequestHandler = async (req, res, next) => {
    res.locals.studio = await publicStudio.gate(params<{ slug: string }>(res).slug, address(req));
    next();
  };

  r.get('/public/studios/:slug', publicRoute(), validate({ params: slugParams }), json((_req, res) => publicStudio.page(params<{ slug: string }>(res).slug)));
  r.post('/public/studios/:slug/enquiries', publicRoute(), validate({ params: slugParams }), gate, enquiryUpload(), validate({ body: enquiryMultipartFields }), json((req, res) => publicStudio.submit(res.locals.studio as PublicStudioRow, address(req), req.body, (req.files as Express.Multer.File[] | undefined) ?? []), 201));
  r.get('/studios/:studioId/public-page', allow('owner'), json((req) => publicStudio.settings(member(req).studioId)));
  r.put('/studios/:studioId/public-page', allow('owner'), validate({ body: publicPageInput }), json((req) => publicStudio.saveSettings(member(req).studioId, req.body)));
}
