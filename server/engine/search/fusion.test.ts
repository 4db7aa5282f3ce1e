import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../linalg/random';
import { fuseScores, minMaxNormalise, type Scored } from './fusion';

// CombSUM over min-max normalised scores (Fox & Shaw 1994; Lee 1997), as the module
// header defines it, written the plain way: one map per list, one object per hit.
function reference<T>(keyword: Scored<T>[], concept: Scored<T>[], w: number) {
  const kw = minMaxNormalise(keyword);
  const cs = minMaxNormalise(concept);
  const order = new Map<T, number>();
  for (const { id } of [...keyword, ...concept]) if (!order.has(id)) order.set(id, order.size);
  return [...order.keys()]
    .map((id) => {
      const k = kw.get(id) ?? null;
      const c = cs.get(id) ?? null;
      return { id, score: w * (k ?? 0) + (1 - w) * (c ?? 0), keyword: k, concept: c };
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

  it('rejects a weight outside [0, 1]', () => {
    expect(() => fuseScores([], [], 1.5)).toThrow(RangeError);
  });
});
