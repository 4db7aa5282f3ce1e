import { describe, expect, it } from 'vitest';
import {
  crossAccumulate,
  gram,
  householderQr,
  orthonormalize,
  subtractProduct,
  timesSmall,
} from './dense';
import { orthogonalityError } from './diagnostics';
import { fillGaussian } from './random';

/** Max-abs of Y - Q R for row-major Y (n x b), Q (n x b), upper R (b x b). */
function reconstructionError(
  y: Float64Array,
  q: Float64Array,
  r: Float64Array,
  n: number,
  b: number,
) {
  let worst = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < b; j++) {
      let s = 0;
      for (let c = 0; c <= j; c++) s += q[i * b + c] * r[c * b + j];
      worst = Math.max(worst, Math.abs(s - y[i * b + j]));
    }
  }
  return worst;
}

// Tall-skinny QR: CholeskyQR2 (Fukaya et al. 2014; Yamamoto et al. 2015) and Householder
// (Golub & Van Loan, Matrix Computations, 4th ed., Alg. 5.2.1): Q^T Q = I and Y = Q R.
describe('tall-skinny orthonormalisation', () => {
  it('CholeskyQR2 on a well-conditioned block', () => {
    const n = 503;
    const b = 17;
    const y = new Float64Array(n * b);
    fillGaussian(y, 1);
    const original = y.slice();
    const { r, method } = orthonormalize(y, n, b, 2);
    expect(method).toBe('cholesky-qr2');
    expect(orthogonalityError(y, n, b)).toBeLessThan(1e-14);
    expect(reconstructionError(original, y, r, n, b)).toBeLessThan(1e-12);
  });

  it('falls back to Householder on a rank-deficient block and stays orthonormal', () => {
    const n = 200;
    const b = 6;
    const y = new Float64Array(n * b);
    fillGaussian(y, 2);
    for (let i = 0; i < n; i++) y[i * b + 5] = y[i * b] + y[i * b + 1]; // column 5 dependent
    const original = y.slice();
    const { r, method } = orthonormalize(y, n, b, 2);
    expect(method).toBe('householder');
    expect(orthogonalityError(y, n, b)).toBeLessThan(1e-14);
    expect(reconstructionError(original, y, r, n, b)).toBeLessThan(1e-12);
  });

  it('Householder QR reproduces Y = Q R', () => {
    const n = 40;
    const b = 7;
    const y = new Float64Array(n * b);
    fillGaussian(y, 3);
    const original = y.slice();
    const r = householderQr(y, n, b);
    expect(orthogonalityError(y, n, b)).toBeLessThan(1e-14);
    expect(reconstructionError(original, y, r, n, b)).toBeLessThan(1e-12);
  });
});

describe('block kernels against naive loops', () => {
  const n = 37;
  const w = 9;
  const b = 5;
  const x = new Float64Array(n * w);
  const z = new Float64Array(n * b);
  fillGaussian(x, 4);
  fillGaussian(z, 5);

  it('gram = Y^T Y, crossAccumulate = X^T Z, subtractProduct = Z - X C, timesSmall = Y M', () => {
    const g = gram(x, n, w);
    const c = new Float64Array(w * b);
    crossAccumulate(x, w, w, z, b, c, 0, n);
    for (let a = 0; a < w; a++) {
      for (let d = 0; d < w; d++) {
        let s = 0;
        for (let i = 0; i < n; i++) s += x[i * w + a] * x[i * w + d];
        expect(g[a * w + d]).toBeCloseTo(s, 12);
      }
      for (let j = 0; j < b; j++) {
        let s = 0;
        for (let i = 0; i < n; i++) s += x[i * w + a] * z[i * b + j];
        expect(c[a * b + j]).toBeCloseTo(s, 12);
      }
    }
    const ct = new Float64Array(b * w);
    for (let a = 0; a < w; a++) for (let j = 0; j < b; j++) ct[j * w + a] = c[a * b + j];
    const zz = z.slice();
    subtractProduct(x, w, w, ct, zz, b, n);
    const out = new Float64Array(n * b);
    timesSmall(x, w, ct, b, out, 0, n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < b; j++) {
        let s = 0;
        for (let a = 0; a < w; a++) s += x[i * w + a] * c[a * b + j];
        expect(out[i * b + j]).toBeCloseTo(s, 12);
        expect(zz[i * b + j]).toBeCloseTo(z[i * b + j] - s, 12);
      }
    }
  });

  it('timesSmall with an upper-triangular M (given transposed) sums only i <= j, in place too', () => {
    for (const width of [8, 9]) {
      const y = new Float64Array(n * width);
      fillGaussian(y, width);
      const mt = new Float64Array(width * width); // row j = column j of M, zero below i <= j
      fillGaussian(mt, 40 + width);
      for (let j = 0; j < width; j++) for (let i = j + 1; i < width; i++) mt[j * width + i] = 0;
      const expected = new Float64Array(n * width);
      for (let r = 0; r < n; r++) {
        for (let j = 0; j < width; j++) {
          let s = 0;
          for (let i = 0; i <= j; i++) s += y[r * width + i] * mt[j * width + i];
          expected[r * width + j] = s;
        }
      }
      timesSmall(y, width, mt, width, y, 0, n, true);
      for (let i = 0; i < y.length; i++) expect(y[i]).toBeCloseTo(expected[i], 12);
    }
  });
});
