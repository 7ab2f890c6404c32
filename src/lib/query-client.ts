import { QueryClient, type QueryKey } from '@tanstack/react-query';
import { isApiError } from './api-client';

/**
 * Query-key convention. Farm-scoped data always starts with `farmScope(farmId)`, so live events and
 * a farm switch can invalidate everything of one farm with one prefix:
 *   ['farm', farmId, 'units', 'list', {...filters}]
 *   ['farm', farmId, 'units', 'detail', unitId]
 * Each feature's api/ builds its keys on these in an `<entity>Queries` factory of queryOptions.
 */
export const farmScope = (farmId: string) => ['farm', farmId] as const;
export const farmKey = <const P extends readonly unknown[]>(farmId: string, ...parts: P) =>
  [...farmScope(farmId), ...parts] as const;

function shouldRetry(failureCount: number, error: unknown): boolean {
  if (isApiError(error)) {
    // Client errors will not get better by asking again; the network and 5xx might.
    if (error.status >= 400 && error.status < 500 && error.status !== 408 && error.status !== 429) return false;
  }
  return failureCount < 2;
}

export function createQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        gcTime: 10 * 60_000,
        retry: shouldRetry,
        refetchOnWindowFocus: true,
      },
      mutations: { retry: false },
    },
  });
}

export const queryClient = createQueryClient();

export type { QueryKey };
