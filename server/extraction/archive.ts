// Safe expansion of .zip archives (PKWARE APPNOTE.TXT) into a folder the caller owns.
// Limits are enforced on bytes actually inflated, never on sizes the headers declare, and
// every entry name is checked so nothing is ever written outside the target folder.
import { createWriteStream } from 'node:fs';
import { mkdir, readdir, rename, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import { Transform, type TransformCallback } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import yauzl from 'yauzl';
import { sniffFile } from './sniff';
import { ARCHIVE_DEFAULTS, type ArchiveLimits, type FailureReason } from './types';

/** One file taken out of an archive (nested archives are expanded in place of the file). */
export interface ArchiveFile {
  /** Path inside the upload, "/"-separated, e.g. "Smith mailbox/2021/memo.pdf" or "a/inner.zip/b.txt". */
  relativePath: string;
  absolutePath: string;
  size: number;
}

/** An entry left out while the rest of the archive was kept. */
export interface ArchiveSkipped {
  relativePath: string;
  reason: FailureReason | 'operating-system metadata' | 'symbolic link';
}

export type ExpandResult =
  | { ok: true; files: ArchiveFile[]; skipped: ArchiveSkipped[]; unpackedBytes: number }
  | { ok: false; reason: FailureReason; detail: string };

class ArchiveFailure extends Error {
  constructor(
    readonly reason: FailureReason,
    readonly detail: string,
  ) {
    super(`${reason}: ${detail}`);
  }
}

class EntryTooLarge extends Error {}

interface Budget {
  limits: ArchiveLimits;
  entries: number;
  bytes: number;
  files: ArchiveFile[];
  skipped: ArchiveSkipped[];
}

/**
 * Returns the entry name as safe "/"-separated segments, or null when it could escape the
 * target: ".." segments, absolute paths, drive letters, backslashes or NUL bytes.
 */
export function safeEntryPath(name: string): string | null {
  if (name.includes('\0') || name.includes('\\')) return null;
  if (name.startsWith('/') || /^[a-zA-Z]:/.test(name)) return null;
  const parts = name.split('/').filter((part) => part !== '' && part !== '.');
  if (parts.length === 0 || parts.some((part) => part === '..' || /^[a-zA-Z]:$/.test(part)))
    return null;
  return parts.join('/');
}

/** True when `child` resolves to a path strictly inside `root`. */
function isInside(root: string, child: string): boolean {
  const relative = path.relative(root, child);
  return relative !== '' && !relative.startsWith('..') && !path.isAbsolute(relative);
}

// yauzl's own name checks (validateFileName) report these; they mean a hostile name.
const UNSAFE_NAME_ERRORS = /^(invalid characters in fileName|absolute path|invalid relative path)/;

function mapZipError(error: unknown): ArchiveFailure {
  if (error instanceof ArchiveFailure) return error;
  const message = error instanceof Error ? error.message : String(error);
  if (UNSAFE_NAME_ERRORS.test(message))
    return new ArchiveFailure('unsafe path in archive', message);
  if (/encrypted/i.test(message)) return new ArchiveFailure('encrypted archive', message);
  // "too many bytes in the stream": an entry inflating past its declared size (a lying header).
  if (/too many bytes/i.test(message))
    return new ArchiveFailure('archive exceeds the unpacked-size limit', message);
  return new ArchiveFailure('not a valid ZIP archive', message);
}

const isOsMetadata = (relative: string) =>
  relative
    .split('/')
    .some((part) => part === '__MACOSX' || part === '.DS_Store' || part === 'Thumbs.db');

// Unix mode bits live in the high 16 bits of the external attributes (APPNOTE §4.4.15, Info-ZIP).
const isSymlink = (entry: yauzl.Entry) =>
  ((entry.externalFileAttributes >>> 16) & 0o170000) === 0o120000;

/** Counts inflated bytes against the entry and archive budgets, failing the stream when over. */
function byteCounter(budget: Budget, perEntryLimit: number): Transform {
  let entryBytes = 0;
  return new Transform({
    transform(chunk: Buffer, _encoding, callback: TransformCallback) {
      entryBytes += chunk.length;
      budget.bytes += chunk.length;
      if (budget.bytes > budget.limits.maxArchiveUnpackedBytes) {
        return callback(
          new ArchiveFailure(
            'archive exceeds the unpacked-size limit',
            `more than ${budget.limits.maxArchiveUnpackedBytes} bytes unpacked`,
          ),
        );
      }
      if (entryBytes > perEntryLimit) return callback(new EntryTooLarge());
      callback(null, chunk);
    },
  });
}

function openZip(zipPath: string): Promise<yauzl.ZipFile> {
  return new Promise((resolve, reject) => {
    yauzl.open(
      zipPath,
      {
        lazyEntries: true,
        autoClose: false,
        validateEntrySizes: true,
        decodeStrings: true,
        strictFileNames: false,
      },
      (error, zip) => (error || !zip ? reject(mapZipError(error)) : resolve(zip)),
    );
  });
}

function openEntry(zip: yauzl.ZipFile, entry: yauzl.Entry): Promise<NodeJS.ReadableStream> {
  return new Promise((resolve, reject) => {
    zip.openReadStream(entry, (error, stream) =>
      error || !stream ? reject(mapZipError(error)) : resolve(stream),
    );
  });
}

/** Iterates entries one at a time (lazyEntries), surfacing zip errors as rejections. */
async function* entriesOf(zip: yauzl.ZipFile): AsyncGenerator<yauzl.Entry> {
  let pending: {
    resolve: (entry: yauzl.Entry | null) => void;
    reject: (error: unknown) => void;
  } | null = null;
  let failure: unknown = null;
  let ended = false;
  zip.on('entry', (entry: yauzl.Entry) => pending?.resolve(entry));
  zip.on('end', () => {
    ended = true;
    pending?.resolve(null);
  });
  zip.on('error', (error: unknown) => {
    failure = error;
    pending?.reject(error);
  });
  for (;;) {
    if (failure) throw failure;
    if (ended) return;
    const next = await new Promise<yauzl.Entry | null>((resolve, reject) => {
      pending = { resolve, reject };
      zip.readEntry();
    });
    pending = null;
    if (next === null) return;
    yield next;
  }
}

/** Picks a free file name next to `wanted` ("memo (2).pdf") when an archive repeats a name. */
async function freeName(wanted: string): Promise<string> {
  const exists = async (p: string) =>
    stat(p).then(
      () => true,
      () => false,
    );
  if (!(await exists(wanted))) return wanted;
  const ext = path.extname(wanted);
  const stem = wanted.slice(0, wanted.length - ext.length);
  for (let n = 2; ; n += 1) {
    const candidate = `${stem} (${n})${ext}`;
    if (!(await exists(candidate))) return candidate;
  }
}

async function expandInto(
  zipPath: string,
  root: string,
  folder: string,
  depth: number,
  budget: Budget,
): Promise<void> {
  if (depth > budget.limits.maxArchiveDepth) {
    throw new ArchiveFailure(
      'archive nesting too deep',
      `more than ${budget.limits.maxArchiveDepth} levels of archives`,
    );
  }
  const zip = await openZip(zipPath);
  try {
    // The declared count is only an early exit; the real count is kept below.
    if (budget.entries + zip.entryCount > budget.limits.maxArchiveEntries) {
      throw new ArchiveFailure(
        'archive has too many files',
        `more than ${budget.limits.maxArchiveEntries} entries`,
      );
    }
    for await (const entry of entriesOf(zip)) {
      budget.entries += 1;
      if (budget.entries > budget.limits.maxArchiveEntries) {
        throw new ArchiveFailure(
          'archive has too many files',
          `more than ${budget.limits.maxArchiveEntries} entries`,
        );
      }
      const safe = safeEntryPath(entry.fileName);
      if (safe === null) throw new ArchiveFailure('unsafe path in archive', entry.fileName);
      const destination = path.resolve(folder, safe);
      if (!isInside(root, destination))
        throw new ArchiveFailure('unsafe path in archive', entry.fileName);
      const relativeToRoot = path.relative(root, destination).split(path.sep).join('/');

      if (entry.fileName.endsWith('/')) continue; // directory entry (APPNOTE §4.3.8 note)
      if (isOsMetadata(safe)) {
        budget.skipped.push({ relativePath: relativeToRoot, reason: 'operating-system metadata' });
        continue;
      }
      if (isSymlink(entry)) {
        budget.skipped.push({ relativePath: relativeToRoot, reason: 'symbolic link' });
        continue;
      }
      if (entry.isEncrypted()) {
        budget.skipped.push({ relativePath: relativeToRoot, reason: 'encrypted archive' });
        continue;
      }

      await mkdir(path.dirname(destination), { recursive: true });
      const target = await freeName(destination);
      const stream = await openEntry(zip, entry);
      try {
        await pipeline(
          stream,
          byteCounter(budget, budget.limits.maxFileBytes),
          createWriteStream(target, { flags: 'wx' }),
        );
      } catch (error) {
        await rm(target, { force: true });
        if (error instanceof EntryTooLarge) {
          budget.skipped.push({
            relativePath: relativeToRoot,
            reason: 'file exceeds the size limit',
          });
          continue;
        }
        throw mapZipError(error);
      }

      const targetRelative = path.relative(root, target).split(path.sep).join('/');
      const kind = (await sniffFile(target, target)).kind;
      if (kind === 'zip') {
        // Expand the inner archive in a folder named like it: "a/inner.zip/...".
        const staged = `${target}.quarry-nested-${process.pid}-${budget.entries}`;
        await rename(target, staged);
        await mkdir(target);
        try {
          await expandInto(staged, root, target, depth + 1, budget);
        } finally {
          await rm(staged, { force: true });
        }
        continue;
      }
      budget.files.push({
        relativePath: targetRelative,
        absolutePath: target,
        size: (await stat(target)).size,
      });
    }
  } finally {
    zip.close();
  }
}

/**
 * Expands `zipPath` into `targetDir` (created; must be absent or empty), nested archives
 * included up to `limits.maxArchiveDepth`. On failure the folder is removed again, so a
 * rejected archive leaves nothing behind. Never throws for bad archives.
 */
export async function expandArchive(
  zipPath: string,
  targetDir: string,
  limits: Partial<ArchiveLimits> = {},
): Promise<ExpandResult> {
  const root = path.resolve(targetDir);
  const budget: Budget = {
    limits: { ...ARCHIVE_DEFAULTS, ...limits },
    entries: 0,
    bytes: 0,
    files: [],
    skipped: [],
  };
  await mkdir(root, { recursive: true });
  if ((await readdir(root)).length > 0)
    throw new Error(`expandArchive: target folder ${root} is not empty`);
  try {
    await expandInto(zipPath, root, root, 1, budget);
    return { ok: true, files: budget.files, skipped: budget.skipped, unpackedBytes: budget.bytes };
  } catch (error) {
    await rm(root, { recursive: true, force: true });
    const failure = mapZipError(error);
    return { ok: false, reason: failure.reason, detail: failure.detail };
  }
}
