import bcrypt from 'bcryptjs';
import { isCommonPassword } from '@shared/schemas/common-passwords';
import { installCommonPasswordCheck, passwordProblems, type PasswordContext } from '@shared/schemas/password';
import { badRequest } from '../lib/errors';

// Every server path that sets a password comes through this module, so the shared schemas'
// common-password rule is armed before the first request.
installCommonPasswordCheck(isCommonPassword);

export const hashPassword = (password: string, cost: number) => bcrypt.hash(password, cost);
export const verifyPassword = (password: string, hash: string) => bcrypt.compare(password, hash);

// A fixed hash at the configured cost to compare against when the account does not exist, so
// that the time of the answer does not reveal it (bcrypt's work doubles with each cost step).
const dummyHashes = new Map<number, Promise<string>>();
export async function burnPasswordCheck(password: string, cost: number): Promise<void> {
  let dummy = dummyHashes.get(cost);
  if (!dummy) dummyHashes.set(cost, (dummy = bcrypt.hash('kfield-no-such-account', cost)));
  await bcrypt.compare(password, await dummy);
}

/** Refuse a new password for this account with a 400 naming the reasons on `password`. */
export function refuseWeakPassword(password: string, account: PasswordContext): void {
  const problems = passwordProblems(password, account);
  if (problems.length) throw badRequest(`The password cannot be used — ${problems[0]}`, { password: problems.join('. ') }, 'WEAK_PASSWORD');
}
