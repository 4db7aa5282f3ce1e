// Extraction of every supported format from generated fixtures, and hostile or broken inputs.
import { mkdtemp, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  makeDocx,
  makeEml,
  makeHtml,
  makeImageOnlyPdf,
  makePdf,
  makeText,
  makeZip,
} from '../../corpus-demo/render';
import { closeExtractionPool, extractFile, extractionPool } from './extract';
import type { ExtractResult, ExtractSuccess } from './types';

let sandbox: string;
let dir: string;
let before: string[];

beforeAll(async () => {
  sandbox = await mkdtemp(path.join(tmpdir(), 'quarry-extract-'));
  dir = path.join(sandbox, 'files');
  await writeFile(path.join(sandbox, 'sentinel.txt'), 'untouched');
  await import('node:fs/promises').then((fs) => fs.mkdir(dir));
  before = await readdir(sandbox);
  await extractionPool().warm();
});
afterAll(async () => {
  // Extraction only reads: nothing appears next to the inputs' folder.
  expect(await readdir(sandbox)).toEqual(before);
  await rm(sandbox, { recursive: true, force: true });
  await closeExtractionPool();
});

let counter = 0;
async function extractBytes(bytes: Buffer, name: string, limits = {}): Promise<ExtractResult> {
  counter += 1;
  const file = path.join(dir, `${counter}-${path.basename(name)}`);
  await writeFile(file, bytes);
  return extractFile(file, name, limits);
}

function expectOk(result: ExtractResult): ExtractSuccess {
  if (!result.ok) throw new Error(`expected success, got ${result.reason}`);
  return result;
}

describe('extractFile: formats and metadata', () => {
  it('PDF: text of every page, Title/Author from the document information dictionary (ISO 32000-1 §14.3.3), page count', async () => {
    const pdf = await makePdf({
      title: 'Turbine supply agreement',
      author: 'Dana Whitlock',
      pages: [
        'The seller shall deliver forty turbines.',
        'Payment is due within thirty days.',
        'Signed in Rivertown.',
      ],
      createdAt: new Date('2021-03-15T12:00:00Z'),
    });
    const r = expectOk(await extractBytes(pdf, 'agreement.pdf'));
    expect(r).toMatchObject({
      kind: 'pdf',
      mime: 'application/pdf',
      title: 'Turbine supply agreement',
      author: 'Dana Whitlock',
      pageCount: 3,
    });
    expect(r.createdAt).toBe('2021-03-15T12:00:00.000Z');
    expect(r.text).toContain('forty turbines');
    expect(r.text).toContain('thirty days');
    expect(r.text).toContain('Rivertown');
    expect(r.text).not.toMatch(/-- \d+ of \d+ --/); // no page markers injected into the text
    expect(r.recipients).toBeNull();
  });

  it('DOCX: body text via mammoth, dc:title and dc:creator from docProps/core.xml (ECMA-376 Part 2 §11)', async () => {
    const docx = await makeDocx({
      title: 'Board minutes & resolutions',
      author: 'Priya Castellano',
      paragraphs: [
        'The board approved the settlement framework.',
        'Counsel will circulate a draft.',
      ],
      createdAt: new Date('2020-11-02T08:30:00Z'),
    });
    const r = expectOk(await extractBytes(docx, 'minutes.docx'));
    expect(r).toMatchObject({
      kind: 'docx',
      title: 'Board minutes & resolutions',
      author: 'Priya Castellano',
    });
    expect(r.createdAt).toBe('2020-11-02T08:30:00.000Z');
    expect(r.text).toContain('settlement framework');
    expect(r.text).toContain('circulate a draft');
    expect(r.text).not.toMatch(/<w:|<\?xml/);
  });

  it('e-mail: From, To, Cc, Date, Subject (RFC 5322 §3.6) and the body; attachments (RFC 2046 §5.1 multipart/mixed) returned as children', async () => {
    const memo = await makePdf({
      title: 'Attached memo',
      author: 'Lena Ortiz',
      pages: ['Inventory shortfall details.'],
    });
    const eml = await makeEml({
      from: 'Lena Ortiz <lena.ortiz@harbor-freight.example.com>',
      to: ['Marcus Bell <marcus.bell@example.com>', 'ops@example.org'],
      cc: ['Ana Ruiz <ana.ruiz@example.net>'],
      subject: 'Re: delayed shipment — revised schedule',
      date: new Date('2021-05-06T14:22:00Z'),
      text: 'Marcus,\n\nThe revised schedule is attached.\n\nLena',
      attachments: [
        { filename: 'memo.pdf', contentType: 'application/pdf', content: memo },
        {
          filename: 'notes.txt',
          contentType: 'text/plain',
          content: Buffer.from('Call the warehouse.'),
        },
      ],
    });
    const r = expectOk(await extractBytes(eml, 'message.eml'));
    expect(r.kind).toBe('email');
    expect(r.mime).toBe('message/rfc822');
    expect(r.title).toBe('Re: delayed shipment — revised schedule'); // RFC 2047 encoded-word decoded
    expect(r.author).toBe('Lena Ortiz <lena.ortiz@harbor-freight.example.com>');
    expect(r.recipients).toEqual({
      to: 'Marcus Bell <marcus.bell@example.com>, ops@example.org',
      cc: 'Ana Ruiz <ana.ruiz@example.net>',
    });
    expect(r.sentAt).toBe('2021-05-06T14:22:00.000Z');
    expect(r.text).toContain('The revised schedule is attached.');
    expect(r.attachments.map((a) => [a.name, a.contentType, a.inline])).toEqual([
      ['memo.pdf', 'application/pdf', false],
      ['notes.txt', 'text/plain', false],
    ]);
    // The attachment bytes survive base64 transfer encoding (RFC 2045 §6.8) unchanged.
    expect(r.attachments[0].content.equals(memo)).toBe(true);
    expect(r.attachments[1].content.toString()).toBe('Call the warehouse.');
    // Each child is itself extractable as its own document.
    const child = expectOk(await extractBytes(r.attachments[0].content, r.attachments[0].name));
    expect(child.text).toContain('Inventory shortfall');
  });

  it('e-mail with only an HTML body is converted to text', async () => {
    const raw = [
      'From: a@example.com',
      'To: b@example.com',
      'Subject: html only',
      'Date: Tue, 04 May 2021 10:00:00 +0200',
      'MIME-Version: 1.0',
      'Content-Type: text/html; charset=utf-8',
      '',
      '<html><body><p>Please <b>review</b> the draft.</p><script>steal()</script></body></html>',
      '',
    ].join('\r\n');
    const r = expectOk(await extractBytes(Buffer.from(raw), 'm.eml'));
    expect(r.sentAt).toBe('2021-05-04T08:00:00.000Z'); // zone offset applied (RFC 5322 §3.3)
    expect(r.text).toContain('Please review the draft.');
    expect(r.text).not.toContain('<');
  });

  it('HTML: text without markup, scripts or styles; title from <title>', async () => {
    const html = makeHtml({
      title: 'Press release: Q3 results',
      bodyParagraphs: ['Revenue rose in the third quarter.', 'Costs & margins held.'],
      includeScript: true,
    });
    const r = expectOk(await extractBytes(html, 'release.html'));
    expect(r).toMatchObject({ kind: 'html', title: 'Press release: Q3 results' });
    expect(r.text).toContain('Revenue rose in the third quarter.');
    expect(r.text).toContain('Costs & margins held.');
    expect(r.text).not.toContain('do-not-index-this-script-text');
    expect(r.text).not.toContain('font-family');
    expect(r.text).not.toMatch(/<\/?[a-z]/i);
  });

  it('plain text in ISO-8859-1 is decoded by detected charset', async () => {
    const text =
      'Réunion à Zürich: les pièces jointes sont arrivées. Señor Müller a confirmé. '.repeat(3);
    const r = expectOk(await extractBytes(makeText(text, { encoding: 'latin1' }), 'note.txt'));
    expect(r.kind).toBe('text');
    expect(r.text).toBe(text.trim());
    expect(r.charset).toMatch(/^(ISO-8859-1|windows-1252)$/);
  });

  it('plain text in UTF-16LE with BOM', async () => {
    const text = 'Delivery schedule — revised. Größe: 12 m³.';
    const r = expectOk(await extractBytes(makeText(text, { encoding: 'utf16le' }), 'schedule.txt'));
    expect(r).toMatchObject({ kind: 'text', text, charset: 'UTF-16LE' });
  });

  it('Markdown keeps its text and takes the first ATX heading (CommonMark §4.2) as title', async () => {
    const r = expectOk(
      await extractBytes(
        makeText('# Witness list\n\n- Dana Whitlock\n- Marcus Bell\n'),
        'witnesses.md',
      ),
    );
    expect(r).toMatchObject({ kind: 'markdown', mime: 'text/markdown', title: 'Witness list' });
    expect(r.text).toContain('Marcus Bell');
  });
});

describe('extractFile: hostile and broken inputs', () => {
  it('a truncated PDF is "not a valid PDF"', async () => {
    const pdf = await makePdf({ title: 'T', author: 'A', pages: ['some text here', 'and more'] });
    expect(await extractBytes(pdf.subarray(0, Math.floor(pdf.length / 3)), 'cut.pdf')).toEqual({
      ok: false,
      kind: 'pdf',
      mime: 'application/pdf',
      reason: 'not a valid PDF',
    });
  });

  it('a PDF header followed by garbage is "not a valid PDF"', async () => {
    const bytes = Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.alloc(2000, 0x41)]);
    expect(await extractBytes(bytes, 'junk.pdf')).toMatchObject({
      ok: false,
      reason: 'not a valid PDF',
    });
  });

  it('random bytes named .pdf are "not a valid PDF" (no %PDF- header, ISO 32000-1 §7.5.2); named .bin, "unsupported type"', async () => {
    const noise = Buffer.alloc(8192);
    let x = 987654321;
    for (let i = 0; i < noise.length; i += 1)
      noise[i] = (x = (x * 1103515245 + 12345) & 0x7fffffff) >> 16;
    expect(await extractBytes(noise, 'report.pdf')).toEqual({
      ok: false,
      kind: 'pdf',
      mime: 'application/pdf',
      reason: 'not a valid PDF',
    });
    expect(await extractBytes(noise, 'report.bin')).toEqual({
      ok: false,
      kind: 'unknown',
      mime: 'application/octet-stream',
      reason: 'unsupported type',
    });
  });

  it('a PNG named .pdf is what its bytes say: an image (for OCR); a broken one "file could not be read"', async () => {
    const png = Buffer.concat([
      Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex'),
      Buffer.alloc(200),
    ]);
    expect(await extractBytes(png, 'scan.pdf')).toMatchObject({
      ok: false,
      kind: 'image',
      reason: 'file could not be read',
    });
  });

  it('an encrypted PDF (standard security handler, ISO 32000-1 §7.6.3) is "encrypted PDF"', async () => {
    const pdf = await makePdf({
      title: 'Secret',
      author: 'A',
      pages: ['hidden words'],
      userPassword: 'open-sesame',
    });
    expect(await extractBytes(pdf, 'secret.pdf')).toMatchObject({
      ok: false,
      kind: 'pdf',
      reason: 'encrypted PDF',
    });
  });

  it('an image-only PDF goes to OCR; a blank scan is "OCR found no text"', async () => {
    expect(await extractBytes(await makeImageOnlyPdf(), 'scan.pdf')).toMatchObject({
      ok: false,
      kind: 'pdf',
      reason: 'OCR found no text',
    });
  });

  it('a DOCX that is not a zip (no PK signature, PKWARE APPNOTE §4.3.7) is "not a valid DOCX"', async () => {
    const noise = Buffer.alloc(4096);
    let x = 42;
    for (let i = 0; i < noise.length; i += 1)
      noise[i] = (x = (x * 1103515245 + 12345) & 0x7fffffff) >> 16;
    expect(await extractBytes(noise, 'contract.docx')).toEqual({
      ok: false,
      kind: 'docx',
      mime: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
      reason: 'not a valid DOCX',
    });
    // Readable text is indexed as text whatever it is called: the content decides.
    const text = await extractBytes(
      Buffer.from('This is not a Word file at all, just text.'),
      'notes.docx',
    );
    expect(text).toMatchObject({ ok: true, kind: 'text' });
    // A legacy Word 97-2003 (OLE2 compound file) renamed .docx is another format altogether.
    const ole2 = Buffer.concat([
      Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]),
      Buffer.alloc(512),
    ]);
    expect(await extractBytes(ole2, 'legacy.docx')).toMatchObject({
      ok: false,
      kind: 'unknown',
      reason: 'unsupported type',
    });
  });

  it('a DOCX whose zip is broken is "not a valid DOCX"', async () => {
    const docx = await makeDocx({ title: 'T', author: 'A', paragraphs: ['p'] });
    const broken = Buffer.from(docx.subarray(0, Math.floor(docx.length / 2)));
    expect(await extractBytes(broken, 'broken.docx')).toEqual({
      ok: false,
      kind: 'docx',
      mime: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
      reason: 'not a valid DOCX',
    });
  });

  it('a DOCX package whose document part is corrupt is "not a valid DOCX"', async () => {
    const zip = await makeZip([
      { name: '[Content_Types].xml', content: Buffer.from('<?xml version="1.0"?><Types/>') },
      { name: 'word/document.xml', content: Buffer.from('<w:document><<<not xml') },
    ]);
    expect(await extractBytes(zip, 'bad.docx')).toMatchObject({
      ok: false,
      kind: 'docx',
      reason: 'not a valid DOCX',
    });
  });

  it('a small DOCX that inflates far beyond the size limit (a zip bomb in OOXML clothing) is refused', async () => {
    const docx = await makeDocx({
      title: 'T',
      author: 'A',
      paragraphs: ['lorem '.repeat(400_000)],
    });
    expect(docx.length).toBeLessThan(100 * 1024);
    expect(await extractBytes(docx, 'bomb.docx', { maxFileBytes: 100 * 1024 })).toMatchObject({
      ok: false,
      kind: 'docx',
      reason: 'file exceeds the size limit',
    });
  });

  it('an empty file is "empty file"', async () => {
    expect(await extractBytes(Buffer.alloc(0), 'empty.txt')).toMatchObject({
      ok: false,
      reason: 'empty file',
    });
  });

  it('a file over the size limit is "file exceeds the size limit"', async () => {
    expect(
      await extractBytes(Buffer.alloc(2048, 0x61), 'big.txt', { maxFileBytes: 1024 }),
    ).toMatchObject({
      ok: false,
      kind: 'text',
      reason: 'file exceeds the size limit',
    });
  });

  it('a zip is not extracted but handed to expandArchive', async () => {
    const zip = await makeZip([{ name: 'a.txt', content: Buffer.from('a') }]);
    expect(await extractBytes(zip, 'folder.zip')).toMatchObject({
      ok: false,
      kind: 'zip',
      reason: 'archive must be expanded, not extracted',
    });
  });

  it('a GIF named .txt is "unsupported type" (OCR takes PNG, JPEG and TIFF only)', async () => {
    const gif = Buffer.concat([Buffer.from('GIF89a', 'latin1'), Buffer.alloc(100)]);
    expect(await extractBytes(gif, 'photo.txt')).toMatchObject({
      ok: false,
      kind: 'unknown',
      reason: 'unsupported type',
    });
  });

  it('an extraction that overruns its time budget is "extraction timed out"', async () => {
    const pdf = await makePdf({
      title: 'T',
      author: 'A',
      pages: Array.from({ length: 40 }, (_, i) => `Page ${i} text. `.repeat(200)),
    });
    expect(await extractBytes(pdf, 'slow.pdf', { timeoutMs: 1 })).toMatchObject({
      ok: false,
      kind: 'pdf',
      reason: 'extraction timed out',
    });
  });

  it('the worker that was stopped for a timeout is replaced: the next file extracts normally', async () => {
    const r = expectOk(await extractBytes(makeText('after the timeout'), 'next.txt'));
    expect(r.text).toBe('after the timeout');
  });

  it('a missing file resolves to a failure instead of throwing', async () => {
    expect(await extractFile(path.join(dir, 'does-not-exist.pdf'), 'x.pdf')).toMatchObject({
      ok: false,
      reason: 'file could not be read',
    });
  });
});
