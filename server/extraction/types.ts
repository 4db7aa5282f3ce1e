// Result types and the fixed failure wording shared by sniffing, extraction and archives.
// Reasons are shown to paralegals as-is, so they name the problem in plain words.
import { UPLOAD_DEFAULTS } from '../../shared/limits';

/** What a file is, decided from its bytes (the extension only breaks ties). */
export type FileKind =
  | 'pdf'
  | 'docx'
  | 'zip'
  | 'email'
  | 'html'
  | 'text'
  | 'markdown'
  // Mail containers (split into messages at load time, like a zip): RFC 4155 MBOX, Outlook PST.
  | 'mbox'
  | 'pst'
  /** One Outlook message (MS-OXMSG, a compound file). */
  | 'msg'
  | 'xlsx'
  | 'csv'
  | 'pptx'
  /** PNG, JPEG or TIFF: read by OCR. */
  | 'image'
  | 'unknown';

/** Kinds that hold other files and are expanded at load time rather than extracted. */
export const CONTAINER_KINDS = ['zip', 'mbox', 'pst'] as const;
export type ContainerKind = (typeof CONTAINER_KINDS)[number];
export const isContainerKind = (kind: FileKind): kind is ContainerKind =>
  (CONTAINER_KINDS as readonly string[]).includes(kind);

export const MIME_OF: Record<FileKind, string> = {
  pdf: 'application/pdf',
  docx: 'application/vnd.openxmlformats-officedocument.wordprocessingml.document',
  zip: 'application/zip',
  email: 'message/rfc822',
  html: 'text/html',
  text: 'text/plain',
  markdown: 'text/markdown',
  mbox: 'application/mbox',
  pst: 'application/vnd.ms-outlook-pst',
  msg: 'application/vnd.ms-outlook',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
  csv: 'text/csv',
  pptx: 'application/vnd.openxmlformats-officedocument.presentationml.presentation',
  image: 'image/png',
  unknown: 'application/octet-stream',
};

/** Every reason a file can fail, worded for a paralegal. */
export const FAILURE_REASONS = [
  'encrypted PDF',
  'no text layer: scanned image',
  'not a valid DOCX',
  'not a valid PDF',
  'not a valid ZIP archive',
  'encrypted archive',
  'archive exceeds the unpacked-size limit',
  'archive has too many files',
  'archive nesting too deep',
  'unsafe path in archive',
  'unsupported type',
  'empty file',
  'file exceeds the size limit',
  'extraction timed out',
  'extraction ran out of memory',
  'file could not be read',
  // Not a failure of the file: a zip goes to expandArchive, not extractFile.
  'archive must be expanded, not extracted',
  'not a valid Outlook message',
  'not a valid Outlook data file',
  'mailbox holds no messages',
  'not a valid spreadsheet',
  'not a valid presentation',
  'OCR found no text',
  'OCR timed out on a page',
  'OCR is not available on this server',
  'too many pages to OCR',
] as const;
export type FailureReason = (typeof FAILURE_REASONS)[number];

export interface SniffResult {
  kind: FileKind;
  mime: string;
  /** Character set of text kinds (text, markdown, html, email), e.g. "UTF-8", "ISO-8859-1". */
  charset?: string;
  /** For kind "unknown": what the bytes look like, e.g. "PNG image", for logs and tooltips. */
  detail?: string;
  /**
   * True when the bytes matched no known format and the kind comes from the extension alone
   * (unrecognisable bytes named .pdf or .docx); extraction then reports the file as invalid
   * ("not a valid PDF" / "not a valid DOCX"), which tells a paralegal more than "unsupported".
   */
  fromExtensionOnly?: boolean;
}

/** An e-mail attachment, returned so the caller stores and extracts it as a child document. */
export interface ChildFile {
  name: string;
  contentType: string;
  /** True for inline parts (RFC 2387 multipart/related, e.g. a signature logo). */
  inline: boolean;
  content: Buffer;
}

/** E-mail header fields kept apart (RFC 5322 §3.6); address lists as display text. */
export interface EmailFields {
  from: string;
  to: string;
  cc: string;
  bcc: string;
  /** Message-ID with its angle brackets, e.g. "<a1@example.com>"; null when absent. */
  messageId: string | null;
  inReplyTo: string | null;
  /** References as written: message ids separated by single spaces. */
  references: string;
  /** Delivery date (the top Received field, or the store's delivery time), ISO 8601. */
  receivedAt: string | null;
}

export interface ExtractSuccess {
  ok: true;
  kind: Exclude<FileKind, 'unknown' | ContainerKind>;
  mime: string;
  title: string | null;
  /** Author of a PDF/DOCX, or the sender (From) of an e-mail. */
  author: string | null;
  /** E-mail recipients as display text ("Name <addr>, ..."); null for other kinds. */
  recipients: { to: string; cc: string } | null;
  /** E-mail Date header as ISO 8601; null for other kinds or when absent/invalid. */
  sentAt: string | null;
  /** Creation date from PDF info or DOCX core properties, ISO 8601, else null. */
  createdAt: string | null;
  /** Last modified date from the file's own metadata (PDF ModDate, OOXML dcterms:modified). */
  modifiedAt: string | null;
  /** OOXML cp:lastModifiedBy. */
  lastAuthor: string | null;
  /** E-mail header fields (e-mail and Outlook messages), else null. */
  email: EmailFields | null;
  /** True when the text came from OCR (a scan or an image). */
  ocr: boolean;
  pageCount: number | null;
  charset: string | null;
  text: string;
  attachments: ChildFile[];
}

export interface ExtractFailure {
  ok: false;
  kind: FileKind;
  mime: string;
  reason: FailureReason;
}

export type ExtractResult = ExtractSuccess | ExtractFailure;

export interface ExtractLimits {
  maxFileBytes: number;
  /** Wall-clock budget per file; a hostile file must not hang the worker. */
  timeoutMs: number;
  /** Time limit for OCR of one page (tesseract is stopped after it). */
  ocrPageTimeoutMs: number;
  /** Most pages OCR reads from one PDF; a longer scan fails with a reason. */
  ocrMaxPages: number;
  /** Passwords to try on an encrypted PDF (the matter's password list); never logged. */
  passwords: string[];
}

export const EXTRACT_DEFAULTS: ExtractLimits = {
  maxFileBytes: UPLOAD_DEFAULTS.maxFileBytes,
  timeoutMs: 30_000,
  ocrPageTimeoutMs: 60_000,
  ocrMaxPages: 200,
  passwords: [],
};

export interface ArchiveLimits {
  maxArchiveEntries: number;
  maxArchiveUnpackedBytes: number;
  /** 1 means a plain zip; 2 allows a zip inside it; and so on. */
  maxArchiveDepth: number;
  /** Largest single entry, so one member cannot exceed the per-file limit. */
  maxFileBytes: number;
}

export const ARCHIVE_DEFAULTS: ArchiveLimits = {
  maxArchiveEntries: UPLOAD_DEFAULTS.maxArchiveEntries,
  maxArchiveUnpackedBytes: UPLOAD_DEFAULTS.maxArchiveUnpackedBytes,
  maxArchiveDepth: UPLOAD_DEFAULTS.maxArchiveDepth,
  maxFileBytes: UPLOAD_DEFAULTS.maxFileBytes,
};
