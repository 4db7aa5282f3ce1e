// Backup and restore of a Quarry installation (docs/BACKUP.md). A plain copy of a live
// WAL database can miss committed transactions (they sit in the -wal file until a
// checkpoint), so the database is copied with SQLite's online backup API
// (https://www.sqlite.org/backup.html) through better-sqlite3; the blob store is
// content-addressed and its files are never rewritten, so they are copied as they are.
import { readFileSync } from 'node:fs';
import { chmod, mkdir, readFile, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import SQLite from 'better-sqlite3';
import {
  BACKUP_FORMAT,
  BACKUP_FORMAT_VERSION,
  BLOBS_FOLDER,
  DATABASE_FILE,
  MANIFEST_FILE,
  locate,
  manifestPathProblem,
  manifestSchema,
  type Manifest,
  type ManifestFile,
} from './format';
import { DIR_MODE, FILE_MODE, copyHashed, listFiles, syncFile } from './files';
import { sha256OfFile } from '../storage/blob-store';

/** A problem with a backup or its destination, worded for the person running the command. */
export class BackupError extends Error {
  override name = 'BackupError';
}

const BLOB_FILE = /^[0-9a-f]{2}\/[0-9a-f]{2}\/([0-9a-f]{64})$/;

function quarryVersion(): string {
  try {
    const pkg = JSON.parse(
      readFileSync(new URL('../../package.json', import.meta.url), 'utf8'),
    ) as { version?: string };
    return pkg.version ?? 'unknown';
  } catch {
    return 'unknown';
  }
}

async function isEmptyFolder(dir: string): Promise<boolean> {
  const entries = await readdir(dir).catch((error: NodeJS.ErrnoException) => {
    if (error.code === 'ENOENT') return [];
    throw error;
  });
  return entries.length === 0;
}

/** Rows per ordinary table (virtual tables are skipped: their shadow tables are counted). */
function tableCounts(db: SQLite.Database): Record<string, number> {
  const names = db
    .prepare(
      `SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%'
         AND sql NOT LIKE 'CREATE VIRTUAL TABLE%' ORDER BY name`,
    )
    .pluck()
    .all() as string[];
  const counts: Record<string, number> = {};
  for (const name of names)
    counts[name] = db
      .prepare(`SELECT count(*) FROM "${name.replaceAll('"', '""')}"`)
      .pluck()
      .get() as number;
  return counts;
}

function lastMigration(db: SQLite.Database): string | null {
  try {
    return (
      (db.prepare('SELECT name FROM kysely_migration ORDER BY name DESC LIMIT 1').pluck().get() as
        string | undefined) ?? null
    );
  } catch {
    return null;
  }
}

function integrityProblems(db: SQLite.Database): string[] {
  const rows = db.pragma('integrity_check') as { integrity_check: string }[];
  const messages = rows.map((row) => row.integrity_check);
  return messages.length === 1 && messages[0] === 'ok' ? [] : messages;
}

export interface BackupResult {
  outDir: string;
  manifest: Manifest;
  /** Blobs the copied database names that the store did not hold (reported, not fatal). */
  missingBlobs: string[];
}

/**
 * Writes a backup of the database `dbFile` and the blob store `blobDir` into `outDir`
 * (which must be missing or empty). Safe while Quarry runs and writes: the database copy is
 * one consistent snapshot, and the manifest is written last, so a folder without one is
 * an unfinished backup.
 */
export async function createBackup(options: {
  dbFile: string;
  blobDir: string;
  outDir: string;
}): Promise<BackupResult> {
  const outDir = path.resolve(options.outDir);
  if (!(await stat(options.dbFile).catch(() => null))?.isFile())
    throw new BackupError(`there is no Quarry database at ${options.dbFile}`);
  if (!(await isEmptyFolder(outDir)))
    throw new BackupError(`${outDir} is not empty; give a new or empty folder for the backup`);
  await mkdir(outDir, { recursive: true, mode: DIR_MODE });

  const dbCopy = path.join(outDir, DATABASE_FILE);
  const source = new SQLite(options.dbFile, { fileMustExist: true });
  try {
    source.pragma('busy_timeout = 5000');
    // better-sqlite3 steps 100 pages at a time, and SQLite restarts a stepwise backup
    // whenever another connection writes between steps; asking for every remaining page
    // makes the copy one step, one read transaction, which WAL writers never block.
    await source.backup(dbCopy, { progress: () => 0x7fffffff });
  } finally {
    source.close();
  }

  const copy = new SQLite(dbCopy, { fileMustExist: true });
  let tables: Record<string, number>;
  let schemaMigration: string | null;
  let referenced: string[];
  try {
    // A self-contained single file: no -wal beside it.
    copy.pragma('journal_mode = DELETE');
    const problems = integrityProblems(copy);
    if (problems.length > 0)
      throw new BackupError(
        `the database copy failed its integrity check: ${problems.slice(0, 3).join('; ')}`,
      );
    tables = tableCounts(copy);
    schemaMigration = lastMigration(copy);
    referenced = hasTable(copy, 'documents')
      ? (copy.prepare('SELECT DISTINCT sha256 FROM documents').pluck().all() as string[])
      : [];
  } finally {
    copy.close();
  }
  await chmodQuiet(dbCopy);

  const files: ManifestFile[] = [];
  const dbInfo = await stat(dbCopy);
  files.push({ path: DATABASE_FILE, size: dbInfo.size, sha256: await sha256OfFile(dbCopy) });

  // Blobs stored after the snapshot are copied too (harmless extras); interrupted writes
  // (.incoming) are not.
  const blobNames = await listFiles(
    options.blobDir,
    (rel) => rel === '.incoming' || rel.startsWith('.incoming/'),
  );
  const copied = new Set<string>();
  for (const relative of blobNames) {
    const match = BLOB_FILE.exec(relative);
    if (!match) continue; // not a blob (nothing else belongs there; left alone)
    const target = `${BLOBS_FOLDER}/${relative}`;
    const written = await copyHashed(
      path.join(options.blobDir, ...relative.split('/')),
      locate(outDir, target),
    );
    if (written.sha256 !== match[1])
      throw new BackupError(
        `blob ${relative} in the store does not match its name (its content hashes to ${written.sha256}); the store is damaged`,
      );
    files.push({ path: target, size: written.size, sha256: written.sha256 });
    copied.add(match[1]);
  }

  const manifest: Manifest = {
    format: BACKUP_FORMAT,
    version: BACKUP_FORMAT_VERSION,
    createdAt: new Date().toISOString(),
    quarryVersion: quarryVersion(),
    schemaMigration,
    tables,
    scope: { kind: 'installation' },
    files,
  };
  const temp = path.join(outDir, `.${MANIFEST_FILE}.${randomUUID()}.part`);
  await writeFile(temp, `${JSON.stringify(manifest, null, 2)}\n`, { mode: FILE_MODE, flag: 'wx' });
  await syncFile(temp);
  await rename(temp, path.join(outDir, MANIFEST_FILE));
  return { outDir, manifest, missingBlobs: referenced.filter((sha) => !copied.has(sha)).sort() };
}

function hasTable(db: SQLite.Database, name: string): boolean {
  return Boolean(
    db.prepare("SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = ?").get(name),
  );
}

async function chmodQuiet(file: string): Promise<void> {
  await chmod(file, FILE_MODE).catch(() => undefined);
}

/**
 * Checks a backup folder against its manifest: every listed file present with its size
 * and SHA-256, nothing unlisted beside them, and only paths a backup may hold. Throws a
 * BackupError naming the first problem; returns the manifest when all is well.
 */
export async function verifyBackup(dir: string): Promise<Manifest> {
  const root = path.resolve(dir);
  const manifestPath = path.join(root, MANIFEST_FILE);
  const raw = await readFile(manifestPath, 'utf8').catch((error: NodeJS.ErrnoException) => {
    if (error.code === 'ENOENT')
      throw new BackupError(
        `${root} is not a Quarry backup (it has no ${MANIFEST_FILE}), or the backup did not finish`,
      );
    throw error;
  });
  let json: unknown;
  try {
    json = JSON.parse(raw);
  } catch {
    throw new BackupError(
      `${MANIFEST_FILE} is not valid JSON: the backup is damaged or was altered`,
    );
  }
  const parsed = manifestSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new BackupError(
      `${MANIFEST_FILE} is not a version ${BACKUP_FORMAT_VERSION} ${BACKUP_FORMAT} manifest (${issue.path.join('.') || 'root'}: ${issue.message})`,
    );
  }
  const manifest = parsed.data;
  const listed = new Set<string>();
  for (const file of manifest.files) {
    const problem = manifestPathProblem(file);
    if (problem) throw new BackupError(`refusing the backup: ${problem}`);
    if (listed.has(file.path))
      throw new BackupError(`refusing the backup: ${file.path} is listed twice`);
    listed.add(file.path);
  }
  if (!listed.has(DATABASE_FILE))
    throw new BackupError(`refusing the backup: its manifest does not list ${DATABASE_FILE}`);
  for (const file of manifest.files) {
    const full = locate(root, file.path);
    const info = await stat(full).catch(() => null);
    if (!info?.isFile()) throw new BackupError(`refusing the backup: ${file.path} is missing`);
    if (info.size !== file.size || (await sha256OfFile(full)) !== file.sha256)
      throw new BackupError(
        `refusing the backup: ${file.path} does not match its SHA-256 in the manifest (the file was altered or damaged)`,
      );
  }
  const present = await listFiles(root);
  const extra = present.filter((rel) => rel !== MANIFEST_FILE && !listed.has(rel));
  if (extra.length > 0)
    throw new BackupError(
      `refusing the backup: ${extra[0]}${extra.length > 1 ? ` and ${extra.length - 1} more` : ''} not in its manifest`,
    );
  return manifest;
}

export interface RestoreResult {
  dataDir: string;
  manifest: Manifest;
  replaced: boolean;
}

/**
 * Restores a verified backup into `dataDir`. Refuses a non-empty folder unless `force`
 * (then its database and blob store are replaced; other files are left alone). Files are
 * copied into a staging folder inside `dataDir`, hashed again as they are written and the
 * database checked, before anything already there is touched. Quarry must not be running
 * on `dataDir` meanwhile.
 */
export async function restoreBackup(
  backupDir: string,
  dataDir: string,
  options: { force?: boolean } = {},
): Promise<RestoreResult> {
  const manifest = await verifyBackup(backupDir);
  const target = path.resolve(dataDir);
  const root = path.resolve(backupDir);
  const rel = path.relative(root, target);
  if (rel === '' || (!rel.startsWith('..') && !path.isAbsolute(rel)))
    throw new BackupError('the data folder may not be the backup folder or inside it');
  const empty = await isEmptyFolder(target);
  if (!empty && !options.force)
    throw new BackupError(
      `${target} is not empty; restore into an empty data folder, or pass --force to replace its database and blobs`,
    );
  await mkdir(target, { recursive: true, mode: DIR_MODE });
  const staging = path.join(target, `.restore-${randomUUID()}`);
  await mkdir(staging, { mode: DIR_MODE });
  try {
    for (const file of manifest.files) {
      const written = await copyHashed(locate(root, file.path), locate(staging, file.path));
      if (written.sha256 !== file.sha256)
        throw new BackupError(
          `refusing the backup: ${file.path} changed while it was being restored`,
        );
    }
    const db = new SQLite(path.join(staging, DATABASE_FILE), { fileMustExist: true });
    try {
      const problems = integrityProblems(db);
      if (problems.length > 0)
        throw new BackupError(
          `refusing the backup: its database fails PRAGMA integrity_check (${problems[0]})`,
        );
      const counts = tableCounts(db);
      for (const [table, count] of Object.entries(manifest.tables))
        if (counts[table] !== count)
          throw new BackupError(
            `refusing the backup: table ${table} holds ${counts[table] ?? 'no'} rows, the manifest says ${count}`,
          );
    } finally {
      db.close();
    }
    if (!empty) {
      for (const name of [DATABASE_FILE, `${DATABASE_FILE}-wal`, `${DATABASE_FILE}-shm`])
        await rm(path.join(target, name), { force: true });
      await rm(path.join(target, BLOBS_FOLDER), { recursive: true, force: true });
    }
    await rename(path.join(staging, DATABASE_FILE), path.join(target, DATABASE_FILE));
    const stagedBlobs = path.join(staging, BLOBS_FOLDER);
    if (await stat(stagedBlobs).catch(() => null))
      await rename(stagedBlobs, path.join(target, BLOBS_FOLDER));
    else await mkdir(path.join(target, BLOBS_FOLDER), { mode: DIR_MODE });
  } finally {
    await rm(staging, { recursive: true, force: true });
  }
  return { dataDir: target, manifest, replaced: !empty };
}
