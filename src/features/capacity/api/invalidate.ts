import type { QueryClient } from '@tanstack/react-query';
import { capacityKey } from './get-capacity';

/** Hours and days off move the forecast: the schedule and the home pages follow. */
export function invalidateAfterCapacity(queryClient: QueryClient) {
  return Promise.all([
    queryClient.invalidateQueries({ queryKey: capacityKey }),
    queryClient.invalidateQueries({ queryKey: ['schedule'] }),
    queryClient.invalidateQueries({ queryKey: ['dashboard'] }),
  ]);
}
