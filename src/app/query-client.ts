import { MutationCache, QueryCache, QueryClient } from '@tanstack/react-query';
import { isApiError } from '@/lib/api-client';
import { authKeys } from '@/features/auth/api';

const meKey = authKeys.me();

function isMeQuery(query: { queryKey: readonly unknown[] }): boolean {
  return query.queryKey.length === meKey.length && query.queryKey.every((part, i) => part === meKey[i]);
}

/**
 * One client for the app. A 401 from any call other than the sign-in check itself means the
 * session ended (idle timeout, signed out in another tab): mark the person signed out, and the
 * app shell sends them to sign-in with the page they were on as ?next=.
 */
export function createQueryClient(): QueryClient {
  const queryClient: QueryClient = new QueryClient({
    queryCache: new QueryCache({
      onError: (error, query) => {
        if (isApiError(error) && error.status === 401 && !isMeQuery(query)) signedOut();
      },
    }),
    mutationCache: new MutationCache({
      onError: (error) => {
        // A wrong password on sign-in is a 401 too, but says nothing about the current session.
        if (isApiError(error) && error.status === 401 && error.code !== 'BAD_CREDENTIALS') signedOut();
      },
    }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        retry: (failureCount, error) => {
          if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
          return failureCount < 2;
        },
      },
      mutations: { retry: false },
    },
  });
  function signedOut() {
    if (queryClient.getQueryData(meKey)) queryClient.setQueryData(meKey, null);
  }
  return queryClient;
}
