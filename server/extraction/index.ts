// Public API of the file-handling library (no Express, no database): sniff a file's type,
// expand archives safely, extract text and metadata. See the README in this folder.
export { sniffFile, sniffHead, looksLikeEmail, looksLikeHtml, SNIFF_HEAD_BYTES } from './sniff';
export { detectTextCharset, decodeText } from './charset';
export {
  expandArchive,
  safeEntryPath,
  type ArchiveFile,
  type ArchiveSkipped,
  type ExpandResult,
} from './archive';
export {
  extractFile,
  extractFileInProcess,
  extractionPool,
  closeExtractionPool,
  ExtractionPool,
  type PoolOptions,
} from './extract';
export {
  FAILURE_REASONS,
  MIME_OF,
  EXTRACT_DEFAULTS,
  ARCHIVE_DEFAULTS,
  type FileKind,
  type FailureReason,
  type SniffResult,
  type ChildFile,
  type ExtractSuccess,
  type ExtractFailure,
  type ExtractResult,
  type ExtractLimits,
  type ArchiveLimits,
} from './types';
