import { defineConfig } from 'vitest/config';
import { clientAliases } from './vite.config.ts';

// Unit and API tests run in Node against real, freshly migrated SQLite files.
// Browser tests (tests/browser) drive Debian's Chromium through playwright-core.
export default defineConfig({
  resolve: { alias: clientAliases },
  test: {
    environment: 'node',
    include: ['**/*.test.ts'],
    exclude: ['node_modules/**', 'dist/**', 'data/**'],
    testTimeout: 180_000,
    hookTimeout: 120_000,
    pool: 'forks',
    fileParallelism: true,
    maxWorkers: 2,
  },
});
