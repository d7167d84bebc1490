import type { Request } from 'express';
import { earliestDeliveryQuery, queueOrderInput, scheduleQuery, type EarliestDeliveryQuery, type ScheduleQuery } from '../../../shared/schemas/schedule';
import { member, user, type Allow } from '../../lib/policy';
import { json, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { ScheduleService } from './schedule.service';

const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function scheduleRoutes(r: RouteTable, deps: { allow: Allow; schedule: ScheduleService }) {
  const { allow, schedule } = deps;
  // The answer's JSON text comes from the service (the team's is kept beside the run it was worked out from).
  r.get('/studios/:studioId/schedule', allow('owner', 'painter', 'client'), validate({ query: scheduleQuery }), async (req, res) => {
    const text = await schedule.viewJson(actor(req), query<ScheduleQuery>(res));
    res.status(200).type('json').send(text);
  });
  r.put('/studios/:studioId/schedule/queue', allow('owner'), validate({ body: queueOrderInput }), json((req) => schedule.reorder(actor(req), req.body)));
  r.get('/studios/:studioId/schedule/earliest-delivery', allow('owner'), validate({ query: earliestDeliveryQuery }), json((req, res) => schedule.earliestDelivery(actor(req), query<EarliestDeliveryQuery>(res))));
}
