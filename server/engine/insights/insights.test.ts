// Figures of the concept-space views against independent computations.
// Reference library: ml-matrix's full dense SVD (Golub-Reinsch) of the same matrix.
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { ConceptSpace } from '../index/concept-space';
import { mulberry32 } from '../linalg/random';
import { csrFromDense } from '../sparse/csr';
import { analyze } from '../text/analyzer';
import { columnExtremes, columnLargestAbs, topTermsOfVector } from './dimensions';
import { projectionDrift, summariseDrift } from './drift';
import { assessHealth, DEFAULT_HEALTH_THRESHOLDS, noiseDimensions } from './health';
import { mapCoordinates } from './map';
import { cumulativeEnergy } from './spectrum';

interface Reference {
  s: number[];
  U: Matrix;
  V: Matrix;
  frobeniusSq: number;
}

/** Full SVD by ml-matrix, singular triplets sorted by descending sigma. */
function reference(rows: number, cols: number, data: number[]): Reference {
  const dense: number[][] = [];
  for (let i = 0; i < rows; i++) dense.push(data.slice(i * cols, (i + 1) * cols));
  const a = new Matrix(dense);
  // ml-matrix wants rows >= cols for the thin SVD; transpose when needed.
  const flip = rows < cols;
  const svd = new SingularValueDecomposition(flip ? a.transpose() : a, { autoTranspose: false });
  const s = svd.diagonal;
  const order = s.map((_, i) => i).sort((x, y) => s[y] - s[x]);
  const pick = (m: Matrix) => new Matrix(order.map((o) => m.getColumn(o))).transpose();
  const U = pick(flip ? svd.rightSingularVectors : svd.leftSingularVectors);
  const V = pick(flip ? svd.leftSingularVectors : svd.rightSingularVectors);
  let frobeniusSq = 0;
  for (const v of data) frobeniusSq += v * v;
  return { s: order.map((o) => s[o]), U, V, frobeniusSq };
}

/** 1 - ||U_k^T d||^2 / ||d||^2 with U_k the reference's first k left singular vectors. */
function referenceDrift(ref: Reference, d: number[], k: number): number {
  let dd = 0;
  for (const x of d) dd += x * x;
  let pp = 0;
  for (let c = 0; c < k; c++) {
    let dot = 0;
    for (let i = 0; i < d.length; i++) dot += ref.U.get(i, c) * d[i];
    pp += dot * dot;
  }
  return 1 - pp / dd;
}

// Deerwester, Dumais, Furnas, Landauer & Harshman (1990), "Indexing by latent semantic
// analysis", JASIS 41(6), Table 2: raw counts of 12 terms in 9 titles (c1-c5, m1-m4).
const TERM_WORDS = [
  'human',
  'interface',
  'computer',
  'user',
  'system',
  'response',
  'time',
  'EPS',
  'survey',
  'trees',
  'graph',
  'minors',
];
// prettier-ignore
const TABLE_2 = [
  1, 0, 0, 1, 0, 0, 0, 0, 0,
  1, 0, 1, 0, 0, 0, 0, 0, 0,
  1, 1, 0, 0, 0, 0, 0, 0, 0,
  0, 1, 1, 0, 1, 0, 0, 0, 0,
  0, 1, 1, 2, 0, 0, 0, 0, 0,
  0, 1, 0, 0, 1, 0, 0, 0, 0,
  0, 1, 0, 0, 1, 0, 0, 0, 0,
  0, 0, 1, 1, 0, 0, 0, 0, 0,
  0, 1, 0, 0, 0, 0, 0, 0, 1,
  0, 0, 0, 0, 0, 1, 1, 1, 0,
  0, 0, 0, 0, 0, 0, 1, 1, 1,
  0, 0, 0, 0, 0, 0, 0, 1, 1,
];
const DOCS = ['c1', 'c2', 'c3', 'c4', 'c5', 'm1', 'm2', 'm3', 'm4'];

function spaceOf(
  terms: string[],
  m: number,
  n: number,
  data: number[],
  k: number,
  ids: (string | number)[],
) {
  return ConceptSpace.fromCounts(terms, csrFromDense(m, n, data), ids, {
    k,
    weighting: 'raw',
    svd: { method: 'lanczos' },
  });
}

describe('Deerwester et al. (1990) Table 2, k = 2 (reference: ml-matrix full SVD)', () => {
  const terms = TERM_WORDS.map((w) => analyze(w)[0]);
  const { space, diagnostics } = spaceOf(terms, 12, 9, TABLE_2, 2, DOCS);
  const ref = reference(12, 9, TABLE_2);

  it('energy kept = (sigma_1^2 + sigma_2^2) / ||A||_F^2 and the cumulative curve', () => {
    // ||A||_F^2 = 31 (27 ones and one 2), counted from the table.
    expect(ref.frobeniusSq).toBe(31);
    expect(diagnostics.frobeniusSq).toBeCloseTo(31, 12);
    const expected = (ref.s[0] ** 2 + ref.s[1] ** 2) / ref.frobeniusSq;
    expect(diagnostics.energy).toBeCloseTo(expected, 10);
    const curve = cumulativeEnergy(space.sigma, diagnostics.frobeniusSq);
    expect(curve[0]).toBeCloseTo(ref.s[0] ** 2 / 31, 10);
    expect(curve[1]).toBeCloseTo(expected, 10);
    // Paper's S_0 (from memory, two decimals): 3.34, 2.54 -> (11.16 + 6.45) / 31.
    expect(curve[1]).toBeCloseTo((3.34 ** 2 + 2.54 ** 2) / 31, 2);
    // All nine values keep all of it (Eckart-Young with k = rank).
    expect(cumulativeEnergy(ref.s, 31)[8]).toBeCloseTo(1, 10);
  });

  it('condition number sigma_1 / sigma_k and sigma_1 = ||A||_2', () => {
    const health = assessHealth(
      {
        documents: 9,
        terms: 12,
        builtDocuments: 9,
        nnz: diagnostics.nnz,
        sigma: space.sigma,
        energyKept: diagnostics.energy,
        orthogonalityU: diagnostics.orthogonalityU,
        orthogonalityV: diagnostics.orthogonalityV,
        foldedIn: 0,
        driftMean: null,
        driftMax: null,
      },
      DEFAULT_HEALTH_THRESHOLDS,
    );
    expect(health.conditionNumber).toBeCloseTo(ref.s[0] / ref.s[1], 8);
    expect(health.sigma1).toBeCloseTo(ref.s[0], 8);
    // 28 non-zero cells of 108 (counted from the table).
    expect(diagnostics.nnz).toBe(28);
    expect(health.sparsity).toBeCloseTo(1 - 28 / 108, 12);
    expect(health.rebuildRecommended).toBe(false);
    expect(health.messages).toEqual([]);
  });

  it('drift of a folded-in document equals 1 - ||U_k^T d||^2 / ||d||^2 from the full U', () => {
    // "human computer interaction": d = e_human + e_computer (interaction is not a term).
    const [folded] = space.foldInDocuments([{ id: 'q', text: 'human computer interaction' }]);
    const d = new Array(12).fill(0);
    d[0] = 1;
    d[2] = 1;
    const expected = referenceDrift(ref, d, 2);
    expect(folded.drift).toBeCloseTo(expected, 6);
    const w = space.weightTerms(analyze('human computer interaction'));
    expect(projectionDrift(w.ids, w.weights, space.termVectors, space.k)).toBeCloseTo(expected, 6);
    // More dimensions can only hold more of d (nested subspaces).
    expect(referenceDrift(ref, d, 9)).toBeLessThan(expected);
  });

  it('map coordinates are V_k S_k rows over their length (reference V)', () => {
    const { x, y } = mapCoordinates(space.docMatrix, 9, 2, space.sigma, 'projection', 0, 1);
    for (let j = 0; j < 9; j++) {
      const a = ref.V.get(j, 0) * ref.s[0];
      const b = ref.V.get(j, 1) * ref.s[1];
      const len = Math.hypot(a, b);
      // Singular vectors are unique up to sign: compare |x| and |y|.
      expect(Math.abs(x[j])).toBeCloseTo(Math.abs(a / len), 5);
      expect(Math.abs(y[j])).toBeCloseTo(Math.abs(b / len), 5);
    }
  });

  it('dimension extremes: the strongest terms of U_k column 2 against a full sort', () => {
    const { positive, negative } = columnExtremes(space.termVectors, 12, 2, 1, 3);
    const column = Array.from({ length: 12 }, (_, i) => ({ i, v: space.termVectors[i * 2 + 1] }));
    const sorted = [...column].sort((a, b) => b.v - a.v);
    expect(positive.map((p) => p.index)).toEqual(
      sorted
        .filter((c) => c.v > 0)
        .slice(0, 3)
        .map((c) => c.i),
    );
    expect(negative.map((p) => p.index)).toEqual(
      [...sorted]
        .reverse()
        .filter((c) => c.v < 0)
        .slice(0, 3)
        .map((c) => c.i),
    );
    // Dimension 2 contrasts the two topics (Deerwester et al. 1990, Figure 1): graph/trees/
    // minors sit at one end, human-computer terms at the other.
    const ends = [positive, negative].map((list) => list.map((l) => TERM_WORDS[l.index]));
    const graphEnd = ends.find((e) => e.includes('graph'))!;
    expect(graphEnd).toEqual(expect.arrayContaining(['graph', 'trees', 'minors']));
    const largest = columnLargestAbs(space.termVectors, 12, 2, 1, 12);
    expect(largest.map((l) => Math.abs(l.value))).toEqual(
      column
        .map((c) => Math.abs(c.v))
        .filter((v) => v > 0)
        .sort((a, b) => b - a),
    );
  });

  it('a centre seen in the term space: U_k c against a brute-force product', () => {
    const c = [0.7, -0.3];
    const top = topTermsOfVector(space.termVectors, 12, 2, c, 4);
    const brute = Array.from({ length: 12 }, (_, i) => ({
      i,
      w: space.termVectors[i * 2] * c[0] + space.termVectors[i * 2 + 1] * c[1],
    }))
      .filter((t) => t.w > 0)
      .sort((a, b) => b.w - a.w)
      .slice(0, 4);
    expect(top.map((t) => t.index)).toEqual(brute.map((t) => t.i));
  });
});

describe('seeded random 40 x 30 count matrix, k = 6 (reference: ml-matrix full SVD)', () => {
  const rand = mulberry32(2024);
  const m = 40;
  const n = 30;
  const data = Array.from({ length: m * n }, () =>
    rand() < 0.25 ? 1 + Math.floor(rand() * 4) : 0,
  );
  // Every term and document needs at least one count.
  for (let i = 0; i < m; i++) data[i * n + (i % n)] += 1;
  const terms = Array.from({ length: m }, (_, i) => `t${String(i).padStart(2, '0')}`);
  const ids = Array.from({ length: n }, (_, j) => j + 1);
  const k = 6;
  const { space, diagnostics } = spaceOf(terms, m, n, data, k, ids);
  const ref = reference(m, n, data);

  it('energy and condition number agree with the full SVD', () => {
    let top = 0;
    for (let i = 0; i < k; i++) top += ref.s[i] ** 2;
    expect(diagnostics.energy).toBeCloseTo(top / ref.frobeniusSq, 8);
    expect(cumulativeEnergy(space.sigma, diagnostics.frobeniusSq)[k - 1]).toBeCloseTo(
      top / ref.frobeniusSq,
      8,
    );
    expect(diagnostics.conditionNumber).toBeCloseTo(ref.s[0] / ref.s[k - 1], 6);
    // Eckart-Young: the rank-k error ||A - A_k||_F^2 = sum_{i>k} sigma_i^2.
    let tail = 0;
    for (let i = k; i < ref.s.length; i++) tail += ref.s[i] ** 2;
    expect(1 - diagnostics.energy).toBeCloseTo(tail / ref.frobeniusSq, 8);
  });

  it('drift of random documents and its mean agree with the full U', () => {
    const drifts: number[] = [];
    const expected: number[] = [];
    for (let t = 0; t < 5; t++) {
      const idsOf: number[] = [];
      const weights: number[] = [];
      const d = new Array(m).fill(0);
      for (let i = 0; i < m; i++) {
        if (rand() < 0.3) {
          d[i] = 1 + Math.floor(rand() * 3);
          idsOf.push(i);
          weights.push(d[i]);
        }
      }
      if (idsOf.length === 0) continue;
      drifts.push(projectionDrift(idsOf, weights, space.termVectors, k));
      expected.push(referenceDrift(ref, d, k));
    }
    drifts.forEach((value, i) => expect(value).toBeCloseTo(expected[i], 5));
    const summary = summariseDrift(drifts);
    expect(summary.mean).toBeCloseTo(expected.reduce((a, b) => a + b, 0) / expected.length, 5);
    expect(summary.max).toBeCloseTo(Math.max(...expected), 5);
  });
});

describe('health judgements', () => {
  const base = {
    documents: 1000,
    terms: 5000,
    builtDocuments: 880,
    nnz: 40_000,
    sigma: [10, 5, 1],
    energyKept: 0.4,
    orthogonalityU: 1e-12,
    orthogonalityV: 1e-12,
    foldedIn: 120,
    driftMean: 0.2,
    driftMax: 0.5,
  };
  it('recommends a rebuild past the folded share and the drift thresholds', () => {
    const folded = assessHealth(base, DEFAULT_HEALTH_THRESHOLDS);
    expect(folded.foldedShare).toBeCloseTo(0.12, 12);
    expect(folded.rebuildRecommended).toBe(true);
    expect(folded.messages.map((m) => m.code)).toEqual(['rebuild-folded']);
    const drift = assessHealth(
      { ...base, foldedIn: 50, driftMean: 0.4 },
      DEFAULT_HEALTH_THRESHOLDS,
    );
    expect(drift.messages.map((m) => m.code)).toEqual(['rebuild-drift']);
    expect(drift.messages[0].message).toMatch(/40\.0%/);
    const fine = assessHealth({ ...base, foldedIn: 50 }, DEFAULT_HEALTH_THRESHOLDS);
    expect(fine.rebuildRecommended).toBe(false);
  });
  it('warns about noise dimensions below max(m, n) * 2^-24 * sigma_1 (Golub & Van Loan 5.4.1)', () => {
    // floor = 5000 * 2^-24 = 2.98e-4
    expect(noiseDimensions([1, 1e-3, 2e-4, 1e-9], 5000, 880)).toEqual({
      floor: 5000 * 2 ** -24,
      count: 2,
    });
    const noisy = assessHealth(
      { ...base, foldedIn: 0, driftMean: null, sigma: [1, 1e-3, 2e-4, 1e-9] },
      DEFAULT_HEALTH_THRESHOLDS,
    );
    expect(noisy.noiseDimensions).toBe(2);
    expect(noisy.messages.map((m) => m.code)).toEqual(['noise-dimensions']);
    expect(noisy.messages[0].message).toMatch(/k = 2/);
    const weak = assessHealth(
      { ...base, foldedIn: 0, driftMean: null, sigma: [1, 0.5, 1e-3] },
      { ...DEFAULT_HEALTH_THRESHOLDS, conditionNumber: 100 },
    );
    expect(weak.messages.map((m) => m.code)).toEqual(['ill-conditioned']);
  });
});
