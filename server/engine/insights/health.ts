// Index health in plain words. Figures come from the build (index_versions) and from
// the folded-in documents; this module only judges them.
//
// Noise floor for the last dimensions. Golub & Van Loan (Matrix Computations, 4th ed.,
// 5.4.1, "numerical rank") treat sigma_i as zero when sigma_i <= tol with
// tol = max(m, n) * u * sigma_1, u the unit roundoff of the arithmetic that produced or
// holds the data. The engine keeps U_k and the document rows in float32 (u = 2^-24),
// so a dimension with sigma_i / sigma_1 <= max(m, n) * 2^-24 carries nothing the stored
// vectors can resolve: it is noise. (The build itself already drops dimensions below
// the float64 floor, max(m, n) * 2^-52, in server/engine/linalg/svd.ts numericalRank.)
// Separately, a condition number sigma_1 / sigma_k above 1e6 (common practice as a
// warning level) says the last dimensions are weak enough that small changes to the
// matrix move them a lot (Golub & Van Loan 2.6.2, 8.6.1: singular subspaces of close or
// small singular values are sensitive).

export const FLOAT32_UNIT_ROUNDOFF = 2 ** -24;

export interface HealthThresholdsInput {
  drift: number;
  foldedShare: number;
  conditionNumber: number;
}

export const DEFAULT_HEALTH_THRESHOLDS: HealthThresholdsInput = {
  drift: 0.35,
  foldedShare: 0.1,
  conditionNumber: 1e6,
};

export interface HealthFigures {
  documents: number;
  terms: number;
  builtDocuments: number;
  nnz: number;
  sigma: ArrayLike<number>;
  energyKept: number | null;
  orthogonalityU: number | null;
  orthogonalityV: number | null;
  foldedIn: number;
  driftMean: number | null;
  driftMax: number | null;
}

export interface HealthMessageOut {
  code: string;
  message: string;
}

export interface HealthAssessment {
  sparsity: number;
  sigma1: number;
  sigmaK: number;
  conditionNumber: number;
  foldedShare: number;
  noiseFloor: number;
  noiseDimensions: number;
  rebuildRecommended: boolean;
  messages: HealthMessageOut[];
  summary: string[];
}

const pct = (x: number, digits = 1) => `${(x * 100).toFixed(digits)}%`;
const num = (x: number) =>
  !Number.isFinite(x)
    ? 'infinite'
    : Math.abs(x) >= 1e5 || (x !== 0 && Math.abs(x) < 1e-3)
      ? x.toExponential(2)
      : x.toFixed(3);

/** Dimensions i with sigma_i / sigma_1 <= max(m, n) * 2^-24 (see the file comment). */
export function noiseDimensions(
  sigma: ArrayLike<number>,
  m: number,
  n: number,
): { floor: number; count: number } {
  const floor = Math.max(m, n) * FLOAT32_UNIT_ROUNDOFF;
  let count = 0;
  const s1 = sigma.length > 0 ? sigma[0] : 0;
  for (let i = 0; i < sigma.length; i++) if (!(s1 > 0) || sigma[i] / s1 <= floor) count++;
  return { floor, count };
}

export function assessHealth(f: HealthFigures, t: HealthThresholdsInput): HealthAssessment {
  const k = f.sigma.length;
  const sigma1 = k > 0 ? f.sigma[0] : 0;
  const sigmaK = k > 0 ? f.sigma[k - 1] : 0;
  const conditionNumber = sigmaK > 0 ? sigma1 / sigmaK : Infinity;
  const cells = f.terms * f.builtDocuments;
  const sparsity = cells > 0 ? 1 - f.nnz / cells : 1;
  const foldedShare = f.documents > 0 ? f.foldedIn / f.documents : 0;
  const noise = noiseDimensions(f.sigma, f.terms, f.builtDocuments);
  const messages: HealthMessageOut[] = [];
  let rebuildRecommended = false;

  if (f.driftMean !== null && f.driftMean > t.drift) {
    rebuildRecommended = true;
    messages.push({
      code: 'rebuild-drift',
      message: `Rebuild recommended: on average ${pct(f.driftMean)} of the weight of the documents added since the build lies outside the concept space (threshold ${pct(t.drift, 0)}). They are about things the current dimensions do not cover.`,
    });
  }
  if (foldedShare > t.foldedShare) {
    rebuildRecommended = true;
    messages.push({
      code: 'rebuild-folded',
      message: `Rebuild recommended: ${f.foldedIn} of ${f.documents} documents (${pct(foldedShare)}) were folded in after the build (threshold ${pct(t.foldedShare, 0)}). Folded-in documents do not change the vocabulary or the dimensions.`,
    });
  }
  if (noise.count > 0) {
    messages.push({
      code: 'noise-dimensions',
      message: `Warning: the last ${noise.count} of ${k} dimensions have sigma_i / sigma_1 at or below ${noise.floor.toExponential(1)}, the precision the stored vectors can resolve; they are noise. Rebuild with k = ${Math.max(1, k - noise.count)} or less.`,
    });
  } else if (conditionNumber > t.conditionNumber) {
    messages.push({
      code: 'ill-conditioned',
      message: `Warning: the condition number sigma_1 / sigma_k is ${num(conditionNumber)} (above ${num(t.conditionNumber)}); the last dimensions are very weak and may be noise. Consider a smaller k.`,
    });
  }
  if (f.orthogonalityU !== null && f.orthogonalityU > 1e-4) {
    messages.push({
      code: 'orthogonality',
      message: `Warning: the term vectors are not orthonormal to working precision (error ${num(f.orthogonalityU)}); rebuild the index.`,
    });
  }
  if (f.orthogonalityV !== null && f.orthogonalityV > 1e-4) {
    messages.push({
      code: 'orthogonality',
      message: `Warning: the document vectors are not orthonormal to working precision (error ${num(f.orthogonalityV)}); rebuild the index.`,
    });
  }

  const summary = [
    `${f.documents} documents are indexed (${f.builtDocuments} in the build, ${f.foldedIn} folded in since) over ${f.terms} terms.`,
    `The term-document matrix is ${pct(sparsity, 2)} empty (sparsity 1 - nnz/(terms x documents), ${f.nnz} non-zero entries).`,
    `sigma_1 = ${num(sigma1)}: the largest singular value, which is the matrix 2-norm ||A||_2.`,
    `The condition number sigma_1 / sigma_k is ${num(conditionNumber)} at k = ${k} (sigma_k = ${num(sigmaK)}).`,
    f.energyKept !== null
      ? `The ${k} dimensions keep ${pct(f.energyKept)} of the matrix's energy (sum of sigma_i^2 over ||A||_F^2); the best rank-${k} approximation misses ${pct(Math.max(0, 1 - f.energyKept))}.`
      : 'The share of energy kept is unknown for this build.',
    f.orthogonalityU !== null && f.orthogonalityV !== null
      ? `The computed singular vectors are orthonormal to ${num(f.orthogonalityU)} (terms, U) and ${num(f.orthogonalityV)} (documents, V), the largest entry of Q^T Q - I.`
      : 'Orthogonality errors were not recorded for this build.',
    f.driftMean !== null
      ? `${pct(foldedShare)} of the documents were folded in; on average ${pct(f.driftMean)} of their weight lies outside the space (largest ${pct(f.driftMax ?? 0)}).`
      : 'No document has been folded in since the build, so there is no drift to measure.',
  ];
  return {
    sparsity,
    sigma1,
    sigmaK,
    conditionNumber,
    foldedShare,
    noiseFloor: noise.floor,
    noiseDimensions: noise.count,
    rebuildRecommended,
    messages,
    summary,
  };
}
