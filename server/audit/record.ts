import type { Kysely, Transaction } from 'kysely';
import type { AuditAction } from '../../shared/audit';
import type { Database } from '../db/schema';

export interface AuditEntry {
  actorId?: string | null;
  actorEmail?: string | null;
  matterId?: number | null;
  action: AuditAction;
  targetType?: string | null;
  targetId?: string | number | null;
  detail?: Record<string, unknown>;
  ip?: string | null;
}

/**
 * Appends one event to the audit log (audit_events is append-only: the migration's
 * triggers refuse UPDATE and DELETE). Pass the transaction when the change it records
 * is in one, so the event and the change commit together.
 */
export async function recordAudit(
  db: Kysely<Database> | Transaction<Database>,
  entry: AuditEntry,
): Promise<void> {
  await db
    .insertInto('audit_events')
    .values({
      at: new Date().toISOString(),
      actor_id: entry.actorId ?? null,
      actor_email: entry.actorEmail ?? null,
      matter_id: entry.matterId ?? null,
      action: entry.action,
      target_type: entry.targetType ?? null,
      target_id: entry.targetId == null ? null : String(entry.targetId),
      detail: JSON.stringify(entry.detail ?? {}),
      ip: entry.ip ?? null,
    })
    .execute();
}

/** The actor fields of an audit entry for a signed-in user. */
export const actorOf = (user: { id: string; email: string }, ip: string | null) => ({
  actorId: user.id,
  actorEmail: user.email,
  ip,
});
