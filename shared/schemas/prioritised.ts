import { z } from 'zod';
import { searchFiltersSchema } from './search';

// Prioritised review (server/prioritised): a learned ranking of the matter's uncoded
// documents from its Responsive / Not responsive codes, retrained in the background.

/** Codes of each kind needed before the first model is trained. */
export const MIN_CODES_EACH = 10;
/** A model is retrained after this many new relevance codes. */
export const RETRAIN_EVERY = 25;
/** Names of the relevance codes in the matter's code set. */
export const RESPONSIVE_CODE = 'Responsive';
export const NOT_RESPONSIVE_CODE = 'Not responsive';

/** Codes of each kind before the space is tuned from them. */
export const MIN_CODES_FOR_TUNING = 50;

export interface TuningCell {
  dims: number;
  keywordWeight: number;
  /** Mean average precision of held-out Responsive documents (5-fold cross-validation). */
  map: number;
}

export interface TuningResult {
  folds: number;
  /** The space as served: all k axes, the shipped hybrid weight. */
  current: TuningCell;
  best: TuningCell;
  cells: TuningCell[];
}

export interface RankingModelInfo {
  version: number;
  indexVersion: number;
  positives: number;
  negatives: number;
  trainedAt: string;
  trainMs: number;
  rankMs: number;
  reason: string;
  /** Documents the ranking scored. */
  scored: number;
  /** Measured when 50 codes of each kind exist; null before. */
  tuning: TuningResult | null;
}

/** GET /api/matters/:matterId/prioritised */
export interface PrioritisedStatusResponse {
  responsive: number;
  notResponsive: number;
  /** How many more of each kind are needed before training (0 when enough). */
  moreResponsiveNeeded: number;
  moreNotResponsiveNeeded: number;
  /** Relevance codes since the current model was trained (retrain at RETRAIN_EVERY). */
  newCodesSinceModel: number;
  model: RankingModelInfo | null;
  /** A training job queued or running. */
  training: { jobId: number; status: 'queued' | 'running' } | null;
  /** The relevance codes exist in the code set (by name). */
  codesPresent: boolean;
}

/** POST /api/matters/:matterId/prioritised/train */
export interface TrainResponse {
  jobId: number;
}

/** POST /api/matters/:matterId/prioritised/more-like-responsive */
export const moreLikeResponsiveSchema = z.object({
  filters: searchFiltersSchema.default({}),
  limit: z
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(200, 'must be at most 200')
    .default(50),
});
export type MoreLikeResponsiveReq = z.input<typeof moreLikeResponsiveSchema>;

export interface RankedDocument {
  documentId: number;
  controlNumber: string;
  title: string;
  score: number;
  rank: number;
}

export interface MoreLikeResponsiveResponse {
  /** Responsive / Not responsive documents the feedback vector was built from. */
  relevant: number;
  nonRelevant: number;
  indexVersion: number;
  documents: RankedDocument[];
}

/** POST /api/matters/:matterId/prioritised/batches: "next 100 most likely responsive". */
export const prioritisedBatchSchema = z.object({
  size: z
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(1000, 'must be at most 1000')
    .default(100),
  /** Share of randomly chosen documents mixed in (default 1 in 10). */
  randomShare: z
    .number({ error: 'must be a number' })
    .min(0, 'must be between 0 and 0.5')
    .max(0.5, 'must be between 0 and 0.5')
    .default(0.1),
  seed: z
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(0, 'must be 0 or more')
    .max(2 ** 31 - 1, 'must be below 2^31')
    .optional(),
  name: z.string({ error: 'must be text' }).trim().min(1).max(200).optional(),
});
export type PrioritisedBatchReq = z.input<typeof prioritisedBatchSchema>;

export interface PrioritisedBatchResponse {
  batchId: number | null;
  modelVersion: number;
  seed: number;
  /** Documents in review order; `random` marks the ones mixed in at random. */
  documents: { documentId: number; random: boolean }[];
}
