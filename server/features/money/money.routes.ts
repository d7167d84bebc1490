import { member, type Allow } from '../../lib/policy';
import { json, type RouteTable } from '../../lib/routes';
import type { MoneyService } from './money.service';

export function moneyRoutes(r: RouteTable, deps: { allow: Allow; money: MoneyService }) {
  r.get('/studios/:studioId/money', deps.allow('owner'), json((req) => deps.money.view(member(req).studioId)));
}
