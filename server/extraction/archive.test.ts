// Safe zip expansion: limits counted on inflated bytes, hostile names refused, nothing
// written outside the target folder. Zip structure per PKWARE APPNOTE.TXT 6.3.x.
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { makeDocx, makeZip } from '../../corpus-demo/render';
import {
  makeLyingZip,
  makeNestedZip,
  makeZipWithEncryptedEntries,
  makeZipBomb,
  makeZipWithRawNames,
} from '../../tests/fixtures/hostile-zips';
import { expandArchive, safeEntryPath } from './archive';

let sandbox: string;
let target: string;
let zipPath: string;

/** Every path under the sandbox except inside the target folder. */
async function listingOutsideTarget(): Promise<string[]> {
  const entries = await readdir(sandbox, { recursive: true });
  return entries
    .filter((entry) => entry !== 'target' && !entry.startsWith(`target${path.sep}`))
    .sort();
}

beforeEach(async () => {
  sandbox = await mkdtemp(path.join(tmpdir(), 'quarry-archive-'));
  target = path.join(sandbox, 'target');
  zipPath = path.join(sandbox, 'upload.zip');
});
afterEach(async () => {
  await rm(sandbox, { recursive: true, force: true });
});

const small = {
  maxArchiveEntries: 50,
  maxArchiveUnpackedBytes: 1024 * 1024,
  maxArchiveDepth: 3,
  maxFileBytes: 512 * 1024,
};

describe('expandArchive', () => {
  it('expands a folder tree, keeping relative paths for custodian/folder display', async () => {
    await writeFile(
      zipPath,
      await makeZip([
        { name: 'Smith mailbox/2021/memo.txt', content: Buffer.from('Quarterly memo') },
        { name: 'Smith mailbox/notes.md', content: Buffer.from('# Notes') },
        { name: '__MACOSX/._memo.txt', content: Buffer.from('resource fork') },
      ]),
    );
    const result = await expandArchive(zipPath, target, small);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.files.map((f) => f.relativePath).sort()).toEqual([
      'Smith mailbox/2021/memo.txt',
      'Smith mailbox/notes.md',
    ]);
    const memo = result.files.find((f) => f.relativePath.endsWith('memo.txt'))!;
    expect(await readFile(memo.absolutePath, 'utf8')).toBe('Quarterly memo');
    expect(memo.size).toBe(14);
    expect(result.skipped).toEqual([
      { relativePath: '__MACOSX/._memo.txt', reason: 'operating-system metadata' },
    ]);
    expect(result.unpackedBytes).toBe(14 + 7); // skipped metadata is never inflated
  });

  it('expands nested zips in place ("inner.zip/...") within the depth limit, but keeps a DOCX whole', async () => {
    const docx = await makeDocx({ title: 'T', author: 'A', paragraphs: ['p'] });
    const inner = await makeZip([{ name: 'deep.txt', content: Buffer.from('deep') }]);
    await writeFile(
      zipPath,
      await makeZip([
        { name: 'a/inner.zip', content: inner },
        { name: 'a/letter.docx', content: docx },
      ]),
    );
    const result = await expandArchive(zipPath, target, small);
    expect(result.ok && result.files.map((f) => f.relativePath).sort()).toEqual([
      'a/inner.zip/deep.txt',
      'a/letter.docx',
    ]);
  });

  it('allows exactly maxArchiveDepth levels and refuses one more ("archive nesting too deep")', async () => {
    await writeFile(zipPath, await makeNestedZip(3));
    const ok = await expandArchive(zipPath, target, small);
    expect(ok.ok && ok.files.map((f) => f.relativePath)).toEqual([
      'level-2.zip/level-3.zip/memo.txt',
    ]);

    await rm(target, { recursive: true });
    await writeFile(zipPath, await makeNestedZip(4));
    const before = await listingOutsideTarget();
    const deep = await expandArchive(zipPath, target, small);
    expect(deep).toMatchObject({ ok: false, reason: 'archive nesting too deep' });
    expect(await listingOutsideTarget()).toEqual(before);
    expect(await readdir(sandbox)).not.toContain('target'); // partial output removed
  });

  it('stops a zip bomb by counting inflated bytes ("archive exceeds the unpacked-size limit")', async () => {
    // 3 MiB of one repeated byte deflates (RFC 1951) to a few KiB.
    const bomb = await makeZipBomb(3 * 1024 * 1024);
    expect(bomb.length).toBeLessThan(16 * 1024);
    await writeFile(zipPath, bomb);
    const result = await expandArchive(zipPath, target, {
      ...small,
      maxFileBytes: 10 * 1024 * 1024,
    });
    expect(result).toMatchObject({ ok: false, reason: 'archive exceeds the unpacked-size limit' });
    expect(await readdir(sandbox)).toEqual(['upload.zip']);
  });

  it('counts the total across entries, not per entry', async () => {
    const chunk = Buffer.alloc(300 * 1024, 0x41);
    await writeFile(
      zipPath,
      await makeZip([1, 2, 3, 4].map((n) => ({ name: `part-${n}.txt`, content: chunk }))),
    );
    expect(await expandArchive(zipPath, target, small)).toMatchObject({
      ok: false,
      reason: 'archive exceeds the unpacked-size limit',
    });
  });

  it('does not trust sizes in the headers: an entry declaring 100 bytes that inflates to 4 MiB is stopped', async () => {
    await writeFile(zipPath, makeLyingZip(4 * 1024 * 1024, 100));
    const result = await expandArchive(zipPath, target, small);
    expect(result).toMatchObject({ ok: false, reason: 'archive exceeds the unpacked-size limit' });
    expect(await readdir(sandbox)).toEqual(['upload.zip']);
  });

  it('skips a single entry over the per-file limit and keeps the rest', async () => {
    await writeFile(
      zipPath,
      await makeZip([
        { name: 'big.txt', content: Buffer.alloc(600 * 1024, 0x41) },
        { name: 'ok.txt', content: Buffer.from('fine') },
      ]),
    );
    const result = await expandArchive(zipPath, target, small);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.files.map((f) => f.relativePath)).toEqual(['ok.txt']);
    expect(result.skipped).toEqual([
      { relativePath: 'big.txt', reason: 'file exceeds the size limit' },
    ]);
    expect(await readdir(target)).toEqual(['ok.txt']);
  });

  it('refuses too many entries ("archive has too many files")', async () => {
    const entries = Array.from({ length: 51 }, (_, i) => ({
      name: `f${i}.txt`,
      content: Buffer.from(String(i)),
    }));
    await writeFile(zipPath, await makeZip(entries));
    expect(await expandArchive(zipPath, target, small)).toMatchObject({
      ok: false,
      reason: 'archive has too many files',
    });
  });

  for (const name of [
    '../escape.txt',
    'docs/../../escape.txt',
    '/etc/escape.txt',
    'C:/escape.txt',
    '..\\escape.txt',
    'a\\..\\..\\x.txt',
  ]) {
    it(`refuses the entry name ${JSON.stringify(name)} ("unsafe path in archive") and writes nothing outside`, async () => {
      await writeFile(
        zipPath,
        await makeZipWithRawNames([
          { name: 'fine-first-entry.txt', content: Buffer.from('ok') },
          { name, content: Buffer.from('payload') },
        ]),
      );
      const before = await listingOutsideTarget();
      const result = await expandArchive(zipPath, target, small);
      expect(result).toMatchObject({ ok: false, reason: 'unsafe path in archive' });
      expect(await listingOutsideTarget()).toEqual(before);
      expect(await readdir(sandbox)).toEqual(['upload.zip']);
      expect(await readdir(path.dirname(sandbox))).not.toContain('escape.txt');
    });
  }

  it('skips an encrypted entry (APPNOTE §4.4.4 bit 0) as "encrypted archive" and keeps the others', async () => {
    await writeFile(
      zipPath,
      await makeZipWithEncryptedEntries(
        [
          { name: 'locked.txt', content: Buffer.from('secret') },
          { name: 'open.txt', content: Buffer.from('public') },
        ],
        ['locked.txt'],
      ),
    );
    const result = await expandArchive(zipPath, target, small);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.files.map((f) => f.relativePath)).toEqual(['open.txt']);
    expect(result.skipped).toEqual([{ relativePath: 'locked.txt', reason: 'encrypted archive' }]);
  });

  it('reports a corrupt archive as "not a valid ZIP archive"', async () => {
    const zip = await makeZip([{ name: 'a.txt', content: Buffer.from('hello world') }]);
    await writeFile(zipPath, zip.subarray(0, zip.length - 30));
    expect(await expandArchive(zipPath, target, small)).toMatchObject({
      ok: false,
      reason: 'not a valid ZIP archive',
    });
  });

  it('safeEntryPath normalises harmless names and rejects escapes', () => {
    expect(safeEntryPath('./a//b/c.txt')).toBe('a/b/c.txt');
    expect(safeEntryPath('a/../b')).toBeNull();
    expect(safeEntryPath('D:evil')).toBeNull();
    expect(safeEntryPath('a\u0000b')).toBeNull();
  });
});
