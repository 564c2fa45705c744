import { z } from 'zod';

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

const utf8Bytes = (s: string) => new TextEncoder().encode(s).length;

/** bcrypt reads at most 72 bytes: longer passwords are refused, never truncated. */
export const newPasswordSchema = z
  .string({ error: 'Password is required' })
  .refine((p) => utf8Bytes(p) >= 12, 'Password must be at least 12 bytes long')
  .refine((p) => utf8Bytes(p) <= 72, 'Password must be at most 72 bytes long (longer ones cannot be stored safely)');

export const personNameSchema = z
  .string({ error: 'Name is required' })
  .trim()
  .min(1, 'Name is required')
  .max(120, 'Name must be at most 120 characters');

export const okSchema = z.object({ ok: z.literal(true) });
