import type { Logger } from 'pino';
import { JOB_KINDS, type JobKind } from '../../shared/schemas/jobs';
import type { Db } from '../db/database';
import type { JobRow } from '../db/schema';
import {
  countUnfinishedJobs,
  finishJob,
  insertJob,
  listRunningJobs,
  markJobRunning,
  nextQueuedJob,
  requeueJob,
  updateJobProgress,
  type NewJob,
} from './queries';

/** What a job handler is given: its row, parsed payload, a progress reporter and a stop signal. */
export interface JobRun<P = unknown> {
  job: JobRow;
  payload: P;
  signal: AbortSignal;
  /** Records progress; writes are throttled to a few per second. */
  progress(values: { progress?: number; total?: number; message?: string }): Promise<void>;
}

export interface JobHandler<P = unknown> {
  /** Runs the job; throwing marks it failed with the error's message. Returns the final message. */
  run(run: JobRun<P>): Promise<string | void>;
  /** After a crash left this job 'running': queue whatever must be done again (or nothing). */
  requeue?(job: JobRow, payload: P): Promise<void>;
}

export const INTERRUPTED_MESSAGE = 'interrupted by a restart';

/** Marks a failed job's error for an aborted (shutting down) run. */
export class JobAborted extends Error {
  constructor() {
    super('stopped because the server shut down');
  }
}

/**
 * A small in-process job runner over the jobs table: one loop per job kind, so each kind
 * runs one job at a time (concurrency 1 per kind) while different kinds overlap (an index
 * build does not hold up extraction). State lives in SQLite, so a restart finds what a
 * crash left behind (recoverInterrupted).
 */
export class JobRunner {
  private readonly handlers = new Map<JobKind, JobHandler<never>>();
  private readonly loops = new Map<JobKind, Promise<void>>();
  private readonly wakeAgain = new Set<JobKind>();
  private readonly abort = new AbortController();
  private readonly idleWaiters: (() => void)[] = [];
  private started = false;

  constructor(
    private readonly db: Db,
    private readonly logger: Logger,
  ) {}

  register<P>(kind: JobKind, handler: JobHandler<P>): void {
    this.handlers.set(kind, handler as JobHandler<never>);
  }

  /** Recovers interrupted jobs and starts working through the queue. */
  async start(): Promise<void> {
    await this.recoverInterrupted();
    this.started = true;
    for (const kind of JOB_KINDS) this.wake(kind);
  }

  /**
   * Jobs left 'running' by a crash are marked failed ("interrupted by a restart") and their
   * handler may queue the work again (extraction does; a half-built index is just failed).
   */
  async recoverInterrupted(): Promise<number> {
    const stale = await listRunningJobs(this.db);
    for (const job of stale) {
      await finishJob(this.db, job.id, {
        status: 'failed',
        error: INTERRUPTED_MESSAGE,
        message: 'Interrupted',
      });
      const handler = this.handlers.get(job.kind as JobKind);
      try {
        await handler?.requeue?.(job, JSON.parse(job.payload) as never);
      } catch (error) {
        this.logger.error({ err: error, jobId: job.id }, 'could not re-queue an interrupted job');
      }
    }
    if (stale.length > 0) this.logger.warn({ jobs: stale.length }, 'jobs interrupted by a restart');
    return stale.length;
  }

  /** Queues a job (pass the transaction to commit it with the change it follows) and wakes its loop. */
  async enqueue(db: Db | Parameters<typeof insertJob>[0], job: NewJob & { kind: JobKind }) {
    const id = await insertJob(db, job);
    // Inside a transaction the row is not visible yet: wake on the next turn as well.
    setImmediate(() => this.wake(job.kind));
    return id;
  }

  /** Starts the loop for a kind if it is not running (call after committing a queued job). */
  wake(kind: JobKind): void {
    if (!this.started || this.abort.signal.aborted) return;
    if (this.loops.has(kind)) {
      this.wakeAgain.add(kind);
      return;
    }
    const loop = this.drain(kind).finally(() => {
      this.loops.delete(kind);
      if (this.wakeAgain.delete(kind)) this.wake(kind);
      else this.notifyIdle();
    });
    this.loops.set(kind, loop);
  }

  private async drain(kind: JobKind): Promise<void> {
    const handler = this.handlers.get(kind);
    if (!handler) return;
    while (!this.abort.signal.aborted) {
      this.wakeAgain.delete(kind);
      const job = await nextQueuedJob(this.db, kind);
      if (!job) return;
      if (!(await markJobRunning(this.db, job.id))) continue;
      await this.runOne(handler, job);
    }
  }

  private async runOne(handler: JobHandler<never>, job: JobRow): Promise<void> {
    let lastWrite = 0;
    let pending: { progress?: number; total?: number; message?: string } = {};
    const progress: JobRun['progress'] = async (values) => {
      pending = { ...pending, ...values };
      const now = Date.now();
      if (now - lastWrite < 250) return;
      lastWrite = now;
      const write = pending;
      pending = {};
      await updateJobProgress(this.db, job.id, write);
    };
    try {
      const message = await handler.run({
        job,
        payload: JSON.parse(job.payload) as never,
        signal: this.abort.signal,
        progress,
      });
      if (Object.keys(pending).length > 0) await updateJobProgress(this.db, job.id, pending);
      await finishJob(this.db, job.id, { status: 'succeeded', message: message ?? 'Done' });
    } catch (error) {
      if (error instanceof JobAborted || this.abort.signal.aborted) {
        // Shutting down: put the job back so the next start picks it up again.
        await requeueJob(this.db, job.id).catch(() => undefined);
        return;
      }
      const text = error instanceof Error ? error.message : String(error);
      if (!(error instanceof JobAborted))
        this.logger.error({ err: error, jobId: job.id, kind: job.kind }, 'job failed');
      if (Object.keys(pending).length > 0)
        await updateJobProgress(this.db, job.id, pending).catch(() => undefined);
      await finishJob(this.db, job.id, { status: 'failed', message: 'Failed', error: text }).catch(
        (e: unknown) => this.logger.error({ err: e }, 'could not record a job failure'),
      );
    }
  }

  private async notifyIdle(): Promise<void> {
    if (this.loops.size > 0) return;
    const waiters = this.idleWaiters.splice(0);
    for (const resolve of waiters) resolve();
  }

  /**
   * Resolves when no job is queued or running (for the CLI, the seed and tests); a job
   * that queues another (extraction queues an index build) is waited for too.
   */
  async waitForIdle(timeoutMs = 120_000): Promise<void> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      if (this.loops.size === 0 && (await countUnfinishedJobs(this.db)) === 0) return;
      if (Date.now() > deadline) throw new Error(`jobs still running after ${timeoutMs} ms`);
      await new Promise<void>((resolve) => {
        const timer = setTimeout(resolve, 100);
        this.idleWaiters.push(() => {
          clearTimeout(timer);
          resolve();
        });
      });
    }
  }

  /** Stops taking jobs, signals running handlers to stop, and waits for them. */
  async close(): Promise<void> {
    this.abort.abort();
    await Promise.allSettled([...this.loops.values()]);
  }
}
