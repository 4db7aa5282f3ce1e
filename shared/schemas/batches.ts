import { z } from 'zod';
import { QUERY_MAX_LENGTH } from '../limits';
import { idSchema, text, type PersonRef } from './common';
import { SEARCH_MODES, searchFiltersSchema } from './search';

// Review batches: cut from a search or saved search, assigned, checked out and in.

export const BATCH_KINDS = ['review', 'qc', 'validation'] as const;
export type BatchKind = (typeof BATCH_KINDS)[number];
export const BATCH_STATES = ['unassigned', 'assigned', 'checked_out', 'checked_in'] as const;
export type BatchState = (typeof BATCH_STATES)[number];
export const BATCH_STATE_LABELS: Record<BatchState, string> = {
  unassigned: 'Not assigned',
  assigned: 'Assigned',
  checked_out: 'Checked out',
  checked_in: 'Checked in',
};
export const BATCH_KIND_LABELS: Record<BatchKind, string> = {
  review: 'Review',
  qc: 'Quality control',
  validation: 'Validation',
};

export const BATCH_SIZE_DEFAULT = 100;
export const BATCH_SIZE_MAX = 1_000;
/** Most documents one request may cut into batches. */
export const BATCH_DOCUMENTS_MAX = 50_000;
export const BATCH_NAME_MAX_LENGTH = 80;

export const batchParams = z.object({ matterId: idSchema, batchId: idSchema });

/** POST /api/matters/:matterId/batches (batches.manage). */
export const createBatchesSchema = z
  .object({
    savedSearchId: idSchema.optional(),
    search: z
      .object({
        /** Empty or missing: every extracted document that passes the filters, by control number. */
        query: z
          .string({ error: 'must be text' })
          .max(QUERY_MAX_LENGTH, `must be at most ${QUERY_MAX_LENGTH} characters`)
          .optional(),
        mode: z
          .enum(SEARCH_MODES, { error: `must be one of ${SEARCH_MODES.join(', ')}` })
          .default('hybrid'),
        filters: searchFiltersSchema.default({}),
      })
      .optional(),
    size: z
      .number({ error: 'must be a number' })
      .int('must be a whole number')
      .min(1, 'must be at least 1')
      .max(BATCH_SIZE_MAX, `must be at most ${BATCH_SIZE_MAX}`)
      .default(BATCH_SIZE_DEFAULT),
    keepFamilies: z.boolean({ error: 'must be true or false' }).default(true),
    /** Name stem: batches are named "<name> 1", "<name> 2", ... (default: the search). */
    name: text()
      .trim()
      .min(1, 'must not be empty')
      .max(BATCH_NAME_MAX_LENGTH - 8, `must be at most ${BATCH_NAME_MAX_LENGTH - 8} characters`)
      .optional(),
  })
  .refine((v) => (v.savedSearchId === undefined) !== (v.search === undefined), {
    message: 'give either savedSearchId or search, not both',
    path: ['savedSearchId'],
  });
export type CreateBatchesReq = z.input<typeof createBatchesSchema>;

/** GET /api/matters/:matterId/batches?mine=true&kind= */
export const listBatchesQuerySchema = z.object({
  mine: z
    .enum(['true', 'false'], { error: 'must be true or false' })
    .transform((v) => v === 'true')
    .optional(),
  kind: z.enum(BATCH_KINDS, { error: `must be one of ${BATCH_KINDS.join(', ')}` }).optional(),
});

/** POST .../batches/:batchId/assign (batches.manage). */
export const assignBatchSchema = z.object({
  userId: text().min(1, 'is required').max(100),
});

export interface BatchProgress {
  documents: number;
  /** Documents carrying at least one code. */
  coded: number;
  /** Documents with every required group coded. */
  complete: number;
}

export interface Batch {
  id: number;
  name: string;
  kind: BatchKind;
  state: BatchState;
  assignee: PersonRef | null;
  source: string;
  createdBy: PersonRef | null;
  createdAt: string;
  assignedAt: string | null;
  checkedOutAt: string | null;
  checkedInAt: string | null;
  progress: BatchProgress;
  /** A QC batch's sample. */
  qcSampleId: number | null;
}

export interface BatchesResponse {
  batches: Batch[];
}

/** Answer of POST .../batches. */
export interface CreateBatchesResponse {
  batches: Batch[];
  /** Documents of the search already in an open batch (their whole family when keepFamilies). */
  skipped: number;
  notices: string[];
}

export interface BatchDocument {
  id: number;
  position: number;
  controlNumber: string;
  title: string;
  docType: string;
  familyId: number | null;
  parentId: number | null;
  codeIds: number[];
  /** Every required group has a code. */
  complete: boolean;
}

export interface BatchResponse {
  batch: Batch;
  documents: BatchDocument[];
}

export interface ReviewerProgress {
  reviewer: PersonRef;
  batches: number;
  documentsCoded: number;
  /** Hours between check-out and check-in (or now) summed over their batches. */
  hours: number;
  documentsPerHour: number | null;
  codesGiven: number;
  codesByName: Record<string, number>;
}

export interface BatchProgressRow {
  batch: Batch;
  hours: number;
  documentsPerHour: number | null;
  codesGiven: number;
}

/** GET /api/matters/:matterId/batches/progress (batches.manage). */
export interface TeamProgressResponse {
  batches: BatchProgressRow[];
  reviewers: ReviewerProgress[];
  /** Members a batch may be assigned to (their role codes documents). */
  assignable: PersonRef[];
}
