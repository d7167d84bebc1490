import type { Request } from 'express';
import { z } from 'zod';
import { arrayPageParams, id, type PageParams } from '../../../shared/schemas/common';
import { manualTimeInput, updateTimeInput } from '../../../shared/schemas/commissions';
import { arrayPage } from '../../lib/page';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { TimeService } from './time.service';

const stageParams = z.object({ studioId: id, stageId: id });
const entryParams = z.object({ studioId: id, entryId: id });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function timeRoutes(r: RouteTable, deps: { allow: Allow; time: TimeService }) {
  const { allow, time } = deps;
  r.get('/studios/:studioId/stages/:stageId/time', allow('owner', 'painter'), validate({ params: stageParams, query: arrayPageParams }), json(async (req, res) => arrayPage(res, await time.listForStage(actor(req), params(res).stageId, query<PageParams>(res)))));
  r.post('/studios/:studioId/stages/:stageId/time', allow('owner', 'painter'), validate({ params: stageParams, body: manualTimeInput }), json((req, res) => time.addManual(actor(req), params(res).stageId, req.body), 201));
  r.post('/studios/:studioId/stages/:stageId/timer', allow('owner', 'painter'), validate({ params: stageParams }), json((req, res) => time.start(actor(req), params(res).stageId), 201));
  r.get('/studios/:studioId/timer', allow('owner', 'painter'), json((req) => time.running(actor(req))));
  r.post('/studios/:studioId/timer/stop', allow('owner', 'painter'), json((req) => time.stop(actor(req))));
  r.patch('/studios/:studioId/time/:entryId', allow('owner', 'painter'), validate({ params: entryParams, body: updateTimeInput }), json((req, res) => time.update(actor(req), params(res).entryId, req.body)));
  r.delete('/studios/:studioId/time/:entryId', allow('owner', 'painter'), validate({ params: entryParams }), json((req, res) => time.remove(actor(req), params(res).entryId)));
}
