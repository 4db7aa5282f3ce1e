import { z } from 'zod';
import { AUDIT_ACTIONS, type AuditAction } from '../audit';
import { idSchema } from './common';

export const AUDIT_PAGE_DEFAULT = 50;
export const AUDIT_PAGE_MAX = 200;

/**
 * GET /api/matters/:matterId/audit?actor=<userId>&action=<action>&before=<id>&limit=<n>.
 * Newest first; pass the previous page's nextCursor as `before` for the next page.
 */
const dayBound = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'must be a date written YYYY-MM-DD')
  .refine((v) => {
    // A day like 2026-02-30 parses (it rolls over), so it must also read back unchanged.
    const t = Date.parse(`${v}T00:00:00Z`);
    return !Number.isNaN(t) && new Date(t).toISOString().slice(0, 10) === v;
  }, 'is not a calendar date');

export const auditQuerySchema = z.object({
  actor: z.string().min(1).max(100).optional(),
  action: z.enum(AUDIT_ACTIONS, { error: 'is not a known audit action' }).optional(),
  before: idSchema.optional(),
  /** An inclusive day range (UTC days), as in the CSV export. */
  from: dayBound.optional(),
  to: dayBound.optional(),
  limit: z.coerce
    .number({ error: 'must be a number' })
    .int('must be a whole number')
    .min(1, 'must be at least 1')
    .max(AUDIT_PAGE_MAX, `must be at most ${AUDIT_PAGE_MAX}`)
    .default(AUDIT_PAGE_DEFAULT),
});
export type AuditQueryReq = z.infer<typeof auditQuerySchema>;

/** GET /api/matters/:matterId/audit.csv: the whole trail, optionally of an inclusive day range (UTC). */
export const auditExportQuerySchema = z
  .object({
    actor: z.string().min(1).max(100).optional(),
    action: z.enum(AUDIT_ACTIONS, { error: 'is not a known audit action' }).optional(),
    from: dayBound.optional(),
    to: dayBound.optional(),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, {
    message: 'must not be before from',
    path: ['to'],
  });
export type AuditExportQueryReq = z.infer<typeof auditExportQuerySchema>;

export const AUDIT_CSV_COLUMNS = [
  'Time (UTC)',
  'Actor',
  'Actor e-mail',
  'Action',
  'What happened',
  'Target type',
  'Target ID',
  'Control number',
  'Details',
  'IP address',
] as const;

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
