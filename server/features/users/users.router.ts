import { z } from 'zod';
import { errorBodySchema, okSchema } from '@shared/schemas/common';
import { adminUserListSchema, adminUserSchema, createUserBodySchema, outboxListSchema, userPatchSchema } from '@shared/schemas/users';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import type { SqliteSessionStore } from '../../auth/session-store';
import { OutboxMessage } from '../mail/outbox-message.entity';
import { createUsersService } from './users.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const userParams = z.object({ userId: z.string().uuid('User id must be a UUID') });

export function adminRoutes(ctx: AppContext, store: SqliteSessionStore, sendReset: (email: string) => Promise<void>): RouteDef[] {
  const svc = createUsersService(ctx, store, sendReset);
  const outbox = ctx.ds.getRepository(OutboxMessage);
  return [
    {
      method: 'get', path: '/api/admin/users', tag: 'Admin', summary: 'Every account of the instance',
      responses: { 200: { description: 'Users', schema: adminUserListSchema } },
      handler: async () => ({ users: await svc.list() }),
    },
    {
      method: 'post', path: '/api/admin/users', tag: 'Admin', summary: 'Create an account',
      body: createUserBodySchema, status: 201,
      responses: { 201: { description: 'Created', schema: adminUserSchema }, 400: err('Invalid fields'), 409: err('E-mail taken') },
      handler: (req) => svc.create(req.body),
    },
    {
      method: 'patch', path: '/api/admin/users/:userId', tag: 'Admin', summary: 'Rename, enable or disable an account, or change its Admin role',
      params: userParams, body: userPatchSchema,
      responses: { 200: { description: 'The user', schema: adminUserSchema }, 409: err('Would lock the instance out') },
      handler: (req) => svc.update(req.user!, String(req.params.userId), req.body),
    },
    {
      method: 'post', path: '/api/admin/users/:userId/reset', tag: 'Admin', summary: 'E-mail the account a password reset link',
      params: userParams, status: 202,
      responses: { 202: { description: 'Sent', schema: okSchema }, 404: err('No such user') },
      handler: async (req) => {
        await svc.reset(String(req.params.userId));
        return { ok: true };
      },
    },
    {
      method: 'get', path: '/api/admin/outbox', tag: 'Admin', summary: 'Messages received by the local mail service, newest first',
      responses: { 200: { description: 'Messages', schema: outboxListSchema } },
      handler: async () => {
        const rows = await outbox.find({ order: { receivedAt: 'DESC' }, take: 500 });
        return {
          messages: rows.map((m) => ({
            id: m.id,
            from: m.fromAddress,
            to: m.toAddresses,
            subject: m.subject,
            text: m.text,
            html: m.html,
            receivedAt: m.receivedAt.toISOString(),
          })),
        };
      },
    },
    {
      method: 'delete', path: '/api/admin/outbox', tag: 'Admin', summary: 'Empty the local outbox', status: 204,
      responses: { 204: { description: 'Emptied' } },
      handler: async () => {
        await outbox.clear();
      },
    },
  ];
}
