import { z } from 'zod';
import { emailSchema, isoDateTime, newPasswordSchema, personNameSchema, siteRoleSchema } from './common';

export const loginBodySchema = z.object({
  email: emailSchema,
  password: z.string({ error: 'Password is required' }).min(1, 'Password is required').max(1024, 'Password is too long'),
});
export type LoginBody = z.infer<typeof loginBodySchema>;

export const meSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  isAdmin: z.boolean(),
  /** Whether "New site" is offered: Admins, or Leads when SITE_CREATORS=leads. */
  canCreateSites: z.boolean().optional(),
});
export type Me = z.infer<typeof meSchema>;

export const loginResponseSchema = z.object({ user: meSchema, csrfToken: z.string() });
export const csrfResponseSchema = z.object({ csrfToken: z.string() });

export const forgotPasswordBodySchema = z.object({ email: emailSchema });
export type ForgotPasswordBody = z.infer<typeof forgotPasswordBodySchema>;

export const resetPasswordBodySchema = z.object({
  token: z.string().min(1, 'The reset link is incomplete'),
  password: newPasswordSchema,
});
export type ResetPasswordBody = z.infer<typeof resetPasswordBodySchema>;

/** Public view of an invitation, shown on the accept page before sign-up. */
export const invitationPreviewSchema = z.object({
  email: z.string(),
  role: siteRoleSchema,
  siteName: z.string(),
  invitedBy: z.string(),
  expiresAt: isoDateTime,
  accountExists: z.boolean(),
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;

/**
 * Accepting an invitation: a new account gives a name and a new password; an existing account
 * proves itself with its current password.
 */
export const acceptInvitationBodySchema = z.object({
  token: z.string().min(1, 'The invitation link is incomplete'),
  name: personNameSchema.optional(),
  password: z.string({ error: 'Password is required' }).min(1, 'Password is required').max(1024, 'Password is too long'),
});
export type AcceptInvitationBody = z.infer<typeof acceptInvitationBodySchema>;

/** Client-side form for a new account (the server re-checks the password rules). */
export const acceptNewAccountFormSchema = z
  .object({ name: personNameSchema, password: newPasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The passwords do not match' });

export const resetPasswordFormSchema = z
  .object({ password: newPasswordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The passwords do not match' });
