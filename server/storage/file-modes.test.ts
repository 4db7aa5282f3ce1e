// The data folder, the database (with its WAL and shared-memory files) and every stored
// original are the service account's alone: folders 0700, files 0600 (OWASP ASVS 4.0.3
// V12.4.1; POSIX permission bits as stat(2) reports them). The review found them created
// with the default umask (0755 folders, 0644 files): readable by every local account.
import { chmodSync, existsSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, test } from 'vitest';
import { loadConfig } from '../config';
import { createContext } from '../context';

const modeOf = (path: string) => statSync(path).mode & 0o777;

describe('file modes under the data folder', () => {
  let parent: string;
  let previousUmask: number;
  beforeEach(() => {
    parent = mkdtempSync(join(tmpdir(), 'quarry-modes-'));
    // The usual default umask; the modes must not depend on a stricter one.
    previousUmask = process.umask(0o022);
  });
  afterEach(() => {
    process.umask(previousUmask);
    rmSync(parent, { recursive: true, force: true });
  });

  test('a fresh data folder, the database files and a stored original are owner-only', async () => {
    const dataDir = join(parent, 'data');
    const ctx = await createContext(
      loadConfig({ QUARRY_DATA_DIR: dataDir, QUARRY_LOG_LEVEL: 'silent', QUARRY_DEMO: '0' }),
    );
    try {
      const blob = await ctx.blobs.putBuffer(Buffer.from('privileged and confidential'));
      await ctx.db.selectFrom('users').select('id').execute();
      const { dbFile, blobDir, tmpDir } = ctx.config;
      for (const dir of [dataDir, blobDir, tmpDir, join(blob.path, '..'), join(blob.path, '../..')])
        expect(modeOf(dir).toString(8), dir).toBe('700');
      for (const file of [dbFile, `${dbFile}-wal`, `${dbFile}-shm`, blob.path]) {
        expect(existsSync(file), file).toBe(true);
        expect(modeOf(file).toString(8), file).toBe('600');
      }
    } finally {
      await ctx.close();
    }
  });

  test('an existing database file left readable by others is tightened at start-up', async () => {
    const dataDir = join(parent, 'old');
    const first = await createContext(
      loadConfig({ QUARRY_DATA_DIR: dataDir, QUARRY_LOG_LEVEL: 'silent', QUARRY_DEMO: '0' }),
    );
    const dbFile = first.config.dbFile;
    await first.close();
    chmodSync(dbFile, 0o644);
    chmodSync(dataDir, 0o755);
    writeFileSync(join(parent, 'unrelated'), 'x');
    const again = await createContext(
      loadConfig({ QUARRY_DATA_DIR: dataDir, QUARRY_LOG_LEVEL: 'silent', QUARRY_DEMO: '0' }),
    );
    try {
      expect(modeOf(dbFile).toString(8)).toBe('600');
      expect(modeOf(dataDir).toString(8)).toBe('700');
      // Only Quarry's own folder changes, not its parent or neighbours.
      expect(modeOf(join(parent, 'unrelated')).toString(8)).toBe('644');
    } finally {
      await again.close();
    }
  });
});
