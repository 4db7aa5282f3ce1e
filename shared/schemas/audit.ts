import { z } from 'zod';
import { AUDIT_ACTIONS, type AuditAction } from '../audit';
import { idSchema } from './common';

export const AUDIT_PAGE_DEFAULT = 50;
export const AUDIT_PAGE_MAX = 200;

/**
 * GET /api/matters/:matterId/audit?actor=<userId>&action=<action>&before=<id>&limit=<n>.
 * Newest first; pass the previous page's nextCursor as `before` for the next page.
 */
export const auditQuerySchema = z.object({
  actor: z.string().min(1).max(100).optional(),
  action: z.enum(AUDIT_ACTIONS, { error: 'is not a known audit action' }).optional(),
  before: idSchema.optional(),
  limit: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(AUDIT_PAGE_MAX, `must be at most ${AUDIT_PAGE_MAX}`)
    .default(AUDIT_PAGE_DEFAULT),
});
export type AuditQueryReq = z.infer<typeof auditQuerySchema>;

export interface AuditEvent {
  id: number;
  at: string;
  actor: { id: string | null; email: string | null; name: string | null } | null;
  action: AuditAction | string;
  targetType: string | null;
  targetId: string | null;
  detail: Record<string, unknown>;
  ip: string | null;
}

export interface AuditPageResponse {
  events: AuditEvent[];
  /** `before` for the next (older) page; null on the last page. */
  nextCursor: number | null;
  /** Everyone who appears in this matter's log, for the person filter. */
  actors: { id: string; email: string | null; name: string | null }[];
}
