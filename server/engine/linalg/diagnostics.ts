// Diagnostics of a truncated SVD that support staff ask about (Golub & Van Loan,
// Matrix Computations, 4th ed., 2.4): ||A||_2 = sigma_1, condition sigma_1 / sigma_k,
// energy kept sum_{i<=k} sigma_i^2 / ||A||_F^2 (Eckart & Young 1936), and the loss of
// orthogonality of the computed singular vectors.
import { type CsrMatrix, frobeniusNormSq } from '../sparse/csr';
import { gram } from './dense';
import type { TruncatedSvd } from './svd';

/** sum s_i^2 / ||A||_F^2, in [0, 1] up to rounding. */
export function energyKept(s: ArrayLike<number>, frobeniusSq: number): number {
  if (!(frobeniusSq > 0)) return 0;
  let sum = 0;
  for (let i = 0; i < s.length; i++) sum += s[i] * s[i];
  return sum / frobeniusSq;
}

/** s_1 / s_k of the kept values (Infinity when s_k is zero). */
export function conditionNumber(s: ArrayLike<number>): number {
  if (s.length === 0) return NaN;
  const last = s[s.length - 1];
  return last === 0 ? Infinity : s[0] / last;
}

/**
 * MAX-ABS entry of Q^T Q - I for a row-major n x k block Q: max_{a,b} |(Q^T Q)_{ab} -
 * delta_{ab}|. (Bounded above by the Frobenius norm and within a factor k of it.)
 */
export function orthogonalityError(Q: Float64Array, n: number, k: number): number {
  const g = gram(Q, n, k); // the blocked Gram kernel: this runs on every index build
  let worst = 0;
  for (let a = 0; a < k; a++) {
    for (let b = a; b < k; b++) worst = Math.max(worst, Math.abs(g[a * k + b] - (a === b ? 1 : 0)));
  }
  return worst;
}

export interface SvdDiagnostics {
  k: number;
  singularValues: number[];
  /** ||A||_2 = sigma_1. */
  norm2: number;
  conditionNumber: number;
  frobeniusNormSq: number;
  energyKept: number;
  orthogonalityErrorU: number;
  orthogonalityErrorV: number;
}

export function svdDiagnostics(a: CsrMatrix, svd: TruncatedSvd): SvdDiagnostics {
  const fro = frobeniusNormSq(a);
  return {
    k: svd.k,
    singularValues: Array.from(svd.s),
    norm2: svd.s[0] ?? 0,
    conditionNumber: conditionNumber(svd.s),
    frobeniusNormSq: fro,
    energyKept: energyKept(svd.s, fro),
    orthogonalityErrorU: orthogonalityError(svd.U, svd.rows, svd.k),
    orthogonalityErrorV: orthogonalityError(svd.V, svd.cols, svd.k),
  };
}
