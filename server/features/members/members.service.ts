import { IsNull } from 'typeorm';
import type { SiteRole } from '@shared/schemas/common';
import type { InvitationPreview } from '@shared/schemas/auth';
import type { Invitation as InvitationDto, Member } from '@shared/schemas/sites';
import type { AppContext } from '../../context';
import { AppError, badRequest, conflict, gone, notFound } from '../../lib/errors';
import { hashPassword, verifyPassword } from '../../auth/password';
import { toSessionUser } from '../../auth/passport';
import { hashToken, newToken } from '../../auth/tokens';
import { newPasswordSchema, personNameSchema } from '@shared/schemas/common';
import { admitMailRequest, type MailRequester } from '../mail/mail-limits';
import { invitationMail } from '../mail/templates';
import { Membership } from '../sites/membership.entity';
import { Site } from '../sites/site.entity';
import { User } from '../users/user.entity';
import { Invitation } from './invitation.entity';
import { fieldErrors } from '../../lib/validate';
import { accountPasswordProblems } from '@shared/schemas/password';

const toMember = (m: Membership, showEmail: boolean): Member => ({
  userId: m.userId,
  name: m.user.name,
  email: showEmail ? m.user.email : null,
  role: m.role,
  disabled: m.user.disabled,
  since: m.createdAt.toISOString(),
});

const toInvitation = (i: Invitation): InvitationDto => ({
  id: i.id,
  email: i.email,
  role: i.role,
  invitedBy: i.invitedBy?.name ?? '',
  createdAt: i.createdAt.toISOString(),
  expiresAt: i.expiresAt.toISOString(),
});

export function createMembersService({ ds, config, outbox }: AppContext) {
  const memberships = ds.getRepository(Membership);
  const invitations = ds.getRepository(Invitation);

  async function list(siteId: string, canManage: boolean, showEmails: boolean) {
    const members = await memberships.find({ where: { siteId }, relations: { user: true }, order: { createdAt: 'ASC' } });
    const pending = canManage
      ? await invitations.find({
          where: { siteId, usedAt: IsNull(), revokedAt: IsNull() },
          relations: { invitedBy: true },
          order: { createdAt: 'DESC' },
        })
      : [];
    return {
      members: members.map((x) => toMember(x, showEmails)),
      invitations: pending.filter((i) => i.expiresAt.getTime() > Date.now()).map(toInvitation),
    };
  }

  async function invite(siteId: string, inviter: Express.User, email: string, role: SiteRole, who: MailRequester = {}): Promise<InvitationDto> {
    const existing = await ds.getRepository(User).findOne({ where: { email } });
    if (existing && (await memberships.exists({ where: { siteId, userId: existing.id } }))) {
      throw conflict('ALREADY_MEMBER', `${email} is already a member of this site`, { email: 'Already a member of this site' });
    }
    const site = await ds.getRepository(Site).findOneOrFail({ where: { id: siteId } });
    const token = newToken();
    return ds.transaction(async (m) => {
      const repo = m.getRepository(Invitation);
      const admitted = await admitMailRequest(m, 'invitation', email, { ...who, requestedById: inviter.id });
      const pending = await repo.findOne({ where: { siteId, email, usedAt: IsNull(), revokedAt: IsNull() }, relations: { invitedBy: true }, order: { createdAt: 'DESC' } });
      if (!admitted.mayMail) {
        // A repeat within minutes (or past the address's daily count) sends nothing new: the pending
        // invitation stands, with the role asked for now.
        if (pending && pending.expiresAt.getTime() > Date.now()) {
          if (pending.role !== role) await repo.update({ id: pending.id }, { role });
          await admitted.record(false);
          return toInvitation({ ...pending, role } as Invitation);
        }
        throw new AppError('RATE_LIMITED', `${email} was sent too many invitations today; try again tomorrow`, 429, { email: 'Too many invitations to this address today' }, { 'Retry-After': '3600' });
      }
      // A new invitation to the same address replaces the earlier pending one.
      await repo.update({ siteId, email, usedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: new Date() });
      const inv = await repo.save(
        repo.create({
          siteId,
          email,
          role,
          tokenHash: hashToken(token),
          invitedById: inviter.id,
          expiresAt: new Date(Date.now() + config.INVITATION_TTL_HOURS * 3600_000),
          usedAt: null,
          revokedAt: null,
        }),
      );
      const link = `${config.PUBLIC_URL.replace(/\/$/, '')}/invitations/${encodeURIComponent(token)}`;
      await outbox.queue(m, {
        kind: 'invitation',
        to: email,
        ...invitationMail({ siteName: site.name, role, invitedBy: inviter.name, link, expiresHours: config.INVITATION_TTL_HOURS }),
      });
      await admitted.record(true);
      inv.invitedBy = { name: inviter.name } as User;
      return toInvitation(inv);
    });
  }

  async function revoke(siteId: string, invitationId: string): Promise<void> {
    const r = await invitations.update({ id: invitationId, siteId, usedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: new Date() });
    if (!r.affected) throw notFound('The pending invitation');
  }

  async function usableInvitation(token: string): Promise<Invitation> {
    const inv = await invitations.findOne({ where: { tokenHash: hashToken(token) }, relations: { site: true, invitedBy: true } });
    if (!inv || inv.revokedAt) throw notFound('The invitation');
    if (inv.usedAt) throw gone('INVITATION_USED', 'This invitation has already been used; sign in, or ask the site Lead for a new one');
    if (inv.expiresAt.getTime() < Date.now()) throw gone('INVITATION_EXPIRED', 'This invitation has expired; ask the site Lead for a new one');
    return inv;
  }

  async function preview(token: string): Promise<InvitationPreview> {
    const inv = await usableInvitation(token);
    const accountExists = await ds.getRepository(User).exists({ where: { email: inv.email } });
    return {
      email: inv.email,
      role: inv.role,
      siteName: inv.site.name,
      invitedBy: inv.invitedBy.name,
      expiresAt: inv.expiresAt.toISOString(),
      accountExists,
    };
  }

  /** Accept: create the account (or prove the existing one) and join the site, all or nothing. */
  async function accept(token: string, name: string | undefined, password: string): Promise<Express.User> {
    const inv = await usableInvitation(token);
    const existing = await ds.getRepository(User).findOne({ where: { email: inv.email } });
    let passwordHash: string | null = null;
    if (existing) {
      // A disabled account answers like a wrong password, after the same bcrypt work (no enumeration).
      if (!(await verifyPassword(password, existing.passwordHash)) || existing.disabled) {
        throw badRequest('The password is not right for this account', { password: 'The password is not right for this account' });
      }
    } else {
      const parsed = { name: personNameSchema.safeParse(name), password: newPasswordSchema.safeParse(password) };
      const fields: Record<string, string> = {};
      if (!parsed.name.success) fields.name = fieldErrors(parsed.name.error)._ ?? 'Name is required';
      if (!parsed.password.success) fields.password = fieldErrors(parsed.password.error)._ ?? 'Invalid password';
      else {
        const problems = accountPasswordProblems(password, { email: inv.email, name });
        if (problems.length) fields.password = problems.join('. ');
      }
      if (Object.keys(fields).length) throw badRequest(`The request body is invalid — ${Object.values(fields)[0]}`, fields);
      passwordHash = await hashPassword(password, config.BCRYPT_COST);
    }
    return ds.transaction(async (m) => {
      const used = await m.getRepository(Invitation).update({ id: inv.id, usedAt: IsNull() }, { usedAt: new Date() });
      if (!used.affected) throw gone('INVITATION_USED', 'This invitation has already been used');
      const users = m.getRepository(User);
      const user =
        existing ??
        (await users.save(users.create({ email: inv.email, name: personNameSchema.parse(name), passwordHash: passwordHash!, isAdmin: false, disabled: false })));
      const mrepo = m.getRepository(Membership);
      const current = await mrepo.findOne({ where: { siteId: inv.siteId, userId: user.id } });
      if (!current) await mrepo.insert({ siteId: inv.siteId, userId: user.id, role: inv.role });
      await users.update({ id: user.id }, { lastSignInAt: new Date() });
      return toSessionUser(user);
    });
  }

  async function leadsLeft(siteId: string, exceptUserId: string): Promise<number> {
    const leads = await memberships.find({ where: { siteId, role: 'Lead' } });
    return leads.filter((l) => l.userId !== exceptUserId).length;
  }

  async function changeRole(siteId: string, userId: string, role: SiteRole): Promise<Member> {
    const m = await memberships.findOne({ where: { siteId, userId }, relations: { user: true } });
    if (!m) throw notFound('The member');
    if (m.role === 'Lead' && role !== 'Lead' && (await leadsLeft(siteId, userId)) === 0) {
      throw conflict('LAST_LEAD', 'A site needs at least one Lead: make someone else Lead first', { role: 'The last Lead cannot be demoted' });
    }
    m.role = role;
    await memberships.update({ siteId, userId }, { role });
    return toMember(m, true);
  }

  async function remove(siteId: string, userId: string): Promise<void> {
    const m = await memberships.findOne({ where: { siteId, userId } });
    if (!m) throw notFound('The member');
    if (m.role === 'Lead' && (await leadsLeft(siteId, userId)) === 0) {
      throw conflict('LAST_LEAD', 'A site needs at least one Lead: make someone else Lead before removing this one');
    }
    await memberships.delete({ siteId, userId });
  }

  return { list, invite, revoke, preview, accept, changeRole, remove };
}
