import { priceTable } from '../../../shared/schemas/price-table';
import { member, user, type Allow } from '../../lib/policy';
import { json, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { PriceTableService } from './price-table.service';

export function priceTableRoutes(r: RouteTable, deps: { allow: Allow; priceTables: PriceTableService }) {
  const { allow, priceTables } = deps;
  r.get('/studios/:studioId/price-table', allow('owner'), json((req) => priceTables.get(member(req).studioId)));
  r.put('/studios/:studioId/price-table', allow('owner'), validate({ body: priceTable }), json((req) => priceTables.put(member(req).studioId, user(req).id, req.body)));
  r.get('/studios/:studioId/price-table/public-summary', allow('owner', 'painter', 'client'), json((req) => priceTables.publicSummary(member(req).studioId)));
}
