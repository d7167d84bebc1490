import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { EarningsReport } from '../../../../shared/schemas/reports';
import { api } from '../../../lib/api-client';
import { reportsKey } from './get-actuals';

export type EarningsWindow = { from?: string; to?: string };

export const getEarnings = (studioId: number, w: EarningsWindow, signal?: AbortSignal) =>
  api<EarningsReport>(`/api/studios/${studioId}/reports/earnings`, { query: { from: w.from, to: w.to }, signal });

export function earningsQueryOptions(studioId: number, w: EarningsWindow = {}) {
  return queryOptions({
    queryKey: [...reportsKey, 'earnings', { studioId, ...w }] as const,
    queryFn: ({ signal }) => getEarnings(studioId, w, signal),
    placeholderData: keepPreviousData,
  });
}

export const useEarnings = (studioId: number, w: EarningsWindow = {}) => useQuery(earningsQueryOptions(studioId, w));
