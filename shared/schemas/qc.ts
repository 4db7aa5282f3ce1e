import { z } from 'zod';
import { idSchema, text, type PersonRef } from './common';

// Second-level review (quality control) of first-level coding calls.

export const QC_METHODS = ['share', 'count', 'targeted'] as const;
export type QcMethod = (typeof QC_METHODS)[number];
export const QC_SAMPLE_MAX = 5_000;
export const QC_VERDICTS = ['confirmed', 'overturned'] as const;
export type QcVerdict = (typeof QC_VERDICTS)[number];

export const qcSampleParams = z.object({ matterId: idSchema, sampleId: idSchema });
export const qcItemParams = z.object({ matterId: idSchema, itemId: idSchema });

/** Which first-level calls the sample draws from (all of the matter's when empty). */
export const qcCriteriaSchema = z.object({
  /** Calls made by this reviewer. */
  reviewerId: text().min(1).max(100).optional(),
  /** Calls applying this code (e.g. every Privileged call). */
  codeId: idSchema.optional(),
  /** Calls on this batch's documents. */
  batchId: idSchema.optional(),
});
export type QcCriteria = z.infer<typeof qcCriteriaSchema>;

/** POST /api/matters/:matterId/qc/samples (qc.manage). */
export const createQcSampleSchema = z
  .object({
    method: z.enum(QC_METHODS, { error: `must be one of ${QC_METHODS.join(', ')}` }),
    /** method share: the fraction of the documents, above 0 and at most 1. */
    share: z
      .number({ error: 'must be a number' })
      .gt(0, 'must be above 0')
      .max(1, 'must be at most 1')
      .optional(),
    /** method count: how many documents. */
    count: z
      .number({ error: 'must be a number' })
      .int('must be a whole number')
      .min(1, 'must be at least 1')
      .max(QC_SAMPLE_MAX, `must be at most ${QC_SAMPLE_MAX}`)
      .optional(),
    /** Random methods: the seed (recorded; a new one is drawn when omitted). */
    seed: z
      .number({ error: 'must be a number' })
      .int('must be a whole number')
      .min(0, 'must be 0 or more')
      .max(2 ** 32 - 1, 'must fit in 32 bits')
      .optional(),
    criteria: qcCriteriaSchema.default({}),
    name: text().trim().min(1, 'must not be empty').max(70).optional(),
  })
  .refine((v) => v.method !== 'share' || v.share !== undefined, {
    message: 'is required for a share sample',
    path: ['share'],
  })
  .refine((v) => v.method !== 'count' || v.count !== undefined, {
    message: 'is required for a count sample',
    path: ['count'],
  })
  .refine((v) => v.method !== 'targeted' || Object.keys(v.criteria).length > 0, {
    message: 'a targeted sample needs a reviewer, a code or a batch',
    path: ['criteria'],
  });
export type CreateQcSampleReq = z.input<typeof createQcSampleSchema>;

/** POST /api/matters/:matterId/qc/items/:itemId/decision (documents.code, the QC batch's reviewer). */
export const qcDecisionSchema = z.object({
  verdict: z.enum(QC_VERDICTS, { error: `must be one of ${QC_VERDICTS.join(', ')}` }),
  /** Overturning a single-choice call: the right code of the same group (omit to remove the code). */
  replacementCodeId: idSchema.nullable().optional(),
  note: text().trim().max(2000, 'must be at most 2000 characters').optional(),
});
export type QcDecisionReq = z.input<typeof qcDecisionSchema>;

export interface QcSample {
  id: number;
  batchId: number;
  batchName: string;
  method: QcMethod;
  seed: number | null;
  share: number | null;
  requested: number | null;
  /** Documents the sample was drawn from. */
  population: number;
  size: number;
  criteria: QcCriteria;
  createdBy: PersonRef | null;
  createdAt: string;
  decided: number;
  calls: number;
}

export interface QcItem {
  id: number;
  documentId: number;
  controlNumber: string;
  title: string;
  code: { id: number; name: string };
  firstCoder: PersonRef | null;
  verdict: QcVerdict | null;
  replacementCode: { id: number; name: string } | null;
  decidedBy: PersonRef | null;
  decidedAt: string | null;
  note: string;
}

export interface QcSampleResponse {
  sample: QcSample;
  items: QcItem[];
}

export interface QcSamplesResponse {
  samples: QcSample[];
}

export interface OverturnRate {
  checked: number;
  overturned: number;
  /** overturned / checked; null when nothing was checked. */
  rate: number | null;
}

/** GET /api/matters/:matterId/qc/overturn-rates (qc.manage). */
export interface OverturnRatesResponse {
  byReviewer: (OverturnRate & { reviewer: PersonRef })[];
  byCode: (OverturnRate & { code: { id: number; name: string } })[];
  overall: OverturnRate;
}
