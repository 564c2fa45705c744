import { z } from 'zod';
import { errorBodySchema, okSchema } from '@shared/schemas/common';
import { adminUserListSchema, adminUserSchema, createUserBodySchema, outboxListSchema, userPatchSchema } from '@shared/schemas/users';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import type { SqliteSessionStore } from '../../auth/session-store';
import { In } from 'typeorm';
import type { MailWorker } from '../mail/outbox';
import { OutboxMessage } from '../mail/outbox-message.entity';
import { notFound } from '../../lib/errors';
import { createUsersService } from './users.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const userParams = z.object({ userId: z.string().uuid('User id must be a UUID') });

export function adminRoutes(ctx: AppContext, store: SqliteSessionStore, sendReset: (email: string) => Promise<void>, mail: MailWorker): RouteDef[] {
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
      method: 'get', path: '/api/admin/outbox', tag: 'Admin', summary: 'Messages Kfield has queued, sent or given up on, newest first',
      responses: { 200: { description: 'Messages and counts by status', schema: outboxListSchema } },
      handler: async () => {
        const rows = await outbox.find({ order: { createdAt: 'DESC' }, take: 500 });
        const counted: { status: string; n: number }[] = await ctx.ds.query('SELECT "status", count(*) AS n FROM "mail_outbox" GROUP BY "status"');
        const counts = { pending: 0, sending: 0, sent: 0, failed: 0 };
        for (const c of counted) if (c.status in counts) counts[c.status as keyof typeof counts] = Number(c.n);
        return {
          counts,
          messages: rows.map((m) => ({
            id: m.id,
            kind: m.kind,
            to: m.toAddresses,
            subject: m.subject,
            text: m.text,
            html: m.html,
            status: m.status,
            attempts: m.attempts,
            lastError: m.lastError,
            createdAt: m.createdAt.toISOString(),
            nextAttemptAt: m.status === 'pending' ? m.nextAttemptAt.toISOString() : null,
            sentAt: m.sentAt ? m.sentAt.toISOString() : null,
          })),
        };
      },
    },
    {
      method: 'post', path: '/api/admin/outbox/:messageId/retry', tag: 'Admin', summary: 'Try a failed message again now',
      params: z.object({ messageId: z.string().uuid('Message id must be a UUID') }), status: 202,
      responses: { 202: { description: 'Queued again', schema: okSchema }, 404: err('No failed message with this id') },
      handler: async (req) => {
        if (!(await mail.retry(String(req.params.messageId)))) throw notFound('The failed message');
        return { ok: true };
      },
    },
    {
      method: 'delete', path: '/api/admin/outbox', tag: 'Admin', summary: 'Remove sent and failed messages from the outbox (pending ones stay)', status: 204,
      responses: { 204: { description: 'Removed' } },
      handler: async () => {
        await outbox.delete({ status: In(['sent', 'failed']) });
      },
    },
  ];
}
