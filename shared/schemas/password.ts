import { z } from 'zod';

/** Who the password is for: their own e-mail and name are context-specific words (OWASP ASVS 5.0 §6.2.11). */
export interface PasswordContext {
  email?: string | null;
  name?: string | null;
}

export type CommonPasswordCheck = (password: string) => boolean;

/**
 * The common-password list (shared/schemas/common-passwords.ts) is about 200 KB gzipped, too much
 * for every page of the client. The server installs it when it loads its password code; the
 * client loads it lazily on the forms that set a password (loadCommonPasswordCheck). Until then
 * the client skips that one rule and the server's answer carries it.
 */
let isCommon: CommonPasswordCheck | null = null;
export function installCommonPasswordCheck(check: CommonPasswordCheck): void {
  isCommon = check;
}
export async function loadCommonPasswordCheck(): Promise<void> {
  if (!isCommon) installCommonPasswordCheck((await import('./common-passwords')).isCommonPassword);
}

const utf8Bytes = (s: string) => new TextEncoder().encode(s).length;
/** Letters and digits only, lower case: "Mara.Lindqvist" and "mara lindqvist" compare equal. */
const fold = (s: string) => s.normalize('NFKC').toLowerCase().replace(/[^\p{L}\p{N}]+/gu, '');

export const PASSWORD_MIN_BYTES = 12;
/** bcrypt reads at most 72 bytes: longer passwords are refused, never truncated. */
export const PASSWORD_MAX_BYTES = 72;

/** The rules that need no account: length, one repeated character, the common-password list. */
export function genericPasswordProblems(password: string): string[] {
  const problems: string[] = [];
  const bytes = utf8Bytes(password);
  if (bytes < PASSWORD_MIN_BYTES) problems.push(`Password must be at least ${PASSWORD_MIN_BYTES} bytes long`);
  if (bytes > PASSWORD_MAX_BYTES) problems.push(`Password must be at most ${PASSWORD_MAX_BYTES} bytes long (longer ones cannot be stored safely)`);
  if (password.length > 0 && new Set(password).size === 1) problems.push('Password must not be one character repeated');
  else if (bytes >= PASSWORD_MIN_BYTES && isCommon?.(password)) {
    problems.push('This password is on a list of common and breached passwords; choose another');
  }
  return problems;
}

/** Words of the account itself: its e-mail, the e-mail's local part, its name (each at least 4 letters or digits). */
export function accountPasswordProblems(password: string, { email, name }: PasswordContext): string[] {
  const p = fold(password);
  const problems: string[] = [];
  const contains = (word: string | null | undefined) => {
    const w = word ? fold(word) : '';
    return w.length >= 4 && p.includes(w);
  };
  if (contains(email) || contains(email?.split('@')[0])) problems.push('Password must not contain your e-mail address');
  const nameParts = (name ?? '').split(/\s+/);
  if (contains(name) || (nameParts.length > 1 && contains([...nameParts].reverse().join('')))) {
    problems.push('Password must not contain your name');
  }
  return problems;
}

/** Every reason to refuse this new password, in the words shown beside the password field. */
export function passwordProblems(password: string, context: PasswordContext = {}): string[] {
  return [...genericPasswordProblems(password), ...accountPasswordProblems(password, context)];
}

const addProblems = (ctx: z.RefinementCtx, problems: string[], path: PropertyKey[] = []) => {
  for (const message of problems) ctx.addIssue({ code: 'custom', message, path });
};

/** A new password for a known account. */
export const newPasswordFor = (context: PasswordContext) =>
  z.string({ error: 'Password is required' }).superRefine((p, ctx) => addProblems(ctx, passwordProblems(p, context)));

/**
 * For a superRefine on a body or form that carries the password beside the account's e-mail and
 * name (its generic rules come from the password field's own schema).
 */
export function refinePasswordAgainstAccount(
  value: { password?: string | undefined; email?: string | null; name?: string | null },
  ctx: z.RefinementCtx,
): void {
  if (value.password) addProblems(ctx, accountPasswordProblems(value.password, value), ['password']);
}
