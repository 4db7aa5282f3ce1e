import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { PASSWORD_MIN_LENGTH } from '../../shared/limits';
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

// Issue 2, account set-up links: the demo firm admin creates an account that receives a
// one-time set-up link by e-mail; the person follows it from the demo mailbox, chooses a
// password and signs in with it; the link then refuses a second use. Afterwards the demo
// lead adds the new account to the demo matter directly and revokes it, and the activity
// log still names the former member.

const ADMIN = { email: 'admin@quarry.example', password: 'quarry-demo' };
const LEAD = { email: 'lead@quarry.example', password: 'quarry-demo' };
const NEWCOMER = {
  email: 'oriel.ashdown@example.com',
  name: 'Oriel Ashdown',
  password: 'tidewater lantern orchard',
};
const MATTER_NAME = 'Brackenfield Bakeries v Harrowgate Mills';

describeBrowser('account set-up link end to end', () => {
  let quarry: QuarryInstance;
  let browser: BrowserSession;
  let page: Page | undefined;

  beforeAll(async () => {
    quarry = await startQuarry({ seedCorpus: false });
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await quarry?.close();
  });

  async function signOut(p: Page) {
    await p.getByTestId('sign-out').click();
    await p.waitForURL(/\/sign-in/);
  }

  it(
    'admin creates an account with a set-up link; the person chooses a password, signs in, and the link works once',
    { timeout: 120_000 },
    async () => {
      page = await browser.context.newPage();
      screenshotOnFailure(() => page, 'account-setup');
      const p = page;

      // 1. The firm admin creates the account, choosing the e-mailed set-up link.
      await signIn(p, quarry.baseUrl, ADMIN.email, ADMIN.password);
      await p.goto(`${quarry.baseUrl}/admin`);
      await p.getByTestId('admin-page').waitFor();
      await p.getByRole('button', { name: 'New account' }).click();
      const form = p.getByTestId('create-account-form');
      await form.waitFor();
      await form.getByLabel('Name', { exact: true }).fill(NEWCOMER.name);
      await form.getByLabel('E-mail', { exact: true }).fill(NEWCOMER.email);
      expect(await form.getByLabel('E-mail a set-up link').isChecked()).toBe(true);
      expect(await form.getByLabel('Temporary password', { exact: true }).count()).toBe(0);
      await form.getByRole('button', { name: 'Create and send link' }).click();
      await p
        .getByTestId('account-created')
        .getByText(`A set-up link was e-mailed to ${NEWCOMER.email}`)
        .waitFor();
      await p.getByTestId('admin-accounts-table').getByText(NEWCOMER.email).waitFor();

      // 2. The mail on the demo mailbox page, which only a firm admin may read in demo mode.
      await p.goto(`${quarry.baseUrl}/dev/mail`);
      const message = p.getByTestId('dev-mail-message').filter({ hasText: NEWCOMER.email }).first();
      await message.waitFor();
      const link = message
        .getByTestId('dev-mail-link')
        .filter({ hasText: '/account-setup/' })
        .first();
      const href = await link.getAttribute('href');
      expect(href).toMatch(new RegExp(`^${quarry.baseUrl}/account-setup/[A-Za-z0-9_-]{43}$`));
      await p.goto(`${quarry.baseUrl}/matters`);
      await signOut(p);

      // 3. The link opens the set-up page for that account.
      await p.goto(href!);
      await p.getByTestId('account-setup-page').waitFor();
      expect(await p.getByTestId('account-setup-email').innerText()).toContain(NEWCOMER.email);
      mkdirSync(ARTIFACTS_DIR, { recursive: true });
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'account-setup.png'), fullPage: true });

      // A password under the minimum is refused in place, under the field, before any request.
      const short = 'x'.repeat(PASSWORD_MIN_LENGTH - 1);
      await p.getByLabel('Choose a password').fill(short);
      await p.getByLabel('Repeat the password').fill(short);
      await p.getByRole('button', { name: 'Set password and sign in' }).click();
      await p
        .getByText(`Use at least ${PASSWORD_MIN_LENGTH} characters for the password.`)
        .waitFor();
      expect(await p.getByLabel('Choose a password').getAttribute('aria-invalid')).toBe('true');

      // 4. A good password: the server signs the browser in and the page goes on to the matters.
      await p.getByLabel('Choose a password').fill(NEWCOMER.password);
      await p.getByLabel('Repeat the password').fill(NEWCOMER.password);
      await p.getByRole('button', { name: 'Set password and sign in' }).click();
      await p.waitForURL(`${quarry.baseUrl}/matters`);
      await p.getByRole('heading', { name: 'My matters' }).waitFor();

      // 5. The link works once.
      await p.goto(href!);
      await p.getByRole('heading', { name: 'This link has already been used' }).waitFor();
      expect(await p.getByTestId('account-setup-form').count()).toBe(0);
      const reuse = await p.evaluate(async (url) => {
        const response = await fetch(
          new URL(url).pathname.replace('/account-setup/', '/api/account-setup/'),
          {
            method: 'POST',
            headers: { 'Content-Type': 'application/json' },
            body: JSON.stringify({ password: 'another long passphrase' }),
          },
        );
        return {
          status: response.status,
          body: (await response.json()) as { error?: { code?: string } },
        };
      }, href!);
      expect(reuse).toMatchObject({ status: 409, body: { error: { code: 'invitation_used' } } });

      // 6. Signed out, the person signs in with the password they chose.
      await p.goto(`${quarry.baseUrl}/matters`);
      await signOut(p);
      await signIn(p, quarry.baseUrl, NEWCOMER.email, NEWCOMER.password);
    },
  );

  it(
    'the lead adds the new account directly, revokes it, and the log still names the person',
    { timeout: 120_000 },
    async () => {
      page = await browser.context.newPage();
      screenshotOnFailure(() => page, 'account-setup-grant');
      const p = page;
      const matterId = quarry.seeded.matterId;

      // Start signed out whatever the first test left behind.
      await browser.context.clearCookies();
      await signIn(p, quarry.baseUrl, LEAD.email, LEAD.password);
      await p.getByRole('link', { name: MATTER_NAME }).click();
      await p.getByTestId('matter-nav-access').click();
      await p.getByTestId('access-page').waitFor();

      // An address with no account: the server's refusal shows under the e-mail field.
      const form = p.getByTestId('grant-form');
      const emailField = form.getByLabel('Account e-mail');
      await emailField.fill('nobody.here@example.com');
      await form.getByRole('button', { name: 'Add to matter' }).click();
      await form
        .getByText('No account has this e-mail address; send an invitation instead.')
        .waitFor();
      expect(await emailField.getAttribute('aria-invalid')).toBe('true');
      mkdirSync(ARTIFACTS_DIR, { recursive: true });
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'access-grant.png'), fullPage: true });

      // The new account: added at once as an attorney.
      await emailField.fill(NEWCOMER.email);
      await form.getByLabel('Role').selectOption('attorney');
      await form.getByRole('button', { name: 'Add to matter' }).click();
      const row = p.getByTestId(`member-row-${NEWCOMER.email}`);
      await row.waitFor();
      expect(await row.getByLabel(`Role of ${NEWCOMER.name}`).inputValue()).toBe('attorney');

      // Adding the same account again is refused under the field.
      await emailField.fill(NEWCOMER.email);
      await form.getByRole('button', { name: 'Add to matter' }).click();
      await form.getByText(`${NEWCOMER.email} is already a member of this matter.`).waitFor();

      // Revoke, then read the log: the revocation names the former member.
      await row.getByRole('button', { name: 'Revoke' }).click();
      await p.getByRole('dialog').getByRole('button', { name: 'Revoke access' }).click();
      await expect.poll(() => row.count()).toBe(0);

      await p.goto(`${quarry.baseUrl}/matters/${matterId}/activity`);
      await p.getByTestId('activity-page').waitFor();
      const newest = p.getByTestId('audit-row').first();
      await expect.poll(() => newest.innerText()).toContain(NEWCOMER.name);
      expect(await newest.innerText()).toContain(NEWCOMER.email);

      // A day range filters the table, and the CSV link exports the same range.
      const today = new Date().toISOString().slice(0, 10);
      await p.getByTestId('audit-filter-from').fill(today);
      await expect.poll(() => p.url()).toContain(`from=${today}`);
      const href = (await p.getByTestId('audit-csv').getAttribute('href')) ?? '';
      expect(href).toBe(`/api/matters/${matterId}/audit.csv?from=${today}`);
      const csv = await p.evaluate(async (url) => (await fetch(url)).text(), href);
      expect(csv.split('\r\n')[0]).toContain('Time (UTC),Actor,Actor e-mail,Action');
      expect(csv).toContain(NEWCOMER.email);
    },
  );
});
