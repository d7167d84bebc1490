import type { QueryClient } from '@tanstack/react-query';

/** Time moves the timer, the stage's entries, logged hours on the commission and the board. */
export function invalidateTime(queryClient: QueryClient) {
  return Promise.all([
    queryClient.invalidateQueries({ queryKey: ['time'] }),
    queryClient.invalidateQueries({ queryKey: ['commissions'] }),
    queryClient.invalidateQueries({ queryKey: ['board'] }),
  ]);
}
