import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import { pointQuery, type PointQuery } from '../../../shared/schemas/paints';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { PaletteService } from './palette.service';

const photoParams = z.object({ studioId: id, referencePhotoId: id });

/** Matches name the rack's paints, so only the studio sees them; the client sees the photo and the scheme. */
export function paletteRoutes(r: RouteTable, deps: { allow: Allow; palette: PaletteService }) {
  const { allow, palette } = deps;
  r.get('/studios/:studioId/reference-photos/:referencePhotoId/palette', allow('owner', 'painter'), validate({ params: photoParams }), json((req, res) => palette.palette(member(req), user(req).id, params(res).referencePhotoId)));
  r.get('/studios/:studioId/reference-photos/:referencePhotoId/point', allow('owner', 'painter'), validate({ params: photoParams, query: pointQuery }), json((req, res) => {
    const q = query<PointQuery>(res);
    return palette.point(member(req), user(req).id, params(res).referencePhotoId, q.x, q.y);
  }));
}
