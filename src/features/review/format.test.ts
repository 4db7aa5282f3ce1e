import { describe, expect, it } from 'vitest';
import { plural } from './format';

describe('plural', () => {
  it('reads "1 page" and "2 pages" (English grammar, common practice)', () => {
    expect(plural(1, 'page')).toBe('1 page');
    expect(plural(2, 'page')).toBe('2 pages');
    expect(plural(0, 'page')).toBe('0 pages');
    expect(plural(1, 'attachment')).toBe('1 attachment');
    expect(plural(3, 'copy', 'copies')).toBe('3 copies');
  });
});
