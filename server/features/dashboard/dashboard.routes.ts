import type { Request } from 'express';
import { member, user, type Allow } from '../../lib/policy';
import { json, type RouteTable } from '../../lib/routes';
import type { DashboardService } from './dashboard.service';

const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

/** One home page per role: the answer's `role` says which (a client only ever sees their own commissions). */
export function dashboardRoutes(r: RouteTable, deps: { allow: Allow; dashboard: DashboardService }) {
  const { allow, dashboard } = deps;
  r.get('/studios/:studioId/dashboard', allow('owner', 'painter', 'client'), json((req) => dashboard.get(actor(req))));
}
