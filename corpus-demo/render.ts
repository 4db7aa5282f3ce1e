// Small, deterministic file makers for the demo corpus and for tests that need real
// documents (PDF, DOCX, RFC 5322 e-mail, HTML, plain text, ZIP). Every maker fixes the
// timestamps and identifiers its library would otherwise take from the clock or a random
// source, so the same input always yields the same bytes.
import { createHash } from 'node:crypto';
import PDFDocument from 'pdfkit';
import { Document, HeadingLevel, Packer, Paragraph, TextRun } from 'docx';
import MailComposer from 'nodemailer/lib/mail-composer';
import yazl from 'yazl';
import yauzl from 'yauzl';

/** The instant every maker uses when the caller gives no date (2021-01-04, a Monday). */
export const DEFAULT_DOCUMENT_DATE = new Date('2021-01-04T09:00:00Z');

/** One e-mail attachment: its file name, MIME type (RFC 2045) and bytes. */
export interface Attachment {
  filename: string;
  contentType: string;
  content: Buffer;
}

/** Input for makePdf: document info, one string per page, and an optional user password. */
export interface PdfInput {
  title: string;
  author: string;
  pages: string[];
  createdAt?: Date;
  userPassword?: string;
}

/** Input for makeDocx: core properties (title, creator) and the body paragraphs. */
export interface DocxInput {
  title: string;
  author: string;
  paragraphs: string[];
  createdAt?: Date;
}

/** Input for makeEml: RFC 5322 header fields, a plain-text body and optional attachments. */
export interface EmlInput {
  from: string;
  to: string[];
  cc?: string[];
  subject: string;
  date: Date;
  messageId?: string;
  inReplyTo?: string;
  text: string;
  attachments?: Attachment[];
}

/** Input for makeHtml: page title, body paragraphs, and whether to add an inline script. */
export interface HtmlInput {
  title: string;
  bodyParagraphs: string[];
  includeScript?: boolean;
}

/** Text encodings makeText can write. */
export type TextEncoding = 'utf8' | 'latin1' | 'utf16le';

/** One ZIP entry: its path inside the archive and its bytes. */
export interface ZipEntry {
  name: string;
  content: Buffer;
}

const sha256Hex = (data: string | Buffer): string =>
  createHash('sha256').update(data).digest('hex');

/** Collects a pdfkit document's output stream into one Buffer once end() is called. */
function collectPdf(doc: PDFKit.PDFDocument): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}

/** A text PDF, one page per entry of `pages`, with fixed info dates; `userPassword` encrypts it. */
export async function makePdf(input: PdfInput): Promise<Buffer> {
  if (input.pages.length === 0) throw new Error('makePdf needs at least one page of text');
  const when = input.createdAt ?? DEFAULT_DOCUMENT_DATE;
  const doc = new PDFDocument({
    autoFirstPage: false,
    size: 'A4',
    margin: 64,
    // The file ID is an MD5 of the info dictionary, so fixed dates give a fixed ID; the
    // default PDF 1.3 security handler (RC4, PDF 32000-1:2008 §7.6.3) derives its key from
    // that ID and the passwords only, so encrypted output is deterministic too.
    info: {
      Title: input.title,
      Author: input.author,
      Producer: 'Quarry demo corpus',
      Creator: 'Quarry demo corpus',
      CreationDate: when,
      ModDate: when,
    },
    ...(input.userPassword
      ? {
          userPassword: input.userPassword,
          ownerPassword: `${input.userPassword}-owner`,
          permissions: { printing: 'lowResolution' as const, copying: false },
        }
      : {}),
  });
  input.pages.forEach((pageText, index) => {
    doc.addPage();
    if (index === 0) {
      doc.font('Helvetica-Bold').fontSize(15).text(input.title, { paragraphGap: 12 });
    }
    doc.font('Helvetica').fontSize(11);
    for (const paragraph of pageText.split(/\n{2,}/)) {
      doc.text(paragraph.trim(), { align: 'left', paragraphGap: 8, lineGap: 2 });
    }
  });
  return collectPdf(doc);
}

/** A one-page PDF holding only drawn shapes and no text layer: a stand-in for a scanned page. */
export async function makeImageOnlyPdf(createdAt: Date = DEFAULT_DOCUMENT_DATE): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margin: 0,
    info: { Producer: 'Quarry demo corpus', CreationDate: createdAt, ModDate: createdAt },
  });
  // A grey "paper" with dark bars where typed lines would be, like a faint scan.
  doc.rect(0, 0, doc.page.width, doc.page.height).fill('#eeeae2');
  for (let line = 0; line < 28; line += 1) {
    const width = 380 - ((line * 37) % 140);
    doc.rect(72, 90 + line * 24, width, 9).fill('#3a3a3a');
  }
  doc.circle(470, 740, 34).lineWidth(3).stroke('#7a1f1f');
  return collectPdf(doc);
}

/** Reads every entry of a ZIP held in memory, in archive order. */
function readZip(data: Buffer): Promise<ZipEntry[]> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(data, { lazyEntries: true }, (openError, zip) => {
      if (openError || !zip) return reject(openError ?? new Error('could not open zip'));
      const entries: ZipEntry[] = [];
      zip.on('entry', (entry: yauzl.Entry) => {
        if (entry.fileName.endsWith('/')) return zip.readEntry();
        zip.openReadStream(entry, (streamError, stream) => {
          if (streamError || !stream)
            return reject(streamError ?? new Error('could not read zip entry'));
          const chunks: Buffer[] = [];
          stream.on('data', (chunk: Buffer) => chunks.push(chunk));
          stream.on('end', () => {
            entries.push({ name: entry.fileName, content: Buffer.concat(chunks) });
            zip.readEntry();
          });
          stream.on('error', reject);
        });
      });
      zip.on('end', () => resolve(entries));
      zip.on('error', reject);
      zip.readEntry();
    });
  });
}

/** A Word (OOXML) document with core properties title/creator and one paragraph per entry. */
export async function makeDocx(input: DocxInput): Promise<Buffer> {
  const when = input.createdAt ?? DEFAULT_DOCUMENT_DATE;
  const doc = new Document({
    title: input.title,
    creator: input.author,
    lastModifiedBy: input.author,
    revision: 1,
    sections: [
      {
        children: [
          new Paragraph({ heading: HeadingLevel.HEADING_1, children: [new TextRun(input.title)] }),
          ...input.paragraphs.map(
            (text) => new Paragraph({ children: [new TextRun(text)], spacing: { after: 160 } }),
          ),
        ],
      },
    ],
  });
  const packed = await Packer.toBuffer(doc);
  // docx stamps core.xml and the zip entries with the current time; rewrite both with `when`.
  const stamp = when.toISOString().replace(/\.\d{3}Z$/, 'Z');
  const entries = (await readZip(packed)).map((entry) =>
    entry.name === 'docProps/core.xml'
      ? {
          name: entry.name,
          content: Buffer.from(
            entry.content
              .toString('utf8')
              .replace(
                /(<dcterms:(created|modified)[^>]*>)[^<]*(<\/dcterms:\2>)/g,
                (_match, open: string, _tag: string, close: string) => `${open}${stamp}${close}`,
              ),
            'utf8',
          ),
        }
      : entry,
  );
  return makeZip(entries, when);
}

/** An RFC 5322 message (MIME multipart/mixed per RFC 2046 when attachments are given). */
export async function makeEml(input: EmlInput): Promise<Buffer> {
  const messageId =
    input.messageId ??
    `<${sha256Hex(`${input.from}|${input.subject}|${input.date.toISOString()}`).slice(0, 24)}@quarry.example>`;
  const composer = new MailComposer({
    from: input.from,
    to: input.to,
    cc: input.cc && input.cc.length > 0 ? input.cc : undefined,
    subject: input.subject,
    date: input.date,
    messageId,
    inReplyTo: input.inReplyTo,
    references: input.inReplyTo,
    text: input.text,
    newline: 'win',
    boundaryPrefix: '----quarry',
    baseBoundary: sha256Hex(messageId).slice(0, 16),
    attachments: (input.attachments ?? []).map((attachment) => ({
      filename: attachment.filename,
      contentType: attachment.contentType,
      content: attachment.content,
    })),
  });
  return composer.compile().build();
}

const escapeHtml = (text: string): string =>
  text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** A small HTML5 page; `includeScript` adds an inline script and style whose text is not content. */
export function makeHtml(input: HtmlInput): Buffer {
  const script = input.includeScript
    ? '  <style>body{font-family:Georgia,serif;max-width:44em;margin:2em auto}</style>\n' +
      '  <script>window.trackingPixel = "do-not-index-this-script-text";</script>\n'
    : '';
  const body = input.bodyParagraphs.map((text) => `    <p>${escapeHtml(text)}</p>`).join('\n');
  const html =
    '<!DOCTYPE html>\n<html lang="en">\n<head>\n  <meta charset="utf-8">\n' +
    `  <title>${escapeHtml(input.title)}</title>\n${script}</head>\n<body>\n  <main>\n` +
    `    <h1>${escapeHtml(input.title)}</h1>\n${body}\n  </main>\n</body>\n</html>\n`;
  return Buffer.from(html, 'utf8');
}

/** Plain text in UTF-8 (default), ISO-8859-1, or UTF-16LE with a byte-order mark. */
export function makeText(text: string, options: { encoding?: TextEncoding } = {}): Buffer {
  const encoding = options.encoding ?? 'utf8';
  if (encoding === 'utf16le')
    return Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
  if (encoding === 'latin1' && [...text].some((char) => char.charCodeAt(0) > 0xff)) {
    throw new Error(
      'makeText: text has characters outside ISO-8859-1 and cannot be written as latin1',
    );
  }
  return Buffer.from(text, encoding);
}

/** A ZIP archive of the given entries, every entry stamped with the same fixed mtime. */
export function makeZip(entries: ZipEntry[], mtime: Date = DEFAULT_DOCUMENT_DATE): Promise<Buffer> {
  // DOS timestamps (APPNOTE.TXT §4.4.6) are local wall-clock time and yazl converts with the
  // local time zone, so pass a Date whose local fields equal the UTC fields of `mtime`: the
  // bytes then do not depend on the machine's TZ.
  const wallClock = new Date(
    mtime.getUTCFullYear(),
    mtime.getUTCMonth(),
    mtime.getUTCDate(),
    mtime.getUTCHours(),
    mtime.getUTCMinutes(),
    mtime.getUTCSeconds(),
  );
  return new Promise((resolve, reject) => {
    const zip = new yazl.ZipFile();
    for (const entry of entries) {
      zip.addBuffer(entry.content, entry.name, {
        mtime: wallClock,
        mode: 0o100644,
        compress: true,
        forceDosTimestamp: true,
      });
    }
    const chunks: Buffer[] = [];
    zip.outputStream.on('data', (chunk: Buffer) => chunks.push(chunk));
    zip.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
    zip.outputStream.on('error', reject);
    zip.end();
  });
}
