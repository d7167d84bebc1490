import { booksSettingsInput, earningsQuery, type EarningsQuery } from '../../../shared/schemas/reports';
import { member, type Allow } from '../../lib/policy';
import { json, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { ReportsService } from './reports.service';

// The books are money and the studio's own performance: owners only.
export function reportsRoutes(r: RouteTable, deps: { allow: Allow; reports: ReportsService }) {
  const { allow, reports } = deps;
  r.get('/studios/:studioId/reports/actuals', allow('owner'), json((req) => reports.actuals(member(req).studioId)));
  r.get('/studios/:studioId/reports/earnings', allow('owner'), validate({ query: earningsQuery }), json((req, res) => reports.earnings(member(req).studioId, query<EarningsQuery>(res))));
  r.put('/studios/:studioId/reports/settings', allow('owner'), validate({ body: booksSettingsInput }), json((req) => reports.saveSettings(member(req).studioId, req.body)));
}
