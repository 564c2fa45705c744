import { queryOptions } from '@tanstack/react-query';
import { api, seg } from '@/lib/api-client';
import { invitationSchema, memberSchema, membersResponseSchema, type InviteBody } from '@shared/schemas/sites';
import type { SiteRole } from '@shared/schemas/common';

export const memberKeys = {
  all: ['members'] as const,
  list: (siteId: string) => [...memberKeys.all, siteId] as const,
};

export function membersQueryOptions(siteId: string) {
  return queryOptions({
    queryKey: memberKeys.list(siteId),
    queryFn: () => api.get(`/api/sites/${seg(siteId)}/members`, membersResponseSchema),
  });
}

export function inviteMember(siteId: string, body: InviteBody) {
  return api.post(`/api/sites/${seg(siteId)}/invitations`, body, invitationSchema);
}

export function revokeInvitation(siteId: string, invitationId: string) {
  return api.delete(`/api/sites/${seg(siteId)}/invitations/${seg(invitationId)}`);
}

export function changeMemberRole(siteId: string, userId: string, role: SiteRole) {
  return api.patch(`/api/sites/${seg(siteId)}/members/${seg(userId)}`, { role }, memberSchema);
}

export function removeMember(siteId: string, userId: string) {
  return api.delete(`/api/sites/${seg(siteId)}/members/${seg(userId)}`);
}
