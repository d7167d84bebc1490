import type { Request } from 'express';
import { earliestDeliveryQuery, queueOrderInput, scheduleQuery, type EarliestDeliveryQuery, type ScheduleQuery } from '../../../shared/schemas/schedule';
import { member, user, type Allow } from '../../lib/policy';
import { json, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { ScheduleService } from './schedule.service';

const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function scheduleRoutes(r: RouteTable, deps: { allow: Allow; schedule: ScheduleService }) {
  const { allow, schedule } = deps;
  r.get('/studios/:studioId/schedule', allow('owner', 'painter', 'client'), validate({ query: scheduleQuery }), json((req, res) => schedule.view(actor(req), query<ScheduleQuery>(res))));
  r.put('/studios/:studioId/schedule/queue', allow('owner'), validate({ body: queueOrderInput }), json((req) => schedule.reorder(actor(req), req.body)));
  r.get('/studios/:studioId/schedule/earliest-delivery', allow('owner'), validate({ query: earliestDeliveryQuery }), json((req, res) => schedule.earliestDelivery(actor(req), query<EarliestDeliveryQuery>(res))));
}
