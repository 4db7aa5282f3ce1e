// Content-addressed blob store and per-request temporary folders.
import { createHash } from 'node:crypto';
import { mkdtemp, readdir, readFile, rm, stat, utimes, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { text } from 'node:stream/consumers';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { BlobStore, sha256OfFile } from './blob-store';
import { makeTempDir, removeTempDir, sweepStaleTempDirs, tempRoot, withTempDir } from './temp-dirs';

let dataDir: string;
beforeEach(async () => {
  dataDir = await mkdtemp(path.join(tmpdir(), 'quarry-blobs-'));
});
afterEach(async () => {
  await rm(dataDir, { recursive: true, force: true });
});

describe('BlobStore', () => {
  it('names a blob by its SHA-256 (FIPS 180-4 test vector "abc") under blobs/ab/cd/<sha256>', async () => {
    const store = new BlobStore(dataDir);
    const source = path.join(dataDir, 'abc.txt');
    await writeFile(source, 'abc');
    const blob = await store.putFile(source);
    // FIPS 180-4 / NIST CSRC example: SHA-256("abc").
    expect(blob.sha256).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(blob).toMatchObject({ size: 3, created: true });
    expect(blob.path).toBe(path.join(dataDir, 'blobs', 'ba', '78', blob.sha256));
    expect(store.pathOf(blob.sha256)).toBe(blob.path);
    expect(await readFile(blob.path, 'utf8')).toBe('abc');
    expect(await readFile(source, 'utf8')).toBe('abc'); // the source is left in place
    expect(await text(await store.read(blob.sha256))).toBe('abc');
  });

  it('stores the same content once and never overwrites: the second put reports created=false', async () => {
    const store = new BlobStore(dataDir);
    const a = path.join(dataDir, 'a.bin');
    const b = path.join(dataDir, 'b.bin');
    const content = Buffer.alloc(300_000, 7);
    await writeFile(a, content);
    await writeFile(b, content);
    const first = await store.putFile(a);
    const before = await stat(first.path);
    const second = await store.putFile(b);
    expect(second).toEqual({ ...first, created: false });
    const after = await stat(second.path);
    expect(after.ino).toBe(before.ino);
    expect(after.mtimeMs).toBe(before.mtimeMs);
    // Only one blob and no leftovers of the temporary writes.
    const files = (await readdir(store.root, { recursive: true, withFileTypes: true })).filter(
      (e) => e.isFile(),
    );
    expect(files.map((e) => e.name)).toEqual([first.sha256]);
  });

  it('putBuffer and putFile agree on the hash; sha256OfFile matches node:crypto', async () => {
    const store = new BlobStore(dataDir);
    const content = Buffer.from('Attachment bytes\n');
    const file = path.join(dataDir, 'x');
    await writeFile(file, content);
    const fromBuffer = await store.putBuffer(content);
    expect(fromBuffer.sha256).toBe(createHash('sha256').update(content).digest('hex'));
    expect(await sha256OfFile(file)).toBe(fromBuffer.sha256);
    expect((await store.putFile(file)).created).toBe(false);
  });

  it('has() is false for unknown or malformed hashes; read() rejects clearly; pathOf refuses non-hashes', async () => {
    const store = new BlobStore(dataDir);
    expect(await store.has('0'.repeat(64))).toBe(false);
    expect(await store.has('../../etc/passwd')).toBe(false);
    await expect(store.read('0'.repeat(64))).rejects.toThrow(/not in the store/);
    expect(() => store.pathOf('../../etc/passwd')).toThrow(/not a SHA-256/);
  });

  it('a failed write (missing source) leaves nothing behind', async () => {
    const store = new BlobStore(dataDir);
    await expect(store.putFile(path.join(dataDir, 'missing'))).rejects.toThrow();
    const files = (await readdir(store.root, { recursive: true, withFileTypes: true })).filter(
      (e) => e.isFile(),
    );
    expect(files).toEqual([]);
  });
});

describe('temporary folders', () => {
  it('makes folders under <dataDir>/tmp and removes them', async () => {
    const dir = await makeTempDir(dataDir, 'upload ../x');
    expect(path.dirname(dir)).toBe(tempRoot(dataDir));
    expect(path.basename(dir)).toMatch(/^upload____x-/);
    await writeFile(path.join(dir, 'f'), 'x');
    await removeTempDir(dataDir, dir);
    expect(await readdir(tempRoot(dataDir))).toEqual([]);
  });

  it('refuses to remove anything outside <dataDir>/tmp', async () => {
    await expect(removeTempDir(dataDir, dataDir)).rejects.toThrow(/refusing/);
    await expect(removeTempDir(dataDir, tempRoot(dataDir))).rejects.toThrow(/refusing/);
    await expect(
      removeTempDir(dataDir, path.join(tempRoot(dataDir), '..', 'blobs')),
    ).rejects.toThrow(/refusing/);
  });

  it('withTempDir cleans up even when the work throws', async () => {
    let seen = '';
    await expect(
      withTempDir(dataDir, 'job', async (dir) => {
        seen = dir;
        await writeFile(path.join(dir, 'partial'), 'x');
        throw new Error('boom');
      }),
    ).rejects.toThrow('boom');
    await expect(stat(seen)).rejects.toThrow();
  });

  it('sweeps only stale folders', async () => {
    const old = await makeTempDir(dataDir, 'old');
    const fresh = await makeTempDir(dataDir, 'fresh');
    const twoDaysAgo = (Date.now() - 2 * 24 * 3600 * 1000) / 1000;
    await utimes(old, twoDaysAgo, twoDaysAgo);
    expect(await sweepStaleTempDirs(dataDir)).toBe(1);
    expect(await readdir(tempRoot(dataDir))).toEqual([path.basename(fresh)]);
  });
});

describe('BlobStore.delete', () => {
  it('removes the blob and its emptied folders, leaves neighbours, and reports a missing one', async () => {
    const store = new BlobStore(dataDir);
    const a = await store.putBuffer(Buffer.from('abc'));
    const b = await store.putBuffer(Buffer.from('other content'));
    expect(await store.delete(a.sha256)).toBe(true);
    expect(await store.has(a.sha256)).toBe(false);
    await expect(stat(path.dirname(a.path))).rejects.toThrow();
    expect(await store.has(b.sha256)).toBe(true);
    expect(await store.delete(a.sha256)).toBe(false);
    await expect(store.delete('../x')).rejects.toThrow(/not a SHA-256/);
  });
});
