import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import { schemeEntryInput, updateSchemeEntryInput } from '../../../shared/schemas/recipes';
import { member, type Allow } from '../../lib/policy';
import { json, params, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { SchemesService } from './schemes.service';

const commissionParams = z.object({ studioId: id, commissionId: id });
const entryParams = z.object({ studioId: id, schemeEntryId: id });

/** The client reads their own commission's scheme (swatches only); the studio writes it and sees what to buy. */
export function schemesRoutes(r: RouteTable, deps: { allow: Allow; schemes: SchemesService }) {
  const { allow, schemes } = deps;
  r.get('/studios/:studioId/commissions/:commissionId/scheme', allow('owner', 'painter', 'client'), validate({ params: commissionParams }), json((req, res) => schemes.get(member(req), params(res).commissionId)));
  r.post('/studios/:studioId/commissions/:commissionId/scheme', allow('owner', 'painter'), validate({ params: commissionParams, body: schemeEntryInput }), json((req, res) => schemes.add(member(req), params(res).commissionId, req.body), 201));
  r.get('/studios/:studioId/commissions/:commissionId/shopping-list', allow('owner', 'painter'), validate({ params: commissionParams }), json((req, res) => schemes.shoppingList(member(req), params(res).commissionId)));
  r.patch('/studios/:studioId/scheme-entries/:schemeEntryId', allow('owner', 'painter'), validate({ params: entryParams, body: updateSchemeEntryInput }), json((req, res) => schemes.update(member(req), params(res).schemeEntryId, req.body)));
  r.delete('/studios/:studioId/scheme-entries/:schemeEntryId', allow('owner', 'painter'), validate({ params: entryParams }), json((req, res) => schemes.remove(member(req), params(res).schemeEntryId)));
}
