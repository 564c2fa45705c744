import bcrypt from 'bcryptjs';

export const hashPassword = (password: string, cost: number) => bcrypt.hash(password, cost);
export const verifyPassword = (password: string, hash: string) => bcrypt.compare(password, hash);

// A fixed hash to compare against when the account does not exist, so timing does not reveal it.
let dummyHash: string | null = null;
export async function burnPasswordCheck(password: string): Promise<void> {
  dummyHash ??= await bcrypt.hash('kfield-no-such-account', 10);
  await bcrypt.compare(password, dummyHash);
}
