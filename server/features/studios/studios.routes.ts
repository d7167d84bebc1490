import { z } from 'zod';
import { arrayPageParams, id, type PageParams } from '../../../shared/schemas/common';
import { inviteMemberInput, updateStudioInput } from '../../../shared/schemas/studios';
import { arrayPage } from '../../lib/page';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { InvitationsService } from '../invitations/invitations.service';
import type { StudiosService } from './studios.service';

const studioParams = z.object({ studioId: id });
const memberParams = studioParams.extend({ userId: id });
const invitationParams = studioParams.extend({ invitationId: id });

export function studiosRoutes(r: RouteTable, deps: { allow: Allow; studios: StudiosService; invitations: InvitationsService }) {
  const { allow, studios, invitations } = deps;
  r.get('/studios/:studioId', allow('owner', 'painter', 'client'), json((req) => studios.get(member(req).studioId, member(req).role)));
  r.patch('/studios/:studioId', allow('owner'), validate({ body: updateStudioInput }), json((req) => studios.update(member(req).studioId, req.body, 'owner')));
  r.get('/studios/:studioId/members', allow('owner'), validate({ query: arrayPageParams }), json(async (req, res) => arrayPage(res, await studios.members(member(req).studioId, query<PageParams>(res)))));
  r.delete('/studios/:studioId/members/:userId', allow('owner'), validate({ params: memberParams }), json((req, res) => studios.removeMember(member(req).studioId, params(res).userId)));
  r.get('/studios/:studioId/invitations', allow('owner'), validate({ query: arrayPageParams }), json(async (req, res) => arrayPage(res, await invitations.listPending(member(req).studioId, query<PageParams>(res)))));
  r.post('/studios/:studioId/invitations', allow('owner'), validate({ body: inviteMemberInput }), json((req) => invitations.inviteMember(member(req).studioId, user(req).id, req.body), 201));
  r.delete('/studios/:studioId/invitations/:invitationId', allow('owner'), validate({ params: invitationParams }), json((req, res) => invitations.revoke(member(req).studioId, params(res).invitationId)));
}
