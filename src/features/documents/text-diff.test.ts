// The word diff against a hand-worked example: the LCS of the two sentences below is
// "the mill shall deliver flour on tuesday" (7 words), so exactly one word is removed
// ("forty") and two are added ("sixty", "before noon" as one run).
import { describe, expect, it } from 'vitest';
import { diffTexts } from './text-diff';

describe('diffTexts', () => {
  it('marks removed and added words between common runs', () => {
    expect(
      diffTexts(
        'the mill shall deliver forty flour on tuesday',
        'the mill shall deliver sixty flour on tuesday before noon',
      ),
    ).toEqual([
      { kind: 'same', text: 'the mill shall deliver' },
      { kind: 'removed', text: 'forty' },
      { kind: 'added', text: 'sixty' },
      { kind: 'same', text: 'flour on tuesday' },
      { kind: 'added', text: 'before noon' },
    ]);
  });

  it('identical texts are one common run; the common words are never lost', () => {
    expect(diffTexts('a b c', 'a  b\nc')).toEqual([{ kind: 'same', text: 'a b c' }]);
    const parts = diffTexts('x a y b z', 'a q b');
    expect(
      parts
        .filter((p) => p.kind !== 'added')
        .map((p) => p.text)
        .join(' '),
    ).toBe('x a y b z');
    expect(
      parts
        .filter((p) => p.kind !== 'removed')
        .map((p) => p.text)
        .join(' '),
    ).toBe('a q b');
  });
});
