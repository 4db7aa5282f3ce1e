// Backup and restore (docs/BACKUP.md). SQLite's documentation says a copy of a WAL
// database file taken while it is written may miss committed transactions and that the
// online backup API gives a consistent snapshot (https://www.sqlite.org/backup.html,
// https://www.sqlite.org/wal.html); the checks here are SQLite's own PRAGMA
// integrity_check and SHA-256 (FIPS 180-4) through node:crypto.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { appendFileSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { readdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import SQLite from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { migrateToLatest, openDatabase } from '../db/database';
import { sha256OfFile } from '../storage/blob-store';
import { MANIFEST_FILE, manifestSchema } from './format';
import { restoreBackup, verifyBackup } from './service';

const repo = path.join(import.meta.dirname, '..', '..');
const work = mkdtempSync(path.join(tmpdir(), 'quarry-backup-'));
const dataDir = path.join(work, 'data');
const backupDir = path.join(work, 'backup');
const restoredDir = path.join(work, 'restored');

function quarry(env: Record<string, string>, ...args: string[]) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/quarry.ts', ...args], {
    cwd: repo,
    encoding: 'utf8',
    env: { ...process.env, QUARRY_LOG_LEVEL: 'silent', ...env },
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The same, without blocking this process (the writer's progress keeps arriving). */
function quarryAsync(env: Record<string, string>, ...args: string[]) {
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/cli/quarry.ts', ...args], {
    cwd: repo,
    env: { ...process.env, QUARRY_LOG_LEVEL: 'silent', ...env },
  });
  let stdout = '';
  let stderr = '';
  child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
  child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
  return new Promise<{ code: number | null; stdout: string; stderr: string }>((resolve) =>
    child.once('close', (code) => resolve({ code, stdout, stderr })),
  );
}

let writer: ChildProcess;
let written = 0;
let writesBeforeBackup = 0;
let writesAfterBackup = 0;
let backupRun: ReturnType<typeof quarry>;

beforeAll(async () => {
  const { db, sqlite } = openDatabase(path.join(dataDir, 'quarry.db'));
  await migrateToLatest(db);
  sqlite
    .prepare(
      "INSERT INTO matters (name, control_prefix, created_at) VALUES ('Backup test', 'BKP', ?)",
    )
    .run(new Date().toISOString());
  await db.destroy();

  writer = spawn(
    process.execPath,
    [path.join(import.meta.dirname, 'test-writer.mjs'), dataDir, '1'],
    {
      stdio: ['ignore', 'pipe', 'inherit'],
    },
  );
  writer.stdout!.setEncoding('utf8');
  writer.stdout!.on('data', (chunk: string) => {
    const last = chunk.trim().split('\n').at(-1);
    if (last) written = Number(last);
  });
  // Let the writer build up a database and a store worth copying.
  while (written < 300) await new Promise((resolve) => setTimeout(resolve, 20));
  writesBeforeBackup = written;
  backupRun = await quarryAsync({ QUARRY_DATA_DIR: dataDir }, 'backup', '--out', backupDir);
  writesAfterBackup = written;
  writer.kill('SIGTERM');
  await new Promise((resolve) => writer.once('exit', resolve));
}, 120_000);

afterAll(() => {
  if (writer.exitCode === null) writer.kill('SIGKILL');
  rmSync(work, { recursive: true, force: true });
});

describe('quarry backup / restore', () => {
  it('backs up through the command line while another process keeps writing', () => {
    expect(backupRun.stderr).toBe('');
    expect(backupRun.code).toBe(0);
    expect(backupRun.stdout).toMatch(/^Backed up .* and \d+ blob\(s\), listed with their SHA-256/);
    // The writer kept committing while the backup command ran.
    expect(writesAfterBackup).toBeGreaterThan(writesBeforeBackup);
  });

  it('restores into a fresh folder: integrity_check ok, row counts as the manifest says, every blob hash right', async () => {
    const result = await restoreBackup(backupDir, restoredDir);
    expect(result.replaced).toBe(false);
    const db = new SQLite(path.join(restoredDir, 'quarry.db'), { readonly: true });
    try {
      expect(db.pragma('integrity_check')).toEqual([{ integrity_check: 'ok' }]);
      const manifest = manifestSchema.parse(
        JSON.parse(readFileSync(path.join(backupDir, MANIFEST_FILE), 'utf8')),
      );
      for (const [table, count] of Object.entries(manifest.tables))
        expect([table, db.prepare(`SELECT count(*) FROM "${table}"`).pluck().get()]).toEqual([
          table,
          count,
        ]);
      // One snapshot: every document's transaction came whole (document, text, audit row).
      const docs = db.prepare('SELECT id, sha256, size FROM documents').all() as {
        id: number;
        sha256: string;
        size: number;
      }[];
      const audits = db
        .prepare("SELECT count(*) FROM audit_events WHERE action = 'test.write'")
        .pluck()
        .get();
      const texts = db.prepare('SELECT count(*) FROM document_texts').pluck().get();
      expect(docs.length).toBeGreaterThanOrEqual(writesBeforeBackup);
      expect(docs.length).toBeLessThanOrEqual(writesAfterBackup);
      expect(audits).toBe(docs.length);
      expect(texts).toBe(docs.length);
      // FTS5 sees the restored texts (its shadow tables came with the snapshot).
      const fts = db
        .prepare("SELECT count(*) FROM documents_fts WHERE documents_fts MATCH 'body'")
        .pluck()
        .get();
      expect(fts).toBe(docs.length);
      for (const doc of docs) {
        const blob = path.join(
          restoredDir,
          'blobs',
          doc.sha256.slice(0, 2),
          doc.sha256.slice(2, 4),
          doc.sha256,
        );
        expect(await sha256OfFile(blob)).toBe(doc.sha256);
      }
    } finally {
      db.close();
    }
    const blobFiles = (
      await readdir(path.join(restoredDir, 'blobs'), { recursive: true, withFileTypes: true })
    ).filter((e) => e.isFile());
    for (const entry of blobFiles)
      expect(await sha256OfFile(path.join(entry.parentPath, entry.name))).toBe(entry.name);
  });

  it('refuses a non-empty data folder unless forced, through the command line', () => {
    const refused = quarry({ QUARRY_DATA_DIR: restoredDir }, 'restore', backupDir);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/is not empty; .*pass --force/);
    const forced = quarry({ QUARRY_DATA_DIR: restoredDir }, 'restore', backupDir, '--force');
    expect(forced.stderr).toBe('');
    expect(forced.stdout).toMatch(/previous database and blobs were replaced/);
  });

  it('refuses a tampered backup before writing anything, naming the file', async () => {
    const manifestPath = path.join(backupDir, MANIFEST_FILE);
    const original = readFileSync(manifestPath, 'utf8');
    const manifest = manifestSchema.parse(JSON.parse(original));
    const blob = manifest.files.find((f) => f.path.startsWith('blobs/'))!;
    const blobPath = path.join(backupDir, ...blob.path.split('/'));
    const blobBytes = readFileSync(blobPath);
    const fresh = path.join(work, 'fresh');
    try {
      // One changed byte in an original.
      const altered = Buffer.from(blobBytes);
      altered[0] ^= 0xff;
      writeFileSync(blobPath, altered);
      await expect(restoreBackup(backupDir, fresh)).rejects.toThrow(
        `refusing the backup: ${blob.path} does not match its SHA-256 in the manifest`,
      );
      await expect(readdir(fresh)).rejects.toThrow(); // nothing was created
      // The manifest edited to match the altered file: the blob's name is its hash, so it still fails.
      const forged = {
        ...manifest,
        files: manifest.files.map((f) => (f === blob ? { ...f, sha256: '0'.repeat(64) } : f)),
      };
      writeFileSync(manifestPath, JSON.stringify(forged));
      await expect(verifyBackup(backupDir)).rejects.toThrow(/named for a different hash/);
      writeFileSync(blobPath, blobBytes);
      // A path that would escape the data folder.
      writeFileSync(
        manifestPath,
        JSON.stringify({
          ...manifest,
          files: [...manifest.files, { path: '../outside', size: 1, sha256: '0'.repeat(64) }],
        }),
      );
      await expect(verifyBackup(backupDir)).rejects.toThrow(
        'refusing the backup: ../outside is not a path a Quarry backup holds',
      );
      writeFileSync(manifestPath, original);
      // A file slipped in beside the listed ones.
      appendFileSync(path.join(backupDir, 'extra.sql'), 'DROP TABLE users;');
      await expect(verifyBackup(backupDir)).rejects.toThrow(
        'refusing the backup: extra.sql not in its manifest',
      );
      rmSync(path.join(backupDir, 'extra.sql'));
      // The database itself altered.
      const dbPath = path.join(backupDir, 'quarry.db');
      const dbBytes = readFileSync(dbPath);
      const dbAltered = Buffer.from(dbBytes);
      dbAltered[dbAltered.length - 100] ^= 0x01;
      writeFileSync(dbPath, dbAltered);
      await expect(verifyBackup(backupDir)).rejects.toThrow(
        'refusing the backup: quarry.db does not match its SHA-256',
      );
      writeFileSync(dbPath, dbBytes);
      await expect(verifyBackup(backupDir)).resolves.toMatchObject({
        format: 'quarry-backup',
        version: 1,
      });
    } finally {
      writeFileSync(manifestPath, original);
      writeFileSync(blobPath, blobBytes);
    }
  });
});
