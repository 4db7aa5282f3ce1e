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

// Issue 2's browser test: the demo lead invites a new reviewer by e-mail, the
// invitation is read in the demo mailbox and accepted, and the new reviewer sees
// only what shared/roles.ts lets a reviewer do (the server refuses the rest).

const LEAD = { email: 'lead@quarry.example', password: 'quarry-demo' };
const NEW_REVIEWER = {
  email: 'nadia.newcomer@example.com',
  name: 'Nadia Newcomer',
  password: 'a long passphrase for nadia',
};

describeBrowser('foundation: invite a reviewer end to end', () => {
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

  it(
    'lead invites, mail arrives, invitee accepts and works as a reviewer only',
    { timeout: 120_000 },
    async () => {
      page = await browser.context.newPage();
      screenshotOnFailure(() => page, 'foundation');
      const p = page;
      const matterId = quarry.seeded.matterId;

      // 1. The demo lead signs in and opens the demo matter from the list.
      await signIn(p, quarry.baseUrl, LEAD.email, LEAD.password);
      await p
        .getByTestId('matters-table')
        .getByRole('link', { name: 'Brackenfield Bakeries v Harrowgate Mills' })
        .click();
      await p.waitForURL(`${quarry.baseUrl}/matters/${matterId}`);
      await p.getByTestId('matter-home').waitFor();
      expect(await p.getByTestId('matter-role').textContent()).toBe('Matter lead');
      expect(await p.getByTestId('matter-nav-access').isVisible()).toBe(true);
      expect(await p.getByTestId('matter-nav-activity').isVisible()).toBe(true);
      mkdirSync(ARTIFACTS_DIR, { recursive: true });
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'matter-home-lead.png'), fullPage: true });

      // 2. Access: invite the new reviewer by e-mail.
      await p.getByTestId('matter-nav-access').click();
      await p.getByTestId('access-page').waitFor();
      const form = p.getByTestId('invite-form');
      await form.getByLabel('E-mail address').fill(NEW_REVIEWER.email);
      await form.getByLabel('Role').selectOption('reviewer');
      await form.getByRole('button', { name: 'Send invitation' }).click();
      await p.getByText(`Invitation sent to ${NEW_REVIEWER.email}`).waitFor();
      await p.getByTestId(`invitation-row-${NEW_REVIEWER.email}`).waitFor();

      // 3. The lead signs out. Signed out, the demo mailbox is closed (its links are
      // credentials); the firm admin reads it and hands the link over.
      await p.getByTestId('sign-out').click();
      await p.waitForURL(/\/sign-in/);
      await p.goto(`${quarry.baseUrl}/dev/mail`);
      await p.getByText('Firm administrators only').waitFor();
      await signIn(p, quarry.baseUrl, 'admin@quarry.example');
      await p.goto(`${quarry.baseUrl}/dev/mail`);
      const message = p
        .getByTestId('dev-mail-message')
        .filter({ hasText: NEW_REVIEWER.email })
        .first();
      await message.waitFor();
      const link = message
        .getByTestId('dev-mail-link')
        .filter({ hasText: '/invitations/' })
        .first();
      const href = await link.getAttribute('href');
      expect(href).toMatch(new RegExp(`^${quarry.baseUrl}/invitations/[A-Za-z0-9_-]{43}$`));
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'dev-mail.png'), fullPage: true });

      // 4. Signed out again, follow the link and accept by creating the account.
      await p.goto(`${quarry.baseUrl}/matters`);
      await p.getByTestId('sign-out').click();
      await p.waitForURL(/\/sign-in/);
      await p.goto(href!);
      await p.getByTestId('invitation-page').waitFor();
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'invitation.png'), fullPage: true });
      await p.getByLabel('Your name').fill(NEW_REVIEWER.name);
      await p.getByLabel('Choose a password').fill(NEW_REVIEWER.password);
      await p.getByLabel('Repeat the password').fill(NEW_REVIEWER.password);
      await p.getByRole('button', { name: 'Create account and join' }).click();
      await p.waitForURL(`${quarry.baseUrl}/matters/${matterId}`);

      // The link works once: opening it again says so.
      await p.goto(href!);
      await p.getByRole('heading', { name: 'This invitation cannot be used' }).waitFor();

      // 5. Sign out, then sign in as the new reviewer with the chosen password.
      await p.goto(`${quarry.baseUrl}/matters`);
      await p.getByTestId('sign-out').click();
      await p.waitForURL(/\/sign-in/);
      await signIn(p, quarry.baseUrl, NEW_REVIEWER.email, NEW_REVIEWER.password);
      await p.getByRole('link', { name: 'Brackenfield Bakeries v Harrowgate Mills' }).click();
      await p.getByTestId('matter-home').waitFor();

      // 6. Only what a reviewer may do: no Access or Activity section, no invite controls.
      expect(await p.getByTestId('matter-role').textContent()).toBe('Reviewer');
      const nav = p.getByTestId('matter-nav');
      expect(await nav.getByTestId('matter-nav-overview').isVisible()).toBe(true);
      expect(await nav.getByTestId('matter-nav-access').count()).toBe(0);
      expect(await nav.getByTestId('matter-nav-activity').count()).toBe(0);
      const permissions = await p.getByTestId('role-permissions').innerText();
      expect(permissions).toContain('Code documents');
      expect(permissions).not.toContain('Grant, change and revoke access');
      expect(permissions).not.toContain('Upload documents');
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'matter-home-reviewer.png'), fullPage: true });

      await p.goto(`${quarry.baseUrl}/matters/${matterId}/access`);
      await p.getByText('Not available to your role').waitFor();
      expect(await p.getByTestId('invite-form').count()).toBe(0);
      expect(await p.getByTestId('members-table').count()).toBe(0);

      // 7. Forcing it through the API is refused by the server's policy.
      const forced = await p.evaluate(async (id) => {
        const members = await fetch(`/api/matters/${id}/members`);
        const invite = await fetch(`/api/matters/${id}/invitations`, {
          method: 'POST',
          headers: { 'Content-Type': 'application/json' },
          body: JSON.stringify({ email: 'someone.else@example.com', role: 'lead' }),
        });
        const audit = await fetch(`/api/matters/${id}/audit`);
        return {
          members: members.status,
          invite: invite.status,
          inviteCode: ((await invite.json()) as { error?: { code?: string } }).error?.code,
          audit: audit.status,
        };
      }, matterId);
      expect(forced).toEqual({ members: 403, invite: 403, inviteCode: 'forbidden', audit: 403 });
    },
  );
});
