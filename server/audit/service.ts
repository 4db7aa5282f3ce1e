import { AUDIT_ACTION_LABELS } from '../../shared/audit';
import {
  AUDIT_CSV_COLUMNS,
  type AuditEvent,
  type AuditExportQueryReq,
  type AuditPageResponse,
  type AuditQueryReq,
} from '../../shared/schemas/audit';
import type { Db } from '../db/database';
import { toCsv } from '../exports/csv';
import { listAuditActors, listAuditEvents } from './queries';
import { recordAudit } from './record';

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

/** An inclusive range of UTC days as the query's [atFrom, atBefore) timestamps. */
function dayRange(from?: string, to?: string) {
  return {
    atFrom: from ? `${from}T00:00:00.000Z` : undefined,
    atBefore: to ? new Date(Date.parse(`${to}T00:00:00Z`) + 86_400_000).toISOString() : undefined,
  };
}

/** One page of the matter's log, newest first, filtered by actor, action and day range. */
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
    ...dayRange(query.from, query.to),
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

const EXPORT_PAGE = 1000;

/** A detail value as a person reads it: "key: value" pairs, lists joined. */
function detailText(detail: Record<string, unknown>): string {
  return Object.entries(detail)
    .filter(([key]) => key !== 'controlNumber')
    .map(([key, value]) => {
      const shown = Array.isArray(value)
        ? value.map((v) => (typeof v === 'object' ? JSON.stringify(v) : String(v))).join(', ')
        : value !== null && typeof value === 'object'
          ? JSON.stringify(value)
          : String(value);
      return `${key}: ${shown}`;
    })
    .join('; ');
}

/**
 * GET .../audit.csv: every event in the matter's scope (newest first, as on screen), of a
 * day range when given, as RFC 4180 CSV; the export is itself audited.
 */
export async function exportAuditCsv(
  db: Db,
  matterId: number,
  query: AuditExportQueryReq,
  actor: { id: string; email: string; ip: string | null },
): Promise<{ filename: string; body: string; rows: number }> {
  const range = dayRange(query.from, query.to);
  const rows: (string | number)[][] = [];
  let beforeId: number | undefined;
  for (;;) {
    const page = await listAuditEvents(db, {
      matterId,
      actorId: query.actor,
      action: query.action,
      beforeId,
      ...range,
      limit: EXPORT_PAGE,
    });
    for (const row of page) {
      const event = auditRowToEvent(row);
      const control = event.detail.controlNumber;
      rows.push([
        event.at,
        event.actor?.name ?? '',
        event.actor?.email ?? '',
        event.action,
        (AUDIT_ACTION_LABELS as Record<string, string>)[event.action] ?? event.action,
        event.targetType ?? '',
        event.targetId ?? '',
        typeof control === 'string' ? control : '',
        detailText(event.detail),
        event.ip ?? '',
      ]);
    }
    if (page.length < EXPORT_PAGE) break;
    beforeId = page[page.length - 1].id;
  }
  await recordAudit(db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'export.audit',
    targetType: 'matter',
    targetId: String(matterId),
    detail: { rows: rows.length, from: query.from ?? null, to: query.to ?? null },
  });
  const day = new Date().toISOString().slice(0, 10);
  return {
    filename: `matter-${matterId}-audit-${day}.csv`,
    body: toCsv(AUDIT_CSV_COLUMNS, rows),
    rows: rows.length,
  };
}
