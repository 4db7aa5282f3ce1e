import type SQLite from 'better-sqlite3';
import pino, { type Logger } from 'pino';
import { createAuth, type Auth } from './auth/session';
import type { Config } from './config';
import { migrateToLatest, openDatabase, type Db } from './db/database';
import { createMailer, type Mailer } from './mail/mailer';
import { ExtractionPool } from './extraction/extract';
import { IndexService } from './indexing/service';
import { buildIndexHandler } from './jobs/build-index';
import { extractBatchHandler } from './jobs/extract-batch';
import { buildProductionHandler } from './productions/build';
import { JobRunner } from './jobs/runner';
import { KeywordIndexCache } from './search/keyword-cache';
import { conceptGroupingHandler } from './concepts/grouping-job';
import { BlobStore } from './storage/blob-store';
import { ensurePrivateDir } from './storage/file-modes';
import { sweepStaleTempDirs } from './storage/temp-dirs';

/**
 * Everything a request handler or job needs, built once per process (or per test app).
 * To add a service (jobs runner, index service): add its member here and build it in
 * createContext below, registering its shutdown with `closers.push(...)`.
 */
export interface AppContext {
  config: Config;
  db: Db;
  /** Raw better-sqlite3 handle (lucia's adapter, bulk BLOB reads). */
  sqlite: SQLite.Database;
  auth: Auth;
  mail: Mailer;
  logger: Logger;
  /** Content-addressed originals (SHA-256) under <dataDir>/blobs. */
  blobs: BlobStore;
  /** Extraction worker threads (hard time limit per file). */
  extraction: ExtractionPool;
  /** Background jobs (extract-batch, build-index) over the jobs table. */
  jobs: JobRunner;
  /** Each matter's concept space: getSpace(matterId) for search; fold-in and rebuilds. */
  index: IndexService;
  /** Each matter's in-memory keyword (bm25) index, kept in step with its texts. */
  keyword: KeywordIndexCache;
  /** Stops services in reverse order of creation, then closes the database. */
  close(): Promise<void>;
}

/** Opens and migrates the database and starts the services. */
export async function createContext(config: Config): Promise<AppContext> {
  // Owner-only (0700): the data folder holds the matters' documents.
  for (const dir of [config.dataDir, config.blobDir, config.tmpDir]) ensurePrivateDir(dir);
  const logger = pino({ level: config.logLevel, base: undefined });
  const { db, sqlite } = openDatabase(config.dbFile);
  const closers: (() => Promise<void> | void)[] = [() => db.destroy()];
  try {
    await migrateToLatest(db);
    const auth = createAuth(sqlite, config);
    const mail = await createMailer(config, logger);
    closers.push(() => mail.close());

    // Add new services here (and a closer for each).
    const blobs = new BlobStore(config.dataDir);
    await blobs.sweepIncoming();
    await sweepStaleTempDirs(config.dataDir);
    const extraction = new ExtractionPool({ size: 1 });
    closers.push(() => extraction.close());
    const index = new IndexService(db, config, logger);
    closers.push(() => index.close());
    const jobs = new JobRunner(db, logger);
    index.attachJobs(jobs);
    closers.push(() => jobs.close());
    const keyword = new KeywordIndexCache(sqlite, logger);
    closers.push(() => keyword.close());

    let closed = false;
    const ctx: AppContext = {
      config,
      db,
      sqlite,
      auth,
      mail,
      logger,
      blobs,
      extraction,
      jobs,
      index,
      keyword,
      async close() {
        if (closed) return;
        closed = true;
        for (const close of closers.reverse()) await close();
      },
    };
    jobs.register('extract-batch', extractBatchHandler(ctx));
    jobs.register('build-index', buildIndexHandler(ctx));
    jobs.register('build-production', buildProductionHandler(ctx));
    jobs.register('concept-grouping', conceptGroupingHandler(config.dbFile));
    await index.recoverInterrupted();
    await jobs.start();
    index.startRecovery();
    keyword.warmAll();
    return ctx;
  } catch (error) {
    for (const close of closers.reverse()) await close();
    throw error;
  }
}
