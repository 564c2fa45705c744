import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { ApiError, api, seg, setCsrfToken } from '@/lib/api-client';
import {
  csrfResponseSchema,
  invitationPreviewSchema,
  loginResponseSchema,
  meSchema,
  type AcceptInvitationBody,
  type ForgotPasswordBody,
  type LoginBody,
  type Me,
  type ResetPasswordBody,
} from '@shared/schemas/auth';
import { okSchema } from '@shared/schemas/common';

export const authKeys = {
  all: ['auth'] as const,
  me: () => [...authKeys.all, 'me'] as const,
  invitation: (token: string) => [...authKeys.all, 'invitation', token] as const,
};

const meResponseSchema = z.object({ user: meSchema });

/** The signed-in person, or null when signed out (401 is an answer here, not a failure). */
export function meQueryOptions() {
  return queryOptions({
    queryKey: authKeys.me(),
    queryFn: async (): Promise<Me | null> => {
      try {
        return (await api.get('/api/auth/me', meResponseSchema)).user;
      } catch (error) {
        if (error instanceof ApiError && error.status === 401) return null;
        throw error;
      }
    },
    staleTime: 60_000,
  });
}

export function invitationQueryOptions(token: string) {
  return queryOptions({
    queryKey: authKeys.invitation(token),
    queryFn: () => api.get(`/api/invitations/${seg(token)}`, invitationPreviewSchema),
    staleTime: Infinity,
  });
}

export async function login(body: LoginBody): Promise<Me> {
  const { user, csrfToken } = await api.post('/api/auth/login', body, loginResponseSchema);
  setCsrfToken(csrfToken);
  return user;
}

export async function logout(): Promise<void> {
  const { csrfToken } = await api.post('/api/auth/logout', {}, csrfResponseSchema);
  setCsrfToken(csrfToken);
}

export async function requestPasswordReset(body: ForgotPasswordBody): Promise<void> {
  await api.postNoContent('/api/auth/password/forgot', body);
}

export async function resetPassword(body: ResetPasswordBody): Promise<void> {
  await api.post('/api/auth/password/reset', body, okSchema);
}

export async function acceptInvitation(body: AcceptInvitationBody): Promise<Me> {
  const { user, csrfToken } = await api.post('/api/invitations/accept', body, loginResponseSchema);
  setCsrfToken(csrfToken);
  return user;
}
