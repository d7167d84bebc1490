import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import { figureInput, updateFigureInput, updateStageInput } from '../../../shared/schemas/commissions';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { Request } from 'express';
import type { FiguresService } from './figures.service';

const commissionParams = z.object({ studioId: id, commissionId: id });
const figureParams = z.object({ studioId: id, figureId: id });
const stageParams = z.object({ studioId: id, stageId: id });
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function figuresRoutes(r: RouteTable, deps: { allow: Allow; figures: FiguresService }) {
  const { allow, figures } = deps;
  r.post('/studios/:studioId/commissions/:commissionId/figures', allow('owner'), validate({ params: commissionParams, body: figureInput }), json((req, res) => figures.add(actor(req), params(res).commissionId, req.body), 201));
  r.patch('/studios/:studioId/figures/:figureId', allow('owner'), validate({ params: figureParams, body: updateFigureInput }), json((req, res) => figures.update(actor(req), params(res).figureId, req.body)));
  r.delete('/studios/:studioId/figures/:figureId', allow('owner'), validate({ params: figureParams }), json((req, res) => figures.remove(actor(req), params(res).figureId)));
  r.post('/studios/:studioId/figures/:figureId/advance', allow('owner', 'painter'), validate({ params: figureParams }), json((req, res) => figures.advance(actor(req), params(res).figureId)));
  r.patch('/studios/:studioId/stages/:stageId', allow('owner', 'painter'), validate({ params: stageParams, body: updateStageInput }), json((req, res) => figures.updateStage(actor(req), params(res).stageId, req.body)));
}
