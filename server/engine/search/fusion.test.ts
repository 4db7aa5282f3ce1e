import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../linalg/random';
import { coverageWeight, fuseScores, minMaxNormalise, type Scored } from './fusion';

// CombSUM over min-max normalised scores (Fox & Shaw 1994; Lee 1997), with the module
// header's rule for a document the keyword list lacks (it keeps its concept score),
// written the plain way: one map per list, one object per hit.
function reference<T>(keyword: Scored<T>[], concept: Scored<T>[], w: number) {
  const kw = minMaxNormalise(keyword);
  const cs = minMaxNormalise(concept);
  const order = new Map<T, number>();
  for (const { id } of [...keyword, ...concept]) if (!order.has(id)) order.set(id, order.size);
  return [...order.keys()]
    .map((id) => {
      const k = kw.get(id) ?? null;
      const c = cs.get(id) ?? null;
      const score = w * (k ?? c ?? 0) + (1 - w) * (c ?? 0);
      // (Every document is inside the concept space and coverage is 1 here.)
      return { id, score, keyword: k, concept: c };
    })
    .sort((a, b) => b.score - a.score || order.get(a.id)! - order.get(b.id)!);
}

describe('fuseScores', () => {
  it('works a small example by hand', () => {
    // keyword: a 10, b 5, c 0 -> 1, 0.5, 0; concept: b 0.9, d 0.5 -> 1, 0.
    // fused (w = 0.3): b 0.15 + 0.7 = 0.85, a 0.3, c 0, d 0 (c before d: keyword first).
    const fused = fuseScores(
      [
        { id: 'a', score: 10 },
        { id: 'b', score: 5 },
        { id: 'c', score: 0 },
      ],
      [
        { id: 'b', score: 0.9 },
        { id: 'd', score: 0.5 },
      ],
      0.3,
    );
    expect(fused.map((h) => h.id)).toEqual(['b', 'a', 'c', 'd']);
    expect(fused[0].score).toBeCloseTo(0.85, 12);
    expect(fused[0]).toMatchObject({ keyword: 0.5, concept: 1 });
    expect(fused[3]).toEqual({ id: 'd', score: 0, keyword: null, concept: 0 });
  });

  it('equals the plain definition on random lists with overlaps, ties and repeated ids', () => {
    const rand = mulberry32(41);
    for (let round = 0; round < 30; round++) {
      const list = (n: number) =>
        Array.from({ length: n }, () => ({
          id: Math.floor(rand() * 400),
          // Rounded scores make ties common.
          score: Math.round(rand() * 20) / 4,
        }));
      const keyword = list(Math.floor(rand() * 300));
      const concept = list(Math.floor(rand() * 300));
      const w = [0, 0.3, 0.5, 1][round % 4];
      expect(fuseScores(keyword, concept, w)).toEqual(reference(keyword, concept, w));
    }
  });

  it('a document only concept search finds keeps its concept score', () => {
    // keyword: a 4, b 2 -> 1, 0; concept: x 0.9, a 0.5, b 0.1 -> 1, 0.5, 0.
    // x (no query word) keeps 1; a: 0.3 + 0.35 = 0.65; b: 0.
    const fused = fuseScores(
      [
        { id: 'a', score: 4 },
        { id: 'b', score: 2 },
      ],
      [
        { id: 'x', score: 0.9 },
        { id: 'a', score: 0.5 },
        { id: 'b', score: 0.1 },
      ],
      0.3,
    );
    expect(fused.map((h) => [h.id, Number(h.score.toFixed(12))])).toEqual([
      ['x', 1],
      ['a', 0.65],
      ['b', 0],
    ]);
  });

  it('partial coverage and documents outside the concept space', () => {
    const keyword = [
      { id: 'new', score: 3 },
      { id: 'a', score: 1 },
    ];
    const concept = [
      { id: 'x', score: 0.9 },
      { id: 'a', score: 0.3 },
    ];
    // Concept sees a third of the query: x's keyword part is 1/3 of its concept score;
    // 'new' is outside the space, so its concept part is its keyword score.
    const fused = fuseScores(keyword, concept, 0.5, {
      conceptCoverage: 1 / 3,
      outsideConcept: (id) => id === 'new',
    });
    const score = Object.fromEntries(fused.map((h) => [h.id, h.score]));
    expect(score.new).toBeCloseTo(1, 12);
    expect(score.x).toBeCloseTo(0.5 / 3 + 0.5, 12);
    expect(score.a).toBeCloseTo(0, 12);
    expect(fused[0].id).toBe('new');
  });

  it('coverageWeight scales each list by the share of the query it sees', () => {
    expect(coverageWeight(0.3, 1, 1)).toBeCloseTo(0.3, 12);
    // Two of three words unknown to the concept space: 0.3 / (0.3 + 0.7 / 3) = 0.5625.
    expect(coverageWeight(0.3, 1, 1 / 3)).toBeCloseTo(0.5625, 12);
    expect(coverageWeight(0.3, 1, 0)).toBe(1);
    expect(coverageWeight(0.3, 0, 1)).toBe(0);
    expect(coverageWeight(0.3, 0, 0)).toBe(0.3);
  });

  it('rejects a weight outside [0, 1]', () => {
    expect(() => fuseScores([], [], 1.5)).toThrow(RangeError);
  });
});
