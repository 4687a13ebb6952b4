import { QueryClient } from '@tanstack/react-query';
import { ApiFailure } from './client';

/** Named stale times, so screens agree on how fresh data must be. */
export const STALE = {
  live: 10_000,
  normal: 30_000,
  slow: 5 * 60_000,
} as const;

export function makeQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: STALE.normal,
        retry: (count, error) => {
          if (error instanceof ApiFailure && ['unauthorized', 'forbidden', 'not-found', 'invalid'].includes(error.problem.kind)) return false;
          return count < 2;
        },
      },
      mutations: { retry: false },
    },
  });
}
