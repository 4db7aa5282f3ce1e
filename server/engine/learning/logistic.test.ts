import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../linalg/random';
import { fitLogistic, type SparseRows } from './logistic';

function dense(rows: number[][]): SparseRows {
  const nCols = rows[0].length;
  const indptr = new Int32Array(rows.length + 1);
  const indices: number[] = [];
  const values: number[] = [];
  rows.forEach((r, i) => {
    r.forEach((v, j) => {
      if (v !== 0) {
        indices.push(j);
        values.push(v);
      }
    });
    indptr[i + 1] = indices.length;
  });
  return {
    nRows: rows.length,
    nCols,
    indptr,
    indices: Int32Array.from(indices),
    values: Float64Array.from(values),
  };
}

/**
 * An independent reference: plain Newton's method with the full Hessian formed
 * explicitly and solved by Gaussian elimination with partial pivoting (the textbook
 * IRLS of Hastie, Tibshirani & Friedman, Elements of Statistical Learning, 4.4.1,
 * plus the ridge term). Returns [w..., b] and the gradient there.
 */
function referenceFit(rows: number[][], y: number[], lambda: number) {
  const d = rows[0].length;
  const X = rows.map((r) => [...r, 1]);
  const beta = new Array(d + 1).fill(0);
  const gradientAt = (b: number[]) => {
    const g = new Array(d + 1).fill(0);
    const p = X.map((x) => 1 / (1 + Math.exp(-x.reduce((s, v, j) => s + v * b[j], 0))));
    X.forEach((x, i) => x.forEach((v, j) => (g[j] += (p[i] - y[i]) * v)));
    for (let j = 0; j < d; j++) g[j] += lambda * b[j];
    return { g, p };
  };
  for (let it = 0; it < 50; it++) {
    const { g, p } = gradientAt(beta);
    const H = Array.from({ length: d + 1 }, () => new Array(d + 1).fill(0));
    X.forEach((x, i) => {
      const w = p[i] * (1 - p[i]);
      for (let a = 0; a <= d; a++) for (let c = 0; c <= d; c++) H[a][c] += w * x[a] * x[c];
    });
    for (let j = 0; j < d; j++) H[j][j] += lambda;
    // Solve H s = -g.
    const A = H.map((row, i) => [...row, -g[i]]);
    for (let col = 0; col <= d; col++) {
      let piv = col;
      for (let r = col + 1; r <= d; r++) if (Math.abs(A[r][col]) > Math.abs(A[piv][col])) piv = r;
      [A[col], A[piv]] = [A[piv], A[col]];
      for (let r = col + 1; r <= d; r++) {
        const f = A[r][col] / A[col][col];
        for (let c = col; c <= d + 1; c++) A[r][c] -= f * A[col][c];
      }
    }
    const s = new Array(d + 1).fill(0);
    for (let r = d; r >= 0; r--) {
      let v = A[r][d + 1];
      for (let c = r + 1; c <= d; c++) v -= A[r][c] * s[c];
      s[r] = v / A[r][r];
    }
    for (let j = 0; j <= d; j++) beta[j] += s[j];
  }
  return { beta, gradient: gradientAt(beta).g };
}

describe('L2-regularised logistic regression', () => {
  it('hand-worked two-dimensional example: (1,1) responsive, (-1,-1) not, lambda = 1/ln 3', () => {
    // By symmetry b = 0 and w1 = w2 = a; the gradient in w1 is -2 sigma(-2a) + lambda a.
    // With 2a = ln 3, sigma(-ln 3) = 1/4, so it vanishes when lambda = 1/ln 3:
    // the optimum is w = (ln 3 / 2, ln 3 / 2), b = 0, and P(responsive | (1,1)) = 3/4.
    const x = dense([
      [1, 1],
      [-1, -1],
    ]);
    const model = fitLogistic(x, [1, 0], { lambda: 1 / Math.log(3) });
    expect(model.weights[0]).toBeCloseTo(Math.log(3) / 2, 10);
    expect(model.weights[1]).toBeCloseTo(Math.log(3) / 2, 10);
    expect(model.bias).toBeCloseTo(0, 10);
    expect(model.gradientNorm).toBeLessThan(1e-8);
  });

  it('hand-worked intercept: a feature that is always 0 gets weight 0, the bias logit(1/3) = -ln 2', () => {
    const x = dense([[0], [0], [0]]);
    const model = fitLogistic(x, [1, 0, 0], { lambda: 0.5 });
    expect(model.weights[0]).toBe(0);
    expect(model.bias).toBeCloseTo(-Math.log(2), 10);
  });

  it('matches a reference Newton fit of the same data, with the gradient zero to 1e-8', () => {
    const random = mulberry32(2014);
    const rows: number[][] = [];
    const y: number[] = [];
    const truth = [1.5, -2, 0.5, 0, 1];
    for (let i = 0; i < 80; i++) {
      const r = truth.map(() => random() * 2 - 1);
      const z = r.reduce((s, v, j) => s + v * truth[j], -0.3);
      rows.push(r);
      y.push(random() < 1 / (1 + Math.exp(-z)) ? 1 : 0);
    }
    const lambda = 0.7;
    const ref = referenceFit(rows, y, lambda);
    expect(Math.max(...ref.gradient.map(Math.abs))).toBeLessThan(1e-8);
    const model = fitLogistic(dense(rows), y, { lambda });
    for (let j = 0; j < 5; j++) expect(model.weights[j]).toBeCloseTo(ref.beta[j], 8);
    expect(model.bias).toBeCloseTo(ref.beta[5], 8);
    // The gradient recomputed here, independently of the fitter, is zero to 1e-8.
    const check = referenceFitGradient(rows, y, lambda, [...model.weights, model.bias]);
    expect(Math.max(...check.map(Math.abs))).toBeLessThan(1e-8);
  });

  it('reaches a zero gradient on a sparse, wide problem where CG solves inexactly', () => {
    const random = mulberry32(7);
    const nRows = 300;
    const nCols = 2000;
    const indptr = new Int32Array(nRows + 1);
    const indices: number[] = [];
    const values: number[] = [];
    const y: number[] = [];
    for (let i = 0; i < nRows; i++) {
      const cols = new Set<number>();
      while (cols.size < 15) cols.add(Math.floor(random() * nCols));
      const sorted = [...cols].sort((a, b) => a - b);
      let z = 0;
      for (const c of sorted) {
        const v = random();
        indices.push(c);
        values.push(v);
        z += c < 100 ? v : -0.2 * v;
      }
      indptr[i + 1] = indices.length;
      y.push(z > 0.1 ? 1 : 0);
    }
    const model = fitLogistic(
      {
        nRows,
        nCols,
        indptr,
        indices: Int32Array.from(indices),
        values: Float64Array.from(values),
      },
      y,
      { lambda: 0.1 },
    );
    expect(model.gradientNorm).toBeLessThan(1e-8);
  });

  it('rejects training data with one label only, bad labels and a bad penalty', () => {
    const x = dense([[1], [2]]);
    expect(() => fitLogistic(x, [1, 1])).toThrow(/both labels/);
    expect(() => fitLogistic(x, [1, 2])).toThrow(/must be 0 or 1/);
    expect(() => fitLogistic(x, [1, 0], { lambda: 0 })).toThrow(/lambda/);
  });
});

function referenceFitGradient(rows: number[][], y: number[], lambda: number, beta: number[]) {
  const d = rows[0].length;
  const g = new Array(d + 1).fill(0);
  rows.forEach((r, i) => {
    const z = r.reduce((s, v, j) => s + v * beta[j], beta[d]);
    const p = 1 / (1 + Math.exp(-z));
    r.forEach((v, j) => (g[j] += (p - y[i]) * v));
    g[d] += p - y[i];
  });
  for (let j = 0; j < d; j++) g[j] += lambda * beta[j];
  return g;
}
