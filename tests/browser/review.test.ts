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
} from './harness';
import { signIn, startQuarryWithDemoCorpus, waitForDemoIndex } from './demo-matter';

// Issue 5's review browser test: the demo reviewer opens the first result of a demo
// query (corpus-demo/README.md, query 4) and codes three documents with the keyboard
// only (the code's key, then j for the next document), checks that keys typed into the
// note box do nothing, then filters the search on that code and sees exactly those three.

const REVIEWER = 'reviewer@quarry.example';
const QUERY = 'contaminated flour';
const CODE = 'Hot';

async function rowControlNumbers(page: Page): Promise<string[]> {
  return page
    .getByTestId('result-row')
    .evaluateAll((rows) => rows.map((row) => row.getAttribute('data-control-number') ?? ''));
}

describeBrowser('review: keyboard coding, then filtering on the code', () => {
  let quarry: QuarryInstance;
  let browser: BrowserSession;
  let page: Page | undefined;

  beforeAll(async () => {
    quarry = await startQuarryWithDemoCorpus();
    browser = await launchBrowser();
  }, 120_000);

  afterAll(async () => {
    await browser?.close();
    await quarry?.close();
  });

  it('the demo reviewer codes three documents by keyboard and finds exactly those three', async () => {
    screenshotOnFailure(() => page, 'review-keyboard-coding');
    page = await browser.context.newPage();
    const p = page;
    const matterId = quarry.seeded.matterId;
    await signIn(p, quarry.baseUrl, REVIEWER);
    await waitForDemoIndex(p, quarry);

    await p.goto(`${quarry.baseUrl}/matters/${matterId}/search`);
    await p.getByTestId('search-query').fill(QUERY);
    await p.getByTestId('search-query').press('Control+Enter');
    await p.getByTestId('result-row').first().waitFor();
    const total = Number((await p.getByTestId('search-total').textContent())?.replace(/\D/g, ''));
    expect(total).toBeGreaterThanOrEqual(3);

    // Keyboard only from here: focus the first result's link and open it with Enter.
    await p.getByTestId('result-open').first().focus();
    await p.keyboard.press('Enter');
    await p.getByTestId('review-page').waitFor();
    expect(await p.getByTestId('review-caution').isVisible()).toBe(true);

    const toggle = p.locator(`[data-testid="code-toggle"][data-code-name="${CODE}"]`);
    const key = (await toggle.locator('kbd').textContent())?.trim() ?? '';
    expect(key).toMatch(/^[a-z0-9]$/);

    const coded: string[] = [];
    for (let i = 0; i < 3; i += 1) {
      await expect
        .poll(() => p.getByTestId('review-position').textContent())
        .toMatch(new RegExp(`^${i + 1} of `));
      const controlNumber = (await p.getByTestId('review-control-number').textContent()) ?? '';
      expect(await toggle.getAttribute('data-applied')).toBe('false');
      await p.keyboard.press(key);
      await expect.poll(() => toggle.getAttribute('data-applied')).toBe('true');
      coded.push(controlNumber);
      if (i === 0) {
        mkdirSync(ARTIFACTS_DIR, { recursive: true });
        await p.screenshot({ path: join(ARTIFACTS_DIR, 'review-coded.png'), fullPage: false });
      }
      if (i < 2) await p.keyboard.press('j');
    }
    expect(new Set(coded).size).toBe(3);

    // Keys typed into a field are text, not commands: n focuses the note box.
    await p.keyboard.press('n');
    await p.keyboard.type(`j${key}k`);
    expect(await p.getByTestId('note-input').inputValue()).toBe(`j${key}k`);
    expect(await p.getByTestId('review-position').textContent()).toMatch(/^3 of /);
    expect(await toggle.getAttribute('data-applied')).toBe('true');
    await p.keyboard.press('Escape'); // leaves the note box

    // Every change reached the server before the filter runs.
    await expect
      .poll(async () =>
        p.evaluate(
          async ({ id, name }) => {
            const r = await fetch(`/api/matters/${id}/codes`);
            const body = (await r.json()) as { codes: { name: string; documentCount: number }[] };
            return body.codes.find((c) => c.name === name)?.documentCount;
          },
          { id: matterId, name: CODE },
        ),
      )
      .toBe(3);

    // Esc goes back to the results; then filter them on the code.
    await p.keyboard.press('Escape');
    await p.getByTestId('search-page').waitFor();
    await p.getByTestId('filter-codes').locator('summary').click();
    // The filter's state lives in the address bar, so the box shows checked once the
    // page has re-rendered from the new URL: click, then wait for it (check() would
    // demand the change within the click itself).
    const codeBox = p.getByTestId('filter-codes').getByLabel(CODE, { exact: true });
    await codeBox.click();
    await expect.poll(() => codeBox.isChecked()).toBe(true);
    await expect.poll(() => p.getByTestId('search-total').textContent()).toBe('3');
    expect((await rowControlNumbers(p)).sort()).toEqual([...coded].sort());
    for (const row of await p.getByTestId('hit-codes').all())
      expect(await row.textContent()).toContain(CODE);
  }, 360_000);
});
