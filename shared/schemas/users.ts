import { z } from 'zod';
import { emailSchema, isoDateTime, newPasswordSchema, personNameSchema, siteRoleSchema } from './common';
import { refinePasswordAgainstAccount } from './password';

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
export const createUserBodySchema = z
  .object({
    email: emailSchema,
    name: personNameSchema,
    isAdmin: z.boolean().default(false),
    password: newPasswordSchema.optional(),
  })
  .superRefine(refinePasswordAgainstAccount);
export type CreateUserBody = z.input<typeof createUserBodySchema>;

export const userPatchSchema = z.object({
  name: personNameSchema.optional(),
  isAdmin: z.boolean().optional(),
  disabled: z.boolean().optional(),
});
export type UserPatch = z.infer<typeof userPatchSchema>;

export const MAIL_KINDS = ['invitation', 'password-reset', 'fit-submitted', 'fit-checked', 'fit-sent-back', 'viewer-link'] as const;
export type MailKind = (typeof MAIL_KINDS)[number];
export const MAIL_STATUSES = ['pending', 'sending', 'sent', 'failed'] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];

export const outboxMessageSchema = z.object({
  id: z.string(),
  kind: z.enum(MAIL_KINDS),
  to: z.array(z.string()),
  subject: z.string(),
  text: z.string(),
  html: z.string().nullable(),
  status: z.enum(MAIL_STATUSES),
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: isoDateTime,
  nextAttemptAt: isoDateTime.nullable().describe('When the next attempt is due (pending messages only)'),
  sentAt: isoDateTime.nullable(),
});
export type OutboxMessage = z.infer<typeof outboxMessageSchema>;
export const outboxListSchema = z.object({
  messages: z.array(outboxMessageSchema),
  counts: z.object({ pending: z.number().int(), sending: z.number().int(), sent: z.number().int(), failed: z.number().int() }),
});
