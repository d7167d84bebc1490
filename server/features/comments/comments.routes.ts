import { z } from 'zod';
import { createCommentInput } from '../../../shared/schemas/comments';
import { arrayPageParams, id, type PageParams } from '../../../shared/schemas/common';
import { arrayPage } from '../../lib/page';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { CommentsService } from './comments.service';

const commissionParams = z.object({ studioId: id, commissionId: id });

export function commentsRoutes(r: RouteTable, deps: { allow: Allow; comments: CommentsService }) {
  const { allow, comments } = deps;
  r.get('/studios/:studioId/commissions/:commissionId/comments', allow('owner', 'painter', 'client'), validate({ params: commissionParams, query: arrayPageParams }), json(async (req, res) => arrayPage(res, await comments.list(member(req), params(res).commissionId, query<PageParams>(res)))));
  r.post('/studios/:studioId/commissions/:commissionId/comments', allow('owner', 'painter', 'client'), validate({ params: commissionParams, body: createCommentInput }), json((req, res) => comments.create(member(req), user(req), params(res).commissionId, req.body), 201));
}
