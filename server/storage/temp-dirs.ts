// Per-request temporary folders under <dataDir>/tmp, on the same filesystem as the blob
// store so finished files can be moved in cheaply, and removed when the request is done.
import { mkdir, mkdtemp, readdir, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import { PRIVATE_DIR_MODE } from './file-modes';

export const tempRoot = (dataDir: string) => path.join(path.resolve(dataDir), 'tmp');

/** Creates a fresh folder <dataDir>/tmp/<label>-XXXXXX and returns its absolute path. */
export async function makeTempDir(dataDir: string, label = 'upload'): Promise<string> {
  const root = tempRoot(dataDir);
  await mkdir(root, { recursive: true, mode: PRIVATE_DIR_MODE });
  const safeLabel = label.replace(/[^a-zA-Z0-9_-]/g, '_').slice(0, 40) || 'tmp';
  return mkdtemp(path.join(root, `${safeLabel}-`));
}

/** Removes a folder made by makeTempDir; refuses anything outside <dataDir>/tmp. */
export async function removeTempDir(dataDir: string, dir: string): Promise<void> {
  const root = tempRoot(dataDir);
  const relative = path.relative(root, path.resolve(dir));
  if (relative === '' || relative.startsWith('..') || path.isAbsolute(relative)) {
    throw new Error(`refusing to remove ${dir}: not a temporary folder under ${root}`);
  }
  await rm(path.resolve(dir), { recursive: true, force: true });
}

/** Runs `work` with a fresh temporary folder and always removes it afterwards. */
export async function withTempDir<T>(
  dataDir: string,
  label: string,
  work: (dir: string) => Promise<T>,
): Promise<T> {
  const dir = await makeTempDir(dataDir, label);
  try {
    return await work(dir);
  } finally {
    await removeTempDir(dataDir, dir);
  }
}

/** Deletes temporary folders older than `maxAgeMs` (left by a crash); returns how many. */
export async function sweepStaleTempDirs(
  dataDir: string,
  maxAgeMs = 24 * 60 * 60 * 1000,
  now = Date.now(),
): Promise<number> {
  const root = tempRoot(dataDir);
  const names = await readdir(root).catch(() => [] as string[]);
  let removed = 0;
  for (const name of names) {
    const full = path.join(root, name);
    const info = await stat(full).catch(() => null);
    if (info && now - info.mtimeMs > maxAgeMs) {
      await rm(full, { recursive: true, force: true });
      removed += 1;
    }
  }
  return removed;
}
