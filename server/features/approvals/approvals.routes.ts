import { z } from 'zod';
import { approveInput, requestApprovalInput, requestChangesInput } from '../../../shared/schemas/approvals';
import { arrayPageParams, id, type PageParams } from '../../../shared/schemas/common';
import { arrayPage } from '../../lib/page';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { ApprovalsService } from './approvals.service';

const commissionParams = z.object({ studioId: id, commissionId: id });
const approvalParams = z.object({ studioId: id, approvalId: id });

export function approvalsRoutes(r: RouteTable, deps: { allow: Allow; approvals: ApprovalsService }) {
  const { allow, approvals } = deps;
  r.get('/studios/:studioId/commissions/:commissionId/approvals', allow('owner', 'painter', 'client'), validate({ params: commissionParams, query: arrayPageParams }), json(async (req, res) => arrayPage(res, await approvals.list(member(req), params(res).commissionId, query<PageParams>(res)))));
  r.post('/studios/:studioId/commissions/:commissionId/approvals', allow('owner', 'painter'), validate({ params: commissionParams, body: requestApprovalInput }), json((req, res) => approvals.request(member(req), user(req), params(res).commissionId, req.body), 201));
  r.post('/studios/:studioId/approvals/:approvalId/approve', allow('client'), validate({ params: approvalParams, body: approveInput }), json((req, res) => approvals.approve(member(req), user(req), params(res).approvalId, req.body)));
  r.post('/studios/:studioId/approvals/:approvalId/request-changes', allow('client'), validate({ params: approvalParams, body: requestChangesInput }), json((req, res) => approvals.requestChanges(member(req), user(req), params(res).approvalId, req.body)));
}
