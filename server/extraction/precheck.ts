// Checks that need no parser: size limits and the content-based type. They run in the
// calling thread before a file is handed to an extraction worker.
import { stat } from 'node:fs/promises';
import { sniffFile } from './sniff';
import {
  isContainerKind,
  MIME_OF,
  type ExtractFailure,
  type ExtractLimits,
  type FailureReason,
  type FileKind,
  type SniffResult,
} from './types';

export const fail = (kind: FileKind, reason: FailureReason): ExtractFailure => ({
  ok: false,
  kind,
  mime: MIME_OF[kind],
  reason,
});

/** What the cheap checks found: a final failure, or a sniffed type ready to extract. */
export type Precheck =
  { done: ExtractFailure } | { done: null; sniffed: SniffResult; size: number };

/** Size and type checks that need no parsing (run before handing a file to a worker). */
export async function precheckFile(
  filePath: string,
  originalName: string,
  limits: ExtractLimits,
): Promise<Precheck> {
  let size: number;
  let sniffed: SniffResult;
  try {
    size = (await stat(filePath)).size;
    if (size === 0) return { done: fail('unknown', 'empty file') };
    sniffed = await sniffFile(filePath, originalName);
  } catch {
    return { done: fail('unknown', 'file could not be read') };
  }
  const { kind } = sniffed;
  if (size > limits.maxFileBytes) return { done: fail(kind, 'file exceeds the size limit') };
  if (kind === 'unknown') return { done: fail(kind, 'unsupported type') };
  if (isContainerKind(kind)) return { done: fail(kind, 'archive must be expanded, not extracted') };
  return { done: null, sniffed, size };
}
