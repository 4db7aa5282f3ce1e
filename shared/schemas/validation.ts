import { z } from 'zod';
import { idSchema } from './common';

// Recall validation (server/validation): prevalence and elusion samples, drawn with a
// recorded seed from the population they name, and their statistics once coded.

export const SAMPLE_KINDS = ['prevalence', 'elusion'] as const;
export type SampleKind = (typeof SAMPLE_KINDS)[number];

/** POST /api/matters/:matterId/validation/samples */
export const createSampleSchema = z.object({
  kind: z.enum(SAMPLE_KINDS, { error: `must be one of ${SAMPLE_KINDS.join(', ')}` }),
  /** Confidence level as a proportion, e.g. 0.95. */
  confidence: z
    .number({ error: 'must be a number between 0.5 and 0.999 (e.g. 0.95)' })
    .min(0.5, 'must be at least 0.5 (e.g. 0.95 for 95%)')
    .max(0.999, 'must be at most 0.999'),
  /** Half-width of the interval as a proportion, e.g. 0.05 for plus or minus 5%. */
  margin: z
    .number({ error: 'must be a number between 0.001 and 0.5 (e.g. 0.05)' })
    .min(0.001, 'must be at least 0.001')
    .max(0.5, 'must be at most 0.5 (e.g. 0.05 for plus or minus 5%)'),
  seed: z
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(0, 'must be 0 or more')
    .max(2 ** 32 - 1, 'must be below 2^32')
    .optional(),
});
export type CreateSampleReq = z.input<typeof createSampleSchema>;

export const sampleParams = z.object({ matterId: idSchema, sampleId: idSchema });

export interface CreateSampleResponse {
  sampleId: number;
  size: number;
  seed: number;
  /** Documents the sample was drawn from. */
  population: number;
  /** The review batch holding the sample (null when batches are not available). */
  batchId: number | null;
}

export interface SampleResponse {
  /** In draw order; controlNumber, title and responsive are for the screen. */
  documents: {
    documentId: number;
    coded: boolean;
    controlNumber: string;
    title: string;
    responsive: boolean;
  }[];
  coded: number;
  size: number;
  responsive: number;
  /** Over the coded part; null until one is coded. */
  rate: number | null;
  interval: { method: 'clopper-pearson'; low: number; high: number } | null;
  wilson: { low: number; high: number } | null;
  /** Elusion: rate x population; prevalence: rate x population (responsive expected). */
  estimatedMissed: number | null;
  recall: { point: number; low: number; high: number } | null;
  /** Prevalence: rate x population, the responsive documents expected in the collection. */
  estimatedResponsive: number | null;
  // Context for the screen and the report (beyond the fields the API promises).
  sampleId: number;
  kind: SampleKind;
  confidence: number;
  margin: number;
  seed: number;
  population: number;
  populationRule: string;
  /** Documents coded Responsive when the sample was drawn (elusion recall's "found"). */
  produced: number;
  batchId: number | null;
  createdAt: string;
  createdBy: string | null;
}

export interface SampleSummary {
  sampleId: number;
  kind: SampleKind;
  size: number;
  seed: number;
  population: number;
  confidence: number;
  margin: number;
  createdAt: string;
}

/** GET /api/matters/:matterId/validation/samples */
export interface SamplesResponse {
  samples: SampleSummary[];
}
