import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { createUserByAdmin } from '../../server/admin/service';
import { createInvitation } from '../../server/invitations/service';
import {
  type BrowserSession,
  type QuarryInstance,
  describeBrowser,
  launchBrowser,
  screenshotOnFailure,
  startQuarry,
} from './harness';

// Accepting an invitation by creating an account used to end on "This page failed —
// CancelledError" (twice out of twice in the review): the accept step emptied the query
// cache while the signed-in page's loader was fetching the new session, and the
// invitation page, left without its cached preview, unmounted the last observer of that
// fetch, which TanStack Query then cancels ("Query cancellation": a query whose signal was
// consumed is aborted when its last observer goes). This clicks through the real page.

const INVITEE = {
  email: 'perrin.oakhollow@example.com',
  name: 'Perrin Oakhollow',
  password: 'moss gate lantern quarry',
};

describeBrowser('accepting an invitation with a new account', () => {
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
    '"Create account and join" lands on the matter page, not an error page',
    { timeout: 60_000 },
    async () => {
      page = await browser.context.newPage();
      screenshotOnFailure(() => page, 'invitation-accept');
      const p = page;
      const { ctx, seeded, baseUrl } = quarry;
      const lead = await ctx.db
        .selectFrom('users')
        .select(['id', 'email', 'name'])
        .where('email', '=', 'lead@quarry.example')
        .executeTakeFirstOrThrow();
      await createInvitation(
        ctx,
        seeded.matterId,
        { email: INVITEE.email, role: 'reviewer' },
        { ...lead, ip: null },
        baseUrl,
      );
      const mail = await ctx.mail.fake!.waitFor((m) => m.to.includes(INVITEE.email));
      const link = mail.links.find((l) => l.includes('/invitations/'))!;

      await p.goto(link);
      await p.getByTestId('invitation-page').waitFor();
      // Demo mode (the harness default): every screen, signed in or not, carries the banner.
      await p.getByTestId('demo-banner').waitFor();
      expect(await p.getByTestId('demo-banner').innerText()).toMatch(
        /published password.*real documents do not belong here/s,
      );
      await p.getByLabel('Your name').fill(INVITEE.name);
      await p.getByLabel('Choose a password').fill(INVITEE.password);
      await p.getByLabel('Repeat the password').fill(INVITEE.password);
      await p.getByRole('button', { name: 'Create account and join' }).click();
      await p.waitForURL(`${baseUrl}/matters/${seeded.matterId}`);
      // The matter's own frame (its section navigation) shows; the error page never does.
      await p.getByTestId('matter-nav-search').waitFor();
      expect(await p.getByText('This page failed').count()).toBe(0);
      expect(await p.getByText('CancelledError').count()).toBe(0);
      expect(await p.getByTestId('demo-banner').isVisible()).toBe(true);
    },
  );

  it(
    'an account with an admin-set temporary password is sent to the password change first',
    { timeout: 60_000 },
    async () => {
      page = await browser.context.newPage();
      screenshotOnFailure(() => page, 'temporary-password');
      const p = page;
      const { ctx, baseUrl } = quarry;
      await p.context().clearCookies();
      const admin = await ctx.db
        .selectFrom('users')
        .select(['id', 'email', 'name'])
        .where('email', '=', 'admin@quarry.example')
        .executeTakeFirstOrThrow();
      const temporary = 'saffron pebble lantern ridge';
      await createUserByAdmin(
        ctx,
        {
          name: 'Idris Penhallow',
          email: 'idris.penhallow@example.com',
          temporaryPassword: temporary,
          isAdmin: false,
        },
        { ...admin, ip: null },
        baseUrl,
      );
      await p.goto(`${baseUrl}/sign-in`);
      await p.getByLabel('E-mail').fill('idris.penhallow@example.com');
      await p.getByLabel('Password').fill(temporary);
      await p.getByRole('button', { name: /sign in/i }).click();
      await p.waitForURL(`${baseUrl}/account`);
      await p.getByText('Choose your own password').waitFor();
      // Another page is not offered until the password is changed.
      await p.goto(`${baseUrl}/matters`);
      await p.waitForURL(`${baseUrl}/account`);
      // The shared rules refuse a guessable password before anything is sent.
      await p.getByLabel('Current password').fill(temporary);
      await p.getByLabel('New password', { exact: true }).fill('password1234');
      await p.getByLabel(/repeat/i).fill('password1234');
      await p.getByRole('button', { name: /change password/i }).click();
      await p.getByText(/too easy to guess/).waitFor();
      await p.getByLabel('New password', { exact: true }).fill('my own granite footpath');
      await p.getByLabel(/repeat/i).fill('my own granite footpath');
      await p.getByRole('button', { name: /change password/i }).click();
      await expect.poll(() => p.getByText('Choose your own password').count()).toBe(0);
      await p.goto(`${baseUrl}/matters`);
      await p.getByRole('heading', { name: 'My matters' }).waitFor();
    },
  );
});
