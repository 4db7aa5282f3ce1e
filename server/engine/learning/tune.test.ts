import { describe, expect, it } from 'vitest';
import { ConceptSpace } from '../index/concept-space';
import { mulberry32 } from '../linalg/random';
import { tuneFromCodes } from './tune';

// A constructed space: axis 1 separates the two kinds exactly (+1 / -1), axes 2-4
// carry large seeded noise. On the first axis alone every held-out Responsive row has
// cosine 1 and every Not responsive row -1, so average precision is exactly 1 there
// (worked by hand); with all four axes the noise mixes some of them.
function space(): { space: ConceptSpace; labels: (0 | 1)[] } {
  const n = 60;
  const k = 4;
  const random = mulberry32(5);
  const labels: (0 | 1)[] = [];
  const rows = new Float32Array(n * k);
  for (let j = 0; j < n; j++) {
    const label = j % 2 === 0 ? 1 : 0;
    labels.push(label);
    rows[j * k] = label ? 1 : -1;
    for (let c = 1; c < k; c++) rows[j * k + c] = 6 * (random() - 0.5);
  }
  return {
    labels,
    space: new ConceptSpace({
      params: {
        formatVersion: 1,
        analyzer: 'test',
        k,
        requestedK: k,
        weighting: 'raw',
        minDf: 1,
        scaling: 'projection',
      },
      terms: [],
      df: new Int32Array(0),
      globalWeights: new Float64Array(0),
      sigma: new Float64Array(k).fill(1),
      termVectors: new Float32Array(0),
      docIds: Array.from({ length: n }, (_, j) => j + 1),
      docVectors: rows,
      foldedIn: new Uint8Array(n),
    }),
  };
}

describe('tuning the space from codes (cross-validated)', () => {
  it('finds that the first axis alone ranks held-out Responsive documents perfectly', () => {
    const { space: s, labels } = space();
    const result = tuneFromCodes(
      s,
      labels.map((label, index) => ({ index, label })),
      { dims: [1, 4], folds: 5 },
    );
    expect(result.folds).toBe(5);
    const one = result.cells.find((c) => c.dims === 1)!;
    const four = result.cells.find((c) => c.dims === 4)!;
    expect(one.map).toBeCloseTo(1, 12);
    expect(four.map).toBeLessThan(one.map - 0.01);
    expect(result.best).toEqual(one);
  });
});
