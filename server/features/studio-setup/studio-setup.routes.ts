import { hazardsInput, listsInput, stageTemplateInput } from '../../../shared/schemas/commissions';
import { member, type Allow } from '../../lib/policy';
import { json, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { StudioSetupService } from './studio-setup.service';

export function studioSetupRoutes(r: RouteTable, deps: { allow: Allow; setup: StudioSetupService }) {
  const { allow, setup } = deps;
  r.get('/studios/:studioId/stage-template', allow('owner', 'painter'), json((req) => setup.getTemplate(member(req).studioId)));
  r.put('/studios/:studioId/stage-template', allow('owner'), validate({ body: stageTemplateInput }), json((req) => setup.putTemplate(member(req).studioId, req.body)));
  r.get('/studios/:studioId/lists', allow('owner', 'painter', 'client'), json((req) => setup.getLists(member(req).studioId)));
  r.put('/studios/:studioId/lists', allow('owner'), validate({ body: listsInput }), json((req) => setup.putLists(member(req).studioId, req.body)));
  r.get('/studios/:studioId/hazards', allow('owner', 'painter', 'client'), json((req) => setup.getHazards(member(req).studioId)));
  r.put('/studios/:studioId/hazards', allow('owner'), validate({ body: hazardsInput }), json((req) => setup.putHazards(member(req).studioId, req.body)));
}
