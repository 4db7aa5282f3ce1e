// Content-addressed store for original files: each distinct content is kept once, named by
// its SHA-256 (FIPS 180-4) under <dataDir>/blobs/ab/cd/<sha256>. Blobs are written to a
// temporary name on the same filesystem and then linked into place, so a reader never sees
// a half-written blob and an existing blob is never overwritten.
import { createHash, randomUUID } from 'node:crypto';
import { createReadStream, createWriteStream, type ReadStream } from 'node:fs';
import { link, mkdir, open, rename, rm, rmdir, stat, unlink } from 'node:fs/promises';
import path from 'node:path';
import { Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { PRIVATE_DIR_MODE, PRIVATE_FILE_MODE } from './file-modes';

export interface StoredBlob {
  sha256: string;
  size: number;
  path: string;
  /** False when the same content was already stored (a duplicate). */
  created: boolean;
}

const SHA256_HEX = /^[0-9a-f]{64}$/;

export class BlobStore {
  readonly root: string;
  private readonly incoming: string;

  constructor(dataDir: string) {
    this.root = path.join(path.resolve(dataDir), 'blobs');
    this.incoming = path.join(this.root, '.incoming');
  }

  /** Where the blob with this hash lives (whether or not it exists). */
  pathOf(sha256: string): string {
    if (!SHA256_HEX.test(sha256)) throw new Error(`not a SHA-256 hex digest: ${sha256}`);
    return path.join(this.root, sha256.slice(0, 2), sha256.slice(2, 4), sha256);
  }

  async has(sha256: string): Promise<boolean> {
    if (!SHA256_HEX.test(sha256)) return false;
    return stat(this.pathOf(sha256)).then(
      (s) => s.isFile(),
      () => false,
    );
  }

  /** A read stream of a stored blob; rejects with a clear error when it is missing. */
  async read(sha256: string): Promise<ReadStream> {
    if (!(await this.has(sha256))) throw new Error(`blob ${sha256} is not in the store`);
    return createReadStream(this.pathOf(sha256));
  }

  /** Copies a file into the store, hashing while it streams; the source is left in place. */
  async putFile(sourcePath: string): Promise<StoredBlob> {
    return this.store((hasher) =>
      pipeline(createReadStream(sourcePath), hasher.stream, hasher.sink),
    );
  }

  /** Stores bytes held in memory (e.g. an e-mail attachment). */
  async putBuffer(content: Buffer): Promise<StoredBlob> {
    return this.store(async (hasher) => {
      hasher.stream.end(content);
      await pipeline(hasher.stream, hasher.sink);
    });
  }

  private async store(
    write: (hasher: { stream: Transform; sink: NodeJS.WritableStream }) => Promise<void>,
  ): Promise<StoredBlob> {
    // Owner-only: originals are the matter's documents (0700 folders, 0600 files).
    await mkdir(this.incoming, { recursive: true, mode: PRIVATE_DIR_MODE });
    const temp = path.join(this.incoming, `${randomUUID()}.part`);
    const hash = createHash('sha256');
    let size = 0;
    const stream = new Transform({
      transform(chunk: Buffer, _encoding, callback) {
        hash.update(chunk);
        size += chunk.length;
        callback(null, chunk);
      },
    });
    try {
      await write({
        stream,
        sink: createWriteStream(temp, { flags: 'wx', mode: PRIVATE_FILE_MODE }),
      });
      // Flush to disk before the blob becomes visible under its final name.
      const handle = await open(temp, 'r');
      await handle.sync();
      await handle.close();
      const sha256 = hash.digest('hex');
      const final = this.pathOf(sha256);
      await mkdir(path.dirname(final), { recursive: true, mode: PRIVATE_DIR_MODE });
      let created = true;
      try {
        // link() fails with EEXIST instead of replacing: an existing blob is never overwritten.
        await link(temp, final);
      } catch (error) {
        const code = (error as NodeJS.ErrnoException).code;
        if (code === 'EEXIST') created = false;
        else if (code === 'EPERM' || code === 'ENOTSUP' || code === 'ENOSYS') {
          // Filesystems without hard links: rename, having checked the name is still free.
          if (await this.has(sha256)) created = false;
          else await rename(temp, final);
        } else throw error;
      }
      return { sha256, size, path: final, created };
    } finally {
      await unlink(temp).catch(() => undefined);
    }
  }

  /**
   * Removes a blob for good (a purged document's original). The caller decides that no
   * document still needs it: the store does not know who refers to what. Empty ab/cd
   * folders are removed too. Returns whether a file was there.
   */
  async delete(sha256: string): Promise<boolean> {
    const file = this.pathOf(sha256);
    try {
      await unlink(file);
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === 'ENOENT') return false;
      throw error;
    }
    for (const dir of [path.dirname(file), path.dirname(path.dirname(file))])
      await rmdir(dir).catch(() => undefined); // not empty: another blob lives there
    return true;
  }

  /** Removes leftovers of interrupted writes (call at start-up). */
  async sweepIncoming(): Promise<void> {
    await rm(this.incoming, { recursive: true, force: true });
  }
}

/** SHA-256 of a file, streamed. */
export async function sha256OfFile(filePath: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(filePath)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}
