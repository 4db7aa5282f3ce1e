import { describe, expect, it } from 'vitest';
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import {
  type CsrMatrix,
  csrFromDense,
  csrFromTriplets,
  csrToDense,
  frobeniusNormSq,
} from '../sparse/csr';
import { numericalRank, truncatedSvd } from './svd';
import { conditionNumber, energyKept, orthogonalityError, svdDiagnostics } from './diagnostics';
import { mulberry32 } from './random';

/** Seeded random sparse matrix with uniform(0,1] values at random positions. */
function randomSparse(rows: number, cols: number, density: number, seed: number): CsrMatrix {
  const rand = mulberry32(seed);
  const ri: number[] = [];
  const ci: number[] = [];
  const vs: number[] = [];
  const count = Math.round(rows * cols * density);
  for (let t = 0; t < count; t++) {
    ri.push(Math.floor(rand() * rows));
    ci.push(Math.floor(rand() * cols));
    vs.push(1 - rand() * 2);
  }
  return csrFromTriplets(rows, cols, ri, ci, vs);
}

/** Reference: ml-matrix's full dense SVD (Golub-Reinsch), descending. */
function referenceSingularValues(a: CsrMatrix): number[] {
  const dense = csrToDense(a);
  const rows: number[][] = [];
  for (let i = 0; i < a.rows; i++)
    rows.push(Array.from(dense.subarray(i * a.cols, (i + 1) * a.cols)));
  return [...new SingularValueDecomposition(new Matrix(rows)).diagonal].sort((x, y) => y - x);
}

function maxRelativeError(
  actual: ArrayLike<number>,
  expected: ArrayLike<number>,
  k: number,
): number {
  let worst = 0;
  for (let i = 0; i < k; i++)
    worst = Math.max(worst, Math.abs(actual[i] - expected[i]) / expected[i]);
  return worst;
}

/** ||A - U_k S_k V_k^T||_F^2, formed densely. */
function residualFrobeniusSq(a: CsrMatrix, svd: ReturnType<typeof truncatedSvd>): number {
  const dense = csrToDense(a);
  const { k } = svd;
  let sum = 0;
  for (let i = 0; i < a.rows; i++) {
    for (let j = 0; j < a.cols; j++) {
      let approx = 0;
      for (let c = 0; c < k; c++) approx += svd.U[i * k + c] * svd.s[c] * svd.V[j * k + c];
      const d = dense[i * a.cols + j] - approx;
      sum += d * d;
    }
  }
  return sum;
}

describe('truncatedSvd on seeded random sparse matrices (reference: ml-matrix full SVD)', () => {
  const cases = [
    { rows: 150, cols: 90, density: 0.08, k: 10, seed: 1 },
    { rows: 70, cols: 160, density: 0.1, k: 15, seed: 2 },
    { rows: 120, cols: 120, density: 0.05, k: 25, seed: 3 },
    // Large enough that the block Krylov basis (9 blocks of 15) stays below min(rows, cols).
    { rows: 400, cols: 300, density: 0.03, k: 10, seed: 4 },
  ];
  for (const method of ['block-krylov', 'randomized', 'lanczos'] as const) {
    for (const c of cases) {
      // The large case exists for the block Krylov path; the others cover the rest quickly.
      if (c.rows === 400 && method !== 'block-krylov') continue;
      it(`${method}: ${c.rows} x ${c.cols}, k = ${c.k}: values, orthonormality, Eckart-Young`, () => {
        const a = randomSparse(c.rows, c.cols, c.density, c.seed);
        const ref = referenceSingularValues(a);
        // Random sparse matrices have flat spectra, the hard case for randomized methods
        // (Halko et al. 2011, section 10): subspace iteration needs q = 30 for the tested
        // accuracy, block Krylov (Musco & Musco 2015) far fewer.
        const powerIterations = method === 'randomized' ? 30 : 11;
        const svd = truncatedSvd(a, { k: c.k, method, powerIterations, seed: 7 });
        expect(svd.s.length).toBe(c.k);
        for (let i = 1; i < c.k; i++) expect(svd.s[i]).toBeLessThanOrEqual(svd.s[i - 1]);
        expect(maxRelativeError(svd.s, ref, c.k)).toBeLessThan(1e-6);
        expect(orthogonalityError(svd.U, c.rows, c.k)).toBeLessThan(1e-8);
        expect(orthogonalityError(svd.V, c.cols, c.k)).toBeLessThan(1e-8);
        // Eckart & Young (1936): the rank-k truncation's squared error is sum_{i>k} sigma_i^2.
        const tail = ref.slice(c.k).reduce((s, x) => s + x * x, 0);
        const residual = residualFrobeniusSq(a, svd);
        expect(Math.abs(residual - tail) / frobeniusNormSq(a)).toBeLessThan(1e-9);
      });
    }
  }

  it('default options on a matrix with a decaying spectrum match to 1e-6', () => {
    // A = sum_i 2^-i x_i y_i^T plus sparse noise: geometric decay, as in Halko et al. 7.
    const rows = 200;
    const cols = 120;
    const rand = mulberry32(11);
    const dense = new Float64Array(rows * cols);
    for (let r = 0; r < 30; r++) {
      const x = Array.from({ length: rows }, () => (rand() < 0.3 ? rand() - 0.5 : 0));
      const y = Array.from({ length: cols }, () => (rand() < 0.3 ? rand() - 0.5 : 0));
      const w = Math.pow(0.7, r);
      for (let i = 0; i < rows; i++) {
        if (x[i] === 0) continue;
        for (let j = 0; j < cols; j++) dense[i * cols + j] += w * x[i] * y[j];
      }
    }
    const a = csrFromDense(rows, cols, dense);
    const ref = referenceSingularValues(a);
    const svd = truncatedSvd(a, { k: 10 });
    expect(maxRelativeError(svd.s, ref, 10)).toBeLessThan(1e-6);
  });

  it('is deterministic for a given seed', () => {
    const a = randomSparse(80, 60, 0.1, 5);
    const x = truncatedSvd(a, { k: 5, seed: 99 });
    const y = truncatedSvd(a, { k: 5, seed: 99 });
    expect(Array.from(x.U)).toEqual(Array.from(y.U));
  });

  it('reports progress from 0 to 1', () => {
    const seen: number[] = [];
    truncatedSvd(randomSparse(50, 40, 0.2, 8), { k: 4, onProgress: (f) => seen.push(f) });
    expect(seen.at(-1)).toBe(1);
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThanOrEqual(seen[i - 1]);
  });

  it('throws a RangeError naming the problem for bad k', () => {
    const a = randomSparse(10, 6, 0.5, 4);
    expect(() => truncatedSvd(a, { k: 0 })).toThrow(/k must be at least 1/);
    expect(() => truncatedSvd(a, { k: -3 })).toThrow(RangeError);
    expect(() => truncatedSvd(a, { k: 7 })).toThrow(/exceeds min\(rows, cols\) = 6/);
    expect(() => truncatedSvd(a, { k: 2.5 })).toThrow(/whole number/);
    expect(() => truncatedSvd(csrFromTriplets(0, 5, [], [], []), { k: 1 })).toThrow(/empty/);
  });
});

describe('textbook facts (Golub & Van Loan, Matrix Computations, 4th ed., 2.4)', () => {
  it('[[1,2],[3,4]]: sigma = sqrt of the eigenvalues 29.866, 0.134 of A^T A; ||A||_2 = sigma_1', () => {
    const a = csrFromDense(2, 2, [1, 2, 3, 4]);
    for (const method of ['randomized', 'lanczos'] as const) {
      const svd = truncatedSvd(a, { k: 2, method });
      expect(svd.s[0]).toBeCloseTo(5.465, 3);
      expect(svd.s[1]).toBeCloseTo(0.366, 3);
      // A^T A = [[10,14],[14,20]]: eigenvalues 15 +- sqrt(221) (worked by hand).
      expect(svd.s[0] ** 2).toBeCloseTo(15 + Math.sqrt(221), 9);
      expect(svd.s[1] ** 2).toBeCloseTo(15 - Math.sqrt(221), 9);
      // ||A||_2 = max ||Ax|| / ||x||: no unit vector on a fine grid beats sigma_1.
      let best = 0;
      for (let t = 0; t < 2000; t++) {
        const x = [Math.cos((Math.PI * t) / 2000), Math.sin((Math.PI * t) / 2000)];
        best = Math.max(best, Math.hypot(x[0] + 2 * x[1], 3 * x[0] + 4 * x[1]));
      }
      expect(best).toBeLessThanOrEqual(svd.s[0] + 1e-12);
      expect(best).toBeGreaterThan(svd.s[0] - 1e-5);
    }
  });

  it('cond([[4,1],[1,4]]) = 5/3 (eigenvalues 5 and 3 of a symmetric positive definite matrix)', () => {
    const svd = truncatedSvd(csrFromDense(2, 2, [4, 1, 1, 4]), { k: 2 });
    expect(conditionNumber(svd.s)).toBeCloseTo(5 / 3, 12);
  });

  const hilbert = (n: number) => {
    const d: number[] = [];
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) d.push(1 / (i + j + 1));
    return csrFromDense(n, n, d);
  };

  it('Hilbert matrix condition numbers grow exponentially: 1.55e4 at n = 4, 1.60e13 at n = 10', () => {
    // Published values: cond_2(H_4) = 1.5514e4, cond_2(H_10) = 1.6025e13 (Golub & Van Loan; Higham,
    // Accuracy and Stability of Numerical Algorithms, 2nd ed., 2002, ch. 28 - from memory).
    const h4 = truncatedSvd(hilbert(4), { k: 4 });
    expect(conditionNumber(h4.s) / 1.5514e4).toBeCloseTo(1, 3);
    // For n = 10, sigma_10 ~ 1.1e-13 is ~1e-13 of sigma_1: any backward-stable SVD gets it
    // only to an absolute error near eps * sigma_1 ~ 4e-16, i.e. ~1e-3 relative, so the
    // check is loose (2%).
    const h10 = truncatedSvd(hilbert(10), { k: 10 });
    expect(Math.abs(conditionNumber(h10.s) / 1.6025e13 - 1)).toBeLessThan(0.02);
    const h6 = truncatedSvd(hilbert(6), { k: 6 });
    expect(conditionNumber(h6.s)).toBeGreaterThan(conditionNumber(h4.s) * 100);
    expect(conditionNumber(h10.s)).toBeGreaterThan(conditionNumber(h6.s) * 1e5);
  });

  it('numericalRank counts s_i > max(m, n) * eps * s_1 (Golub & Van Loan 5.4.1)', () => {
    // Rank-2 matrix: third column = first + second.
    const a = csrFromDense(4, 3, [1, 0, 1, 0, 1, 1, 1, 1, 2, 2, 1, 3]);
    const svd = truncatedSvd(a, { k: 3 });
    expect(numericalRank(svd.s, 4, 3)).toBe(2);
    expect(numericalRank(new Float64Array([3, 2, 1]), 3, 3)).toBe(3);
    expect(numericalRank(new Float64Array([1, 1e-17]), 2, 2)).toBe(1);
  });
});

describe('Deerwester, Dumais, Furnas, Landauer & Harshman (1990), Table 2 example', () => {
  // Raw term counts of the 12 index terms in titles c1-c5 (human-computer interaction)
  // and m1-m4 (graph theory), as printed in the paper.
  const counts = [
    [1, 0, 0, 1, 0, 0, 0, 0, 0], // human
    [1, 0, 1, 0, 0, 0, 0, 0, 0], // interface
    [1, 1, 0, 0, 0, 0, 0, 0, 0], // computer
    [0, 1, 1, 0, 1, 0, 0, 0, 0], // user
    [0, 1, 1, 2, 0, 0, 0, 0, 0], // system
    [0, 1, 0, 0, 1, 0, 0, 0, 0], // response
    [0, 1, 0, 0, 1, 0, 0, 0, 0], // time
    [0, 0, 1, 1, 0, 0, 0, 0, 0], // EPS
    [0, 1, 0, 0, 0, 0, 0, 0, 1], // survey
    [0, 0, 0, 0, 0, 1, 1, 1, 0], // trees
    [0, 0, 0, 0, 0, 0, 1, 1, 1], // graph
    [0, 0, 0, 0, 0, 0, 0, 1, 1], // minors
  ];
  const published = [3.34, 2.54, 2.35, 1.64, 1.5, 1.31, 0.85, 0.56, 0.36];

  it('has the published singular values 3.34 ... 0.36 to two decimals', () => {
    const a = csrFromDense(12, 9, counts.flat());
    for (const method of ['randomized', 'lanczos'] as const) {
      const svd = truncatedSvd(a, { k: 9, method });
      published.forEach((value, i) =>
        expect(Math.abs(svd.s[i] - value)).toBeLessThan(0.005 + 1e-9),
      );
      const d = svdDiagnostics(a, svd);
      expect(d.norm2).toBeCloseTo(3.34, 2);
      expect(d.energyKept).toBeCloseTo(1, 10); // k = rank: all of ||A||_F^2 is kept
    }
    // The 2-factor space of the paper's Figure keeps (3.34^2 + 2.54^2) / ||A||_F^2.
    // ||A||_F^2 = 31: 30 ones and one 2 ("system" twice in c4), counted by hand from the table.
    expect(frobeniusNormSq(a)).toBe(31);
    const two = truncatedSvd(a, { k: 2 });
    expect(energyKept(two.s, 31)).toBeCloseTo((3.34 ** 2 + 2.54 ** 2) / 31, 2);
  });
});

describe('diagnostics', () => {
  it('orthogonalityError is the max-abs entry of Q^T Q - I', () => {
    const q = new Float64Array([1, 0, 0, 1, 0, 0]); // 3 x 2, orthonormal
    expect(orthogonalityError(q, 3, 2)).toBe(0);
    const skew = new Float64Array([1, 0.1, 0, 1, 0, 0]); // Q^T Q = [[1, .1], [.1, 1.01]]
    expect(orthogonalityError(skew, 3, 2)).toBeCloseTo(0.1, 12);
  });
  it('energyKept and conditionNumber follow their definitions', () => {
    expect(energyKept([3, 4], 50)).toBeCloseTo(0.5, 12);
    expect(conditionNumber([10, 2, 0.5])).toBe(20);
    expect(conditionNumber([1, 0])).toBe(Infinity);
  });
});

describe('two-thread randomized SVD', () => {
  it('gives the same result as one thread (same seed)', () => {
    const a = randomSparse(300, 200, 0.05, 21);
    const one = truncatedSvd(a, { k: 8, seed: 3 });
    const two = truncatedSvd(a, { k: 8, seed: 3, threads: 2 });
    expect(two.method).toMatch(/2 threads/);
    expect(one.method).not.toMatch(/2 threads/);
    expect(maxRelativeError(two.s, one.s, 8)).toBeLessThan(1e-12);
    expect(orthogonalityError(two.U, 300, 8)).toBeLessThan(1e-8);
  });
});
