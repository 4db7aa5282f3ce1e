import type { Kysely, Transaction } from 'kysely';
import type { Database, JobRow } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export interface NewJob {
  matterId: number | null;
  kind: string;
  payload: unknown;
  total?: number;
  message?: string;
  createdBy?: string | null;
}

export async function insertJob(db: Executor, job: NewJob): Promise<number> {
  const row = await db
    .insertInto('jobs')
    .values({
      matter_id: job.matterId,
      kind: job.kind,
      status: 'queued',
      total: job.total ?? 0,
      message: job.message ?? 'Waiting to start',
      payload: JSON.stringify(job.payload ?? {}),
      created_by: job.createdBy ?? null,
      created_at: new Date().toISOString(),
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export function findJob(db: Executor, jobId: number): Promise<JobRow | undefined> {
  return db.selectFrom('jobs').selectAll().where('id', '=', jobId).executeTakeFirst();
}

export function findJobMatterId(db: Executor, jobId: number) {
  return db.selectFrom('jobs').select('matter_id').where('id', '=', jobId).executeTakeFirst();
}

/** The oldest queued job of a kind (first in, first out). */
export function nextQueuedJob(db: Executor, kind: string): Promise<JobRow | undefined> {
  return db
    .selectFrom('jobs')
    .selectAll()
    .where('kind', '=', kind)
    .where('status', '=', 'queued')
    .orderBy('id')
    .limit(1)
    .executeTakeFirst();
}

export function listMatterJobs(
  db: Executor,
  matterId: number,
  options: { active?: boolean; kind?: string; limit: number },
): Promise<JobRow[]> {
  let query = db.selectFrom('jobs').selectAll().where('matter_id', '=', matterId);
  if (options.active) query = query.where('status', 'in', ['queued', 'running']);
  if (options.kind) query = query.where('kind', '=', options.kind);
  return query.orderBy('id', 'desc').limit(options.limit).execute();
}

export function findActiveJob(db: Executor, matterId: number, kind: string) {
  return db
    .selectFrom('jobs')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('kind', '=', kind)
    .where('status', 'in', ['queued', 'running'])
    .orderBy('id', 'desc')
    .executeTakeFirst();
}

export async function countUnfinishedJobs(db: Executor, matterId?: number): Promise<number> {
  let query = db
    .selectFrom('jobs')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .where('status', 'in', ['queued', 'running']);
  if (matterId !== undefined) query = query.where('matter_id', '=', matterId);
  return Number((await query.executeTakeFirstOrThrow()).n);
}

export async function markJobRunning(db: Executor, jobId: number): Promise<boolean> {
  const result = await db
    .updateTable('jobs')
    .set({ status: 'running', started_at: new Date().toISOString(), message: 'Starting' })
    .where('id', '=', jobId)
    .where('status', '=', 'queued')
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}

export async function updateJobProgress(
  db: Executor,
  jobId: number,
  values: { progress?: number; total?: number; message?: string },
): Promise<void> {
  await db.updateTable('jobs').set(values).where('id', '=', jobId).execute();
}

export async function finishJob(
  db: Executor,
  jobId: number,
  outcome: {
    status: 'succeeded' | 'failed' | 'cancelled';
    message?: string;
    error?: string | null;
  },
): Promise<void> {
  await db
    .updateTable('jobs')
    .set({
      status: outcome.status,
      ...(outcome.message !== undefined ? { message: outcome.message } : {}),
      error: outcome.error ?? null,
      finished_at: new Date().toISOString(),
    })
    .where('id', '=', jobId)
    .execute();
}

/** Jobs a crash left 'running' (and therefore never finished). */
export function listRunningJobs(db: Executor): Promise<JobRow[]> {
  return db.selectFrom('jobs').selectAll().where('status', '=', 'running').execute();
}

/** Puts a running job back in the queue (the server is shutting down mid-job). */
export async function requeueJob(db: Executor, jobId: number): Promise<void> {
  await db
    .updateTable('jobs')
    .set({ status: 'queued', started_at: null, message: 'Waiting to resume' })
    .where('id', '=', jobId)
    .execute();
}
