import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { Board, BoardQuery } from '../../../../shared/schemas/commissions';
import { api } from '../../../lib/api-client';

export function getBoard(studioId: number, filter: BoardQuery, signal?: AbortSignal): Promise<Board> {
  return api<Board>(`/api/studios/${studioId}/board`, { query: { ...filter }, signal });
}

export function boardQueryOptions(studioId: number, filter: BoardQuery = {}) {
  return queryOptions({
    queryKey: ['board', { studioId, ...filter }] as const,
    queryFn: ({ signal }) => getBoard(studioId, filter, signal),
    placeholderData: keepPreviousData,
  });
}

export function useBoard(studioId: number, filter: BoardQuery) {
  return useQuery(boardQueryOptions(studioId, filter));
}
