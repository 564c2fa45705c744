import { z } from 'zod';
import { acceptInvitationBodySchema, invitationPreviewSchema, loginResponseSchema, meSchema } from '@shared/schemas/auth';
import { errorBodySchema } from '@shared/schemas/common';
import { invitationSchema, inviteBodySchema, memberPatchSchema, memberSchema, membersResponseSchema } from '@shared/schemas/sites';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import { signIn } from '../auth/auth.router';
import { canCreateSites } from '../sites/sites.service';
import { createMembersService } from './members.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const siteId = z.string().uuid('Site id must be a UUID');
const uuid = (what: string) => z.string().uuid(`${what} must be a UUID`);

export function membersRoutes(ctx: AppContext): RouteDef[] {
  const svc = createMembersService(ctx);
  const canManage = (req: Express.Request) => req.siteAccess?.role === 'Lead' || !!req.user?.isAdmin;
  return [
    {
      method: 'get', path: '/api/sites/:siteId/members', tag: 'Members', summary: 'Members of a site, and pending invitations for its Leads',
      params: z.object({ siteId }),
      responses: { 200: { description: 'Members', schema: membersResponseSchema } },
      // A Viewer (a stakeholder) sees who is on the site and in which role, not their addresses.
      handler: (req) => svc.list(req.siteAccess!.siteId, canManage(req), req.siteAccess?.role !== 'Viewer' || !!req.user?.isAdmin),
    },
    {
      method: 'post', path: '/api/sites/:siteId/invitations', tag: 'Members', summary: 'Invite someone by e-mail with a role (Lead)',
      params: z.object({ siteId }), body: inviteBodySchema, status: 201,
      responses: {
        201: { description: 'Invitation sent', schema: invitationSchema },
        400: err('Invalid e-mail or role'),
        409: err('Already a member'),
        429: err('Too many invitations from this account or address, or to this address today'),
      },
      handler: (req) => svc.invite(req.siteAccess!.siteId, req.user!, req.body.email, req.body.role, { clientAddress: req.ip ?? null }),
    },
    {
      method: 'delete', path: '/api/sites/:siteId/invitations/:invitationId', tag: 'Members', summary: 'Revoke a pending invitation (Lead)',
      params: z.object({ siteId, invitationId: uuid('Invitation id') }), status: 204,
      responses: { 204: { description: 'Revoked' }, 404: err('No such pending invitation') },
      handler: async (req) => {
        await svc.revoke(req.siteAccess!.siteId, String(req.params.invitationId));
      },
    },
    {
      method: 'patch', path: '/api/sites/:siteId/members/:userId', tag: 'Members', summary: "Change a member's role (Lead)",
      params: z.object({ siteId, userId: uuid('User id') }), body: memberPatchSchema,
      responses: { 200: { description: 'The member', schema: memberSchema }, 409: err('Would leave the site without a Lead') },
      handler: (req) => svc.changeRole(req.siteAccess!.siteId, String(req.params.userId), req.body.role),
    },
    {
      method: 'delete', path: '/api/sites/:siteId/members/:userId', tag: 'Members', summary: 'Remove a member (Lead)',
      params: z.object({ siteId, userId: uuid('User id') }), status: 204,
      responses: { 204: { description: 'Removed' }, 409: err('Would leave the site without a Lead') },
      handler: async (req) => {
        await svc.remove(req.siteAccess!.siteId, String(req.params.userId));
      },
    },
    {
      method: 'get', path: '/api/invitations/:token', tag: 'Members', summary: 'What an invitation link offers',
      params: z.object({ token: z.string().min(10, 'The invitation link is incomplete').max(200, 'The invitation link is malformed') }),
      responses: {
        200: { description: 'The invitation', schema: invitationPreviewSchema },
        404: err('Unknown or revoked'),
        410: err('Used or expired'),
      },
      handler: (req) => svc.preview(String(req.params.token)),
    },
    {
      method: 'post', path: '/api/invitations/accept', tag: 'Members', summary: 'Accept an invitation and sign in',
      body: acceptInvitationBodySchema,
      responses: {
        200: { description: 'Joined and signed in', schema: loginResponseSchema },
        400: err('Invalid name or password'),
        404: err('Unknown or revoked'),
        410: err('Used or expired'),
      },
      handler: async (req) => {
        const user = await svc.accept(req.body.token, req.body.name, req.body.password);
        const csrfToken = await signIn(req, user);
        return { user: meSchema.parse({ ...user, canCreateSites: await canCreateSites(ctx, user) }), csrfToken };
      },
    },
  ];
}
