import { useCallback } from 'react';
import { useMutation, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useNavigate } from 'react-router-dom';
import type { Me } from '@shared/schemas/auth';
import { authKeys, logout, meQueryOptions } from './api';

function isMeQuery(query: { queryKey: readonly unknown[] }): boolean {
  const key = authKeys.me();
  return query.queryKey.length === key.length && query.queryKey.every((part, i) => part === key[i]);
}

/** The signed-in person, or null. Suspends on the first load. */
export function useMe(): Me | null {
  return useSuspenseQuery(meQueryOptions()).data;
}

/**
 * After sign-in or accepting an invitation the session belongs to someone else:
 * drop everything cached for the previous person before showing anything.
 */
export function useStartSession(): (user: Me) => void {
  const queryClient = useQueryClient();
  return useCallback(
    (user: Me) => {
      queryClient.removeQueries({ predicate: (q) => !isMeQuery(q) });
      queryClient.setQueryData(authKeys.me(), user);
    },
    [queryClient],
  );
}

export function useSignOut() {
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  return useMutation({
    mutationFn: logout,
    onSuccess: async () => {
      // Start leaving the signed-in screens first, and commit that at once (flushSync, not a
      // transition), so the shell sees a navigation under way and does not add a ?next= of its own.
      const leaving = navigate('/sign-in', { replace: true, flushSync: true });
      queryClient.setQueryData(authKeys.me(), null);
      await leaving;
      queryClient.removeQueries({ predicate: (q) => !isMeQuery(q) });
    },
  });
}
