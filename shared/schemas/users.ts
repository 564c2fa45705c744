import { z } from 'zod';
import { emailSchema, isoDateTime, newPasswordSchema, personNameSchema, siteRoleSchema } from './common';

export const adminUserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  isAdmin: z.boolean(),
  disabled: z.boolean(),
  createdAt: isoDateTime,
  lastSignInAt: isoDateTime.nullable(),
  memberships: z.array(z.object({ siteId: z.string(), siteName: z.string(), role: siteRoleSchema })),
});
export type AdminUser = z.infer<typeof adminUserSchema>;
export const adminUserListSchema = z.object({ users: z.array(adminUserSchema) });

/** An Admin creates an account directly, with a first password to hand over, or sends a reset link. */
export const createUserBodySchema = z.object({
  email: emailSchema,
  name: personNameSchema,
  isAdmin: z.boolean().default(false),
  password: newPasswordSchema.optional(),
});
export type CreateUserBody = z.input<typeof createUserBodySchema>;

export const userPatchSchema = z.object({
  name: personNameSchema.optional(),
  isAdmin: z.boolean().optional(),
  disabled: z.boolean().optional(),
});
export type UserPatch = z.infer<typeof userPatchSchema>;

export const outboxMessageSchema = z.object({
  id: z.string(),
  from: z.string(),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
  receivedAt: isoDateTime,
});
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;
export const outboxListSchema = z.object({ messages: z.array(outboxMessageSchema) });
