import { describe, expect, it } from 'vitest';
import { ftsTerm } from '../search/fts5-tokens';
import { analyze, stem } from './analyzer';
import { PORTER_MAX_BYTES, TOKEN_MAX_BYTES } from './token-limits';

// The long-token rules are SQLite FTS5's (its porter tokenizer stems tokens of at most 64
// bytes, FTS5 keeps a token's first 32,768 bytes; keyword-index.test.ts checks the
// keyword side against FTS5 itself): the concept analyzer follows the same rules so a
// long token is one term on both sides.
describe('analyzer on long tokens', () => {
  it('stems a token of 64 bytes, not one of 65 (as FTS5 porter does)', () => {
    const at64 = `${'a'.repeat(53)}connections`;
    const at65 = `${'a'.repeat(54)}connections`;
    expect(at64.length).toBe(PORTER_MAX_BYTES);
    expect(analyze(at64)).toEqual([`${'a'.repeat(53)}connect`]);
    expect(analyze(at65)).toEqual([at65]);
    expect(analyze(at65)).toEqual([ftsTerm(at65)]);
  });

  it('keeps the first 32,768 bytes of a longer token', () => {
    const [digits] = analyze('1'.repeat(100_000));
    expect(digits).toBe('1'.repeat(TOKEN_MAX_BYTES));
    // Two-byte letters: 16,384 of them fill the cap.
    const [accented] = analyze('é'.repeat(20_000));
    expect(accented).toBe('é'.repeat(TOKEN_MAX_BYTES / 2));
  });

  it('is linear in the token length (natural Porter alone is quadratic on a run of one letter)', () => {
    // Before the cap a 100,000-digit token took several seconds (about 0.6 s at 20,000);
    // the bound is generous for a loaded machine and still far below that.
    const started = performance.now();
    expect(analyze('S'.repeat(8 * 1024 * 1024))).toHaveLength(1);
    expect(analyze('1'.repeat(100_000))).toHaveLength(1);
    expect(stem('s'.repeat(30_000))).toHaveLength(30_000);
    expect(performance.now() - started).toBeLessThan(3000);
  });
});
