// The backup format (docs/BACKUP.md): a folder holding the database, the blob store and
// a manifest of every file's SHA-256. A later per-matter archive reuses it, which is why
// the manifest is versioned and its checks live here rather than in the CLI.
import path from 'node:path';
import { z } from 'zod';

export const BACKUP_FORMAT = 'quarry-backup';
export const BACKUP_FORMAT_VERSION = 1;
export const MANIFEST_FILE = 'manifest.json';
export const DATABASE_FILE = 'quarry.db';
export const BLOBS_FOLDER = 'blobs';

const SHA256_HEX = /^[0-9a-f]{64}$/;
/** The only paths a manifest may name: the database and content-addressed blobs. */
const BLOB_PATH = /^blobs\/([0-9a-f]{2})\/([0-9a-f]{2})\/([0-9a-f]{64})$/;

export const manifestFileSchema = z.object({
  /** Relative to the backup folder, with forward slashes. */
  path: z.string().min(1),
  size: z.number().int().min(0),
  sha256: z.string().regex(SHA256_HEX, 'must be 64 lowercase hex digits'),
});
export type ManifestFile = z.infer<typeof manifestFileSchema>;

export const manifestSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  version: z.literal(BACKUP_FORMAT_VERSION),
  createdAt: z.string(),
  /** package.json version of the Quarry that wrote it. */
  quarryVersion: z.string(),
  /** Name of the last migration applied to the database when it was copied. */
  schemaMigration: z.string().nullable(),
  /** Rows per table in the copied database (a restore checks them again). */
  tables: z.record(z.string(), z.number().int().min(0)),
  /** What the copy covers: the whole installation (a per-matter archive would say 'matter'). */
  scope: z.object({ kind: z.literal('installation') }),
  files: z.array(manifestFileSchema),
});
export type Manifest = z.infer<typeof manifestSchema>;

/**
 * Why a manifest path is unacceptable, or null when it is fine: only `quarry.db` and
 * `blobs/ab/cd/<sha256>` (whose name must match its hash) may appear, so a crafted manifest
 * cannot make a restore write outside the data folder.
 */
export function manifestPathProblem(file: ManifestFile): string | null {
  if (file.path === DATABASE_FILE) return null;
  const match = BLOB_PATH.exec(file.path);
  if (!match) return `${file.path} is not a path a Quarry backup holds`;
  const [, a, b, name] = match;
  if (name.slice(0, 2) !== a || name.slice(2, 4) !== b)
    return `${file.path} is filed under the wrong folders for its name`;
  if (name !== file.sha256) return `${file.path} is named for a different hash than the manifest's`;
  return null;
}

/** The file's location under `root` (the manifest path uses forward slashes). */
export const locate = (root: string, relative: string) => path.join(root, ...relative.split('/'));
