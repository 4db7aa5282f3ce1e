import { describe, expect, it } from 'vitest';
import type { UploadedFile } from '@shared/schemas/documents';
import { perFileFractions } from '../api/upload-documents';
import { chunkForUpload, matchResults } from './upload-plan';

// Per-file progress is derived from one request's byte count. The check below serialises
// a real FormData with Node's built-in (undici) implementation of the Fetch Standard's
// multipart/form-data encoding (RFC 7578 framing) and finds where each file's bytes
// really lie in the body, then asks perFileFractions about those offsets.

async function serialise(files: { name: string; body: string }[]) {
  const form = new FormData();
  form.append('custodian', 'Odile Marchetti');
  for (const file of files) form.append('files', new Blob([file.body]), file.name);
  const body = Buffer.from(await new Response(form).arrayBuffer());
  const spans = files.map((file) => {
    const start = body.indexOf(file.body);
    return { start, end: start + Buffer.byteLength(file.body) };
  });
  return { total: body.length, spans };
}

describe('perFileFractions', () => {
  it('marks a file done once the body has passed its bytes, and later files barely started', async () => {
    const files = [
      { name: 'a.pdf', body: 'A'.repeat(40_000) },
      { name: 'b.docx', body: 'B'.repeat(15_000) },
      { name: 'c.eml', body: 'C'.repeat(60_000) },
    ];
    const { total, spans } = await serialise(files);
    const sizes = files.map((f) => f.body.length);
    for (let i = 0; i < files.length; i += 1) {
      const fractions = perFileFractions(sizes, { loaded: spans[i].end, total });
      for (let j = 0; j < i; j += 1) expect(fractions[j]).toBe(1);
      // Framing is a few hundred bytes per part, spread evenly: within 2% of the truth.
      expect(fractions[i]).toBeGreaterThan(0.98);
      for (let j = i + 1; j < files.length; j += 1) expect(fractions[j]).toBeLessThan(0.02);
    }
    // Half-way through the second file's bytes reads about one half.
    const middle = (spans[1].start + spans[1].end) / 2;
    const half = perFileFractions(sizes, { loaded: middle, total })[1];
    expect(half).toBeGreaterThan(0.45);
    expect(half).toBeLessThan(0.55);
  });

  it('reads 0 before anything is sent and 1 for every file at the end', () => {
    expect(perFileFractions([10, 0, 20], { loaded: 0, total: 500 })).toEqual([0, 0, 0]);
    expect(perFileFractions([10, 0, 20], { loaded: 500, total: 500 })).toEqual([1, 1, 1]);
  });
});

describe('chunkForUpload', () => {
  const item = (size: number) => ({ file: { size } });

  it('keeps requests to 20 files', () => {
    const chunks = chunkForUpload(Array.from({ length: 45 }, () => item(1000)));
    expect(chunks.map((c) => c.length)).toEqual([20, 20, 5]);
  });

  it('sends a file larger than a request on its own, and keeps order', () => {
    const big = item(200 * 1024 * 1024);
    const items = [item(10), big, item(20)];
    const chunks = chunkForUpload(items);
    expect(chunks).toEqual([[items[0]], [big], [items[2]]]);
  });
});

describe('matchResults', () => {
  const row = (id: number, path: string): UploadedFile => ({
    id,
    name: path.split('/').pop()!,
    path,
    controlNumber: `BBHM-${String(id).padStart(6, '0')}`,
    status: 'pending',
  });

  it('gives an ordinary file its row and an archive its entries', () => {
    const files = [
      row(1, 'memo.pdf'),
      row(2, 'box.zip/2021/letter.docx'),
      row(3, 'box.zip/notes.txt'),
      row(4, 'reply.eml'),
    ];
    expect(matchResults(['memo.pdf', 'box.zip', 'reply.eml'], files)).toEqual([
      [files[0]],
      [files[1], files[2]],
      [files[3]],
    ]);
  });

  it('pairs two picked files of the same name with one row each', () => {
    const files = [row(1, 'scan.pdf'), row(2, 'scan.pdf')];
    expect(matchResults(['scan.pdf', 'scan.pdf'], files)).toEqual([[files[0]], [files[1]]]);
  });

  it('leaves a file the server did not list with no rows', () => {
    expect(matchResults(['lost.pdf'], [row(1, 'other.pdf')])).toEqual([[]]);
  });
});
