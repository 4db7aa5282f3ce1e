import { describe, expect, it } from 'vitest';
import { ApiError } from './api-client';
import { safeNext } from './safe-next';
import { shouldRetry } from './query-retry';

describe('safeNext (no open redirect after sign-in)', () => {
  it('keeps same-site paths', () => {
    expect(safeNext('/matters/3/access?x=1')).toBe('/matters/3/access?x=1');
  });
  it('refuses other hosts, scheme-relative and backslash tricks', () => {
    // Browsers treat "//host" and "/\\host" as another origin (WHATWG URL parser).
    for (const next of ['https://evil.example/', '//evil.example', '/\\evil.example', 'matters']) {
      expect(safeNext(next)).toBe('/matters');
    }
  });
  it('never loops back to sign-in', () => {
    expect(safeNext('/sign-in?next=/x')).toBe('/matters');
    expect(safeNext(null)).toBe('/matters');
  });
});

describe('shouldRetry', () => {
  it('does not retry client errors', () => {
    for (const status of [400, 401, 403, 404, 409, 429]) {
      expect(shouldRetry(0, new ApiError(status, 'x', 'x'))).toBe(false);
    }
  });
  it('retries server and network failures twice', () => {
    const error = new ApiError(503, 'internal_error', 'down');
    expect(shouldRetry(0, error)).toBe(true);
    expect(shouldRetry(1, error)).toBe(true);
    expect(shouldRetry(2, error)).toBe(false);
    expect(shouldRetry(0, new ApiError(0, 'network_error', 'offline'))).toBe(true);
  });
});
