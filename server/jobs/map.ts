import type { Job, JobKind, JobStatus } from '../../shared/schemas/jobs';
import type { JobRow } from '../db/schema';

/** A jobs row as the API shows it (the payload stays on the server). */
export function jobRowToApi(row: JobRow): Job {
  return {
    id: row.id,
    matterId: row.matter_id,
    kind: row.kind as JobKind,
    status: row.status as JobStatus,
    progress: row.progress,
    total: row.total,
    message: row.message,
    error: row.error,
    createdAt: row.created_at,
    startedAt: row.started_at,
    finishedAt: row.finished_at,
  };
}
