import { z } from 'zod';
import { genericPasswordProblems } from './password';

/** The one JSON error shape for every 4xx/5xx answer. */
export const errorBodySchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    fields: z.record(z.string(), z.string()).optional(),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;

export const idSchema = z.string().uuid();
export const isoDateTime = z.string().datetime({ offset: true });

export const SITE_ROLES = ['Lead', 'Analyst', 'Checker', 'Viewer'] as const;
export const siteRoleSchema = z.enum(SITE_ROLES);
export type SiteRole = z.infer<typeof siteRoleSchema>;

export const emailSchema = z
  .string({ error: 'E-mail is required' })
  .trim()
  .min(1, 'E-mail is required')
  .max(254, 'E-mail must be at most 254 characters')
  .pipe(z.email({ error: 'Enter a valid e-mail address' }))
  .transform((v) => v.toLowerCase());

/** 12 to 72 bytes, not one character repeated, not a common or breached password (shared/schemas/password.ts). */
export const newPasswordSchema = z
  .string({ error: 'Password is required' })
  .superRefine((p, ctx) => {
    for (const message of genericPasswordProblems(p)) ctx.addIssue({ code: 'custom', message });
  });

export const personNameSchema = z
  .string({ error: 'Name is required' })
  .trim()
  .min(1, 'Name is required')
  .max(120, 'Name must be at most 120 characters');

export const okSchema = z.object({ ok: z.literal(true) });
