import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import yauzl from 'yauzl';
import { afterAll, beforeAll, expect, it } from 'vitest';
import {
  type BrowserSession,
  type QuarryInstance,
  describeBrowser,
  launchBrowser,
  screenshotOnFailure,
} from './harness';
import { signIn, startQuarryWithDemoCorpus, waitForDemoIndex } from './demo-matter';

// The demo lead builds a small production from a saved search (keyword "Wendle", a few
// documents of the invented demo matter), resolves its family check, builds it and
// downloads the zip, which holds a manifest and the metadata file.

const LEAD = 'lead@quarry.example';

function zipEntries(file: string): Promise<string[]> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(readFileSync(file), { lazyEntries: true }, (error, zip) => {
      if (error) return reject(error);
      const names: string[] = [];
      zip.on('entry', (entry: yauzl.Entry) => {
        names.push(entry.fileName);
        zip.readEntry();
      });
      zip.on('end', () => resolve(names));
      zip.readEntry();
    });
  });
}

describeBrowser('productions: the lead builds one from a saved search and downloads it', () => {
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

  it('defines, builds and downloads a production', async () => {
    screenshotOnFailure(() => page, 'productions-build');
    page = await browser.context.newPage();
    const p = page;
    const matterId = quarry.seeded.matterId;
    await signIn(p, quarry.baseUrl, LEAD);
    await waitForDemoIndex(p, quarry);
    const saved = await p.evaluate(async (id) => {
      const r = await fetch(`/api/matters/${id}/saved-searches`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json' },
        body: JSON.stringify({ name: 'Wendle payments', query: 'Wendle', mode: 'keyword' }),
      });
      return r.status;
    }, matterId);
    expect(saved).toBe(201);

    await p.goto(`${quarry.baseUrl}/matters/${matterId}/productions`);
    await p.getByTestId('productions-page').waitFor();
    expect(await p.getByTestId('review-caution').count()).toBe(1);
    await p.getByTestId('production-name').fill('Wendle production');
    await p.getByTestId('production-saved-search').selectOption({ label: 'Wendle payments' });
    await p.getByTestId('production-prefix').fill('HGM');
    await p.getByTestId('production-create').click();
    await p.getByTestId('production-detail').waitFor();
    // Resolve a split family, if the saved search splits one, by adding its members.
    const addAll = p.getByRole('button', { name: 'Add all' });
    if (await addAll.isVisible()) await addAll.click();
    await expect
      .poll(() => p.getByTestId('family-check').textContent())
      .toContain('no family is split');
    await p.getByTestId('production-build').click();
    await expect
      .poll(() => p.getByTestId('production-state').textContent(), { timeout: 120_000 })
      .toBe('Built and locked');
    expect(await p.getByTestId('production-range').textContent()).toMatch(
      /^HGM0000001 to HGM\d{7}$/,
    );
    const [download] = await Promise.all([
      p.waitForEvent('download'),
      p.getByTestId('production-download').click(),
    ]);
    expect(download.suggestedFilename()).toBe('Wendle-production.zip');
    const file = await download.path();
    const names = await zipEntries(file);
    expect(names).toContain('manifest.json');
    expect(names).toContain('DATA/metadata.csv');
    expect(names.some((n) => /^PDF\/HGM0000001\.pdf$/.test(n))).toBe(true);
  });
});
