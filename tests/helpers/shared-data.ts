import { it } from 'vitest';
import { cranfieldAvailable, cranfieldDir } from '../../server/engine/index';

/**
 * The one guard for tests that need the Cranfield collection in ../shared/data/cranfield.
 * Returns whether it is there. Missing on a developer's machine: the caller's tests skip
 * with one notice. Missing under CI=true: a failing test names the folder, so CI cannot
 * pass without the data. Use `describe.runIf(requireShared('what needs it'))`.
 */
export function requireShared(purpose: string): boolean {
  if (cranfieldAvailable()) return true;
  const message = `Cranfield collection not found at ${cranfieldDir()} (needed by: ${purpose})`;
  if (process.env.CI === 'true') {
    it(`finds the Cranfield collection (CI=true): ${purpose}`, () => {
      throw new Error(`${message}; CI must provide ../shared/data/cranfield`);
    });
  } else {
    console.warn(`[skip] ${message}`);
  }
  return false;
}
