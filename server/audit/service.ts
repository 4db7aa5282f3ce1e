import type { AuditEvent, AuditPageResponse, AuditQueryReq } from '../../shared/schemas/audit';
import type { Db } from '../db/database';
import { listAuditActors, listAuditEvents } from './queries';

type AuditEventRow = Awaited<ReturnType<typeof listAuditEvents>>[number];

function parseDetail(detail: string): Record<string, unknown> {
  try {
    const value: unknown = JSON.parse(detail);
    return value && typeof value === 'object' && !Array.isArray(value)
      ? (value as Record<string, unknown>)
      : {};
  } catch {
    return {};
  }
}

export function auditRowToEvent(row: AuditEventRow): AuditEvent {
  return {
    id: row.id,
    at: row.at,
    actor:
      row.actor_id || row.actor_email
        ? { id: row.actor_id, email: row.actor_email, name: row.actor_name ?? null }
        : null,
    action: row.action,
    targetType: row.target_type,
    targetId: row.target_id,
    detail: parseDetail(row.detail),
    ip: row.ip,
  };
}

/** One page of the matter's log, newest first, filtered by actor and action. */
export async function readAuditPage(
  db: Db,
  matterId: number,
  query: AuditQueryReq,
): Promise<AuditPageResponse> {
  const rows = await listAuditEvents(db, {
    matterId,
    actorId: query.actor,
    action: query.action,
    beforeId: query.before,
    limit: query.limit + 1,
  });
  const page = rows.slice(0, query.limit);
  const actors = await listAuditActors(db, matterId);
  return {
    events: page.map(auditRowToEvent),
    nextCursor: rows.length > query.limit ? page[page.length - 1].id : null,
    actors: actors.map((actor) => ({
      id: actor.actor_id as string,
      email: actor.current_email ?? actor.actor_email ?? null,
      name: actor.name ?? null,
    })),
  };
}
