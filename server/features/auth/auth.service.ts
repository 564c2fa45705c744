import { IsNull, MoreThan } from 'typeorm';
import type { AppContext } from '../../context';
import { badRequest } from '../../lib/errors';
import { hashPassword, refuseWeakPassword } from '../../auth/password';
import { hashToken, newToken } from '../../auth/tokens';
import { admitMailRequest, type MailRequester } from '../mail/mail-limits';
import { passwordResetMail } from '../mail/templates';
import { User } from '../users/user.entity';
import { PasswordReset } from './password-reset.entity';
import type { SqliteSessionStore } from '../../auth/session-store';

export function createAuthService(ctx: AppContext, store: SqliteSessionStore) {
  const { ds, config, outbox } = ctx;

  /**
   * E-mail a single-use reset link; silent when the address has no account (no enumeration). Every
   * request does the same work in one transaction (look-up, the limits, one request row), and the
   * message goes through the outbox, so the answer takes as long whether or not the account exists.
   */
  async function sendReset(email: string, who: MailRequester = {}): Promise<void> {
    const target = email.trim().toLowerCase();
    const token = newToken();
    await ds.transaction(async (m) => {
      const user = await m.getRepository(User).findOne({ where: { email: target } });
      const admitted = await admitMailRequest(m, 'password-reset', target, who);
      const mail = Boolean(user && !user.disabled && admitted.mayMail);
      if (user && mail) {
        // A new link replaces any earlier unused one.
        await m.getRepository(PasswordReset).update({ userId: user.id, usedAt: IsNull() }, { usedAt: new Date() });
        await m.getRepository(PasswordReset).insert({
          userId: user.id,
          tokenHash: hashToken(token),
          expiresAt: new Date(Date.now() + config.RESET_TTL_HOURS * 3600_000),
          usedAt: null,
        });
        const link = `${config.PUBLIC_URL.replace(/\/$/, '')}/reset-password?token=${encodeURIComponent(token)}`;
        await outbox.queue(m, { kind: 'password-reset', to: user.email, ...passwordResetMail({ name: user.name, link, expiresHours: config.RESET_TTL_HOURS }) });
      }
      await admitted.record(mail);
    });
  }

  async function resetPassword(token: string, password: string): Promise<void> {
    const tokenHash = hashToken(token);
    const pending = await ds.getRepository(PasswordReset).findOne({ where: { tokenHash }, relations: { user: true } });
    // The new password is checked against the account's own e-mail and name (OWASP ASVS 5.0 §6.2).
    if (pending?.user && !pending.usedAt && pending.expiresAt.getTime() >= Date.now()) refuseWeakPassword(password, { email: pending.user.email, name: pending.user.name });
    const hash = await hashPassword(password, config.BCRYPT_COST);
    const userId = await ds.transaction(async (m) => {
      const repo = m.getRepository(PasswordReset);
      const reset = await repo.findOne({ where: { tokenHash } });
      if (!reset || reset.usedAt) {
        throw badRequest('This reset link has already been used or is not valid; ask for a new one', {
          token: 'This reset link has already been used or is not valid',
        }, 'TOKEN_INVALID');
      }
      if (reset.expiresAt.getTime() < Date.now()) {
        throw badRequest('This reset link has expired; ask for a new one', { token: 'This reset link has expired' }, 'TOKEN_EXPIRED');
      }
      const used = await repo.update({ id: reset.id, usedAt: IsNull(), expiresAt: MoreThan(new Date()) }, { usedAt: new Date() });
      if (!used.affected) throw badRequest('This reset link has already been used', { token: 'This reset link has already been used' }, 'TOKEN_INVALID');
      await m.getRepository(User).update({ id: reset.userId }, { passwordHash: hash });
      return reset.userId;
    });
    // Every other session of the account ends with the old password.
    await store.destroyForUser(userId);
  }

  return { sendReset, resetPassword };
}
export type AuthService = ReturnType<typeof createAuthService>;
