// Drift of a folded-in document (Deerwester et al. 1990, section 4: folding-in leaves
// the space as built). For the document's weighted term vector d and the orthonormal
// basis U_k of the term space, ||U_k^T d||^2 is the squared length of d's orthogonal
// projection onto span(U_k), so 1 - ||U_k^T d||^2 / ||d||^2 is the share of the
// document's weight that the space cannot represent (0: wholly inside; 1: orthogonal).
// Rebuilding makes room for it; a growing mean says the new documents are about
// something the space has no axes for.

/** 1 - ||U_k^T d||^2 / ||d||^2 for a sparse d (term ids and weights); 1 for d = 0. */
export function projectionDrift(
  termIds: ArrayLike<number>,
  weights: ArrayLike<number>,
  termVectors: ArrayLike<number>,
  k: number,
): number {
  const projected = new Float64Array(k);
  let normSq = 0;
  for (let p = 0; p < termIds.length; p++) {
    const w = weights[p];
    normSq += w * w;
    const o = termIds[p] * k;
    for (let c = 0; c < k; c++) projected[c] += w * termVectors[o + c];
  }
  if (!(normSq > 0)) return 1;
  let projectedSq = 0;
  for (let c = 0; c < k; c++) projectedSq += projected[c] * projected[c];
  // Rounding (and float32 U_k) can push the ratio a hair above 1.
  return Math.min(1, Math.max(0, 1 - projectedSq / normSq));
}

export interface DriftSummary {
  count: number;
  mean: number | null;
  max: number | null;
}

export function summariseDrift(values: ArrayLike<number>): DriftSummary {
  if (values.length === 0) return { count: 0, mean: null, max: null };
  let sum = 0;
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) {
    sum += values[i];
    max = Math.max(max, values[i]);
  }
  return { count: values.length, mean: sum / values.length, max };
}
