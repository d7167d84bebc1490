import type { Request } from 'express';
import { z } from 'zod';
import { dayOffInput, setHoursInput } from '../../../shared/schemas/capacity';
import { id } from '../../../shared/schemas/common';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { CapacityService } from './capacity.service';

const painterParams = z.object({ studioId: id, painterId: id });
const dayOffParams = z.object({ studioId: id, dayOffId: id });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function capacityRoutes(r: RouteTable, deps: { allow: Allow; capacity: CapacityService }) {
  const { allow, capacity } = deps;
  r.get('/studios/:studioId/capacity', allow('owner', 'painter'), json((req) => capacity.view(actor(req))));
  r.put('/studios/:studioId/capacity/painters/:painterId/hours', allow('owner', 'painter'), validate({ params: painterParams, body: setHoursInput }), json((req, res) => capacity.setHours(actor(req), params(res).painterId, req.body)));
  r.post('/studios/:studioId/capacity/days-off', allow('owner', 'painter'), validate({ body: dayOffInput }), json((req) => capacity.addDayOff(actor(req), req.body), 201));
  r.delete('/studios/:studioId/capacity/days-off/:dayOffId', allow('owner', 'painter'), validate({ params: dayOffParams }), json((req, res) => capacity.removeDayOff(actor(req), params(res).dayOffId)));
}
