import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import { dictionary } from '@zxcvbn-ts/language-common';

const LIST = 'passwords-common';
const words = dictionary[LIST];

/** Entries in zxcvbn-ts's list of common and breached passwords (49,233 in language-common 4.1.3). */
export const COMMON_PASSWORD_COUNT = words.length;

// Only the one list: zxcvbn then finds its entries in any case, reversed or with look-alike
// characters (p@ssw0rd), and we ask only whether one entry is the whole password.
const zxcvbn = new ZxcvbnFactory({ dictionary: { [LIST]: words }, useLevenshteinDistance: false });

export function isCommonPassword(password: string): boolean {
  const { sequence } = zxcvbn.check(password);
  return sequence.length === 1 && sequence[0].pattern === 'dictionary' && sequence[0].dictionaryName === LIST;
}
