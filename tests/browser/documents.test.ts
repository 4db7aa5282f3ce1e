import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { makeDocx, makeEml, makePdf, makeText, makeZip } from '../../corpus-demo/render';
import {
  ARTIFACTS_DIR,
  type BrowserSession,
  type QuarryInstance,
  describeBrowser,
  launchBrowser,
  screenshotOnFailure,
  startQuarry,
} from './harness';

// Issue 4's browser test: the demo paralegal uploads three files (a PDF, a DOCX and an
// RFC 5322 e-mail, made by the corpus-demo makers) for a new custodian, watches every
// per-file progress bar and the extraction job finish, and finds the files in the
// document list under their control numbers (matter prefix, dash, six digits: see
// server/documents/control-numbers.ts).

const PARALEGAL = { email: 'paralegal@quarry.example', password: 'quarry-demo' };
const CUSTODIAN = 'Odile Marchetti';

// Invented demo content (fictional people and companies, example.com addresses).
const FILES = {
  pdf: {
    name: 'flour-supply-schedule.pdf',
    title: 'Flour supply schedule for the spring quarter',
    phrase: 'milled wheat deliveries to the Fenwick bakery',
  },
  docx: {
    name: 'board-minutes-march.docx',
    title: 'Minutes of the March board meeting',
    phrase: 'the directors resolved to renegotiate the grain contract',
  },
  eml: {
    name: 'late-delivery-complaint.eml',
    title: 'Late delivery of rye flour',
    phrase: 'the rye consignment arrived nine days after the agreed date',
  },
} as const;

async function writeFixtures(dir: string): Promise<string[]> {
  const pdf = await makePdf({
    title: FILES.pdf.title,
    author: 'Harriet Quill',
    pages: [`This schedule covers ${FILES.pdf.phrase} from April to June.`],
  });
  const docx = await makeDocx({
    title: FILES.docx.title,
    author: 'Simon Aldous',
    paragraphs: [`After discussion ${FILES.docx.phrase} before the summer.`],
  });
  const eml = await makeEml({
    from: 'Odile Marchetti <odile.marchetti@brackenfield.example.com>',
    to: ['Supplies Desk <supplies@harrowgate.example.com>'],
    subject: FILES.eml.title,
    date: new Date('2021-03-15T10:30:00Z'),
    text: `Dear colleagues,\n\nI write because ${FILES.eml.phrase}.\n\nRegards,\nOdile`,
  });
  const paths = [join(dir, FILES.pdf.name), join(dir, FILES.docx.name), join(dir, FILES.eml.name)];
  writeFileSync(paths[0], pdf);
  writeFileSync(paths[1], docx);
  writeFileSync(paths[2], eml);
  return paths;
}

describeBrowser('documents: a paralegal uploads files and finds them in the list', () => {
  let quarry: QuarryInstance;
  let browser: BrowserSession;
  let page: Page | undefined;
  let fixtureDir: string;
  let fixturePaths: string[];
  /** Control numbers the first test saw, by fixture kind. */
  const controlNumbers: Record<string, string> = {};

  beforeAll(async () => {
    fixtureDir = mkdtempSync(join(tmpdir(), 'quarry-upload-fixtures-'));
    fixturePaths = await writeFixtures(fixtureDir);
    quarry = await startQuarry({ seedCorpus: false });
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await quarry?.close();
    if (fixtureDir) rmSync(fixtureDir, { recursive: true, force: true });
  });

  it(
    'uploads a PDF, a DOCX and an e-mail with a custodian, then lists them',
    { timeout: 180_000 },
    async () => {
      page = await browser.context.newPage();
      screenshotOnFailure(() => page, 'documents');
      const p = page;
      const matterId = quarry.seeded.matterId;
      mkdirSync(ARTIFACTS_DIR, { recursive: true });

      // 1. Sign in as the demo paralegal and open the matter's Upload section.
      await p.goto(`${quarry.baseUrl}/sign-in`);
      await p.getByLabel('E-mail').fill(PARALEGAL.email);
      await p.getByLabel('Password').fill(PARALEGAL.password);
      await p.getByRole('button', { name: 'Sign in' }).click();
      await p.waitForURL(`${quarry.baseUrl}/matters`);
      await p.goto(`${quarry.baseUrl}/matters/${matterId}`);
      await p.getByTestId('matter-home').waitFor();
      expect(await p.getByTestId('matter-role').textContent()).toBe('Paralegal');
      await p.getByTestId('matter-nav-upload').click();
      await p.getByTestId('upload-page').waitFor();

      // 2. Pick the three files and name a new custodian.
      await p.getByTestId('file-input').setInputFiles(fixturePaths);
      const rows = p.getByTestId('upload-row');
      await expect.poll(() => rows.count()).toBe(3);
      await p.getByTestId('custodian-select').selectOption('__new__');
      await p.getByLabel("New custodian's name").fill(CUSTODIAN);
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'upload-ready.png'), fullPage: true });
      await p.getByTestId('upload-start').click();

      // 3. Every per-file bar reaches 100% and each row gets its control number.
      for (const name of Object.values(FILES).map((file) => file.name)) {
        const row = p.locator(`[data-testid="upload-row"][data-file-name="${name}"]`);
        await expect
          .poll(() => row.getAttribute('data-phase'), { timeout: 30_000 })
          .toBe('uploaded');
        expect(await row.getByTestId('upload-progress').getAttribute('aria-valuenow')).toBe('100');
      }
      const results = p.getByTestId('upload-result');
      await expect.poll(() => results.count()).toBe(3);

      // 4. The extraction job's bar finishes, and each file reads "Extracted".
      const job = p.locator('[data-job-kind="extract-batch"]').first();
      await expect
        .poll(() => job.getAttribute('data-job-status'), { timeout: 90_000 })
        .toBe('succeeded');
      expect(await job.locator('[role="progressbar"]').first().getAttribute('aria-valuenow')).toBe(
        '100',
      );
      await expect
        .poll(
          async () =>
            (await results.evaluateAll((els) => els.map((el) => el.getAttribute('data-status'))))
              .sort()
              .join(','),
          { timeout: 60_000 },
        )
        .toBe('extracted,extracted,extracted');

      for (const [kind, file] of Object.entries(FILES)) {
        const row = p.locator(`[data-testid="upload-row"][data-file-name="${file.name}"]`);
        const control = await row.getByTestId('upload-result').getAttribute('data-control-number');
        expect(control).toMatch(/^BBHM-\d{6}$/);
        controlNumbers[kind] = control!;
      }
      // Load order: the files went up in the order picked, so their numbers ascend.
      const sequence = Object.values(controlNumbers).map((c) => Number(c.slice(-6)));
      expect(sequence).toEqual([...sequence].sort((a, b) => a - b));
      expect(new Set(sequence).size).toBe(3);
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'upload-done.png'), fullPage: true });

      // 5. The document list shows the three files with their numbers, custodian and status.
      await p.getByTestId('matter-nav-documents').click();
      await p.getByTestId('documents-page').waitFor();
      const table = p.getByTestId('document-table');
      await table.waitFor();
      for (const [kind, file] of Object.entries(FILES)) {
        const row = table.locator(
          `[data-testid="document-row"][data-control-number="${controlNumbers[kind]}"]`,
        );
        await row.waitFor();
        const text = await row.innerText();
        expect(text).toContain(file.title);
        expect(text).toContain(CUSTODIAN);
        expect(await row.getAttribute('data-status')).toBe('extracted');
      }

      // Sorting (TanStack Table v9 row sorting): control number descending puts the
      // e-mail, loaded last, first; the header says so to assistive technology.
      await p.getByTestId('sort-controlNumber').click();
      await p.getByTestId('sort-controlNumber').click();
      const header = p.locator('th', { has: p.getByTestId('sort-controlNumber') });
      expect(await header.getAttribute('aria-sort')).toBe('descending');
      expect(
        await table.getByTestId('document-row').first().getAttribute('data-control-number'),
      ).toBe(controlNumbers.eml);

      // The custodian filter narrows the list to the new custodian's documents.
      const custodianFilter = p.getByTestId('filter-custodian');
      const option = custodianFilter.locator('option', { hasText: CUSTODIAN });
      await custodianFilter.selectOption((await option.getAttribute('value'))!);
      await expect.poll(() => p.url()).toContain('custodian=');
      await expect.poll(() => table.getByTestId('document-row').count()).toBe(3);
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'document-list.png'), fullPage: true });

      // 6. Opening a row shows its metadata and extracted text.
      await table
        .locator(`[data-testid="document-row"][data-control-number="${controlNumbers.eml}"]`)
        .getByRole('link', { name: controlNumbers.eml })
        .click();
      await p.getByTestId('document-page').waitFor();
      expect(await p.getByTestId('document-control-number').textContent()).toBe(controlNumbers.eml);
      await expect
        .poll(() => p.getByTestId('document-text').innerText(), { timeout: 15_000 })
        .toContain(FILES.eml.phrase);
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'document-page.png'), fullPage: true });
    },
  );

  it(
    'a .zip is unpacked into one row per entry, and a copy is recorded as a duplicate',
    { timeout: 120_000 },
    async () => {
      const p = page!;
      screenshotOnFailure(() => page, 'documents-zip');
      const matterId = quarry.seeded.matterId;
      const { readFileSync } = await import('node:fs');
      const zip = await makeZip([
        { name: 'copies/flour-supply-schedule.pdf', content: readFileSync(fixturePaths[0]) },
        {
          name: 'notes/warehouse-log.txt',
          content: makeText('Warehouse log: forty sacks of spelt moved to bay three on Tuesday.'),
        },
      ]);
      const zipPath = join(fixtureDir, 'second-collection.zip');
      writeFileSync(zipPath, zip);

      await p.goto(`${quarry.baseUrl}/matters/${matterId}/upload`);
      await p.getByTestId('upload-page').waitFor();
      await p.getByTestId('file-input').setInputFiles([zipPath]);
      const select = p.getByTestId('custodian-select');
      const option = select.locator('option', { hasText: CUSTODIAN });
      await select.selectOption((await option.getAttribute('value'))!);
      await p.getByTestId('upload-start').click();

      const row = p.locator('[data-testid="upload-row"][data-file-name="second-collection.zip"]');
      await expect.poll(() => row.getAttribute('data-phase'), { timeout: 30_000 }).toBe('uploaded');
      const entries = row.getByTestId('upload-result');
      await expect.poll(() => entries.count()).toBe(2);
      // SHA-256 content addressing: the PDF inside the zip is the first test's PDF again.
      const statuses = async () =>
        (await entries.evaluateAll((els) => els.map((el) => el.getAttribute('data-status'))))
          .sort()
          .join(',');
      await expect.poll(statuses, { timeout: 60_000 }).toBe('duplicate,extracted');
      const duplicate = entries.and(p.locator('[data-status="duplicate"]'));
      expect(await duplicate.innerText()).toContain(controlNumbers.pdf);
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'upload-zip.png'), fullPage: true });
    },
  );

  it(
    'a broken file reads "Failed" with its reason, and a paralegal can remove it',
    { timeout: 120_000 },
    async () => {
      // Runs after the first test: same server, same signed-in paralegal, custodian exists.
      const p = page!;
      screenshotOnFailure(() => page, 'documents-failed');
      const matterId = quarry.seeded.matterId;
      // A PDF cut short: the %PDF- header but no cross-reference table or trailer
      // (ISO 32000-1 §7.5), which the extraction tests call "not a valid PDF".
      const whole = await makePdf({ title: 'Cut short', author: 'Nobody', pages: ['Gone.'] });
      const broken = join(fixtureDir, 'truncated-invoice.pdf');
      writeFileSync(broken, whole.subarray(0, 200));

      await p.goto(`${quarry.baseUrl}/matters/${matterId}/upload`);
      await p.getByTestId('upload-page').waitFor();
      await p.getByTestId('file-input').setInputFiles([broken]);
      // Choose the existing custodian this time.
      const select = p.getByTestId('custodian-select');
      const option = select.locator('option', { hasText: CUSTODIAN });
      await select.selectOption((await option.getAttribute('value'))!);
      await p.getByTestId('upload-start').click();

      const result = p.getByTestId('upload-result');
      await expect
        .poll(() => result.getAttribute('data-status'), { timeout: 60_000 })
        .toBe('failed');
      expect(await p.getByTestId('upload-row').getByTestId('failure-reason').innerText()).toBe(
        'not a valid PDF',
      );
      const control = (await result.getAttribute('data-control-number'))!;

      // The list filtered to failed files shows it with Retry and Remove.
      await p.goto(`${quarry.baseUrl}/matters/${matterId}/documents?status=failed`);
      const row = p.locator(`[data-testid="document-row"][data-control-number="${control}"]`);
      await row.waitFor();
      expect(await row.innerText()).toContain('not a valid PDF');
      expect(await p.getByTestId('document-row').count()).toBe(1);
      await row.getByTestId('retry-document').waitFor();
      await p.screenshot({ path: join(ARTIFACTS_DIR, 'document-list-failed.png'), fullPage: true });

      await row.getByTestId('remove-document').click();
      await p.getByTestId('confirm-remove').click();
      await expect.poll(() => row.count(), { timeout: 15_000 }).toBe(0);
      const status = await p.evaluate(
        async ([id, number]) => {
          const res = await fetch(`/api/matters/${id}/documents?pageSize=500`);
          const body = (await res.json()) as { documents: { controlNumber: string }[] };
          return body.documents.some((d) => d.controlNumber === number);
        },
        [matterId, control] as const,
      );
      expect(status).toBe(false);
    },
  );
});
