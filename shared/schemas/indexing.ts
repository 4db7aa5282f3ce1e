import { z } from 'zod';
import type { Job } from './jobs';

// The matter's concept-space index: state, versions and rebuilds.

/** Term weightings the engine offers (server/engine/index/weighting.ts). */
export const INDEX_WEIGHTINGS = ['log-entropy', 'tf-idf', 'raw'] as const;
export type IndexWeighting = (typeof INDEX_WEIGHTINGS)[number];

export const INDEX_K_DEFAULT = 200;

/**
 * The k a build uses when nobody asked for one: 200 for a large matter, but well below
 * the number of documents for a small one. With k near the document count the rank-k
 * space reproduces the term-document matrix almost exactly and concept search falls
 * back to keyword matching (Deerwester et al. 1990 chose k = 100 for 1,033 documents;
 * on Cranfield's 1,400 the best k measured here is 200, docs/RETRIEVAL.md). One axis per
 * twelve documents, from 10 up to 200, is our rule of thumb (measured on the demo matter).
 */
export function automaticK(documentCount: number): number {
  return Math.max(10, Math.min(INDEX_K_DEFAULT, Math.round(documentCount / 12)));
}
export const INDEX_K_MAX = 1000;

/**
 * The one rule for a k the matter can hold, used by the rebuild form and the API alike: a
 * rank-k truncated SVD of an m x n matrix needs k <= min(m, n) (Golub and Van Loan, Matrix
 * Computations, 4th ed., section 2.4), and the documents of a build are its n columns. A k
 * within this bound can still be lowered to the matrix's numerical rank (near-identical
 * documents), which the build reports.
 */
export function indexKError(k: number, buildableDocuments: number): string | null {
  if (buildableDocuments > 0 && k > buildableDocuments)
    return `must be at most ${buildableDocuments}, the number of documents the concept space is built from`;
  return null;
}

/** POST /api/matters/:matterId/index/rebuild (202). Defaults: the current version's settings. */
export const rebuildIndexSchema = z.object({
  k: z
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(INDEX_K_MAX, `must be at most ${INDEX_K_MAX}`)
    .optional(),
  weighting: z
    .enum(INDEX_WEIGHTINGS, { error: `must be one of ${INDEX_WEIGHTINGS.join(', ')}` })
    .optional(),
});
export type RebuildIndexReq = z.infer<typeof rebuildIndexSchema>;

export const INDEX_VERSION_STATUSES = ['building', 'ready', 'failed', 'superseded'] as const;
export type IndexVersionStatus = (typeof INDEX_VERSION_STATUSES)[number];

export interface IndexDiagnostics {
  /** sigma_1 >= ... >= sigma_k. */
  singularValues: number[];
  /** ||A||_2 = sigma_1. */
  sigma1: number | null;
  /** sigma_1 / sigma_k. */
  conditionNumber: number | null;
  /** ||A||_F^2 of the weighted matrix. */
  frobeniusSq: number | null;
  /** Share of ||A||_F^2 kept by the rank-k space (Eckart-Young). */
  energy: number | null;
  /** max |(U^T U - I)_ab|, and the same for V. */
  orthogonalityU: number | null;
  orthogonalityV: number | null;
  buildMs: number | null;
  peakRssMb: number | null;
}

export interface IndexVersionInfo {
  id: number;
  version: number;
  status: IndexVersionStatus;
  k: number;
  /** k asked for (the engine lowers k to the numerical rank when needed). */
  requestedK: number | null;
  weighting: string;
  nDocs: number;
  nTerms: number;
  nnz: number;
  createdAt: string;
  /** When the build finished (ready or failed). */
  completedAt: string | null;
  error: string | null;
  diagnostics: IndexDiagnostics;
}

export interface IndexCounts {
  /** In the built space. */
  indexed: number;
  /** Folded in since the build. */
  foldedIn: number;
  /** Extracted or pending, not yet in the space. */
  waiting: number;
  /** Extraction failed. */
  failed: number;
  duplicates: number;
}

/** GET /api/matters/:matterId/index */
export interface IndexStateResponse {
  counts: IndexCounts;
  /** The version serving searches; null before the first build. */
  current: IndexVersionInfo | null;
  /** A build in progress, if any. */
  building: IndexVersionInfo | null;
  /** The most recent failed build, when it is newer than the current version. */
  lastFailed: IndexVersionInfo | null;
  /** The running or queued build-index job, else the newest extraction still running. */
  activeJob: Job | null;
  /** foldedIn / (indexed + foldedIn) above which a rebuild is queued by itself. */
  rebuildFoldInShare: number;
  /** Extracted documents: the columns a rebuild would have (k is at most this, indexKError). */
  buildableDocuments: number;
}

/** 202 answer of POST /api/matters/:matterId/index/rebuild */
export interface RebuildIndexResponse {
  job: Job;
}
