import { queryOptions } from '@tanstack/react-query';
import { api, seg } from '@/lib/api-client';
import {
  adminUserListSchema,
  adminUserSchema,
  outboxListSchema,
  type CreateUserBody,
  type UserPatch,
} from '@shared/schemas/users';

export const adminKeys = {
  all: ['admin'] as const,
  users: () => [...adminKeys.all, 'users'] as const,
  outbox: () => [...adminKeys.all, 'outbox'] as const,
};

export function usersQueryOptions() {
  return queryOptions({
    queryKey: adminKeys.users(),
    queryFn: async () => (await api.get('/api/admin/users', adminUserListSchema)).users,
  });
}

export function outboxQueryOptions() {
  return queryOptions({
    queryKey: adminKeys.outbox(),
    queryFn: async () => (await api.get('/api/admin/outbox', outboxListSchema)).messages,
    // Mail arrives from the server side at any time (an invitation sent in another tab).
    refetchInterval: 15_000,
  });
}

export function createUser(body: CreateUserBody) {
  return api.post('/api/admin/users', body, adminUserSchema);
}

export function updateUser(userId: string, patch: UserPatch) {
  return api.patch(`/api/admin/users/${seg(userId)}`, patch, adminUserSchema);
}

export function sendPasswordReset(userId: string) {
  return api.postNoContent(`/api/admin/users/${seg(userId)}/reset`);
}

export function clearOutbox() {
  return api.delete('/api/admin/outbox');
}

export function retryOutboxMessage(messageId: string) {
  return api.postNoContent(`/api/admin/outbox/${seg(messageId)}/retry`);
}
