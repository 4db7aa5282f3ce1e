// The spectrum of a truncated SVD A ~ U_k S_k V_k^T. By Eckart & Young (1936) the best
// rank-i approximation A_i leaves ||A - A_i||_F^2 = ||A||_F^2 - sum_{j<=i} sigma_j^2, so
// the share of the matrix's "energy" (squared Frobenius norm) the first i dimensions
// keep is sum_{j<=i} sigma_j^2 / ||A||_F^2 (Golub & Van Loan, Matrix Computations,
// 4th ed., 2.4.8).

/** cumulative[i] = sum_{j<=i} sigma_j^2 / ||A||_F^2 (0-based i); empty when ||A||_F^2 is not positive. */
export function cumulativeEnergy(sigma: ArrayLike<number>, frobeniusSq: number): Float64Array {
  if (!(frobeniusSq > 0)) return new Float64Array(0);
  const out = new Float64Array(sigma.length);
  let sum = 0;
  for (let i = 0; i < sigma.length; i++) {
    sum += sigma[i] * sigma[i];
    out[i] = sum / frobeniusSq;
  }
  return out;
}

/** sigma_i^2 / ||A||_F^2 for one dimension. */
export function energyShare(sigmaI: number, frobeniusSq: number): number | null {
  return frobeniusSq > 0 ? (sigmaI * sigmaI) / frobeniusSq : null;
}
