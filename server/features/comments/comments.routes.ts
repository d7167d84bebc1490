import { z } from 'zod';
import { createCommentInput } from '../../../shared/schemas/comments';
import { id } from '../../../shared/schemas/common';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { CommentsService } from './comments.service';

const commissionParams = z.object({ studioId: id, commissionId: id });

export function commentsRoutes(r: RouteTable, deps: { allow: Allow; comments: CommentsService }) {
  const { allow, comments } = deps;
  r.get('/studios/:studioId/commissions/:commissionId/comments', allow('owner', 'painter', 'client'), validate({ params: commissionParams }), json((req, res) => comments.list(member(req), params(res).commissionId)));
  r.post('/studios/:studioId/commissions/:commissionId/comments', allow('owner', 'painter', 'client'), validate({ params: commissionParams, body: createCommentInput }), json((req, res) => comments.create(member(req), user(req), params(res).commissionId, req.body), 201));
}
