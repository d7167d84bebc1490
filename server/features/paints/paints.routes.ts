import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import { createPaintInput, importPaintsInput, nearestQuery, paintListQuery, updatePaintInput, type NearestQuery, type PaintListQuery } from '../../../shared/schemas/paints';
import { arrayPage } from '../../lib/page';
import { member, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { PaintsService } from './paints.service';

const studioParams = z.object({ studioId: id });
const paintParams = z.object({ studioId: id, paintId: id });

/** The rack is the studio's: owners and painters keep it; clients never see it. */
export function paintsRoutes(r: RouteTable, deps: { allow: Allow; paints: PaintsService }) {
  const { allow, paints } = deps;
  const staff = () => allow('owner', 'painter');
  r.get('/studios/:studioId/paints', staff(), validate({ query: paintListQuery }), json(async (req, res) => arrayPage(res, await paints.list(member(req).studioId, query<PaintListQuery>(res)))));
  r.post('/studios/:studioId/paints', staff(), validate({ body: createPaintInput }), json((req) => paints.create(member(req).studioId, req.body), 201));
  r.get('/studios/:studioId/paints/export', staff(), validate({ params: studioParams }), async (req, res) => {
    const csv = await paints.exportCsv(member(req).studioId);
    res.set({ 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': 'attachment; filename="paint-rack.csv"', 'Cache-Control': 'no-store' });
    res.send(csv);
  });
  r.post('/studios/:studioId/paints/import', staff(), validate({ body: importPaintsInput }), json((req) => paints.importCsv(member(req).studioId, req.body.csv)));
  r.get('/studios/:studioId/paints/nearest', staff(), validate({ query: nearestQuery }), json((req, res) => {
    const q = query<NearestQuery>(res);
    return paints.nearest(member(req).studioId, q.hex, q.k);
  }));
  r.get('/studios/:studioId/paints/:paintId', staff(), validate({ params: paintParams }), json((req, res) => paints.get(member(req).studioId, params(res).paintId)));
  r.patch('/studios/:studioId/paints/:paintId', staff(), validate({ params: paintParams, body: updatePaintInput }), json((req, res) => paints.update(member(req).studioId, params(res).paintId, req.body)));
  r.delete('/studios/:studioId/paints/:paintId', staff(), validate({ params: paintParams }), json((req, res) => paints.remove(member(req).studioId, params(res).paintId)));
}
