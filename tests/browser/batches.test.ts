import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { createBatchFromDocuments, assignBatch } from '../../server/batches/service';
import { formatControlNumber } from '../../server/documents/control-numbers';
import {
  type BrowserSession,
  type QuarryInstance,
  describeBrowser,
  launchBrowser,
  screenshotOnFailure,
  signIn,
  startQuarry,
} from './harness';

// The demo reviewer works a batch with the keyboard: the single-choice and undo rules,
// the privilege type and basis, required Responsiveness before moving on, check-in; then
// the lead sees the progress. Documents are invented memos inserted for the test.

const REVIEWER = 'reviewer@quarry.example';
const LEAD = 'lead@quarry.example';

async function insertDocuments(quarry: QuarryInstance) {
  const db = quarry.ctx.db;
  const matterId = quarry.seeded.matterId;
  const matter = await db
    .selectFrom('matters')
    .select('control_prefix')
    .where('id', '=', matterId)
    .executeTakeFirstOrThrow();
  const ids: number[] = [];
  const titles = ['Flour supply memo', 'Attached price table', 'Mill inspection notes'];
  for (const [i, title] of titles.entries()) {
    const row = await db
      .insertInto('documents')
      .values({
        matter_id: matterId,
        control_number: formatControlNumber(matter.control_prefix, 900_001 + i),
        original_name: `memo-${i + 1}.txt`,
        original_path: `memo-${i + 1}.txt`,
        sha256: String(i + 1).padEnd(64, 'a'),
        mime: 'text/plain',
        doc_type: 'text',
        size: title.length,
        title,
        sent_at: '2024-03-0' + (i + 1) + 'T09:00:00Z',
        extract_status: 'extracted',
        parent_id: i === 1 ? ids[0] : null,
        duplicate_of: null,
        created_at: new Date().toISOString(),
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    ids.push(row.id);
    await db
      .insertInto('document_texts')
      .values({ document_id: row.id, title, body: `${title}. Invented text for the test.` })
      .execute();
  }
  return ids;
}

describeBrowser('batches: the reviewer codes a batch by keyboard, the lead sees progress', () => {
  let quarry: QuarryInstance;
  let browser: BrowserSession;
  let page: Page | undefined;
  let ids: number[];

  beforeAll(async () => {
    quarry = await startQuarry();
    browser = await launchBrowser();
    ids = await insertDocuments(quarry);
    const lead = { id: quarry.seeded.users[LEAD], email: LEAD, ip: null };
    const { batch } = await createBatchFromDocuments(quarry.ctx, quarry.seeded.matterId, lead, {
      name: 'Supply memos',
      kind: 'review',
      documentIds: [ids[1], ids[2]],
    });
    await assignBatch(
      quarry.ctx.db,
      quarry.seeded.matterId,
      batch.id,
      quarry.seeded.users[REVIEWER],
      lead,
    );
  }, 120_000);

  afterAll(async () => {
    await browser?.close();
    await quarry?.close();
  });

  it('checks out, codes with keys under the group rules, checks in; the lead sees it', async () => {
    screenshotOnFailure(() => page, 'batches-keyboard');
    page = await browser.context.newPage();
    const p = page;
    const base = `${quarry.baseUrl}/matters/${quarry.seeded.matterId}`;
    await signIn(p, quarry.baseUrl, REVIEWER);
    await p.goto(`${base}/batches`);
    const row = p.locator('[data-testid="my-batch"][data-batch-name="Supply memos"]');
    await row.getByTestId('batch-open').click();
    await p.getByTestId('review-page').waitFor();
    // The family came whole and in order: the parent memo leads its attachment.
    expect(await p.getByTestId('review-position').textContent()).toBe('1 of 3');
    expect(await p.getByTestId('review-page').getAttribute('data-document-id')).toBe(
      String(ids[0]),
    );

    const toggle = (name: string) =>
      p.locator(`[data-testid="code-toggle"][data-code-name="${name}"]`);
    const keyOf = async (name: string) =>
      ((await toggle(name).locator('kbd').textContent()) ?? '').trim();
    const applied = (name: string) => toggle(name).getAttribute('data-applied');
    const [responsive, notResponsive, hot, privileged] = await Promise.all(
      ['Responsive', 'Not responsive', 'Hot', 'Privileged'].map(keyOf),
    );

    // Moving on is refused while Responsiveness is empty.
    await p.keyboard.press('j');
    await p.getByTestId('blocked-notice').waitFor();
    expect(await p.getByTestId('review-position').textContent()).toBe('1 of 3');

    // A second choice in the one-choice group replaces the first, with an undo.
    await p.keyboard.press(responsive);
    await expect.poll(() => applied('Responsive')).toBe('true');
    await p.keyboard.press(notResponsive);
    await expect.poll(() => applied('Not responsive')).toBe('true');
    expect(await applied('Responsive')).toBe('false');
    expect(await p.getByTestId('undo-toast').textContent()).toContain(
      'Not responsive replaced Responsive',
    );
    await p.keyboard.press('u');
    await expect.poll(() => applied('Responsive')).toBe('true');
    expect(await applied('Not responsive')).toBe('false');

    // Pressing Hot's key on a document coded Hot removes it, and says so with an undo.
    await p.keyboard.press(hot);
    await expect.poll(() => applied('Hot')).toBe('true');
    await p.keyboard.press(hot);
    await expect.poll(() => applied('Hot')).toBe('false');
    expect(await p.getByTestId('undo-toast').textContent()).toContain('Removed Hot');
    await p.getByTestId('undo-button').click();
    await expect.poll(() => applied('Hot')).toBe('true');

    // Privileged asks for its type and basis before it is applied.
    await p.keyboard.press(privileged);
    await p.getByTestId('privilege-fields').waitFor();
    expect(await applied('Privileged')).toBe('false');
    await p.getByTestId('privilege-basis').fill('Legal advice on supply terms');
    await p.getByTestId('privilege-apply').click();
    await expect.poll(() => applied('Privileged')).toBe('true');

    // The rest of the batch: one key each, then j.
    await p.keyboard.press('j');
    await expect.poll(() => p.getByTestId('review-position').textContent()).toBe('2 of 3');
    await p.keyboard.press(notResponsive);
    await expect.poll(() => applied('Not responsive')).toBe('true');
    await p.keyboard.press('j');
    await expect.poll(() => p.getByTestId('review-position').textContent()).toBe('3 of 3');
    await p.keyboard.press(responsive);
    await expect.poll(() => applied('Responsive')).toBe('true');

    // The server agrees with what the screen shows.
    const stored = await quarry.ctx.db
      .selectFrom('document_codes as dc')
      .innerJoin('codes as c', 'c.id', 'dc.code_id')
      .select(['dc.document_id', 'c.name'])
      .where('dc.document_id', 'in', ids)
      .orderBy('dc.document_id')
      .orderBy('c.sort_order')
      .execute();
    expect(stored.map((r) => `${ids.indexOf(r.document_id)}:${r.name}`)).toEqual([
      '0:Responsive',
      '0:Privileged',
      '0:Hot',
      '1:Not responsive',
      '2:Responsive',
    ]);

    await p.keyboard.press('Escape');
    await p.getByTestId('batches-page').waitFor();
    await row.getByTestId('batch-checkin').click();
    await expect.poll(() => row.count()).toBe(0);

    // The lead's team screen shows the reviewer's batch done.
    await p.context().clearCookies();
    await signIn(p, quarry.baseUrl, LEAD);
    await p.goto(`${base}/batches`);
    const mine = p.locator(`[data-testid="reviewer-progress"][data-reviewer="${REVIEWER}"]`);
    await mine.waitFor();
    expect(await mine.getByTestId('reviewer-coded').textContent()).toBe('3');
    const batchRow = p.locator('[data-testid="batch-row"][data-batch-name="Supply memos"]');
    expect(await batchRow.textContent()).toContain('Checked in');
    expect(await batchRow.getByTestId('batch-progress').textContent()).toContain('3 of 3 done');
  }, 120_000);
});
