import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-client';
import { reportUnexpectedError } from './errors';

export function createQueryClient(): QueryClient {
  return new QueryClient({
    queryCache: new QueryCache({
      // A first load that fails is shown by the screen itself; a background refresh
      // failing behind data that is already on screen would otherwise go unnoticed.
      onError: (error, query) => {
        if (query.state.data !== undefined) reportUnexpectedError(error);
      },
    }),
    mutationCache: new MutationCache({
      onError: (error) => reportUnexpectedError(error),
    }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // A 4xx will answer the same way again; only retry what might be passing trouble.
        retry: (failureCount, error) => !(isApiError(error) && error.status >= 400 && error.status < 500) && failureCount < 2,
        refetchOnWindowFocus: false,
      },
      mutations: { retry: false },
    },
  });
}
