import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Board, BoardFilter } from '../../../../shared/schemas/commissions';
import { MAX_PAGE_SIZE } from '../../../../shared/schemas/common';
import { allOffsets } from '../../../lib/all-pages';
import { api } from '../../../lib/api-client';

/** A later page's cards join the first page's columns; a column only a later page has goes before "done". */
export function mergeBoards(into: Board, next: Board): Board {
  const columns = into.columns.map((c) => ({ ...c, cards: [...c.cards] }));
  for (const col of next.columns) {
    const same = columns.find((c) => c.key === col.key);
    if (same) same.cards.push(...col.cards);
    else columns.splice(Math.max(0, columns.findIndex((c) => c.key === 'done')), 0, { ...col, cards: [...col.cards] });
  }
  return { ...into, columns };
}

/** The whole board: the server sends a page of figures at a time, soonest due first. */
export function getBoard(studioId: number, filter: BoardFilter, signal?: AbortSignal): Promise<Board> {
  return allOffsets<Board>((offset) => api<Board>(`/api/studios/${studioId}/board`, { query: { ...filter, limit: MAX_PAGE_SIZE, offset }, signal }), mergeBoards);
}

export function boardQueryOptions(studioId: number, filter: BoardFilter = {}) {
  return queryOptions({
    queryKey: ['board', { studioId, ...filter }] as const,
    queryFn: ({ signal }) => getBoard(studioId, filter, signal),
    placeholderData: keepPreviousData,
  });
}

export function useBoard(studioId: number, filter: BoardFilter) {
  return useQuery(boardQueryOptions(studioId, filter));
}
