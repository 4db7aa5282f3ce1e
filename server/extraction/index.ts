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
export { expandContainer } from './containers';
export { splitMbox, expandMbox, looksLikeMbox, type MboxMessage } from './mbox';
export { expandPst } from './pst';
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
  CONTAINER_KINDS,
  isContainerKind,
  MIME_OF,
  EXTRACT_DEFAULTS,
  ARCHIVE_DEFAULTS,
  type FileKind,
  type ContainerKind,
  type EmailFields,
  type FailureReason,
  type SniffResult,
  type ChildFile,
  type ExtractSuccess,
  type ExtractFailure,
  type ExtractResult,
  type ExtractLimits,
  type ArchiveLimits,
} from './types';
