import { describe, expect, it } from 'vitest';
import { csrFromDense } from '../sparse/csr';
import { applyWeights, globalWeights } from './weighting';

// Dumais (1991), "Improving the retrieval of information from external sources":
// a_ij = log2(1 + tf_ij) * (1 + sum_j p_ij log p_ij / log n), p_ij = tf_ij / gf_i.
describe('log-entropy weights (Dumais 1991), checked by hand', () => {
  // 3 terms x 3 documents.
  // prettier-ignore
  const counts = csrFromDense(3, 3, [
    1, 1, 2, // gf = 4: p = 1/4, 1/4, 1/2
    3, 0, 0, // one document only: G = 1
    1, 1, 1, // spread evenly: G = 0
  ]);

  it('global weights', () => {
    const g = globalWeights('log-entropy', counts);
    // 1 + (2 * 0.25 ln 0.25 + 0.5 ln 0.5) / ln 3 = 1 - 1.0397208 / 1.0986123 = 0.0536052
    expect(g[0]).toBeCloseTo(0.0536052, 6);
    expect(g[1]).toBeCloseTo(1, 12);
    expect(g[2]).toBeCloseTo(0, 12);
  });

  it('entries: log2(1 + tf) * G', () => {
    const a = applyWeights('log-entropy', counts, globalWeights('log-entropy', counts));
    // Row 0: tf 1, 1, 2 -> 1 * 0.0536052, 1 * 0.0536052, log2(3) * 0.0536052 = 0.0849623.
    expect(Array.from(a.values.subarray(a.rowPtr[0], a.rowPtr[1]))).toEqual([
      expect.closeTo(0.0536052, 6),
      expect.closeTo(0.0536052, 6),
      expect.closeTo(0.0849623, 6),
    ]);
    // Row 1: tf 3 -> log2(4) * 1 = 2.
    expect(a.values[a.rowPtr[1]]).toBeCloseTo(2, 12);
  });

  it('tf-idf: idf = ln(n / df) (Salton & Buckley 1988)', () => {
    const g = globalWeights('tf-idf', counts);
    expect(g[0]).toBeCloseTo(0, 12); // in all 3 documents
    expect(g[1]).toBeCloseTo(Math.log(3), 12);
  });
});
