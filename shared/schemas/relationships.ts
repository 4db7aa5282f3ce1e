import { z } from 'zod';

// Threads and near-duplicates of a document (server/relationships).

/** One message of a thread, in tree order (depth 0 is the thread's first message). */
export interface ThreadNode {
  id: number;
  controlNumber: string;
  title: string;
  from: string;
  sentAt: string | null;
  parentId: number | null;
  depth: number;
  inclusive: boolean;
}

/** GET /api/matters/:matterId/documents/:docId/thread */
export interface ThreadResponse {
  threadId: number | null;
  messages: ThreadNode[];
}

export interface NearDuplicateMemberRef {
  id: number;
  controlNumber: string;
  title: string;
  /** Estimated Jaccard resemblance to the principal (MinHash). */
  similarity: number;
  principal: boolean;
}

/** GET /api/matters/:matterId/documents/:docId/near-duplicates */
export interface NearDuplicatesResponse {
  groupId: number | null;
  threshold: number;
  members: NearDuplicateMemberRef[];
}

export const NEAR_DUP_THRESHOLD_MIN = 0.5;

/** PUT /api/matters/:matterId/near-duplicates/settings */
export const nearDuplicateSettingsSchema = z.object({
  threshold: z
    .number({ error: 'must be a number' })
    .min(NEAR_DUP_THRESHOLD_MIN, `must be at least ${NEAR_DUP_THRESHOLD_MIN}`)
    .max(1, 'must be at most 1'),
});
export type NearDuplicateSettingsReq = z.infer<typeof nearDuplicateSettingsSchema>;

export interface NearDuplicateSettingsResponse {
  threshold: number;
  groups: number;
  grouped: number;
}
