import { QueryClient } from '@tanstack/react-query';
import { ApiFailure, earlyAnswer } from './client';
import type { EarlyAnswer } from './early-requests';

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
        // Ask even when the browser says it is offline: the service worker answers from the last
        // answer it kept, so an installed app opens its lists with no connection.
        networkMode: 'offlineFirst',
        retry: (count, error) => {
          if (error instanceof ApiFailure && ['unauthorized', 'forbidden', 'not-found', 'invalid'].includes(error.problem.kind)) return false;
          return count < 2;
        },
      },
      mutations: { retry: false },
    },
  });
}

/**
 * Options that start a query from the page's early answer for `path` (early-requests.ts) when it
 * has already arrived, so the screen draws its data in its first pass. The answer is dated when
 * it arrived, so the query's stale time counts from then. Without one the query fetches as usual.
 */
export function fromEarlyAnswer<TBody, TData>(path: string, select: (body: TBody) => TData) {
  let taken: EarlyAnswer | null | undefined;
  const take = () => (taken === undefined ? (taken = earlyAnswer(path)) : taken);
  return {
    initialData: (): TData | undefined => {
      const answer = take();
      return answer ? select(answer.body as TBody) : undefined;
    },
    initialDataUpdatedAt: (): number | undefined => take()?.at,
  };
}
