import { describe, expect, it } from 'vitest';
import { FIRST_SCREENS, measureFirstScreens } from '../../scripts/bench/client-bundle';

// The product's budget for the first screens: under 250 KB of JavaScript, gzipped, for
// the sign-in screen and the matter list (entry chunk plus its static imports). The
// figure comes from a real production build (Vite), measured as the browser would
// fetch it before any dynamic import().
const BUDGET_BYTES = 250 * 1024;

describe('route-level code splitting', () => {
  it('keeps the sign-in screen and the matter list under 250 KB of gzipped JavaScript', async () => {
    const screens = await measureFirstScreens();
    expect(Object.keys(screens)).toEqual(Object.keys(FIRST_SCREENS));
    for (const [screen, { files, gzipBytes }] of Object.entries(screens)) {
      expect(gzipBytes, `${screen}: ${files.join(', ')}`).toBeLessThan(BUDGET_BYTES);
      // The heaviest pages (the spectrum chart, the document map) stay out of it.
      expect(
        files.some((file) => /concepts-(spectrum|map)/.test(file)),
        screen,
      ).toBe(false);
    }
  });
});
