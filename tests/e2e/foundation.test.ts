/// <reference lib="dom" />
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoEmail } from '../support/test-server';
import { startE2E, type E2E } from './driver';

let e2e: E2E;
beforeAll(async () => {
  e2e = await startE2E();
});
afterAll(async () => e2e?.close());

async function signOut(page: Page) {
  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL((u) => u.pathname === '/sign-in');
}

/** The newest outbox message to an address, opened through the Admin's Outbox page. */
async function openMessageAsAdmin(page: Page, to: string, subject: RegExp) {
  await e2e.signIn(page, demoEmail('Admin'));
  await page.getByRole('link', { name: 'Outbox' }).click();
  await page.getByRole('list', { name: 'Messages' }).getByRole('link').filter({ hasText: `To ${to}` }).first().click();
  await expect.poll(() => page.locator('#outbox-message-subject').textContent()).toMatch(subject);
}

describe('foundation in the browser', () => {
  it('signs in and out as every demo role', async () => {
    const page = await e2e.newPage();
    for (const role of ['Admin', 'Lead', 'Analyst', 'Checker', 'Viewer'] as const) {
      await e2e.signIn(page, demoEmail(role));
      await page.getByRole('heading', { level: 1 }).first().waitFor();
      await expect.poll(() => page.getByRole('link', { name: /Willow Bend former fuel depot/ }).first().isVisible()).toBe(true);
      if (role === 'Admin') await expect.poll(() => page.getByRole('link', { name: 'Users' }).isVisible()).toBe(true);
      else expect(await page.getByRole('link', { name: 'Users' }).count()).toBe(0);
      await e2e.shot(page, `sites-${role.toLowerCase()}-1280`);
      await signOut(page);
    }
    await e2e.shot(page, 'sign-in-1280');
  });

  it('refuses a wrong password with a message beside the form', async () => {
    const page = await e2e.newPage();
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(demoEmail('Viewer'));
    await page.getByLabel('Password', { exact: true }).fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByText('The e-mail or password is not right').isVisible()).toBe(true);
    await e2e.shot(page, 'sign-in-wrong-password');
  });

  it('lets a Lead invite a new address whose e-mailed link creates a member with that role', async () => {
    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Lead'));
    await page.getByRole('link', { name: /Willow Bend former fuel depot/ }).first().click();
    await page.waitForURL(/\/sites\/[0-9a-f-]{36}$/);
    await e2e.shot(page, 'site-overview-lead');
    await page.getByRole('link', { name: /members/i }).first().click();
    await page.waitForURL(/\/members$/);
    await page.getByLabel('E-mail address').fill('new.hydro@demo.kfield.example');
    await page.getByLabel('Role', { exact: true }).selectOption('Checker');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => page.getByLabel('Revoke invitation for new.hydro@demo.kfield.example').isVisible()).toBe(true);
    await e2e.shot(page, 'site-members-lead-1280');
    await signOut(page);

    await openMessageAsAdmin(page, 'new.hydro@demo.kfield.example', /invited to Willow Bend/);
    await e2e.shot(page, 'admin-outbox-invitation');
    const href = await page.getByRole('link', { name: /\/invitations\// }).first().getAttribute('href');
    expect(href).toMatch(new RegExp(`^${e2e.ts.baseUrl}/invitations/`));
    await signOut(page);

    await page.goto(href!);
    await page.getByLabel('Your name').fill('Nell Hydro');
    // A password made of the account's own name is refused with the reason beside the field (OWASP ASVS 5.0 §6.2).
    await page.getByLabel('Password', { exact: true }).fill('nell-hydro-password');
    await page.getByLabel('Repeat password').fill('nell-hydro-password');
    await page.getByRole('button', { name: 'Create account and join' }).click();
    await expect.poll(() => page.getByText(/your name/i).first().isVisible()).toBe(true);
    await e2e.shot(page, 'accept-invitation-own-name');
    await page.getByLabel('Password', { exact: true }).fill('tidewater-gauge-4471');
    await page.getByLabel('Repeat password').fill('tidewater-gauge-4471');
    await e2e.shot(page, 'accept-invitation');
    await page.getByRole('button', { name: 'Create account and join' }).click();
    await page.waitForURL((u) => !u.pathname.startsWith('/invitations'));
    await expect.poll(() => page.getByRole('link', { name: /Willow Bend former fuel depot/ }).first().isVisible()).toBe(true);
    await expect.poll(() => page.getByText('Checker').first().isVisible()).toBe(true);
    await e2e.shot(page, 'sites-new-member');
  });

  it('resets a forgotten password through the e-mailed link, once only', async () => {
    const page = await e2e.newPage();
    await page.goto('/sign-in');
    await page.getByRole('link', { name: 'Forgot password?' }).click();
    await page.getByLabel('E-mail').fill(demoEmail('Analyst'));
    await page.getByRole('button', { name: 'Send reset link' }).click();
    await expect.poll(() => page.getByText(/sent|check your/i).first().isVisible()).toBe(true);
    await e2e.shot(page, 'forgot-password-sent');

    await openMessageAsAdmin(page, demoEmail('Analyst'), /Reset your Kfield password/);
    const href = await page.getByRole('link', { name: /reset-password\?token=/ }).first().getAttribute('href');
    await signOut(page);

    await page.goto(href!);
    await page.getByLabel('New password', { exact: true }).fill('analyst-new-password');
    await page.getByLabel('Repeat new password').fill('analyst-new-password');
    await page.getByRole('button', { name: 'Set new password' }).click();
    // The account's own e-mail in the password is refused, with the reason shown.
    await expect.poll(() => page.getByText(/your e-mail/i).first().isVisible()).toBe(true);
    await e2e.shot(page, 'reset-password-own-email');
    await page.getByLabel('New password', { exact: true }).fill('ridge-borehole-9051');
    await page.getByLabel('Repeat new password').fill('ridge-borehole-9051');
    await e2e.shot(page, 'reset-password');
    await page.getByRole('button', { name: 'Set new password' }).click();
    await page.waitForURL((u) => u.pathname === '/sign-in' || u.pathname === '/');
    await e2e.signIn(page, demoEmail('Analyst'), 'ridge-borehole-9051');
    await signOut(page);

    await page.goto(href!);
    await page.getByLabel('New password', { exact: true }).fill('analyst-third-password');
    await page.getByLabel('Repeat new password').fill('analyst-third-password');
    await page.getByRole('button', { name: 'Set new password' }).click();
    await expect.poll(() => page.getByText(/already been used/).first().isVisible()).toBe(true);
    await e2e.shot(page, 'reset-password-reused');
  });

  it('works at 390 px wide without horizontal overflow', async () => {
    const page = await e2e.newPage({ width: 390, height: 844 });
    await e2e.signIn(page, demoEmail('Lead'));
    await e2e.shot(page, 'sites-lead-390');
    await page.getByRole('link', { name: /Willow Bend former fuel depot/ }).first().click();
    await page.waitForURL(/\/sites\/[0-9a-f-]{36}$/);
    await e2e.shot(page, 'site-overview-390');
    await page.getByRole('link', { name: /members/i }).first().click();
    await page.waitForURL(/\/members$/);
    await e2e.shot(page, 'site-members-390');
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
    expect(overflow).toBeLessThanOrEqual(0);
  });

  it("shows a Viewer the site's members by name and role only, and offers no New site to anyone but an Admin", async () => {
    const page = await e2e.newPage();
    await e2e.signIn(page, demoEmail('Viewer'));
    expect(await page.getByRole('button', { name: 'New site' }).or(page.getByRole('link', { name: 'New site' })).count()).toBe(0);
    await page.getByRole('link', { name: /Willow Bend former fuel depot/ }).first().click();
    await page.waitForURL(/\/sites\/[0-9a-f-]{36}$/);
    await page.getByRole('link', { name: /members/i }).first().click();
    await page.waitForURL(/\/members$/);
    await expect.poll(() => page.getByRole('table', { name: 'Site members' }).getByText('Mara Lindqvist').isVisible()).toBe(true);
    await e2e.shot(page, 'site-members-viewer-1280');
    expect(await page.getByRole('table', { name: 'Site members' }).innerText()).not.toMatch(/@/);
    expect(await page.getByRole('columnheader', { name: 'E-mail' }).count()).toBe(0);
    await signOut(page);

    await e2e.signIn(page, demoEmail('Lead'));
    await page.getByRole('heading', { level: 1 }).first().waitFor();
    expect(await page.getByRole('button', { name: 'New site' }).or(page.getByRole('link', { name: 'New site' })).count()).toBe(0);
    await signOut(page);
    await e2e.signIn(page, demoEmail('Admin'));
    await expect.poll(() => page.getByRole('button', { name: 'New site' }).or(page.getByRole('link', { name: 'New site' })).first().isVisible()).toBe(true);
    await signOut(page);
  });

  it('asks nothing of any origin but its own', () => {
    const foreign = e2e.requests.filter((u) => !u.startsWith(e2e.ts.baseUrl) && !u.startsWith('data:') && !u.startsWith('blob:'));
    expect(e2e.requests.length).toBeGreaterThan(10);
    expect(foreign).toEqual([]);
  });
});
