// Mail containers, office files and scans: MBOX (RFC 4155), Outlook PST (the Enron sample
// pst-extractor ships), XLSX/CSV/PPTX written in the test by their own writers, OCR of a
// sentence rendered inside the test, and encrypted PDFs opened from a password list.
//
// Outlook .msg: no writer for compound files (MS-CFB) is installed and no .msg file with a
// known licence ships in node_modules, so no real .msg is read here; the refusal of a
// compound file that is not a message is checked instead. PST: enron.pst is from the EDRM
// Enron e-mail data set (CC BY 3.0 US, attribution ZL Technologies), as its own text says.
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import ExcelJS from 'exceljs';
import PDFDocument from 'pdfkit';
import yazl from 'yazl';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makePdf } from '../../corpus-demo/render';
import { expandContainer } from './containers';
import { closeExtractionPool, extractFile, extractFileInProcess, extractionPool } from './extract';
import { splitMbox } from './mbox';
import { sniffFile } from './sniff';
import { ARCHIVE_DEFAULTS, type ExtractResult, type ExtractSuccess } from './types';

const run = promisify(execFile);
let dir: string;
let counter = 0;

beforeAll(async () => {
  dir = await mkdtemp(path.join(tmpdir(), 'quarry-formats-'));
  await extractionPool().warm();
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
  await closeExtractionPool();
});

async function save(bytes: Buffer, name: string): Promise<string> {
  counter += 1;
  const file = path.join(dir, `${counter}-${name}`);
  await writeFile(file, bytes);
  return file;
}

function ok(result: ExtractResult): ExtractSuccess {
  if (!result.ok) throw new Error(`expected success, got ${result.reason}`);
  return result;
}

const words = (text: string) => text.toLowerCase().match(/[a-z0-9]+/g) ?? [];

describe('MBOX (RFC 4155)', () => {
  const message = (n: number, body: string) =>
    `From sender${n}@example.com Thu Jan  6 10:0${n}:00 2022\n` +
    `From: Sender ${n} <sender${n}@example.com>\nTo: b@example.com\nSubject: Message ${n}\n` +
    `Date: Thu, 06 Jan 2022 10:0${n}:00 +0000\nMessage-ID: <m${n}@example.com>\n\n${body}\n`;

  it('splits on "From " lines that open a message, and unescapes ">From " (RFC 4155 Appendix A; mboxrd)', () => {
    const mbox =
      message(1, 'First body.\n>From the escaped line\n>>From a doubly escaped line') +
      '\n' +
      message(2, 'Second body.\nFrom here on, a body line that follows no blank line.') +
      '\n' +
      message(3, 'Third body.');
    const parts = splitMbox(Buffer.from(mbox, 'latin1'));
    expect(parts.map((p) => p.envelope)).toEqual([
      'sender1@example.com Thu Jan  6 10:01:00 2022',
      'sender2@example.com Thu Jan  6 10:02:00 2022',
      'sender3@example.com Thu Jan  6 10:03:00 2022',
    ]);
    const first = parts[0].content.toString('latin1');
    expect(first.startsWith('From: Sender 1')).toBe(true); // the separator line is not a header
    expect(first).toContain('\nFrom the escaped line\n');
    expect(first).toContain('\n>From a doubly escaped line');
    expect(parts[1].content.toString('latin1')).toContain('From here on, a body line');
  });

  it('keeps CRLF messages and bytes in other charsets intact, and ignores text before the first separator', () => {
    const latin1 = Buffer.from('Caf\xe9 cr\xe8me', 'latin1');
    const mbox = Buffer.concat([
      Buffer.from('stray preamble\r\n\r\n', 'latin1'),
      Buffer.from(message(1, 'A').replace(/\n/g, '\r\n'), 'latin1'),
      Buffer.from('\r\n', 'latin1'),
      Buffer.from(
        message(2, '').replace('Subject', 'Content-Type: text/plain; charset=ISO-8859-1\nSubject'),
        'latin1',
      ),
      latin1,
      Buffer.from('\n', 'latin1'),
    ]);
    const parts = splitMbox(mbox);
    expect(parts).toHaveLength(2);
    expect(parts[0].content.toString('latin1')).toContain('Subject: Message 1\r\n');
    expect(parts[1].content.includes(latin1)).toBe(true);
  });

  it('a two-message mailbox is sniffed as a mailbox and becomes two e-mails with their own headers', async () => {
    const file = await save(Buffer.from(message(1, 'One.') + '\n' + message(2, 'Two.')), 'box');
    expect((await sniffFile(file, 'box')).kind).toBe('mbox');
    const target = path.join(dir, 'mbox-out');
    const expanded = await expandContainer('mbox', file, target, ARCHIVE_DEFAULTS);
    if (!expanded.ok) throw new Error(expanded.reason);
    expect(expanded.files.map((f) => f.relativePath)).toEqual([
      'message-00001.eml',
      'message-00002.eml',
    ]);
    const second = ok(await extractFile(expanded.files[1].absolutePath, 'message-00002.eml'));
    expect(second).toMatchObject({ kind: 'email', title: 'Message 2', text: 'Two.' });
    expect(second.email).toMatchObject({
      from: 'Sender 2 <sender2@example.com>',
      messageId: '<m2@example.com>',
    });
  });
});

describe('Outlook PST (MS-PST, pst-extractor)', () => {
  const require = createRequire(import.meta.url);
  const pstDir = path.join(
    path.dirname(require.resolve('pst-extractor/package.json')),
    'example',
    'testdata',
  );

  it("the Enron sample's 71 e-mails come out under their folder paths, as the package's own listing shows", async () => {
    // output.txt is pst-extractor's own run over enron.pst: its folder tree and one line per e-mail.
    const listing = (await readFile(path.join(pstDir, 'output.txt'), 'utf8')).split('\n');
    const end = listing.findIndex((l) => l.includes('enron.pst processed'));
    const expected = new Map<string, string[]>();
    const stack: string[] = [];
    for (const line of listing.slice(0, end)) {
      const at = line.indexOf('|- ');
      if (at < 0) continue;
      const depth = (line.slice(0, at + 1).match(/\|/g) ?? []).length - 1;
      const item = line.slice(at + 3).trim();
      const sender = /^Sender: .*, Subject:(.*)$/.exec(item);
      if (sender) {
        const folder = stack.slice(0, depth).join('/');
        expected.set(folder, [...(expected.get(folder) ?? []), sender[1].trim()]);
      } else {
        stack.length = depth;
        stack[depth] = item;
      }
    }
    const target = path.join(dir, 'pst-out');
    const expanded = await expandContainer(
      'pst',
      path.join(pstDir, 'enron.pst'),
      target,
      ARCHIVE_DEFAULTS,
    );
    if (!expanded.ok) throw new Error(expanded.reason);
    expect(expanded.files).toHaveLength(71);
    expect([...expected.values()].flat()).toHaveLength(71);
    const byFolder = new Map<string, number>();
    for (const f of expanded.files) {
      const folder = path.posix.dirname(f.relativePath);
      byFolder.set(folder, (byFolder.get(folder) ?? 0) + 1);
    }
    for (const [folder, subjects] of expected) {
      expect(byFolder.get(folder), folder).toBe(subjects.length);
    }
    // One message read back as an e-mail: subject, sender and the folder kept in X-Folder.
    const inbox = expanded.files.find((f) => f.relativePath.includes('TW-Commercial Group'))!;
    const mail = ok(await extractFile(inbox.absolutePath, 'message.eml'));
    expect(
      expected.get('Top of Personal Folders/lokay-m/MLOKAY (Non-Privileged)/TW-Commercial Group'),
    ).toContain(mail.title);
    expect(mail.kind).toBe('email');
  });

  it('a file with the PST signature but no valid structure is "not a valid Outlook data file"', async () => {
    const file = await save(
      Buffer.concat([Buffer.from('!BDN', 'latin1'), Buffer.alloc(600)]),
      'x.pst',
    );
    expect((await sniffFile(file, 'x.pst')).kind).toBe('pst');
    expect(await expandContainer('pst', file, path.join(dir, 'bad-pst'))).toMatchObject({
      ok: false,
      reason: 'not a valid Outlook data file',
    });
  });

  it('an OLE2 compound file named .msg that is no message is "not a valid Outlook message"', async () => {
    const ole2 = Buffer.concat([
      Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]),
      Buffer.alloc(1024),
    ]);
    expect(await extractFile(await save(ole2, 'note.msg'), 'note.msg')).toMatchObject({
      ok: false,
      kind: 'msg',
      reason: 'not a valid Outlook message',
    });
  });
});

describe('office files', () => {
  it('XLSX written by exceljs: every sheet by name, cell text, core properties (ECMA-376 Part 2 §11)', async () => {
    const workbook = new ExcelJS.Workbook();
    workbook.creator = 'Mara Quill';
    workbook.lastModifiedBy = 'Tobin Reyes';
    workbook.created = new Date('2021-02-03T04:05:06Z');
    workbook.modified = new Date('2021-03-04T05:06:07Z');
    workbook.title = 'Flour deliveries';
    const first = workbook.addWorksheet('Deliveries');
    first.addRow(['Date', 'Tonnes', 'Mill']);
    first.addRow([new Date('2021-01-05T00:00:00Z'), 12.5, 'Eastgate']);
    first.getCell('D2').value = { formula: 'B2*2', result: 25 };
    const second = workbook.addWorksheet('Notes');
    second.getCell('A1').value = 'Late delivery penalty applies';
    const file = await save(Buffer.from(await workbook.xlsx.writeBuffer()), 'deliveries.xlsx');
    const result = ok(await extractFile(file, 'deliveries.xlsx'));
    expect(result.kind).toBe('xlsx');
    expect(result.text).toMatch(
      /^Sheet: Deliveries\nDate\tTonnes\tMill\n.*\t12\.5\tEastgate\t25\n\nSheet: Notes\nLate delivery penalty applies$/,
    );
    expect(result).toMatchObject({
      title: 'Flour deliveries',
      author: 'Mara Quill',
      lastAuthor: 'Tobin Reyes',
      createdAt: '2021-02-03T04:05:06.000Z',
      modifiedAt: '2021-03-04T05:06:07.000Z',
      pageCount: 2,
    });
  });

  it('CSV (RFC 4180): quoted fields with commas and line breaks, one row per line', async () => {
    const csv = 'name,comment\r\n"Quill, Mara","said ""no""\r\nthen left"\r\nReyes,ok\r\n';
    const result = ok(await extractFile(await save(Buffer.from(csv), 'log.csv'), 'log.csv'));
    expect(result.kind).toBe('csv');
    expect(result.text).toBe('name\tcomment\nQuill, Mara\tsaid "no" then left\nReyes\tok');
  });

  it('PPTX written as an OOXML zip with yazl: slide text in slide-list order, speaker notes', async () => {
    // No PPTX writer package is installed; the parts follow ECMA-376 Part 1 §13 (PresentationML).
    const ns =
      'xmlns:a="http://schemas.openxmlformats.org/drawingml/2006/main" xmlns:p="http://schemas.openxmlformats.org/presentationml/2006/main" xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"';
    const rel = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
    const slide = (lines: string[]) =>
      `<?xml version="1.0" encoding="UTF-8"?><p:sld ${ns}><p:cSld><p:spTree><p:sp><p:txBody>${lines
        .map((l) => `<a:p><a:r><a:t>${l}</a:t></a:r></a:p>`)
        .join('')}</p:txBody></p:sp></p:spTree></p:cSld></p:sld>`;
    const parts: [string, string][] = [
      [
        '[Content_Types].xml',
        '<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="xml" ContentType="application/xml"/><Override PartName="/ppt/presentation.xml" ContentType="application/vnd.openxmlformats-officedocument.presentationml.presentation.main+xml"/></Types>',
      ],
      [
        'ppt/presentation.xml',
        `<?xml version="1.0" encoding="UTF-8"?><p:presentation ${ns}><p:sldIdLst><p:sldId id="256" r:id="rId2"/><p:sldId id="257" r:id="rId1"/></p:sldIdLst></p:presentation>`,
      ],
      [
        'ppt/_rels/presentation.xml.rels',
        `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="${rel}/slide" Target="slides/slide1.xml"/><Relationship Id="rId2" Type="${rel}/slide" Target="slides/slide2.xml"/></Relationships>`,
      ],
      // slide2.xml is shown first: the slide list, not the file name, decides the order.
      ['ppt/slides/slide2.xml', slide(['Quarterly review', 'Flour &amp; grain prices'])],
      ['ppt/slides/slide1.xml', slide(['Next steps'])],
      [
        'ppt/slides/_rels/slide1.xml.rels',
        `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="${rel}/notesSlide" Target="../notesSlides/notesSlide1.xml"/></Relationships>`,
      ],
      [
        'ppt/notesSlides/notesSlide1.xml',
        `<?xml version="1.0" encoding="UTF-8"?><p:notes ${ns}><p:cSld><p:spTree><p:sp><p:txBody><a:p><a:r><a:t>Mention the penalty clause</a:t></a:r></a:p></p:txBody></p:sp></p:spTree></p:cSld></p:notes>`,
      ],
      [
        'docProps/core.xml',
        '<?xml version="1.0" encoding="UTF-8"?><cp:coreProperties xmlns:cp="http://schemas.openxmlformats.org/package/2006/metadata/core-properties" xmlns:dc="http://purl.org/dc/elements/1.1/" xmlns:dcterms="http://purl.org/dc/terms/"><dc:title>Review deck</dc:title><dc:creator>Mara Quill</dc:creator><cp:lastModifiedBy>Tobin Reyes</cp:lastModifiedBy><dcterms:modified>2022-05-06T07:08:09Z</dcterms:modified></cp:coreProperties>',
      ],
    ];
    const zip = new yazl.ZipFile();
    for (const [name, xml] of parts) zip.addBuffer(Buffer.from(xml), name);
    zip.end();
    const chunks: Buffer[] = [];
    for await (const chunk of zip.outputStream) chunks.push(chunk as Buffer);
    const result = ok(
      await extractFile(await save(Buffer.concat(chunks), 'deck.pptx'), 'deck.pptx'),
    );
    expect(result.kind).toBe('pptx');
    expect(result.text).toBe(
      'Slide 1\nQuarterly review\nFlour & grain prices\n\nSlide 2\nNext steps\nNotes:\nMention the penalty clause',
    );
    expect(result).toMatchObject({
      title: 'Review deck',
      author: 'Mara Quill',
      lastAuthor: 'Tobin Reyes',
      modifiedAt: '2022-05-06T07:08:09.000Z',
      pageCount: 2,
    });
  });
});

describe('OCR (tesseract, pages rendered by pdftoppm) and encrypted PDFs', () => {
  const sentence =
    'The miller agreed to deliver forty tonnes of wholemeal flour to the bakery every Tuesday before noon';

  async function renderedPng(): Promise<string> {
    // The sentence set in Helvetica by pdfkit, rendered to a 300 dpi PNG by pdftoppm.
    const doc = new PDFDocument({ size: 'A4', margin: 72 });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    const done = new Promise((resolve) => doc.on('end', resolve));
    doc.font('Helvetica').fontSize(16).text(sentence);
    doc.end();
    await done;
    const pdf = await save(Buffer.concat(chunks), 'sentence.pdf');
    const prefix = path.join(dir, 'sentence');
    await run('pdftoppm', ['-r', '300', '-png', '-singlefile', pdf, prefix]);
    return `${prefix}.png`;
  }

  const recall = (text: string) => {
    const found = new Set(words(text));
    const expected = words(sentence);
    return expected.filter((w) => found.has(w)).length / expected.length;
  };

  it('a PNG of a rendered sentence comes back with at least 95% of its words, flagged as OCR', async () => {
    const png = await renderedPng();
    const result = ok(await extractFile(png, 'scan.png'));
    expect(result).toMatchObject({ kind: 'image', ocr: true });
    expect(recall(result.text)).toBeGreaterThanOrEqual(0.95);
  });

  it('a PDF holding only that image (no text layer) is read by OCR in the worker', async () => {
    const png = await readFile(await renderedPng());
    const doc = new PDFDocument({ size: 'A4', margin: 0 });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    const done = new Promise((resolve) => doc.on('end', resolve));
    doc.image(png, 0, 0, { width: doc.page.width });
    doc.end();
    await done;
    const result = ok(await extractFile(await save(Buffer.concat(chunks), 'scan.pdf'), 'scan.pdf'));
    expect(result).toMatchObject({ kind: 'pdf', ocr: true, pageCount: 1 });
    expect(recall(result.text)).toBeGreaterThanOrEqual(0.95);
  });

  it('an encrypted PDF opens with a password from the list (ISO 32000-1 §7.6.3); without it, "encrypted PDF"', async () => {
    const pdf = await makePdf({
      title: 'Sealed',
      author: 'A',
      pages: ['the hidden settlement figure'],
      userPassword: 'open-sesame',
    });
    const file = await save(pdf, 'sealed.pdf');
    expect(await extractFileInProcess(file, 'sealed.pdf', { passwords: ['wrong'] })).toMatchObject({
      ok: false,
      reason: 'encrypted PDF',
    });
    const opened = ok(
      await extractFile(file, 'sealed.pdf', { passwords: ['wrong', 'open-sesame'] }),
    );
    expect(opened.text).toContain('the hidden settlement figure');
  });

  it('an OCR page over its time limit fails the file with "OCR timed out on a page"', async () => {
    const png = await renderedPng();
    expect(await extractFile(png, 'slow.png', { ocrPageTimeoutMs: 1 })).toMatchObject({
      ok: false,
      reason: 'OCR timed out on a page',
    });
  });
});
