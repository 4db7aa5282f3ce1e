// The index service: each matter's current concept space in memory (serving-cache.ts),
// folding-in of newly extracted documents (Deerwester et al. 1990, §4) computed in a
// worker thread (fold-pool.ts), and full rebuilds in a worker thread (build-runner.ts)
// that replace the serving version in one transaction. Other features (search) call
// getSpace / getIndex.
import type { Logger } from 'pino';
import type { ConceptSpace } from '../engine/index';
import { decodeSingularValues } from '../engine/index';
import type { Weighting } from '../engine/index';
import { prepareForSearch } from '../engine/index';
import { saveFoldedDocuments } from './persist';
import {
  automaticK,
  indexKError,
  type IndexStateResponse,
  type IndexVersionInfo,
  type IndexWeighting,
  type RebuildIndexReq,
} from '../../shared/schemas/indexing';
import { recordAudit } from '../audit/record';
import type { Config } from '../config';
import type { Db } from '../db/database';
import type { IndexVersionRow } from '../db/schema';
import { countExtracted, countIndexStates } from '../documents/queries';
import { conflict, validationError } from '../http/errors';
import { findActiveJob, findJob } from '../jobs/queries';
import { jobRowToApi } from '../jobs/map';
import type { JobRun, JobRunner } from '../jobs/runner';
import type { BuildSummary } from './build-core';
import { BuildWorkers } from './build-runner';
import { FoldWorker } from './fold-pool';
import {
  countFoldedIn,
  currentIndexIdOf,
  extractedNotIndexedMatters,
  failStaleBuilds,
  findIndexVersion,
  insertBuildingVersion,
  latestVersionWithStatus,
  markVersionFailed,
  pruneSuperseded,
  stillExtracted,
  switchToVersion,
} from './queries';
import { ServingCache, type LoadedIndex } from './serving-cache';

export type { LoadedIndex } from './serving-cache';

/** Payload of a build-index job. */
export interface BuildIndexPayload {
  k?: number;
  weighting?: IndexWeighting;
  /** Who asked ('fold-in share' / 'first build' when the server queued it). */
  reason: 'requested' | 'fold-in share' | 'first build' | 'document purged';
  requestedBy?: string | null;
  requestedByEmail?: string | null;
  /** Times this build was queued again after a restart interrupted it. */
  restarts?: number;
}

function parseParams(row: IndexVersionRow): Record<string, unknown> {
  try {
    return JSON.parse(row.params) as Record<string, unknown>;
  } catch {
    return {};
  }
}

/** Maps an index_versions row to the API type (with its build diagnostics). */
export function versionToApi(row: IndexVersionRow): IndexVersionInfo {
  const sigma = Array.from(decodeSingularValues(row.singular_values));
  const params = parseParams(row);
  const last = sigma.length > 0 ? sigma[sigma.length - 1] : null;
  return {
    id: row.id,
    version: row.version,
    status: row.status,
    k: row.k,
    requestedK: typeof params.requestedK === 'number' ? params.requestedK : null,
    weighting: row.weighting,
    nDocs: row.n_docs,
    nTerms: row.n_terms,
    nnz: row.nnz,
    createdAt: row.created_at,
    completedAt: row.completed_at,
    error: row.error,
    diagnostics: {
      singularValues: sigma,
      sigma1: sigma.length > 0 ? sigma[0] : null,
      conditionNumber: sigma.length > 0 && last ? sigma[0] / last : null,
      frobeniusSq: row.frobenius_sq,
      energy: row.energy,
      orthogonalityU: row.orthogonality_u,
      orthogonalityV: row.orthogonality_v,
      buildMs: row.build_ms,
      peakRssMb: row.peak_rss_mb,
    },
  };
}

export class IndexService {
  private readonly serving: ServingCache;
  private readonly builds = new BuildWorkers();
  private readonly folds = new FoldWorker();
  private jobs: JobRunner | null = null;

  constructor(
    private readonly db: Db,
    private readonly config: Config,
    private readonly logger: Logger,
  ) {
    this.serving = new ServingCache(db);
  }

  /** The runner is created after the service (its handlers call back into it). */
  attachJobs(jobs: JobRunner): void {
    this.jobs = jobs;
  }

  /** Runs `work` after earlier work for the same matter (fold-ins and switches never interleave). */
  private withLock<T>(matterId: number, work: () => Promise<T>): Promise<T> {
    return this.serving.withLock(matterId, work);
  }

  /** The matter's serving index (loaded from SQLite on first use), or null before the first build. */
  getIndex(matterId: number): Promise<LoadedIndex | null> {
    return this.serving.get(matterId);
  }

  /** The matter's current concept space, or null when none is built yet. */
  async getSpace(matterId: number): Promise<ConceptSpace | null> {
    return (await this.getIndex(matterId))?.space ?? null;
  }

  /** Forgets the in-memory space (after documents are deleted); the next use reloads it. */
  invalidate(matterId: number): void {
    this.serving.invalidate(matterId);
  }

  /**
   * After extraction: fold the newly extracted documents into the serving space, or queue
   * the first build when there is none; queue a rebuild when folded-in documents pass
   * config.rebuildFoldInShare of the space.
   */
  async afterExtraction(matterId: number): Promise<{ folded: number; queuedBuild: boolean }> {
    const current = await currentIndexIdOf(this.db, matterId);
    if (current === null) {
      if ((await countExtracted(this.db, matterId)) === 0) return { folded: 0, queuedBuild: false };
      const queued = await this.queueBuild(matterId, { reason: 'first build' });
      return { folded: 0, queuedBuild: queued !== null };
    }
    const folded = await this.foldInWaiting(matterId);
    const share = await this.foldedShare(matterId);
    let queuedBuild = false;
    if (share !== null && share > this.config.rebuildFoldInShare) {
      queuedBuild = (await this.queueBuild(matterId, { reason: 'fold-in share' })) !== null;
    }
    return { folded, queuedBuild };
  }

  /** Share of the serving space's documents that were folded in. */
  async foldedShare(matterId: number): Promise<number | null> {
    const indexId = await currentIndexIdOf(this.db, matterId);
    if (indexId === null) return null;
    const { total, folded } = await countFoldedIn(this.db, indexId);
    return total > 0 ? folded / total : null;
  }

  /** Folds every extracted document the serving version lacks into it; returns how many. */
  foldInWaiting(matterId: number): Promise<number> {
    return this.withLock(matterId, async () => {
      const loaded = await this.getIndex(matterId);
      if (!loaded) return 0;
      // Analysing the texts happens in the worker; here the vectors are only stored.
      const vectors = await this.folds.fold({
        dbFile: this.config.dbFile,
        matterId,
        indexId: loaded.indexId,
      });
      if (vectors.length === 0) return 0;
      // A document deleted while the worker ran is not added back.
      const alive = new Set(
        await stillExtracted(
          this.db,
          matterId,
          vectors.map((v) => v.id),
        ),
      );
      const folded = vectors.filter((v) => alive.has(v.id));
      await saveFoldedDocuments(this.db, loaded.indexId, folded);
      for (const f of folded) loaded.space.putVector(f.id, f.vector, true);
      prepareForSearch(loaded.space); // the new vectors reset the search caches
      this.logger.info({ matterId, documents: folded.length }, 'documents folded into the index');
      return folded.length;
    });
  }

  /** Queues a build-index job unless one is already queued or running (then returns null). */
  async queueBuild(matterId: number, payload: BuildIndexPayload): Promise<number | null> {
    if (!this.jobs) throw new Error('index service has no job runner');
    if (await findActiveJob(this.db, matterId, 'build-index')) return null;
    return this.jobs.enqueue(this.db, {
      matterId,
      kind: 'build-index',
      payload,
      total: 100,
      createdBy: payload.requestedBy ?? null,
      message: 'Waiting to build the index',
    });
  }

  /** POST .../index/rebuild: a lead asks for a full rebuild (409 while one is queued or running). */
  async requestRebuild(
    matterId: number,
    body: RebuildIndexReq,
    actor: { id: string; email: string; ip: string | null },
  ) {
    const buildable = await countExtracted(this.db, matterId);
    if (buildable === 0) throw conflict('There are no extracted documents to index yet.');
    const kError = body.k !== undefined ? indexKError(body.k, buildable) : null;
    if (kError) throw validationError('k', kError);
    const jobId = await this.queueBuild(matterId, {
      k: body.k,
      weighting: body.weighting,
      reason: 'requested',
      requestedBy: actor.id,
      requestedByEmail: actor.email,
    });
    if (jobId === null)
      throw conflict('An index build is already queued or running for this matter.');
    // What the lead chose becomes the matter's setting for later automatic rebuilds.
    if (body.k !== undefined || body.weighting !== undefined) {
      await this.db
        .updateTable('matters')
        .set({
          ...(body.k !== undefined ? { index_k: body.k } : {}),
          ...(body.weighting !== undefined ? { index_weighting: body.weighting } : {}),
        })
        .where('id', '=', matterId)
        .execute();
    }
    await recordAudit(this.db, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'index.rebuild_requested',
      targetType: 'job',
      targetId: jobId,
      detail: { k: body.k ?? null, weighting: body.weighting ?? null },
    });
    const job = await findJob(this.db, jobId);
    return { job: jobRowToApi(job!) };
  }

  /**
   * The settings a build uses: those asked for in this request, else the matter's chosen
   * ones (the last requested rebuild's), else log-entropy and a k that follows the
   * matter's size at every build, so a growing matter gets more axes (automaticK).
   */
  private async buildSettings(matterId: number, payload: BuildIndexPayload) {
    const chosen = await this.db
      .selectFrom('matters')
      .select(['index_k', 'index_weighting'])
      .where('id', '=', matterId)
      .executeTakeFirst();
    const requestedK = payload.k ?? chosen?.index_k ?? null;
    const weighting = (payload.weighting ?? chosen?.index_weighting ?? 'log-entropy') as Weighting;
    const k = requestedK ?? automaticK(await countExtracted(this.db, matterId));
    return { k, requestedK, weighting };
  }

  /** The build-index job: worker build, then the one-transaction switch, then catch-up fold-in. */
  async runBuild(run: JobRun<BuildIndexPayload>): Promise<string> {
    const matterId = run.job.matter_id;
    if (matterId === null) throw new Error('build-index job without a matter');
    const { k, requestedK, weighting } = await this.buildSettings(matterId, run.payload);
    const { id: indexId, version } = await insertBuildingVersion(this.db, {
      matterId,
      k,
      requestedK,
      weighting,
      jobId: run.job.id,
      requestedBy: run.payload.requestedBy ?? null,
    });
    await run.progress({
      progress: 0,
      total: 100,
      message: `Building version ${version} (k = ${k})`,
    });
    let summary: BuildSummary;
    try {
      summary = await this.runWorker(matterId, indexId, { k, weighting }, run);
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      await markVersionFailed(this.db, indexId, message);
      await recordAudit(this.db, {
        actorId: run.payload.requestedBy ?? null,
        actorEmail: run.payload.requestedByEmail ?? null,
        matterId,
        action: 'index.rebuild_failed',
        targetType: 'index_version',
        targetId: indexId,
        detail: { version, k, weighting, error: message, reason: run.payload.reason },
      });
      throw new Error(`index build failed: ${message}`, { cause: error });
    }
    await this.withLock(matterId, async () => {
      await this.db.transaction().execute(async (trx) => {
        const previous = await switchToVersion(trx, matterId, indexId);
        await recordAudit(trx, {
          actorId: run.payload.requestedBy ?? null,
          actorEmail: run.payload.requestedByEmail ?? null,
          matterId,
          action: 'index.rebuilt',
          targetType: 'index_version',
          targetId: indexId,
          detail: {
            version,
            k: summary.k,
            requestedK,
            weighting,
            documents: summary.nDocs,
            terms: summary.nTerms,
            buildMs: Math.round(summary.buildMs),
            previousIndexId: previous,
            reason: run.payload.reason,
            notices: summary.notices,
          },
        });
      });
      this.serving.invalidate(matterId);
      await pruneSuperseded(this.db, matterId);
    });
    // Documents extracted while the worker ran are folded into the new version.
    const caughtUp = await this.foldInWaiting(matterId);
    await this.getIndex(matterId);
    return `Version ${version} ready: ${summary.nDocs} documents, ${summary.nTerms} terms, k = ${summary.k}${
      caughtUp > 0 ? `; ${caughtUp} folded in since` : ''
    }`;
  }

  private runWorker(
    matterId: number,
    indexId: number,
    settings: { k: number; weighting: Weighting },
    run: JobRun<BuildIndexPayload>,
  ): Promise<BuildSummary> {
    return this.builds.run(
      {
        dbFile: this.config.dbFile,
        matterId,
        indexId,
        k: settings.k,
        weighting: settings.weighting,
      },
      run,
    );
  }

  /** Stops a running build's worker (shutdown, tests); the previous version keeps serving. */
  terminateBuild(matterId: number): Promise<boolean> {
    return this.builds.terminate(matterId);
  }

  /** True while a build worker runs for the matter. */
  isBuilding(matterId: number): boolean {
    return this.builds.isBuilding(matterId);
  }

  /** At start-up: versions a crash left 'building' are failed (their job is failed by the runner). */
  async recoverInterrupted(): Promise<void> {
    const n = await failStaleBuilds(this.db, 'interrupted by a restart');
    if (n > 0) this.logger.warn({ versions: n }, 'index builds interrupted by a restart');
  }

  /**
   * At start-up, after the job runner's own recovery: documents a crash left extracted
   * but outside the serving index are folded in (in the worker, so a large one does not
   * hold up the server), and a matter with extracted documents but no index and no
   * build queued gets its first build.
   */
  /** Starts recoverWaitingDocuments in the background; `recovery` settles when it is done. */
  startRecovery(): void {
    this.recovery = this.recoverWaitingDocuments().catch((error: unknown) => {
      this.logger.error({ err: error }, 'start-up index recovery failed');
      return { folded: 0, queued: 0 };
    });
  }

  /** The start-up recovery's outcome (tests wait for it). */
  recovery: Promise<{ folded: number; queued: number }> = Promise.resolve({ folded: 0, queued: 0 });

  async recoverWaitingDocuments(): Promise<{ folded: number; queued: number }> {
    const matters = await extractedNotIndexedMatters(this.db);
    let folded = 0;
    let queued = 0;
    for (const { matterId, hasIndex } of matters) {
      try {
        if (hasIndex) folded += await this.foldInWaiting(matterId);
        else if ((await this.queueBuild(matterId, { reason: 'first build' })) !== null) queued++;
      } catch (error) {
        this.logger.error({ err: error, matterId }, 'start-up fold-in failed');
      }
    }
    if (folded + queued > 0)
      this.logger.info({ folded, queued }, 'documents left outside the index by a restart');
    return { folded, queued };
  }

  /** GET .../index */
  async state(matterId: number): Promise<IndexStateResponse> {
    const currentId = await currentIndexIdOf(this.db, matterId);
    const current = currentId !== null ? await findIndexVersion(this.db, currentId) : undefined;
    const building = await latestVersionWithStatus(this.db, matterId, 'building');
    const failed = await latestVersionWithStatus(this.db, matterId, 'failed');
    const activeBuild = await findActiveJob(this.db, matterId, 'build-index');
    const activeExtraction = activeBuild
      ? undefined
      : await findActiveJob(this.db, matterId, 'extract-batch');
    const active = activeBuild ?? activeExtraction;
    return {
      counts: await countIndexStates(this.db, matterId, currentId),
      current: current ? versionToApi(current) : null,
      building: building ? versionToApi(building) : null,
      lastFailed:
        failed && (!current || failed.version > current.version) ? versionToApi(failed) : null,
      activeJob: active ? jobRowToApi(active) : null,
      rebuildFoldInShare: this.config.rebuildFoldInShare,
      buildableDocuments: await countExtracted(this.db, matterId),
    };
  }

  async close(): Promise<void> {
    await Promise.allSettled([this.builds.close(), this.folds.close()]);
  }
}
