import { z } from 'zod';
import type { Job } from './jobs';
import { idSchema, text, type PersonRef } from './common';

// The concept space seen from outside: spectrum, concept dimensions and their
// labels, term neighbours, the document map, k-means groups and index health.
// Every route is under /api/matters/:matterId/concepts/... and reads the matter's
// current (serving) index version. A rebuild with another k or weighting is
// POST /api/matters/:matterId/index/rebuild (shared/schemas/indexing.ts).
//
// Concept search assists attorney review; it does not decide relevance or privilege.

/** Dimensions the concepts view lists at most (GET .../concepts/dimensions?count=). */
export const CONCEPT_DIMENSIONS_MAX = 50;
export const CONCEPT_DIMENSIONS_DEFAULT = 12;
export const CONCEPT_TERMS_PER_END_MAX = 50;
export const CONCEPT_DOCS_PER_DIMENSION_MAX = 50;
export const DIMENSION_LABEL_MAX_LENGTH = 80;
export const NEIGHBOURS_MAX = 100;
export const NEIGHBOURS_DEFAULT = 20;
export const TERM_QUERY_MAX_LENGTH = 200;
export const GROUPS_MIN = 2;
export const GROUPS_MAX = 50;
export const GROUP_TOP_TERMS = 12;

const count = (max: number, fallback: number) =>
  z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(max, `must be at most ${max}`)
    .default(fallback);

/** A concept dimension, numbered from 1 (dimension 1 belongs to sigma_1). */
export const dimensionSchema = z.coerce
  .number({ error: 'must be a number' })
  .int('must be a whole number')
  .min(1, 'must be at least 1');

// ---------------------------------------------------------------- spectrum

/** The figures of one index version for the spectrum plot. */
export interface SpectrumVersion {
  indexId: number;
  version: number;
  status: 'building' | 'ready' | 'failed' | 'superseded';
  k: number;
  requestedK: number | null;
  weighting: string;
  nDocs: number;
  nTerms: number;
  /** sigma_1 >= ... >= sigma_k. */
  singularValues: number[];
  /** cumulativeEnergy[i] = sum_{j<=i} sigma_j^2 / ||A||_F^2 (Eckart-Young); null without ||A||_F^2. */
  cumulativeEnergy: number[] | null;
  /** ||A||_F^2 of the weighted term-document matrix of the build. */
  frobeniusSq: number | null;
  /** Share of ||A||_F^2 kept by the k dimensions (= the last cumulativeEnergy). */
  energyKept: number | null;
  /** 1 - energyKept: the squared Frobenius error of the best rank-k approximation, as a share. */
  energyBeyondK: number | null;
  completedAt: string | null;
}

/** GET /api/matters/:matterId/concepts/spectrum */
export interface SpectrumResponse {
  /** The serving version; null before the first build. */
  current: SpectrumVersion | null;
  /** The most recent ready version before the current one (for side-by-side comparison). */
  previous: SpectrumVersion | null;
}

// ---------------------------------------------------------------- dimensions

export const dimensionsQuerySchema = z.object({
  /** How many leading dimensions (clipped to k). */
  count: count(CONCEPT_DIMENSIONS_MAX, CONCEPT_DIMENSIONS_DEFAULT),
  /** Terms shown at each end of a dimension. */
  terms: count(CONCEPT_TERMS_PER_END_MAX, 10),
  /** Most typical documents per dimension. */
  docs: count(CONCEPT_DOCS_PER_DIMENSION_MAX, 5),
});
export type DimensionsQuery = z.infer<typeof dimensionsQuerySchema>;

export interface DimensionTerm {
  /** The stem as indexed ("comput"). */
  term: string;
  /** A readable word for it: its most frequent surface form ("computer"). */
  label: string;
  /** The term's entry in this column of U_k (signed). */
  loading: number;
}

export interface DimensionDocument {
  documentId: number;
  controlNumber: string;
  title: string;
  /** The document's entry in this column of V_k (signed; from V_k S_k / sigma for folded-in ones). */
  loading: number;
  foldedIn: boolean;
}

export interface DimensionLabel {
  label: string;
  labelledBy: PersonRef | null;
  labelledAt: string;
}

export interface ConceptDimension {
  /** 1-based. */
  dim: number;
  sigma: number;
  /** sigma_dim^2 / ||A||_F^2. */
  energyShare: number | null;
  label: DimensionLabel | null;
  /** Largest positive loadings first. */
  positiveTerms: DimensionTerm[];
  /** Most negative loadings first. */
  negativeTerms: DimensionTerm[];
  /** Largest |loading| first, with its sign. */
  documents: DimensionDocument[];
}

/** GET /api/matters/:matterId/concepts/dimensions?count=&terms=&docs= */
export interface DimensionsResponse {
  indexId: number;
  version: number;
  k: number;
  dimensions: ConceptDimension[];
}

export const dimensionParams = z.object({ matterId: idSchema, dim: dimensionSchema });
export type DimensionParams = z.infer<typeof dimensionParams>;

/** PUT /api/matters/:matterId/concepts/dimensions/:dim/label (concepts.label). */
export const dimensionLabelSchema = z.object({
  label: text()
    .trim()
    .min(1, 'is required')
    .max(DIMENSION_LABEL_MAX_LENGTH, `must be at most ${DIMENSION_LABEL_MAX_LENGTH} characters`),
});
export type DimensionLabelReq = z.infer<typeof dimensionLabelSchema>;

/** Answer of PUT (and of DELETE, with label null) .../dimensions/:dim/label */
export interface DimensionLabelResponse {
  indexId: number;
  version: number;
  dim: number;
  label: DimensionLabel | null;
}

// ---------------------------------------------------------------- term neighbours

export const neighboursQuerySchema = z.object({
  term: text()
    .trim()
    .min(1, 'is required')
    .max(TERM_QUERY_MAX_LENGTH, `must be at most ${TERM_QUERY_MAX_LENGTH} characters`),
  n: count(NEIGHBOURS_MAX, NEIGHBOURS_DEFAULT),
});
export type NeighboursQuery = z.infer<typeof neighboursQuerySchema>;

export interface NeighbourTerm {
  term: string;
  /** Readable surface form of the stem. */
  label: string;
  /** Cosine similarity in the concept space (rows of U_k S_k). */
  similarity: number;
  /** Documents the term occurs in (at build time). */
  df: number;
}

/** GET /api/matters/:matterId/concepts/terms/neighbours?term=&n= */
export interface NeighboursResponse {
  indexId: number;
  version: number;
  /** What was typed. */
  query: string;
  /** The stems it analyses to, as a query would be analysed. */
  analysed: string[];
  /** Stems the index does not know. */
  unknown: string[];
  neighbours: NeighbourTerm[];
  /** Set when nothing could be looked up (e.g. the word is not in the index). */
  notice: string | null;
}

// ---------------------------------------------------------------- document map

export const mapQuerySchema = z
  .object({
    /** Concept dimension on the horizontal axis (1-based). */
    x: dimensionSchema.default(1),
    /** Concept dimension on the vertical axis (1-based). */
    y: dimensionSchema.default(2),
  })
  .refine((q) => q.x !== q.y, { message: 'x and y must be different dimensions', path: ['y'] });
export type MapQuery = z.infer<typeof mapQuerySchema>;

export interface MapLookup {
  id: number;
  name: string;
}

/**
 * GET /api/matters/:matterId/concepts/map?x=&y=
 * Parallel arrays, one entry per document of the index (index i is one point).
 * Coordinates: the document's row of V_k S_k divided by its length over all k
 * dimensions, taken at dimensions x and y, i.e. the cosine between the document and
 * each concept axis (within [-1, 1]); rounded to 4 decimals.
 */
export interface MapResponse {
  indexId: number;
  version: number;
  k: number;
  dims: [number, number];
  count: number;
  x: number[];
  y: number[];
  ids: number[];
  controlNumbers: string[];
  titles: string[];
  /** Position in `custodians`, or -1 for none. */
  custodian: number[];
  /** Ids of the codes on each document (see `codes`). */
  codeIds: number[][];
  /** 1 for documents folded in after the build. */
  foldedIn: number[];
  custodians: MapLookup[];
  codes: MapLookup[];
}

// ---------------------------------------------------------------- groups

/** POST /api/matters/:matterId/concepts/groupings: k-means over the document vectors. */
export const createGroupingSchema = z.object({
  groups: z
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(GROUPS_MIN, `must be at least ${GROUPS_MIN}`)
    .max(GROUPS_MAX, `must be at most ${GROUPS_MAX}`),
  seed: z
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(0, 'must be at least 0')
    .max(2 ** 31 - 1, 'is too large')
    .default(1),
});
export type CreateGroupingReq = z.infer<typeof createGroupingSchema>;

export const groupingParams = z.object({ matterId: idSchema, groupingId: idSchema });
export type GroupingParams = z.infer<typeof groupingParams>;

export interface GroupTerm {
  term: string;
  label: string;
  /** Entry of U_k c for the group's centre c (the centre seen as a pseudo-document). */
  weight: number;
}

export interface ConceptGroup {
  /** Unique across groupings: the value of search filters.groupId. */
  id: number;
  /** 1..groups within the grouping, largest group first. */
  number: number;
  size: number;
  topTerms: GroupTerm[];
}

export interface GroupingSummary {
  id: number;
  indexId: number;
  version: number;
  groups: number;
  seed: number;
  /** Concept dimensions used for the clustering (the leading ones). */
  dims: number;
  documents: number;
  iterations: number;
  /** False when Lloyd's iterations hit the cap before assignments settled. */
  converged: boolean;
  /** Sum of squared distances of the (unit-length) document vectors to their centres. */
  inertia: number;
  createdBy: PersonRef | null;
  createdAt: string;
}

/** POST .../concepts/groupings (201, or 200 when that grouping exists) and GET .../groupings/:groupingId */
export interface GroupingResponse {
  grouping: GroupingSummary;
  groups: ConceptGroup[];
}

/**
 * POST .../concepts/groupings answers 200 with the grouping when one with these settings
 * exists for the current version, else 202 with the background job computing it (the
 * same job for the same settings); when the job has succeeded the same POST answers 200.
 */
export type CreateGroupingResponse = GroupingResponse | { job: Job };

/** GET /api/matters/:matterId/concepts/groupings: the current version's groupings. */
export interface GroupingsListResponse {
  groupings: GroupingSummary[];
}

// ---------------------------------------------------------------- health

export interface HealthThresholds {
  /** Recommend a rebuild when the mean drift of folded-in documents is above this. */
  drift: number;
  /** ... or when the share of folded-in documents is above this. */
  foldedShare: number;
  /** Warn when sigma_1 / sigma_k is above this. */
  conditionNumber: number;
}

export interface HealthMessage {
  /** Stable code for the client: rebuild-drift, rebuild-folded, noise-dimensions, ill-conditioned, ... */
  code: string;
  message: string;
}

/** GET /api/matters/:matterId/concepts/health */
export interface HealthResponse {
  indexId: number;
  version: number;
  k: number;
  weighting: string;
  documents: number;
  terms: number;
  /** Documents in the build (not folded in). */
  builtDocuments: number;
  /** Non-zero entries of the weighted term-document matrix of the build. */
  nnz: number;
  /** 1 - nnz / (terms * documents of the build). */
  sparsity: number;
  /** sigma_1 = ||A||_2. */
  sigma1: number;
  sigmaK: number;
  /** sigma_1 / sigma_k. */
  conditionNumber: number;
  energyKept: number | null;
  orthogonalityU: number | null;
  orthogonalityV: number | null;
  foldedIn: number;
  /** foldedIn / documents. */
  foldedShare: number;
  /** Mean over folded-in documents of 1 - ||U_k^T d||^2 / ||d||^2; null when none is folded in. */
  drift: number | null;
  /** The largest per-document drift. */
  driftMax: number | null;
  /** Concept dimensions whose sigma is below the noise floor (see the service's comment). */
  noiseDimensions: number;
  thresholds: HealthThresholds;
  rebuildRecommended: boolean;
  /** Reasons to rebuild and warnings, in plain words with the numbers. */
  messages: HealthMessage[];
  /** One sentence per figure, in plain words. */
  summary: string[];
}
