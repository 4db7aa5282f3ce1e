// MBOX (RFC 4155, application/mbox): messages one after another, each opened by a
// "From " separator line. Inside a message, writers escape body lines that would read as a
// separator by prefixing ">" ("From " -> ">From "; the mboxrd convention also escapes
// ">From " -> ">>From "); reading removes one ">" from every line matching /^>+From /.
// Splitting works on bytes (latin1), so each message keeps its own charset.
import { mkdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { ArchiveFile, ArchiveSkipped, ExpandResult } from './archive';
import type { ArchiveLimits } from './types';

// RFC 5322 §2.2: field-name is printable US-ASCII except colon.
const FIELD_LINE = /^[\x21-\x39\x3b-\x7e]+:/;

/**
 * A "From " line opens a message when it starts the file or follows a blank line, and the
 * next line starts a header block (common practice: a body line "From here on ..." after a
 * blank line in an unescaped mailbox is then not taken for a separator).
 */
function isSeparator(lines: string[], i: number): boolean {
  if (!lines[i].startsWith('From ')) return false;
  if (i > 0 && lines[i - 1].replace(/\r$/, '') !== '') return false;
  const next = lines[i + 1];
  return next !== undefined && FIELD_LINE.test(next);
}

/** True when the text opens like an RFC 4155 mailbox: a "From " line, then header fields. */
export function looksLikeMbox(text: string): boolean {
  const lines = text.split('\n', 3);
  return lines.length >= 2 && isSeparator(lines, 0);
}

export interface MboxMessage {
  /** The separator line without "From " (envelope sender and date), for reference. */
  envelope: string;
  /** The message as RFC 5322 text, ">From " unescaped, the separator line removed. */
  content: Buffer;
}

/** Splits an mbox into its messages (RFC 4155 §2 and Appendix A). */
export function splitMbox(bytes: Buffer): MboxMessage[] {
  const lines = bytes.toString('latin1').split('\n');
  const messages: MboxMessage[] = [];
  let current: { envelope: string; lines: string[] } | null = null;
  const close = () => {
    if (!current) return;
    const body = [...current.lines];
    // The blank line that precedes the next separator belongs to the mailbox, not the message.
    while (body.length > 0 && body[body.length - 1].replace(/\r$/, '') === '') body.pop();
    const text = body.join('\n') + '\n';
    messages.push({ envelope: current.envelope, content: Buffer.from(text, 'latin1') });
  };
  for (let i = 0; i < lines.length; i += 1) {
    if (isSeparator(lines, i)) {
      close();
      current = { envelope: lines[i].slice(5).replace(/\r$/, ''), lines: [] };
      continue;
    }
    if (!current) continue; // text before the first separator is not a message
    current.lines.push(/^>+From /.test(lines[i]) ? lines[i].slice(1) : lines[i]);
  }
  close();
  return messages;
}

/** Writes each message of an mbox to `targetDir` as "message-00001.eml", ... in order. */
export async function expandMbox(
  mboxPath: string,
  targetDir: string,
  limits: ArchiveLimits,
): Promise<ExpandResult> {
  const messages = splitMbox(await readFile(mboxPath));
  if (messages.length === 0)
    return { ok: false, reason: 'mailbox holds no messages', detail: 'no "From " separator line' };
  if (messages.length > limits.maxArchiveEntries)
    return {
      ok: false,
      reason: 'archive has too many files',
      detail: `${messages.length} messages`,
    };
  await mkdir(targetDir, { recursive: true });
  const files: ArchiveFile[] = [];
  const skipped: ArchiveSkipped[] = [];
  let unpackedBytes = 0;
  const width = Math.max(5, String(messages.length).length);
  for (const [index, message] of messages.entries()) {
    const relativePath = `message-${String(index + 1).padStart(width, '0')}.eml`;
    if (message.content.length > limits.maxFileBytes) {
      skipped.push({ relativePath, reason: 'file exceeds the size limit' });
      continue;
    }
    const absolutePath = path.join(targetDir, relativePath);
    await writeFile(absolutePath, message.content);
    unpackedBytes += message.content.length;
    files.push({ relativePath, absolutePath, size: message.content.length });
  }
  return { ok: true, files, skipped, unpackedBytes };
}
