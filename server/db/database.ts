import { existsSync } from 'node:fs';
import { dirname } from 'node:path';
import SQLite from 'better-sqlite3';
import { Kysely, Migrator, SqliteDialect, type MigrationProvider } from 'kysely';
import { migrations } from '../../migrations/index';
import { ensurePrivateDir, ensurePrivateFile } from '../storage/file-modes';
import type { Database } from './schema';

export type Db = Kysely<Database>;

export interface OpenedDatabase {
  db: Db;
  /** The raw better-sqlite3 handle, for lucia's adapter and bulk BLOB reads. */
  sqlite: SQLite.Database;
}

/**
 * Opens (creating if needed) the SQLite file with WAL, foreign keys and a busy timeout.
 * The file is created owner-only (0600) first; SQLite gives its -wal and -shm files the
 * database file's permissions ("Temporary Files Used By SQLite"; os_unix.c
 * findCreateFileMode), and existing ones are tightened too.
 */
export function openDatabase(file: string): OpenedDatabase {
  if (file !== ':memory:') {
    ensurePrivateDir(dirname(file));
    ensurePrivateFile(file);
    for (const side of [`${file}-wal`, `${file}-shm`])
      if (existsSync(side)) ensurePrivateFile(side);
  }
  const sqlite = new SQLite(file);
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('busy_timeout = 5000');
  sqlite.pragma('synchronous = NORMAL');
  // Deleted content is overwritten with zeros (SQLite "PRAGMA secure_delete"), so a purged
  // document's text does not linger in free space of the file (server/trash).
  sqlite.pragma('secure_delete = ON');
  // Search reads FTS5 doclists, its docsize table and documents rows all over a large
  // matter: a larger page cache (128 MiB; better-sqlite3 opens with 16 MB) and
  // memory-mapped reads (SQLite "Memory-Mapped I/O") took keyword searches of a
  // 100,000-document matter from 55 to 44 ms on average (measured with 256 MiB / 2 GiB).
  sqlite.pragma('cache_size = -131072');
  sqlite.pragma('mmap_size = 1073741824');
  const db = new Kysely<Database>({ dialect: new SqliteDialect({ database: sqlite }) });
  return { db, sqlite };
}

const staticProvider: MigrationProvider = {
  getMigrations: async () => migrations,
};

/** Brings the schema up to the latest migration; throws with the failing migration's name. */
export async function migrateToLatest(db: Kysely<Database>): Promise<void> {
  const migrator = new Migrator({ db, provider: staticProvider });
  const { error, results } = await migrator.migrateToLatest();
  const failed = results?.find((result) => result.status === 'Error');
  if (error) {
    const where = failed ? ` (migration ${failed.migrationName})` : '';
    throw new Error(`database migration failed${where}: ${String(error)}`, { cause: error });
  }
}
