// From a file on disk to extracted text and metadata, in the calling thread. Pure: no
// Express, no database. Never throws for bad input: every library error is mapped to a
// reason a paralegal reads. extract.ts runs this in a worker thread with a hard time limit.
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { AddressObject, ParsedMail } from 'mailparser';
import { decodeText } from './charset';
import { fail, precheckFile } from './precheck';
import { inflatesWithin, listZipNames, readZipEntry } from './zip-names';
import {
  EXTRACT_DEFAULTS,
  type ChildFile,
  type ExtractLimits,
  type ExtractResult,
  type ExtractSuccess,
  type FailureReason,
  type SniffResult,
} from './types';

type Fields = Omit<ExtractSuccess, 'ok' | 'kind' | 'mime' | 'charset'> & {
  charset?: string | null;
};

class Refused extends Error {
  constructor(readonly reason: FailureReason) {
    super(reason);
  }
}

const blank = (): Fields => ({
  title: null,
  author: null,
  recipients: null,
  sentAt: null,
  createdAt: null,
  pageCount: null,
  text: '',
  attachments: [],
});

const cleanString = (value: unknown): string | null => {
  if (typeof value !== 'string') return null;
  const trimmed = value.replace(/\s+/g, ' ').trim();
  return trimmed === '' ? null : trimmed;
};

const isoOrNull = (value: Date | null | undefined): string | null =>
  value instanceof Date && !Number.isNaN(value.getTime()) ? value.toISOString() : null;

/** Normalises extracted text: Unix newlines, no trailing spaces, at most one blank line in a row. */
export function tidyText(text: string): string {
  return text
    .replace(/\r\n?/g, '\n')
    .replace(/[ \t\f\v]+\n/g, '\n')
    .replace(/\n{3,}/g, '\n\n')
    .trim();
}

/** A PDF page counts as having text when it holds a letter or digit (any script). */
const hasWords = (text: string) => /[\p{L}\p{N}]/u.test(text);

// ---- PDF (ISO 32000) -------------------------------------------------------------------

async function extractPdf(
  filePath: string,
  onCancel: (cancel: () => void) => void,
): Promise<Fields> {
  const bytes = await readFile(filePath);
  // A copy: pdf.js may transfer (detach) the buffer it is given.
  const { PDFParse } = await import('pdf-parse');
  const parser = new PDFParse({ data: new Uint8Array(bytes), verbosity: 0 });
  onCancel(() => void parser.destroy().catch(() => undefined));
  try {
    let textResult;
    try {
      textResult = await parser.getText();
    } catch (error) {
      const name = error instanceof Error ? error.name : '';
      if (name === 'PasswordException') throw new Refused('encrypted PDF');
      throw new Refused('not a valid PDF');
    }
    const pageCount = textResult.total;
    if (!pageCount) throw new Refused('not a valid PDF');
    const text = tidyText(textResult.pages.map((page) => page.text).join('\n\n'));
    if (!hasWords(text)) throw new Refused('no text layer: scanned image');
    const fields = blank();
    fields.pageCount = pageCount;
    fields.text = text;
    try {
      const info = await parser.getInfo();
      const dict = (info.info ?? {}) as Record<string, unknown>;
      fields.title = cleanString(dict.Title) ?? cleanString(info.metadata?.get('dc:title'));
      fields.author = cleanString(dict.Author) ?? cleanString(info.metadata?.get('dc:creator'));
      fields.createdAt = isoOrNull(
        info.getDateNode().CreationDate ?? info.getDateNode().XmpCreateDate,
      );
    } catch {
      // Metadata is optional; the text is what matters.
    }
    return fields;
  } finally {
    await parser.destroy().catch(() => undefined);
  }
}

// ---- DOCX (ECMA-376) -------------------------------------------------------------------

const XML_ENTITIES: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" };
const decodeXml = (text: string) =>
  text.replace(/&(#x[0-9a-f]+|#\d+|amp|lt|gt|quot|apos);/gi, (_m, entity: string) =>
    entity[0] === '#'
      ? String.fromCodePoint(
          entity[1].toLowerCase() === 'x'
            ? parseInt(entity.slice(2), 16)
            : parseInt(entity.slice(1), 10),
        )
      : XML_ENTITIES[entity.toLowerCase()],
  );

/** Reads one element of docProps/core.xml (ECMA-376 Part 2 §11, Dublin Core terms). */
function coreProperty(xml: string, tag: string): string | null {
  const match = new RegExp(`<${tag}(?:\\s[^>]*)?>([\\s\\S]*?)</${tag}>`).exec(xml);
  return match ? cleanString(decodeXml(match[1])) : null;
}

/** Largest inflated size accepted for a DOCX package (mammoth inflates it in memory). */
const DOCX_MAX_INFLATED_FACTOR = 4;

async function extractDocx(filePath: string, limits: ExtractLimits): Promise<Fields> {
  const names = await listZipNames(filePath);
  if (!names || !names.includes('word/document.xml')) throw new Refused('not a valid DOCX');
  // mammoth inflates the whole package in memory: measure the real inflated size first.
  const inflated = await inflatesWithin(filePath, limits.maxFileBytes * DOCX_MAX_INFLATED_FACTOR);
  if (inflated === 'corrupt') throw new Refused('not a valid DOCX');
  if (inflated === 'too large') throw new Refused('file exceeds the size limit');
  let raw: string;
  try {
    const mammoth = (await import('mammoth')).default;
    raw = (await mammoth.extractRawText({ path: filePath })).value;
  } catch {
    throw new Refused('not a valid DOCX');
  }
  const fields = blank();
  fields.text = tidyText(raw);
  const core = await readZipEntry(filePath, 'docProps/core.xml', 1024 * 1024);
  if (core) {
    const xml = core.toString('utf8');
    fields.title = coreProperty(xml, 'dc:title');
    fields.author = coreProperty(xml, 'dc:creator');
    const created = coreProperty(xml, 'dcterms:created');
    fields.createdAt = created ? isoOrNull(new Date(created)) : null;
  }
  const app = await readZipEntry(filePath, 'docProps/app.xml', 1024 * 1024);
  const pages = app ? coreProperty(app.toString('utf8'), 'Pages') : null;
  fields.pageCount = pages && /^\d+$/.test(pages) && Number(pages) > 0 ? Number(pages) : null;
  return fields;
}

// ---- E-mail (RFC 5322, MIME RFC 2045/2046) ---------------------------------------------

type MailAddress = AddressObject['value'][number];

/** "Name <address>" per mailbox (RFC 5322 §3.4), groups flattened to their members. */
function mailboxText(entry: MailAddress): string[] {
  if (entry.group) return entry.group.flatMap(mailboxText);
  const name = cleanString(entry.name);
  const address = cleanString(entry.address);
  if (name && address) return [`${name} <${address}>`];
  return [address ?? name ?? ''].filter(Boolean);
}

const addressText = (value: AddressObject | AddressObject[] | undefined): string =>
  (Array.isArray(value) ? value : value ? [value] : [])
    .flatMap((a) => a.value.flatMap(mailboxText))
    .join(', ');

const EXTENSION_OF: Record<string, string> = {
  'application/pdf': '.pdf',
  'text/plain': '.txt',
  'text/html': '.html',
  'message/rfc822': '.eml',
  'application/zip': '.zip',
  'application/vnd.openxmlformats-officedocument.wordprocessingml.document': '.docx',
};

function childrenOf(mail: ParsedMail): ChildFile[] {
  return mail.attachments.map((attachment, index) => {
    const contentType = attachment.contentType || 'application/octet-stream';
    const fallback = `attachment-${index + 1}${EXTENSION_OF[contentType] ?? '.bin'}`;
    // Only the last path segment of a suggested name is kept (RFC 2183 §2.3).
    const name =
      cleanString(path.basename((attachment.filename ?? '').replace(/\\/g, '/'))) ?? fallback;
    return {
      name,
      contentType,
      inline: attachment.related === true || attachment.contentDisposition === 'inline',
      content: attachment.content,
    };
  });
}

const HTML_OPTIONS = (maxChars: number) => ({
  wordwrap: false as const,
  limits: { maxInputLength: maxChars },
  selectors: [
    { selector: 'a', options: { ignoreHref: true } },
    { selector: 'img', format: 'skip' },
    { selector: 'script', format: 'skip' },
    { selector: 'style', format: 'skip' },
    { selector: 'noscript', format: 'skip' },
    { selector: 'template', format: 'skip' },
    { selector: 'svg', format: 'skip' },
    { selector: 'iframe', format: 'skip' },
    { selector: 'object', format: 'skip' },
  ],
});

async function extractEmail(filePath: string, limits: ExtractLimits): Promise<Fields> {
  const { simpleParser } = await import('mailparser');
  const { htmlToText } = await import('html-to-text');
  const mail = await simpleParser(await readFile(filePath), {
    skipImageLinks: true,
    skipTextLinks: true,
  });
  const fields = blank();
  fields.title = cleanString(mail.subject);
  fields.author = cleanString(addressText(mail.from));
  fields.recipients = { to: addressText(mail.to), cc: addressText(mail.cc) };
  fields.sentAt = isoOrNull(mail.date);
  const body =
    mail.text ?? (mail.html ? htmlToText(mail.html, HTML_OPTIONS(limits.maxFileBytes)) : '');
  fields.text = tidyText(body);
  fields.attachments = childrenOf(mail);
  return fields;
}

// ---- HTML, text, Markdown --------------------------------------------------------------

async function extractHtml(
  filePath: string,
  charset: string | undefined,
  limits: ExtractLimits,
): Promise<Fields> {
  const { htmlToText } = await import('html-to-text');
  const decoded = decodeText(await readFile(filePath), charset);
  const fields = blank();
  fields.charset = decoded.charset;
  const title = /<title[^>]*>([\s\S]*?)<\/title>/i.exec(decoded.text);
  fields.title = title ? cleanString(htmlToText(title[1], { wordwrap: false })) : null;
  fields.text = tidyText(htmlToText(decoded.text, HTML_OPTIONS(limits.maxFileBytes)));
  return fields;
}

async function extractPlain(
  filePath: string,
  kind: 'text' | 'markdown',
  charset: string | undefined,
): Promise<Fields> {
  const decoded = decodeText(await readFile(filePath), charset);
  const fields = blank();
  fields.charset = decoded.charset;
  fields.text = tidyText(decoded.text);
  if (kind === 'markdown') {
    // The first ATX heading (CommonMark §4.2) is the document's title.
    const heading = /^ {0,3}#{1,6}[ \t]+(.+?)[ \t#]*$/m.exec(fields.text);
    fields.title = heading ? cleanString(heading[1]) : null;
  }
  return fields;
}

// ---- Entry point -----------------------------------------------------------------------

/** Parses a file whose type is known. The timeout here only helps when parsers yield. */
export async function extractSniffed(
  filePath: string,
  sniffed: SniffResult,
  size: number,
  limits: ExtractLimits,
): Promise<ExtractResult> {
  const kind = sniffed.kind;
  let cancel: () => void = () => undefined;
  let timer: NodeJS.Timeout | undefined;
  const work = (async (): Promise<Fields> => {
    switch (kind) {
      case 'pdf':
        return extractPdf(filePath, (c) => (cancel = c));
      case 'docx':
        return extractDocx(filePath, limits);
      case 'email':
        return extractEmail(filePath, limits);
      case 'html':
        return extractHtml(filePath, sniffed.charset, limits);
      case 'text':
      case 'markdown':
        return extractPlain(filePath, kind, sniffed.charset);
      default:
        throw new Refused('unsupported type');
    }
  })();
  const timeout = new Promise<'timeout'>((resolve) => {
    timer = setTimeout(() => resolve('timeout'), limits.timeoutMs);
  });
  try {
    const outcome = await Promise.race([work, timeout]);
    if (outcome === 'timeout') {
      cancel();
      work.catch(() => undefined); // the abandoned work may still reject later
      return fail(kind, 'extraction timed out');
    }
    const { charset, ...fields } = outcome;
    return {
      ok: true,
      kind: kind as ExtractSuccess['kind'],
      mime: sniffed.mime,
      charset: charset ?? sniffed.charset ?? null,
      ...fields,
    };
  } catch (error) {
    if (error instanceof Refused) return fail(kind, error.reason);
    if (kind === 'pdf') return fail(kind, 'not a valid PDF');
    if (kind === 'docx') return fail(kind, 'not a valid DOCX');
    return fail(kind, 'file could not be read');
  } finally {
    clearTimeout(timer);
  }
}

/** Extracts in the calling thread (tests, tools); servers use extractFile from extract.ts. */
export async function extractInProcess(
  filePath: string,
  originalName: string,
  limits: Partial<ExtractLimits> = {},
): Promise<ExtractResult> {
  const settings: ExtractLimits = { ...EXTRACT_DEFAULTS, ...limits };
  const checked = await precheckFile(filePath, originalName, settings);
  if (checked.done) return checked.done;
  return extractSniffed(filePath, checked.sniffed, checked.size, settings);
}
