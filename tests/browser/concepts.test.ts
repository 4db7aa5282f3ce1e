import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import type { MapResponse } from '../../shared/schemas/concepts';
import type { IndexStateResponse } from '../../shared/schemas/indexing';
import {
  ARTIFACTS_DIR,
  type BrowserSession,
  type QuarryInstance,
  describeBrowser,
  launchBrowser,
  screenshotOnFailure,
} from './harness';
import { signIn, startQuarryWithDemoCorpus, waitForDemoIndex } from './demo-matter';

// Issue 6's browser test: the demo lead opens the concept space's spectrum, tries
// another k, rebuilds from that screen and sees the new build's k and energy beside the
// old; the document map draws every indexed demo document and a click opens one.
//
// The energy kept by a rank-k space is sum_{i<=k} sigma_i^2 / ||A||_F^2 (Eckart and
// Young 1936), which strictly falls when k falls as long as sigma_k > 0: a rebuild at a
// smaller k must show a smaller energy figure, not merely a different one.

const LEAD = 'lead@quarry.example';

async function indexState(page: Page, matterId: number): Promise<IndexStateResponse> {
  return page.evaluate(async (id) => {
    const response = await fetch(`/api/matters/${id}/index`, { credentials: 'same-origin' });
    if (!response.ok) throw new Error(`GET /index answered ${response.status}`);
    return (await response.json()) as IndexStateResponse;
  }, matterId);
}

const percent = (text: string | null) => Number((text ?? '').replace(/[^0-9.]/g, ''));

describeBrowser('concept space: spectrum, rebuild with another k, document map', () => {
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

  it('the demo lead rebuilds at another k from the spectrum and opens a document from the map', async () => {
    screenshotOnFailure(() => page, 'concepts');
    page = await browser.context.newPage();
    const p = page;
    const matterId = quarry.seeded.matterId;
    mkdirSync(ARTIFACTS_DIR, { recursive: true });

    await signIn(p, quarry.baseUrl, LEAD);
    const ready = await waitForDemoIndex(p, quarry);
    const oldK = ready.current?.k ?? 0;
    expect(oldK).toBeGreaterThan(2);

    // The section is in the matter's navigation; it opens on the spectrum.
    await p.goto(`${quarry.baseUrl}/matters/${matterId}`);
    await p.getByTestId('matter-nav-concepts').click();
    await p.waitForURL(/\/concepts\/spectrum$/);
    await p.getByTestId('spectrum-chart').waitFor();
    expect(await p.getByTestId('spectrum-k').textContent()).toBe(String(oldK));
    expect(await p.getByTestId('spectrum-chart').getAttribute('data-k')).toBe(String(oldK));
    const oldEnergy = percent(await p.getByTestId('spectrum-energy').textContent());
    expect(oldEnergy).toBeGreaterThan(0);
    expect(oldEnergy).toBeLessThanOrEqual(100);
    // recharts draws one bar per singular value.
    await expect
      .poll(() => p.locator('[data-testid="spectrum-chart"] .recharts-bar-rectangle').count())
      .toBe(oldK);
    await p.screenshot({
      path: join(ARTIFACTS_DIR, 'concepts-spectrum-before.png'),
      fullPage: true,
    });

    // A k above the matter's document count is refused in the form by the API's own rule
    // (shared indexKError: k <= min(m, n)), and nothing is queued.
    const impossible = (await indexState(p, matterId)).buildableDocuments + 1;
    await p.getByTestId('rebuild-k').fill(String(impossible));
    await p.getByTestId('rebuild-submit').click();
    await expect
      .poll(() => p.getByTestId('rebuild-form').textContent())
      .toContain(`must be at most ${impossible - 1}, the number of documents`);
    expect(await p.getByTestId('rebuild-progress').count()).toBe(0);

    // Another k, typed into the lead's form; the preview reads the current spectrum.
    const newK = Math.max(3, oldK - 10);
    await p.getByTestId('rebuild-k').fill(String(newK));
    await expect
      .poll(() => p.getByTestId('rebuild-preview').textContent())
      .toContain(`k = ${newK}`);
    await p.getByTestId('rebuild-submit').click();
    await p.getByTestId('rebuild-progress').waitFor();
    await p.getByTestId('rebuild-done').waitFor({ timeout: 240_000 });

    // The new version serves: its k and energy are shown, and the old ones beside them.
    await expect
      .poll(() => p.getByTestId('spectrum-k').textContent(), { timeout: 30_000 })
      .toBe(String(newK));
    expect(await p.getByTestId('spectrum-chart').getAttribute('data-k')).toBe(String(newK));
    await expect
      .poll(() => p.locator('[data-testid="spectrum-chart"] .recharts-bar-rectangle').count())
      .toBe(newK);
    const newEnergy = percent(await p.getByTestId('spectrum-energy').textContent());
    expect(newEnergy).toBeGreaterThan(0);
    expect(newEnergy).toBeLessThan(oldEnergy);
    const comparison = p.getByTestId('version-comparison');
    expect(await comparison.getByTestId('previous-k').textContent()).toBe(String(oldK));
    expect(await comparison.getByTestId('current-k').textContent()).toBe(String(newK));
    expect(percent(await comparison.getByTestId('previous-energy').textContent())).toBe(oldEnergy);
    expect(percent(await comparison.getByTestId('current-energy').textContent())).toBe(newEnergy);
    // The API agrees with the screen.
    const rebuilt = await indexState(p, matterId);
    expect(rebuilt.current?.k).toBe(newK);
    expect(rebuilt.current?.version).toBeGreaterThan(ready.current?.version ?? 0);
    await p.screenshot({
      path: join(ARTIFACTS_DIR, 'concepts-spectrum-after.png'),
      fullPage: true,
    });

    // The other views of the new version, with a look at each (screenshots for design review).
    const indexed = rebuilt.counts.indexed + rebuilt.counts.foldedIn;
    await p.getByTestId('concepts-tab-health').click();
    await expect
      .poll(() => p.getByTestId('health-documents').textContent())
      .toBe(indexed.toLocaleString('en-GB'));
    await p.screenshot({ path: join(ARTIFACTS_DIR, 'concepts-health.png'), fullPage: true });
    await p.getByTestId('concepts-tab-dimensions').click();
    await p.getByTestId('dimension-1').waitFor();
    const firstTerm = await p
      .getByTestId('dimension-1')
      .locator('li span[title]')
      .first()
      .getAttribute('title');
    await p.screenshot({ path: join(ARTIFACTS_DIR, 'concepts-dimensions.png') });
    await p.getByTestId('concepts-tab-terms').click();
    await p.getByTestId('neighbours-term').fill(firstTerm ?? 'contract');
    await p.getByTestId('neighbours-submit').click();
    await p.getByTestId('neighbour-row').first().waitFor();
    await p.screenshot({ path: join(ARTIFACTS_DIR, 'concepts-terms.png') });
    await p.getByTestId('concepts-tab-groups').click();
    await p.getByTestId('groups-count').fill('6');
    await p.getByTestId('groups-run').click();
    // The grouping is a background job the page polls (a worker thread runs k-means).
    await expect.poll(() => p.getByTestId('group-row').count(), { timeout: 30_000 }).toBe(6);
    await p.screenshot({ path: join(ARTIFACTS_DIR, 'concepts-groups.png') });

    // The map draws every document of the serving version.
    await p.getByTestId('concepts-tab-map').click();
    const canvas = p.getByTestId('document-map-canvas');
    await canvas.waitFor();
    expect(indexed).toBeGreaterThan(50);
    await expect.poll(() => canvas.getAttribute('data-points')).toBe(String(indexed));
    expect(await canvas.getAttribute('data-total')).toBe(String(indexed));
    await p.screenshot({ path: join(ARTIFACTS_DIR, 'concepts-map.png'), fullPage: true });

    // Point at a document's mark: the tooltip names it; a click opens that document.
    const [sx, sy, sampleId] = ((await canvas.getAttribute('data-sample')) ?? '')
      .split(',')
      .map(Number);
    expect(sampleId).toBeGreaterThan(0);
    const box = await p.getByTestId('document-map').boundingBox();
    if (!box) throw new Error('the map has no box');
    await p.mouse.move(box.x + sx, box.y + sy);
    const tooltip = p.getByTestId('map-tooltip');
    await tooltip.waitFor();
    const hoveredId = Number(await tooltip.getAttribute('data-document-id'));
    const hoveredControl = (await p.getByTestId('map-tooltip-control').textContent()) ?? '';
    expect(hoveredControl).not.toBe('');
    await p.screenshot({ path: join(ARTIFACTS_DIR, 'concepts-map-hover.png') });
    await p.mouse.click(box.x + sx, box.y + sy);
    await p.waitForURL(new RegExp(`/matters/${matterId}/documents/${hoveredId}$`));
    await expect.poll(() => p.locator('main').textContent()).toContain(hoveredControl);
  }, 480_000);

  it('the map draws 100,000 points on a canvas and still opens the one under the pointer', async () => {
    // The issue asks for a map that stays responsive at 100,000 documents; the demo
    // matter has a few hundred. The map answer is replaced in the browser by a seeded
    // synthetic one of that size (invented data, as the brief allows for the demo), with
    // the ids of real demo documents so a click lands on a real document page.
    screenshotOnFailure(() => page, 'concepts-map-100k');
    page = await browser.context.newPage();
    const p = page;
    const matterId = quarry.seeded.matterId;
    // Signed in already when the first test ran in this browser; sign in when run alone.
    await p.goto(`${quarry.baseUrl}/matters/${matterId}`);
    await p.locator('[data-testid="matter-name"], input[type="email"]').first().waitFor();
    if (await p.locator('input[type="email"]').count()) await signIn(p, quarry.baseUrl, LEAD);
    await waitForDemoIndex(p, quarry);
    const real = await p.evaluate(async (id) => {
      const response = await fetch(`/api/matters/${id}/concepts/map?x=1&y=2`);
      return (await response.json()) as MapResponse;
    }, matterId);
    const n = 100_000;
    let seed = 12345;
    const next = () => {
      seed = (seed * 1103515245 + 12345) % 2147483648;
      return seed / 2147483648;
    };
    const big: MapResponse = {
      ...real,
      count: n,
      x: [],
      y: [],
      ids: [],
      controlNumbers: [],
      titles: [],
      custodian: [],
      codeIds: [],
      foldedIn: [],
    };
    for (let i = 0; i < n; i++) {
      const j = i % real.count;
      big.x.push(Number((real.x[j] + (next() - 0.5) * 0.2).toFixed(4)));
      big.y.push(Number((real.y[j] + (next() - 0.5) * 0.2).toFixed(4)));
      big.ids.push(real.ids[j]);
      big.controlNumbers.push(real.controlNumbers[j]);
      big.titles.push(real.titles[j]);
      big.custodian.push(real.custodian[j]);
      big.codeIds.push(real.codeIds[j]);
      big.foldedIn.push(0);
    }
    await p.route(/\/api\/matters\/\d+\/concepts\/map/, (route) =>
      route.fulfill({ contentType: 'application/json', body: JSON.stringify(big) }),
    );
    await p.goto(`${quarry.baseUrl}/matters/${matterId}/concepts/map`);
    const canvas = p.getByTestId('document-map-canvas');
    await expect
      .poll(() => canvas.getAttribute('data-points'), { timeout: 30_000 })
      .toBe(String(n));
    console.log(
      `100,000-point map: one draw pass took ${await canvas.getAttribute('data-draw-ms')} ms`,
    );
    await p.screenshot({ path: join(ARTIFACTS_DIR, 'concepts-map-100k.png') });
    const [sx, sy] = ((await canvas.getAttribute('data-sample')) ?? '').split(',').map(Number);
    const box = await p.getByTestId('document-map').boundingBox();
    if (!box) throw new Error('the map has no box');
    await p.mouse.move(box.x + sx, box.y + sy);
    const tooltip = p.getByTestId('map-tooltip');
    await tooltip.waitFor();
    const hoveredId = Number(await tooltip.getAttribute('data-document-id'));
    expect(real.ids).toContain(hoveredId);
    await p.mouse.click(box.x + sx, box.y + sy);
    await p.waitForURL(new RegExp(`/matters/${matterId}/documents/${hoveredId}$`));
  }, 120_000);
});
