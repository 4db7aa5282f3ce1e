import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import {
  type BrowserSession,
  type QuarryInstance,
  describeBrowser,
  launchBrowser,
  screenshotOnFailure,
  signIn,
  startQuarry,
} from './harness';

// The matter lead's deletion screens: a matter-wide legal hold set on the documents page
// refuses a deletion (the dialog names the hold); once released, deleting a coded
// document asks for a reason, sends it to the Trash, and Purge destroys it.

describeBrowser('legal holds and the trash', () => {
  let quarry: QuarryInstance;
  let browser: BrowserSession;
  let page: Page | undefined;
  let docId: number;
  let sha256: string;

  beforeAll(async () => {
    quarry = await startQuarry();
    browser = await launchBrowser();
    const { ctx, seeded } = quarry;
    // One coded document, written straight to the tables (the upload path has its own tests).
    const blob = await ctx.blobs.putBuffer(Buffer.from('Advice of counsel on the flour claim.'));
    sha256 = blob.sha256;
    const now = new Date().toISOString();
    const row = await ctx.db
      .insertInto('documents')
      .values({
        matter_id: seeded.matterId,
        control_number: 'HOLD-000001',
        original_name: 'advice.txt',
        sha256: blob.sha256,
        size: blob.size,
        extract_status: 'extracted',
        created_at: now,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    docId = row.id;
    await ctx.db
      .insertInto('document_texts')
      .values({
        document_id: docId,
        title: 'Advice',
        body: 'Advice of counsel on the flour claim.',
      })
      .execute();
    const code = await ctx.db
      .selectFrom('codes')
      .select('id')
      .where('matter_id', '=', seeded.matterId)
      .where('name', '=', 'Privileged')
      .executeTakeFirstOrThrow();
    await ctx.db
      .insertInto('document_codes')
      .values({
        document_id: docId,
        code_id: code.id,
        coded_by: seeded.users['lead@quarry.example'],
        coded_at: now,
      })
      .execute();
  });

  afterAll(async () => {
    await browser?.close();
    await quarry?.close();
  });

  it('a hold refuses deletion; without it a coded document needs a reason, goes to the trash and can be purged', async () => {
    page = await browser.context.newPage();
    screenshotOnFailure(() => page, 'holds-trash');
    const p = page;
    const matterUrl = `${quarry.baseUrl}/matters/${quarry.seeded.matterId}`;
    await signIn(p, quarry.baseUrl, 'lead@quarry.example');

    await p.goto(`${matterUrl}/documents`);
    await p.getByTestId('holds-panel').waitFor();
    await p.getByTestId('hold-reason').fill('Preservation letter of 2 May 2021');
    await p.getByTestId('set-hold').click();
    await p.getByTestId('matter-hold-banner').waitFor();
    expect(await p.getByTestId('active-hold').textContent()).toContain('Whole matter');

    await p.goto(`${matterUrl}/documents/${docId}`);
    await p.getByTestId('delete-document').click();
    await p.getByTestId('delete-reason').fill('Clawback request');
    await p.getByTestId('confirm-remove').click();
    const refused = p.getByTestId('delete-refused');
    await refused.waitFor();
    expect(await refused.textContent()).toMatch(/legal hold #\d+ on the whole matter/);
    await p.keyboard.press('Escape');

    await p.goto(`${matterUrl}/documents`);
    await p.getByTestId('release-hold').click();
    await p.getByTestId('release-reason').fill('Preservation letter withdrawn');
    await p.getByTestId('confirm-release-hold').click();
    await p.getByTestId('matter-hold-banner').waitFor({ state: 'detached' });

    await p.goto(`${matterUrl}/documents/${docId}`);
    await p.getByTestId('delete-document').click();
    await p.getByTestId('confirm-remove').click();
    const reasonError = p.getByTestId('delete-reason-error');
    await reasonError.waitFor();
    expect(await reasonError.textContent()).toContain('it is coded (Privileged)');
    await p.getByTestId('delete-reason').fill('Clawback request from opposing counsel');
    await p.getByTestId('confirm-remove').click();
    await p.waitForURL(`${matterUrl}/documents`);

    await p.getByTestId('matter-nav-trash').click();
    const item = p.getByTestId('trash-item');
    await item.waitFor();
    expect(await item.textContent()).toContain('Clawback request from opposing counsel');
    await item.getByTestId('purge-trash-item').click();
    await p.getByTestId('confirm-purge').click();
    await p.getByText('The trash is empty').waitFor();
    expect(await quarry.ctx.blobs.has(sha256)).toBe(false);
    await p.close();
  });
});
