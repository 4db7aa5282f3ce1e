// From a file on disk to extracted text and metadata, in the calling thread. Pure: no
// Express, no database. Never throws for bad input: every library error is mapped to a
// reason a paralegal reads. extract.ts runs this in a worker thread with a hard time limit.
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { AddressObject, ParsedMail } from 'mailparser';
import { decodeText } from './charset';
import {
  applyCoreProperties,
  blank,
  cleanString,
  isoOrNull,
  Refused,
  tidyText,
  type Fields,
} from './fields';
import { extractMsg } from './msg';
import { ocrImage, ocrPdf, type LongStep } from './ocr';
import { extractCsv, extractPptx, extractXlsx } from './office';
import { fail, precheckFile } from './precheck';
import { inflatesWithin, listZipNames, readZipEntry } from './zip-names';
import {
  EXTRACT_DEFAULTS,
  type ChildFile,
  type EmailFields,
  type ExtractLimits,
  type ExtractResult,
  type ExtractSuccess,
  type SniffResult,
} from './types';

export { tidyText };

/** A PDF page counts as having text when it holds a letter or digit (any script). */
const hasWords = (text: string) => /[\p{L}\p{N}]/u.test(text);

// ---- PDF (ISO 32000) -------------------------------------------------------------------

async function openPdf(bytes: Buffer, password: string | undefined) {
  const { PDFParse } = await import('pdf-parse');
  // A copy: pdf.js may transfer (detach) the buffer it is given.
  return new PDFParse({ data: new Uint8Array(bytes), verbosity: 0, password });
}

const isPasswordError = (error: unknown) =>
  (error instanceof Error ? error.name : '') === 'PasswordException';

async function extractPdf(
  filePath: string,
  limits: ExtractLimits,
  onCancel: (cancel: () => void) => void,
  onLongStep: LongStep,
): Promise<Fields> {
  const bytes = await readFile(filePath);
  // Without a password first, then each of the matter's passwords in turn.
  const candidates: (string | undefined)[] = [undefined, ...limits.passwords];
  let parser: Awaited<ReturnType<typeof openPdf>> | null = null;
  let password: string | undefined;
  let textResult;
  for (const candidate of candidates) {
    const attempt = await openPdf(bytes, candidate);
    onCancel(() => void attempt.destroy().catch(() => undefined));
    try {
      textResult = await attempt.getText();
      parser = attempt;
      password = candidate;
      break;
    } catch (error) {
      await attempt.destroy().catch(() => undefined);
      if (!isPasswordError(error)) throw new Refused('not a valid PDF');
    }
  }
  if (!parser || !textResult) throw new Refused('encrypted PDF');
  try {
    const pageCount = textResult.total;
    if (!pageCount) throw new Refused('not a valid PDF');
    const fields = blank();
    fields.pageCount = pageCount;
    fields.text = tidyText(textResult.pages.map((page) => page.text).join('\n\n'));
    if (!hasWords(fields.text)) {
      // No text layer: a scan. Each page is rendered and read by OCR.
      fields.text = await ocrPdf(filePath, pageCount, limits, password, onLongStep);
      fields.ocr = true;
    }
    try {
      const info = await parser.getInfo();
      const dict = (info.info ?? {}) as Record<string, unknown>;
      fields.title = cleanString(dict.Title) ?? cleanString(info.metadata?.get('dc:title'));
      fields.author = cleanString(dict.Author) ?? cleanString(info.metadata?.get('dc:creator'));
      const dates = info.getDateNode();
      fields.createdAt = isoOrNull(dates.CreationDate ?? dates.XmpCreateDate);
      fields.modifiedAt = isoOrNull(dates.ModDate ?? dates.XmpModifyDate);
    } catch {
      // Metadata is optional; the text is what matters.
    }
    return fields;
  } finally {
    await parser.destroy().catch(() => undefined);
  }
}

// ---- DOCX (ECMA-376) -------------------------------------------------------------------

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
  if (core) applyCoreProperties(fields, core.toString('utf8'));
  const app = await readZipEntry(filePath, 'docProps/app.xml', 1024 * 1024);
  const pages = app ? /<Pages>(\d+)<\/Pages>/.exec(app.toString('utf8'))?.[1] : null;
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

const messageIdOf = (value: unknown): string | null => {
  const text = cleanString(Array.isArray(value) ? value[0] : value);
  return text ? (/<[^<>\s]+>/.exec(text)?.[0] ?? `<${text.replace(/^<|>$/g, '')}>`) : null;
};

/** The date of the newest (topmost) Received field: RFC 5321 §4.4 trace, after its ";". */
function receivedDate(value: unknown): string | null {
  const first = Array.isArray(value) ? value[0] : value;
  if (typeof first !== 'string') return null;
  const semicolon = first.lastIndexOf(';');
  return semicolon < 0 ? null : isoOrNull(new Date(first.slice(semicolon + 1).trim()));
}

function emailFieldsOf(mail: ParsedMail): EmailFields {
  const references = Array.isArray(mail.references)
    ? mail.references
    : mail.references
      ? mail.references.split(/\s+/)
      : [];
  return {
    from: addressText(mail.from),
    to: addressText(mail.to),
    cc: addressText(mail.cc),
    bcc: addressText(mail.bcc),
    messageId: messageIdOf(mail.messageId),
    inReplyTo: messageIdOf(mail.inReplyTo),
    references: references
      .map((r) => messageIdOf(r))
      .filter(Boolean)
      .join(' '),
    receivedAt: receivedDate(mail.headers.get('received')),
  };
}

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
  fields.email = emailFieldsOf(mail);
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
  hooks: { onLongStep?: LongStep } = {},
): Promise<ExtractResult> {
  const kind = sniffed.kind;
  let cancel: () => void = () => undefined;
  let timer: NodeJS.Timeout | undefined;
  let expire: () => void = () => undefined;
  const arm = (ms: number) => {
    clearTimeout(timer);
    timer = setTimeout(() => expire(), ms);
  };
  // An OCR page restarts the clock with its own limit (the pool does the same).
  const onLongStep: LongStep = (ms) => {
    arm(ms + limits.timeoutMs);
    hooks.onLongStep?.(ms);
  };
  const work = (async (): Promise<Fields> => {
    switch (kind) {
      case 'pdf':
        return extractPdf(filePath, limits, (c) => (cancel = c), onLongStep);
      case 'msg':
        return extractMsg(filePath);
      case 'xlsx':
        return extractXlsx(filePath, limits);
      case 'csv':
        return extractCsv(filePath, sniffed.charset);
      case 'pptx':
        return extractPptx(filePath, limits);
      case 'image':
        return ocrImage(filePath, limits, onLongStep);
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
    expire = () => resolve('timeout');
    arm(limits.timeoutMs);
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
