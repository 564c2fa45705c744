import type { z } from 'zod';
import type { AdminUser, createUserBodySchema, UserPatch } from '@shared/schemas/users';
import type { AppContext } from '../../context';
import { conflict, notFound } from '../../lib/errors';
import { uniqueViolation } from '../../lib/error-middleware';
import { hashPassword } from '../../auth/password';
import { newToken } from '../../auth/tokens';
import type { SqliteSessionStore } from '../../auth/session-store';
import { User } from './user.entity';

const toAdminUser = (u: User): AdminUser => ({
  id: u.id,
  email: u.email,
  name: u.name,
  isAdmin: u.isAdmin,
  disabled: u.disabled,
  createdAt: u.createdAt.toISOString(),
  lastSignInAt: u.lastSignInAt ? u.lastSignInAt.toISOString() : null,
  memberships: (u.memberships ?? [])
    .map((m) => ({ siteId: m.siteId, siteName: m.site?.name ?? '', role: m.role }))
    .sort((a, b) => a.siteName.localeCompare(b.siteName)),
});

export function createUsersService({ ds, config }: AppContext, store: SqliteSessionStore, sendReset: (email: string) => Promise<void>) {
  const users = ds.getRepository(User);

  async function get(id: string): Promise<AdminUser> {
    const u = await users.findOne({ where: { id }, relations: { memberships: { site: true } } });
    if (!u) throw notFound('The user');
    return toAdminUser(u);
  }

  async function list(): Promise<AdminUser[]> {
    const rows = await users.find({ relations: { memberships: { site: true } }, order: { name: 'ASC' } });
    return rows.map(toAdminUser);
  }

  /** Without a password the account gets a random one and its owner an e-mailed reset link. */
  async function create(body: z.output<typeof createUserBodySchema>): Promise<AdminUser> {
    const taken = () => conflict('EMAIL_TAKEN', `An account for ${body.email} already exists`, { email: 'An account with this e-mail already exists' });
    if (await users.exists({ where: { email: body.email } })) throw taken();
    const passwordHash = await hashPassword(body.password ?? newToken(), config.BCRYPT_COST);
    const id = await ds
      .transaction(async (m) => {
        const u = await m.getRepository(User).save(
          m.getRepository(User).create({ email: body.email, name: body.name, isAdmin: body.isAdmin, disabled: false, passwordHash }),
        );
        return u.id;
      })
      .catch((e: unknown) => {
        // Another request created the same address while this one was hashing the password.
        if (uniqueViolation(e)?.includes('users.email')) throw taken();
        throw e;
      });
    if (!body.password) await sendReset(body.email);
    return get(id);
  }

  async function update(actor: Express.User, id: string, patch: UserPatch): Promise<AdminUser> {
    const u = await users.findOne({ where: { id } });
    if (!u) throw notFound('The user');
    if (actor.id === id && (patch.disabled === true || patch.isAdmin === false)) {
      throw conflict('SELF_LOCKOUT', 'You cannot disable your own account or remove your own Admin role', {
        [patch.disabled ? 'disabled' : 'isAdmin']: 'Not on your own account',
      });
    }
    if (patch.isAdmin === false && u.isAdmin && (await users.count({ where: { isAdmin: true, disabled: false } })) <= 1) {
      throw conflict('LAST_ADMIN', 'The instance needs at least one Admin', { isAdmin: 'The last Admin cannot be demoted' });
    }
    // An empty change (no field given) is answered with the account as it is.
    if (Object.values(patch).some((v) => v !== undefined)) await users.update({ id }, patch);
    if (patch.disabled) await store.destroyForUser(id);
    return get(id);
  }

  async function reset(id: string): Promise<void> {
    const u = await users.findOne({ where: { id } });
    if (!u) throw notFound('The user');
    if (u.disabled) throw conflict('ACCOUNT_DISABLED', 'Enable the account before sending it a reset link');
    await sendReset(u.email);
  }

  return { list, create, update, reset };
}
