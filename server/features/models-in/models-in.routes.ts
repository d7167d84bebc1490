import type { Request } from 'express';
import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import { modelsInInput, modelsNoticeInput } from '../../../shared/schemas/shipments';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { ModelsInService } from './models-in.service';

const commissionParams = z.object({ studioId: id, commissionId: id });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function modelsInRoutes(r: RouteTable, deps: { allow: Allow; modelsIn: ModelsInService }) {
  const { allow, modelsIn } = deps;
  r.get('/studios/:studioId/commissions/:commissionId/models-in', allow('owner', 'painter'), validate({ params: commissionParams }), json((req, res) => modelsIn.get(actor(req), params(res).commissionId)));
  r.put('/studios/:studioId/commissions/:commissionId/models-in', allow('owner', 'painter'), validate({ params: commissionParams, body: modelsInInput }), json((req, res) => modelsIn.save(actor(req), params(res).commissionId, req.body)));
  r.post('/studios/:studioId/commissions/:commissionId/models-in/notice', allow('owner'), validate({ params: commissionParams, body: modelsNoticeInput }), json((req, res) => modelsIn.notify(actor(req), params(res).commissionId, req.body)));
}
