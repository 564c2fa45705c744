import { MoreThan, type EntityManager } from 'typeorm';
import { AppError } from '../../lib/errors';
import { MailRequest } from './mail-request.entity';

type Kind = MailRequest['kind'];

/**
 * Limits on mail a request can make Kfield send to an address (decision 011). A repeat within
 * `repeatSeconds` sends nothing new but is answered the same; beyond the per-target daily count no
 * more mail goes out either (same answer); past the per-account or per-client-address count the
 * request is refused with 429, whatever the address, so the refusal says nothing about accounts.
 */
export const MAIL_LIMITS: Record<Kind, { repeatSeconds: number; perTargetPerDay: number; perAccountPerHour: number; perClientPerHour: number }> = {
  'password-reset': { repeatSeconds: 5 * 60, perTargetPerDay: 5, perAccountPerHour: 30, perClientPerHour: 20 },
  invitation: { repeatSeconds: 5 * 60, perTargetPerDay: 10, perAccountPerHour: 50, perClientPerHour: 100 },
  // Counted per address mailed: one request to 20 addresses counts 20.
  'viewer-link': { repeatSeconds: 5 * 60, perTargetPerDay: 10, perAccountPerHour: 100, perClientPerHour: 200 },
};

export interface MailRequester {
  clientAddress?: string | null;
  requestedById?: string | null;
}

const LABELS: Record<Kind, string> = { 'password-reset': 'password-reset requests', invitation: 'invitations', 'viewer-link': 'viewer-link e-mails' };

const tooMany = (what: string) =>
  new AppError('RATE_LIMITED', `Too many ${what} in the last hour; try again later`, 429, undefined, { 'Retry-After': '3600' });

/**
 * Count this request against the limits and record it (in the caller's transaction). Returns
 * whether a message may go out for it; throws 429 when the account or the client address is over.
 */
export async function admitMailRequest(m: EntityManager, kind: Kind, target: string, who: MailRequester): Promise<{ mayMail: boolean; record: (mailed: boolean) => Promise<void> }> {
  const limits = MAIL_LIMITS[kind];
  const repo = m.getRepository(MailRequest);
  const now = Date.now();
  const since = (seconds: number) => MoreThan(new Date(now - seconds * 1000));
  const targetKey = target.trim().toLowerCase();
  const label = LABELS[kind];
  if (who.clientAddress && (await repo.count({ where: { kind, clientAddress: who.clientAddress, createdAt: since(3600) } })) >= limits.perClientPerHour) {
    throw tooMany(`${label} from this address`);
  }
  if (who.requestedById && (await repo.count({ where: { kind, requestedById: who.requestedById, createdAt: since(3600) } })) >= limits.perAccountPerHour) {
    throw tooMany(`${label} from your account`);
  }
  const recentlyMailed = await repo.exists({ where: { kind, targetKey, mailed: true, createdAt: since(limits.repeatSeconds) } });
  const mailedToday = await repo.count({ where: { kind, targetKey, mailed: true, createdAt: since(24 * 3600) } });
  const mayMail = !recentlyMailed && mailedToday < limits.perTargetPerDay;
  return {
    mayMail,
    record: async (mailed) => {
      await repo.insert({ kind, targetKey, requestedById: who.requestedById ?? null, clientAddress: who.clientAddress ?? null, mailed, createdAt: new Date(now) });
    },
  };
}
