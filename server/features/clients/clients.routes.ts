import { z } from 'zod';
import { clientListQuery, createClientInput, updateClientInput, type ClientListQuery } from '../../../shared/schemas/clients';
import { id } from '../../../shared/schemas/common';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { InvitationsService } from '../invitations/invitations.service';
import type { ClientsService } from './clients.service';

const clientParams = z.object({ studioId: id, clientId: id });

export function clientsRoutes(r: RouteTable, deps: { allow: Allow; clients: ClientsService; invitations: InvitationsService }) {
  const { allow, clients, invitations } = deps;
  r.get('/studios/:studioId/clients', allow('owner', 'painter'), validate({ query: clientListQuery }), json((req, res) => clients.list(member(req).studioId, query<ClientListQuery>(res))));
  r.post('/studios/:studioId/clients', allow('owner'), validate({ body: createClientInput }), json((req) => clients.create(member(req).studioId, req.body), 201));
  r.get('/studios/:studioId/clients/:clientId', allow('owner', 'painter'), validate({ params: clientParams }), json((req, res) => clients.get(member(req).studioId, params(res).clientId)));
  r.patch('/studios/:studioId/clients/:clientId', allow('owner'), validate({ params: clientParams, body: updateClientInput }), json((req, res) => clients.update(member(req).studioId, params(res).clientId, req.body)));
  r.post('/studios/:studioId/clients/:clientId/invite', allow('owner'), validate({ params: clientParams }), json((req, res) => invitations.inviteClient(member(req).studioId, user(req).id, params(res).clientId), 201));
}
