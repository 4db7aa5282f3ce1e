// File helpers for backups: copy while hashing (so the hash describes the bytes written),
// and walk a folder tree.
import { createHash } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdir, open, readdir } from 'node:fs/promises';
import path from 'node:path';
import { Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';

/** Backups hold privileged material: files readable by their owner only. */
export const FILE_MODE = 0o600;
export const DIR_MODE = 0o700;

/** Copies `from` to `to` (which must not exist), returning the SHA-256 and size of what was written. */
export async function copyHashed(
  from: string,
  to: string,
): Promise<{ sha256: string; size: number }> {
  await mkdir(path.dirname(to), { recursive: true, mode: DIR_MODE });
  const hash = createHash('sha256');
  let size = 0;
  const tap = new Transform({
    transform(chunk: Buffer, _encoding, callback) {
      hash.update(chunk);
      size += chunk.length;
      callback(null, chunk);
    },
  });
  await pipeline(
    createReadStream(from),
    tap,
    createWriteStream(to, { flags: 'wx', mode: FILE_MODE }),
  );
  await syncFile(to);
  return { sha256: hash.digest('hex'), size };
}

export async function syncFile(file: string): Promise<void> {
  const handle = await open(file, 'r');
  try {
    await handle.sync();
  } finally {
    await handle.close();
  }
}

/** Every regular file under `root`, as forward-slash paths relative to it (sorted). */
export async function listFiles(root: string, skip: (relative: string) => boolean = () => false) {
  const found: string[] = [];
  const entries = await readdir(root, { recursive: true, withFileTypes: true }).catch(
    (error: NodeJS.ErrnoException) => {
      if (error.code === 'ENOENT') return [];
      throw error;
    },
  );
  for (const entry of entries) {
    const full = path.join(entry.parentPath, entry.name);
    const relative = path.relative(root, full).split(path.sep).join('/');
    if (skip(relative)) continue;
    if (entry.isFile()) found.push(relative);
    else if (!entry.isDirectory()) found.push(relative); // symlinks and the like: reported, never followed
  }
  return found.sort();
}
