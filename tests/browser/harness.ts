import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { type BrowserContext, type Page, chromium } from 'playwright-core';
import { describe, expect, it, onTestFailed } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { type AppContext, createContext } from '../../server/context';
import { type SeededDemo, postSeedSteps, seedDemo } from '../../server/seed/index';

// Browser tests drive Debian's Chromium through playwright-core against the real
// server, started in this process on a temporary data folder and a random port.

export const CHROMIUM_PATH = '/usr/bin/chromium';
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

const ROOT = resolve(import.meta.dirname, '../..');
export const DIST_DIR = join(ROOT, 'dist');
export const ARTIFACTS_DIR = join(ROOT, 'tests/.artifacts');

export const hasChromium = existsSync(CHROMIUM_PATH);
const inCi = process.env.CI === 'true';

/**
 * `describe` for browser tests: runs when Chromium is installed; otherwise prints a
 * notice and skips, except under CI=true, where a missing browser is a failure.
 */
export function describeBrowser(name: string, body: () => void): void {
  if (hasChromium) {
    describe(name, body);
    return;
  }
  if (inCi) {
    describe(name, () => {
      it('needs Chromium', () => {
        throw new Error(
          `${CHROMIUM_PATH} is missing and CI=true: browser tests must run in CI (apt-get install chromium).`,
        );
      });
    });
    return;
  }
  console.warn(
    `NOTICE: ${CHROMIUM_PATH} not found; skipping browser tests "${name}" (apt-get install chromium to run them).`,
  );
  describe.skip(name, body);
}

const sleep = (ms: number) => Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);

/**
 * Builds the client once when dist/ has none (a present one is used as is: `npm test`
 * builds before the tests). Test files run in parallel workers, so one worker builds
 * under a lock folder and the others wait for dist/index.html.
 */
export function ensureClientBuilt(): void {
  const index = join(DIST_DIR, 'index.html');
  if (existsSync(index)) return;
  const lock = join(ROOT, 'tests/.artifacts/.client-build.lock');
  mkdirSync(join(ROOT, 'tests/.artifacts'), { recursive: true });
  try {
    mkdirSync(lock);
  } catch {
    const deadline = Date.now() + 180_000;
    while (!existsSync(index) && existsSync(lock) && Date.now() < deadline) sleep(250);
    if (existsSync(index)) return;
    throw new Error(
      'Browser tests: waited for another worker to build dist/ and it did not finish.',
    );
  }
  try {
    console.log('Browser tests: dist/index.html is missing, running `npx vite build` once...');
    execFileSync('npx', ['vite', 'build', '--logLevel', 'warn'], { cwd: ROOT, stdio: 'inherit' });
  } finally {
    rmSync(lock, { recursive: true, force: true });
  }
}

export interface StartQuarryOptions {
  /**
   * Run the post-seed steps (the demo corpus load) too. Default false so that
   * foundation tests stay fast; QUARRY_SEED_CORPUS=1 in the environment turns it on.
   */
  seedCorpus?: boolean;
  /** Extra environment for loadConfig (QUARRY_DATA_DIR is set for you). */
  env?: Record<string, string>;
}

export interface QuarryInstance {
  /** http://127.0.0.1:<port>; open pages at this origin (invitation links use it too). */
  baseUrl: string;
  ctx: AppContext;
  /** The demo matter's id and the demo user ids by e-mail. */
  seeded: SeededDemo;
  dataDir: string;
  close(): Promise<void>;
}

/** The real Quarry server with demo seeding, on a mkdtemp data folder and port 0. */
export async function startQuarry(options: StartQuarryOptions = {}): Promise<QuarryInstance> {
  ensureClientBuilt();
  const seedCorpus = options.seedCorpus ?? process.env.QUARRY_SEED_CORPUS === '1';
  const dataDir = mkdtempSync(join(tmpdir(), 'quarry-browser-'));
  const config = loadConfig({
    QUARRY_DATA_DIR: dataDir,
    QUARRY_DEMO: '1',
    QUARRY_LOG_LEVEL: 'silent',
    QUARRY_SEED_CORPUS: seedCorpus ? '1' : '0',
    ...options.env,
  });
  const ctx = await createContext(config);

  // The corpus step reads QUARRY_SEED_CORPUS from the process environment (off under
  // Vitest unless set); each test file runs in its own worker, so setting it is local.
  if (seedCorpus) process.env.QUARRY_SEED_CORPUS = '1';
  // Without the corpus, the post-seed steps (the corpus load) are held back for this seed only.
  const held = seedCorpus ? [] : postSeedSteps.splice(0, postSeedSteps.length);
  let seeded: SeededDemo | null;
  try {
    seeded = await seedDemo(ctx);
  } finally {
    postSeedSteps.unshift(...held);
  }
  if (!seeded) throw new Error('startQuarry: the fresh database was not seeded');

  const app = createApp(ctx, { distDir: DIST_DIR });
  const server = await new Promise<Server>((resolvePromise, reject) => {
    const listening = app.listen(0, '127.0.0.1', () => resolvePromise(listening));
    listening.once('error', reject);
  });
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  return {
    baseUrl,
    ctx,
    seeded,
    dataDir,
    async close() {
      server.closeAllConnections();
      await new Promise<void>((done) => server.close(() => done()));
      await ctx.close();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export interface BrowserSession {
  /** Pages opened here share cookies; launch a second browser for a second person at once. */
  context: BrowserContext;
  close(): Promise<void>;
}

/** Chromium with a fresh user-data folder (so no state leaks between runs), removed on close. */
export async function launchBrowser(): Promise<BrowserSession> {
  const userDataDir = mkdtempSync(join(tmpdir(), 'quarry-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: CHROMIUM_PATH,
    args: CHROMIUM_ARGS,
    headless: true,
    viewport: { width: 1360, height: 860 },
    locale: 'en-GB',
    timezoneId: 'UTC',
  });
  context.setDefaultTimeout(15_000);
  return {
    context,
    async close() {
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** Call at the start of a test: a failing test leaves a full-page screenshot in tests/.artifacts/. */
export function screenshotOnFailure(page: () => Page | undefined, name: string): void {
  onTestFailed(async () => {
    const current = page();
    if (!current || current.isClosed()) return;
    mkdirSync(ARTIFACTS_DIR, { recursive: true });
    const file = join(ARTIFACTS_DIR, `${name.replace(/[^a-z0-9-]+/gi, '-')}-failure.png`);
    await current.screenshot({ path: file, fullPage: true }).catch(() => undefined);
    console.error(`Screenshot of the failing page: ${file} (at ${current.url()})`);
  });
}

/** The demo accounts' published password (server/seed). */
export const DEMO_PASSWORD = 'quarry-demo';

/** Signs in through the sign-in page and waits for the list of the person's matters. */
export async function signIn(
  page: Page,
  baseUrl: string,
  email: string,
  password = DEMO_PASSWORD,
): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.waitForURL(`${baseUrl}/matters`);
  await expect.poll(() => page.getByRole('heading', { name: 'My matters' }).isVisible()).toBe(true);
}
