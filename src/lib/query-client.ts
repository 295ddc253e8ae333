// TanStack Query defaults: failed requests always show a message; a lost session sends the
// user back to sign-in.
import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { ApiError, errorMessage } from './api-client';
import { showToast } from './toasts';

export function createQueryClient() {
  const client: QueryClient = new QueryClient({
    queryCache: new QueryCache({
      onError: (err, query) => {
        if (err instanceof ApiError && err.status === 401) {
          if (query.queryKey[0] !== 'auth') client.invalidateQueries({ queryKey: ['auth', 'me'] });
          return;
        }
        if (query.meta?.quiet) return;
        showToast(errorMessage(err), 'error');
      },
    }),
    mutationCache: new MutationCache({
      onError: (err, _vars, _ctx, mutation) => {
        if (err instanceof ApiError && err.status === 401) client.invalidateQueries({ queryKey: ['auth', 'me'] });
        // Forms show their own field errors; everything else gets a message here.
        if (mutation.meta?.inlineErrors && err instanceof ApiError && err.status < 500 && err.status !== 0) return;
        showToast(errorMessage(err), 'error');
      },
    }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        retry: (count, err) => !(err instanceof ApiError && err.status >= 400 && err.status < 500) && count < 2,
        refetchOnWindowFocus: false,
      },
    },
  });
  return client;
}

declare module '@tanstack/react-query' {
  interface Register {
    queryMeta: { quiet?: boolean };
    mutationMeta: { inlineErrors?: boolean };
  }
}
