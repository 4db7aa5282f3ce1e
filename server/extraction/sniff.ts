// Decides a file's type from its content (magic bytes and structure), using the extension
// only to break ties such as Markdown versus plain text or a borderline e-mail.
import { open } from 'node:fs/promises';
import path from 'node:path';
import iconv from 'iconv-lite';
import { detectTextCharset } from './charset';
import { looksLikeMbox } from './mbox';
import { listZipNames } from './zip-names';
import { MIME_OF, type FileKind, type SniffResult } from './types';

/** Bytes read from the start of a file to decide its type. */
export const SNIFF_HEAD_BYTES = 64 * 1024;

const result = (kind: FileKind, extra: Partial<SniffResult> = {}): SniffResult => ({
  kind,
  mime: MIME_OF[kind],
  ...extra,
});

const startsWith = (head: Buffer, bytes: number[], offset = 0) =>
  head.length >= offset + bytes.length && bytes.every((b, i) => head[offset + i] === b);

const OLE2_SIGNATURE = [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1];
const IMAGE_MIMES: [string, string][] = [
  ['PNG image', 'image/png'],
  ['JPEG image', 'image/jpeg'],
  ['TIFF image', 'image/tiff'],
];

// Signatures of common formats (some Quarry does not extract), so the log can say what they are.
const KNOWN_BINARIES: { detail: string; test: (head: Buffer) => boolean }[] = [
  {
    detail: 'PNG image',
    test: (h) => startsWith(h, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
  },
  {
    detail: 'GIF image',
    test: (h) =>
      h.subarray(0, 6).toString('latin1') === 'GIF87a' ||
      h.subarray(0, 6).toString('latin1') === 'GIF89a',
  },
  { detail: 'JPEG image', test: (h) => startsWith(h, [0xff, 0xd8, 0xff]) },
  {
    detail: 'TIFF image',
    test: (h) => startsWith(h, [0x49, 0x49, 0x2a, 0x00]) || startsWith(h, [0x4d, 0x4d, 0x00, 0x2a]),
  },
  {
    detail: 'BMP image',
    test: (h) => startsWith(h, [0x42, 0x4d]) && h.length > 14 && h.includes(0),
  },
  {
    detail: 'WebP image',
    test: (h) =>
      startsWith(h, [0x52, 0x49, 0x46, 0x46]) && h.subarray(8, 12).toString('latin1') === 'WEBP',
  },
  { detail: 'Windows executable', test: (h) => startsWith(h, [0x4d, 0x5a]) },
  { detail: 'ELF executable', test: (h) => startsWith(h, [0x7f, 0x45, 0x4c, 0x46]) },
  {
    detail: 'Mach-O executable',
    test: (h) =>
      [0xfeedface, 0xfeedfacf, 0xcefaedfe, 0xcffaedfe].includes(
        h.length >= 4 ? h.readUInt32BE(0) : 0,
      ),
  },
  { detail: 'gzip archive', test: (h) => startsWith(h, [0x1f, 0x8b]) },
  { detail: '7-Zip archive', test: (h) => startsWith(h, [0x37, 0x7a, 0xbc, 0xaf, 0x27, 0x1c]) },
  { detail: 'RAR archive', test: (h) => h.subarray(0, 4).toString('latin1') === 'Rar!' },
  {
    detail: 'legacy Office (OLE2) file',
    test: (h) => startsWith(h, [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]),
  },
  { detail: 'RTF document', test: (h) => h.subarray(0, 5).toString('latin1') === '{\\rtf' },
];

// RFC 5322 §3.6 fields that mark a message header block (MIME-Version is RFC 2045 §4).
const STRONG_MAIL_FIELDS = new Set(['from', 'date', 'subject', 'message-id', 'mime-version']);
// RFC 5322 §2.2: field-name is printable US-ASCII except colon.
const FIELD_LINE = /^([\x21-\x39\x3b-\x7e]+):/;

/** True when the text opens with an RFC 5322 header block followed by a blank line. */
export function looksLikeEmail(text: string, extension: string): boolean {
  const lines = text.split(/\r?\n/);
  let strong = 0;
  let fields = 0;
  let ended = false;
  for (let i = 0; i < lines.length && i < 500; i += 1) {
    const line = lines[i];
    if (line === '') {
      ended = true;
      break;
    }
    if (/^[ \t]/.test(line)) {
      if (i === 0) return false; // folded continuation (RFC 5322 §2.2.3) cannot come first
      continue;
    }
    // mbox separator line that some mail clients keep at the top of a saved message.
    if (i === 0 && line.startsWith('From ')) continue;
    const match = FIELD_LINE.exec(line);
    if (!match) return false;
    fields += 1;
    const name = match[1].toLowerCase();
    if (STRONG_MAIL_FIELDS.has(name)) strong += 1;
  }
  if (!ended && lines.length > 1) return false;
  if (fields === 0) return false;
  return strong >= 2 || (extension === '.eml' && strong >= 1);
}

/** True when an HTML document marker appears near the start (WHATWG HTML §13.1). */
export function looksLikeHtml(text: string): boolean {
  const start = text
    .slice(0, 2048)
    .replace(/^\uFEFF/, '')
    .toLowerCase();
  return (
    /^\s*(<!--[\s\S]*?-->\s*)*<!doctype html[\s>]/.test(start) ||
    /<(html|head|body)[\s>]/.test(start)
  );
}

/** Classifies bytes already read (`head` = the first SNIFF_HEAD_BYTES, `truncated` if more follow). */
export function sniffHead(
  head: Buffer,
  originalName: string,
  truncated: boolean,
  zipNames: string[] | null,
): SniffResult {
  const extension = path.extname(originalName).toLowerCase();
  if (head.length === 0) return result('unknown', { detail: 'empty file' });

  // ISO 32000-1 §7.5.2: the header is "%PDF-" and a version; readers accept it within the
  // first 1024 bytes (common practice, after junk some scanners prepend).
  if (head.subarray(0, 1024).includes('%PDF-')) return result('pdf');

  // PKWARE APPNOTE.TXT §4.3.7 local file header signature, or §4.3.16 end record (empty zip).
  if (startsWith(head, [0x50, 0x4b, 0x03, 0x04]) || startsWith(head, [0x50, 0x4b, 0x05, 0x06])) {
    const names = zipNames ?? [];
    // ECMA-376 Part 2 §10.1.2.2 ([Content_Types].xml) and Part 1 §11.3.10 (the main document part).
    if (names.includes('[Content_Types].xml') && names.includes('word/document.xml'))
      return result('docx');
    // ECMA-376 Part 1 §12.3.23 (the workbook part) and §13.3.6 (the presentation part).
    if (names.includes('[Content_Types].xml') && names.includes('xl/workbook.xml'))
      return result('xlsx');
    if (names.includes('[Content_Types].xml') && names.includes('ppt/presentation.xml'))
      return result('pptx');
    if (zipNames === null && extension === '.docx') return result('docx'); // broken package: extract reports it
    // Other OOXML packages (spreadsheets, slides) and OpenDocument files (ISO/IEC 26300 §3.3,
    // the "mimetype" entry) are documents, not folders to unpack.
    if (names.includes('[Content_Types].xml'))
      return result('unknown', { detail: 'Office Open XML file other than a Word document' });
    if (names[0] === 'mimetype') return result('unknown', { detail: 'OpenDocument file' });
    return result('zip');
  }

  // MS-PST §2.2.2.6: dwMagic "!BDN".
  if (head.subarray(0, 4).toString('latin1') === '!BDN') return result('pst');
  // An Outlook message is an OLE2 compound file (MS-CFB §2.2) whose directory names the
  // MAPI property streams "__substg1.0_..." (MS-OXMSG §2.1), in UTF-16LE.
  if (
    startsWith(head, OLE2_SIGNATURE) &&
    (extension === '.msg' || head.includes(Buffer.from('__substg1.0_', 'utf16le')))
  )
    return result('msg');
  // Images go to OCR: PNG (ISO/IEC 15948 §5.2), JPEG SOI (ITU T.81 Annex B), TIFF (TIFF 6.0 §2).
  for (const [detail, mime] of IMAGE_MIMES) {
    if (KNOWN_BINARIES.find((b) => b.detail === detail)?.test(head))
      return result('image', { mime, detail });
  }

  const binary = KNOWN_BINARIES.find((b) => b.test(head));
  if (binary) return result('unknown', { detail: binary.detail });

  const charset = detectTextCharset(head, truncated);
  if (!charset) {
    if (extension === '.pdf') return result('pdf', { fromExtensionOnly: true });
    if (extension === '.docx') return result('docx', { fromExtensionOnly: true });
    return result('unknown', { detail: 'binary data' });
  }
  const text = iconv.decode(head, charset, { stripBOM: true });

  // RFC 4155: a mailbox opens with a "From " separator line; a single saved message named
  // .eml that keeps one is still an e-mail.
  if (looksLikeMbox(text) && extension !== '.eml') return result('mbox', { charset });
  if (looksLikeEmail(text, extension)) return result('email', { charset });
  if (looksLikeHtml(text)) return result('html', { charset });
  if (extension === '.md' || extension === '.markdown') return result('markdown', { charset });
  if (extension === '.csv') return result('csv', { charset });
  return result('text', { charset });
}

/** Reads the head of a file (and a zip's directory) and decides its type. */
export async function sniffFile(filePath: string, originalName: string): Promise<SniffResult> {
  const handle = await open(filePath, 'r');
  let head: Buffer;
  let size: number;
  try {
    size = (await handle.stat()).size;
    const buffer = Buffer.alloc(Math.min(size, SNIFF_HEAD_BYTES));
    const { bytesRead } = await handle.read(buffer, 0, buffer.length, 0);
    head = buffer.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
  const isZip =
    startsWith(head, [0x50, 0x4b, 0x03, 0x04]) || startsWith(head, [0x50, 0x4b, 0x05, 0x06]);
  const zipNames =
    isZip && !head.subarray(0, 1024).includes('%PDF-') ? await listZipNames(filePath) : null;
  return sniffHead(head, originalName, size > head.length, zipNames);
}
