import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import {
  ARTIFACTS_DIR,
  type BrowserSession,
  type QuarryInstance,
  describeBrowser,
  launchBrowser,
  screenshotOnFailure,
  signIn,
  startQuarry,
} from './harness';

// The issue-2 screens beyond the invitation path: firm admin (accounts, matters,
// appoint lead), the lead's access page (role change, revoke) and activity log
// (filters), and My account. Each page is also saved to tests/.artifacts/ for review.

const PASSWORD = 'quarry-demo';

describeBrowser('foundation screens', () => {
  let quarry: QuarryInstance;
  let browser: BrowserSession;
  let page: Page | undefined;

  beforeAll(async () => {
    quarry = await startQuarry();
    browser = await launchBrowser();
    mkdirSync(ARTIFACTS_DIR, { recursive: true });
  });

  afterAll(async () => {
    await browser?.close();
    await quarry?.close();
  });

  const shot = (p: Page, name: string) =>
    p.screenshot({ path: join(ARTIFACTS_DIR, `${name}.png`), fullPage: true });

  async function signInAs(p: Page, email: string, password = PASSWORD) {
    await p.context().clearCookies();
    await signIn(p, quarry.baseUrl, email, password);
  }

  it('shows a clear error on a wrong password and sends a signed-out visitor to sign-in and back', async () => {
    page = await browser.context.newPage();
    screenshotOnFailure(() => page, 'sign-in');
    const p = page;
    await p.context().clearCookies();
    await p.goto(`${quarry.baseUrl}/matters/${quarry.seeded.matterId}/access`);
    await p.waitForURL(/\/sign-in\?next=/);
    await p.getByLabel('E-mail').fill('lead@quarry.example');
    await p.getByLabel('Password').fill('not the password');
    await p.getByRole('button', { name: 'Sign in' }).click();
    const alert = p.getByRole('alert').filter({ hasText: 'Not signed in' });
    await alert.waitFor();
    await shot(p, 'sign-in-error');
    await p.getByLabel('Password').fill(PASSWORD);
    await p.getByRole('button', { name: 'Sign in' }).click();
    // Back where the visitor was going.
    await p.waitForURL(`${quarry.baseUrl}/matters/${quarry.seeded.matterId}/access`);
    await p.getByTestId('members-table').waitFor();
    await p.close();
  });

  it('signs in and opens a matter by keyboard alone, with a visible focus ring', async () => {
    page = await browser.context.newPage();
    screenshotOnFailure(() => page, 'keyboard');
    const p = page;
    await p.context().clearCookies();
    await p.goto(`${quarry.baseUrl}/sign-in`);
    // The e-mail field has focus on arrival.
    const email = p.getByLabel('E-mail');
    await expect
      .poll(() => email.evaluate((element) => element === document.activeElement))
      .toBe(true);
    await p.keyboard.type('lead@quarry.example');
    await p.keyboard.press('Tab');
    await p.keyboard.type(PASSWORD);
    await p.keyboard.press('Tab');
    const focused = await p.evaluate(() => {
      const element = document.activeElement as HTMLElement;
      const style = getComputedStyle(element);
      return { text: element.textContent, outline: `${style.outlineStyle} ${style.outlineWidth}` };
    });
    expect(focused).toEqual({ text: 'Sign in', outline: 'solid 2px' });
    await p.keyboard.press('Enter');
    await p.waitForURL(`${quarry.baseUrl}/matters`);
    const link = p.getByRole('link', { name: 'Brackenfield Bakeries v Harrowgate Mills' });
    await link.waitFor();
    // Tab through the page until the matter's link holds focus, then open it.
    for (let step = 0; step < 12; step += 1) {
      await p.keyboard.press('Tab');
      if (await link.evaluate((element) => element === document.activeElement)) break;
    }
    await p.keyboard.press('Enter');
    await p.getByTestId('matter-home').waitFor();
    await p.close();
  });

  it('firm admin creates an account and a matter, then appoints a lead', async () => {
    page = await browser.context.newPage();
    screenshotOnFailure(() => page, 'admin');
    const p = page;
    await signInAs(p, 'admin@quarry.example');
    // The admin has no matter role: the list is empty and says what to do.
    await p.getByText('You are not on any matter yet').waitFor();
    await p.getByTestId('nav-admin').click();
    await p.getByTestId('admin-page').waitFor();

    await p.getByRole('button', { name: 'New account' }).click();
    const accountDialog = p.getByRole('dialog', { name: 'New account' });
    await accountDialog.getByLabel('Name', { exact: true }).fill('Priya Partner');
    await accountDialog.getByLabel('E-mail', { exact: true }).fill('priya.partner@example.com');
    // The other choice, an e-mailed set-up link, is tests/browser/account-setup.test.ts.
    await accountDialog.getByLabel('Set a temporary password').check();
    await accountDialog
      .getByLabel('Temporary password', { exact: true })
      .fill('temporary passphrase 1');
    await accountDialog.getByRole('button', { name: 'Create account' }).click();
    await accountDialog.waitFor({ state: 'hidden' });
    await p.getByTestId('admin-accounts-table').getByText('priya.partner@example.com').waitFor();

    await p.getByRole('button', { name: 'New matter' }).click();
    const matterDialog = p.getByRole('dialog', { name: 'New matter' });
    await matterDialog.getByLabel('Name').fill('Ostler & Vane supply audit');
    await matterDialog.getByLabel('Control prefix').fill('osva');
    expect(await matterDialog.getByLabel('Control prefix').inputValue()).toBe('OSVA');
    await matterDialog.getByLabel("Lead's e-mail").fill('nobody@example.com');
    await matterDialog.getByRole('button', { name: 'Create matter' }).click();
    // An unknown lead is refused with the server's message, and nothing is created.
    await matterDialog
      .getByText(/nobody@example\.com|no account|not found/i)
      .first()
      .waitFor();
    await matterDialog.getByLabel("Lead's e-mail").fill('priya.partner@example.com');
    await matterDialog.getByRole('button', { name: 'Create matter' }).click();
    await matterDialog.waitFor({ state: 'hidden' });
    const row = p
      .getByTestId('admin-matters-table')
      .getByRole('row')
      .filter({ hasText: 'Ostler & Vane supply audit' });
    await row.getByText('Priya Partner').waitFor();

    await row.getByRole('button', { name: 'Appoint lead' }).click();
    const leadDialog = p.getByRole('dialog', { name: /Appoint a lead/ });
    await leadDialog.getByLabel('Account e-mail').fill('attorney@quarry.example');
    await leadDialog.getByRole('button', { name: 'Appoint lead' }).click();
    await leadDialog.waitFor({ state: 'hidden' });
    await row.getByText('Arturo Attorney').waitFor();
    await shot(p, 'admin');
    await p.close();
  });

  it('lead changes a role, revokes a member and reads both in the activity log', async () => {
    page = await browser.context.newPage();
    screenshotOnFailure(() => page, 'access');
    const p = page;
    const matterId = quarry.seeded.matterId;
    await signInAs(p, 'lead@quarry.example');
    await p.goto(`${quarry.baseUrl}/matters/${matterId}/access`);

    const paralegal = p.getByTestId('member-row-paralegal@quarry.example');
    await paralegal.getByLabel('Role of Pia Paralegal').selectOption('attorney');
    await expect
      .poll(() => paralegal.getByLabel('Role of Pia Paralegal').inputValue())
      .toBe('attorney');

    const outsiderRow = p.getByTestId('member-row-reviewer@quarry.example');
    await outsiderRow.getByRole('button', { name: 'Revoke' }).click();
    const dialog = p.getByRole('dialog', { name: /Revoke Rowan Reviewer/ });
    await dialog.getByRole('button', { name: 'Revoke access' }).click();
    await dialog.waitFor({ state: 'hidden' });
    await outsiderRow.waitFor({ state: 'detached' });
    await shot(p, 'access');

    // The server agrees: the revoked reviewer is gone, the paralegal is now an attorney.
    const members = await p.evaluate(async (id) => {
      const response = await fetch(`/api/matters/${id}/members`);
      return ((await response.json()) as { members: { email: string; role: string }[] }).members;
    }, matterId);
    expect(members.find((m) => m.email === 'reviewer@quarry.example')).toBeUndefined();
    expect(members.find((m) => m.email === 'paralegal@quarry.example')?.role).toBe('attorney');

    await p.getByTestId('matter-nav-activity').click();
    await p.getByTestId('audit-table').waitFor();
    const log = p.getByTestId('audit-table');
    await log.getByText('Revoked access').first().waitFor();
    await log.getByText('Changed a role').first().waitFor();
    // Newest first: the revocation came after the role change.
    const actions = await p.getByTestId('audit-row').locator('td:nth-child(3)').allInnerTexts();
    expect(actions.indexOf('Revoked access')).toBeLessThan(actions.indexOf('Changed a role'));

    // The log names whose role changed, not only the change.
    await p
      .getByTestId('audit-row')
      .filter({ hasText: 'Changed a role' })
      .getByText('Pia Paralegal')
      .waitFor();
    await p.getByTestId('audit-filter-action').selectOption('member.role_changed');
    await expect
      .poll(
        async () =>
          new Set(await p.getByTestId('audit-row').locator('td:nth-child(3)').allInnerTexts()),
      )
      .toEqual(new Set(['Changed a role']));
    await shot(p, 'activity');
    await p.close();
  });

  it('a person with no role on the matter sees the same "no such matter" as for one that does not exist', async () => {
    page = await browser.context.newPage();
    screenshotOnFailure(() => page, 'outsider');
    const p = page;
    await signInAs(p, 'outsider@quarry.example');
    await p.getByText('You are not on any matter yet').waitFor();
    for (const id of [quarry.seeded.matterId, 999_999]) {
      await p.goto(`${quarry.baseUrl}/matters/${id}`);
      await p.getByTestId('not-found').getByText('No such matter').waitFor();
      expect(await p.getByTestId('matter-nav').count()).toBe(0);
    }
    const status = await p.evaluate(
      async (id) => (await fetch(`/api/matters/${id}`)).status,
      quarry.seeded.matterId,
    );
    expect(status).toBe(404);
    await p.close();
  });

  it('a person changes their password on My account and signs in with the new one', async () => {
    page = await browser.context.newPage();
    screenshotOnFailure(() => page, 'account');
    const p = page;
    await signInAs(p, 'outsider@quarry.example');
    await p.getByTestId('nav-account').click();
    const form = p.getByTestId('change-password-form');
    await form.getByLabel('Current password').fill(PASSWORD);
    await form.getByLabel('New password', { exact: true }).fill('short');
    await form.getByLabel('Repeat the new password').fill('short');
    await form.getByRole('button', { name: 'Change password' }).click();
    await form.getByText('Use at least 12 characters.').waitFor();
    await form.getByLabel('New password', { exact: true }).fill('outsider new passphrase');
    await form.getByLabel('Repeat the new password').fill('outsider new passphrase');
    await form.getByRole('button', { name: 'Change password' }).click();
    await form.getByText('Password changed.').waitFor();
    await shot(p, 'account');
    await signInAs(p, 'outsider@quarry.example', 'outsider new passphrase');
    await p.close();
  });
});
