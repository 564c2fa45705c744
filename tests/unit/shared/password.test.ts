import { describe, expect, it } from 'vitest';
import { newPasswordSchema } from '@shared/schemas/common';
import { newPasswordFor, passwordProblems } from '@shared/schemas/password';
import { COMMON_PASSWORD_COUNT, isCommonPassword } from '@shared/schemas/common-passwords';
import { installCommonPasswordCheck } from '@shared/schemas/password';
import { DEMO_PASSWORD, DEMO_USERS } from '../../../server/db/seed/demo';

installCommonPasswordCheck(isCommonPassword);

// OWASP ASVS 5.0 §6.2: no context-specific words (6.2.11), no common or breached passwords
// (6.2.4, 6.2.12), and the reason is shown to the person choosing the password.
describe('new-password rules (OWASP ASVS 5.0 §6.2)', () => {
  it('checks against a list of at least 10,000 common passwords (zxcvbn-ts passwords-common: 49,233)', () => {
    expect(COMMON_PASSWORD_COUNT).toBeGreaterThanOrEqual(10_000);
  });

  it.each(['123qweasdzxc', '1qaz2wsx3edc', 'qwerty123456', 'QWERTY123456', 'cxzdsaewq321', '1q@z2wsx3edc'])(
    'refuses the common password %s (any case, reversed, or with look-alike characters)',
    (password) => {
      expect(passwordProblems(password, {})).toContainEqual(expect.stringMatching(/common/i));
    },
  );

  it('refuses a password of one repeated character', () => {
    expect(passwordProblems('aaaaaaaaaaaaaa', {})).toContainEqual(expect.stringMatching(/one character repeated/i));
    expect(passwordProblems('ééééééééééééé', {})).toContainEqual(expect.stringMatching(/one character repeated/i));
  });

  it("refuses the account's own e-mail or name, also inside a longer password", () => {
    const context = { email: 'mara.lindqvist@example.org', name: 'Mara Lindqvist' };
    expect(passwordProblems('mara.lindqvist@example.org', context)).toContainEqual(expect.stringMatching(/e-mail/));
    expect(passwordProblems('my-Mara.Lindqvist-2025', context)).toContainEqual(expect.stringMatching(/name/));
    expect(passwordProblems('lindqvist.mara.1', context)).toContainEqual(expect.stringMatching(/e-mail|name/));
    expect(passwordProblems('juniper-cobalt-harbour', context)).toEqual([]);
  });

  it('keeps the length rules of the schema (12 to 72 bytes)', () => {
    expect(passwordProblems('short', {})).toContainEqual(expect.stringMatching(/at least 12 bytes/));
    expect(passwordProblems('x'.repeat(40) + 'y'.repeat(40), {})).toContainEqual(expect.stringMatching(/at most 72 bytes/));
  });

  it('puts the reason on the password field of the shared schemas', () => {
    const plain = newPasswordSchema.safeParse('qwerty123456');
    expect(plain.success).toBe(false);
    expect(plain.error?.issues[0].message).toMatch(/common/i);
    const mine = newPasswordFor({ email: 'sam@example.org', name: 'Sam Whitlow' }).safeParse('sam.whitlow.pass');
    expect(mine.error?.issues[0].message).toMatch(/name/);
  });

  it('accepts the demo password for every demo account', () => {
    for (const u of DEMO_USERS) expect(passwordProblems(DEMO_PASSWORD, { email: u.email, name: u.name })).toEqual([]);
  });
});
