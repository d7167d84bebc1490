import { boardQuery, type BoardQuery } from '../../../shared/schemas/commissions';
import { member, type Allow } from '../../lib/policy';
import { json, query, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { BoardService } from './board.service';

export function boardRoutes(r: RouteTable, deps: { allow: Allow; board: BoardService }) {
  const { allow, board } = deps;
  r.get('/studios/:studioId/board', allow('owner', 'painter'), validate({ query: boardQuery }), json((req, res) => board.get(member(req).studioId, query<BoardQuery>(res))));
}
