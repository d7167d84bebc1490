import type { Request } from 'express';
import { z } from 'zod';
import { arrayPageParams, id, type PageParams } from '../../../shared/schemas/common';
import {
  commissionListQuery,
  createCommissionInput,
  schemeNotesInput,
  transitionInput,
  updateCommissionInput,
  type CommissionListQuery,
} from '../../../shared/schemas/commissions';
import { arrayPage } from '../../lib/page';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { CommissionsService } from './commissions.service';

const commissionParams = z.object({ studioId: id, commissionId: id });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function commissionsRoutes(r: RouteTable, deps: { allow: Allow; commissions: CommissionsService }) {
  const { allow, commissions } = deps;
  r.get('/studios/:studioId/commissions', allow('owner', 'painter', 'client'), validate({ query: commissionListQuery }), json((req, res) => commissions.list(actor(req), query<CommissionListQuery>(res))));
  r.post('/studios/:studioId/commissions', allow('owner'), validate({ body: createCommissionInput }), json((req) => commissions.create(actor(req), req.body), 201));
  r.get('/studios/:studioId/commissions/:commissionId', allow('owner', 'painter', 'client'), validate({ params: commissionParams }), json((req, res) => commissions.get(actor(req), params(res).commissionId)));
  r.patch('/studios/:studioId/commissions/:commissionId', allow('owner'), validate({ params: commissionParams, body: updateCommissionInput }), json((req, res) => commissions.update(actor(req), params(res).commissionId, req.body)));
  r.patch('/studios/:studioId/commissions/:commissionId/scheme-notes', allow('owner', 'client'), validate({ params: commissionParams, body: schemeNotesInput }), json((req, res) => commissions.setSchemeNotes(actor(req), params(res).commissionId, req.body)));
  r.post('/studios/:studioId/commissions/:commissionId/transitions', allow('owner'), validate({ params: commissionParams, body: transitionInput }), json((req, res) => commissions.transition(actor(req), params(res).commissionId, req.body)));
  r.get('/studios/:studioId/commissions/:commissionId/activity', allow('owner', 'painter'), validate({ params: commissionParams, query: arrayPageParams }), json(async (req, res) => arrayPage(res, await commissions.activity(actor(req), params(res).commissionId, query<PageParams>(res)))));
}
