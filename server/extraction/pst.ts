// Outlook data files (MS-PST), read with pst-extractor. Every message is rebuilt as
// RFC 5322 text (compose.ts) with its attachments, embedded messages nested as
// message/rfc822 parts, and written to the target folder under its folder path
// ("Top of Personal Folders/Inbox/message-00001.eml"), so the folder path stays with the
// document as its source path. Only e-mail items (message class IPM.Note...) are kept;
// contacts, appointments and tasks are listed as skipped.
import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { PSTAttachment, PSTFolder, PSTMessage } from 'pst-extractor';
import type { ArchiveFile, ArchiveSkipped, ExpandResult } from './archive';
import { composeEml, type ComposeAttachment } from './compose';
import { safeEntryPath } from './archive';
import type { ArchiveLimits } from './types';

/** MS-PST begins with dwMagic "!BDN" (MS-PST §2.2.2.6). */
export const PST_MAGIC = Buffer.from('!BDN', 'latin1');

const iso = (date: Date | null | undefined) =>
  date instanceof Date && !Number.isNaN(date.getTime()) ? date.toISOString() : null;

const mailbox = (name: string, address: string) => {
  const n = name.trim();
  const a = address.trim();
  if (n && a && n !== a && a.includes('@')) return `"${n.replace(/"/g, "'")}" <${a}>`;
  return a.includes('@') ? a : n;
};

/** MAPI PR_RECIPIENT_TYPE: 1 To, 2 Cc, 3 Bcc (MS-OXOMSG §2.2.3.1). */
function recipients(message: PSTMessage, type: number, display: string): string {
  const out: string[] = [];
  for (let i = 0; i < message.numberOfRecipients; i += 1) {
    const r = message.getRecipient(i);
    if (r && r.recipientType === type)
      out.push(mailbox(r.displayName, r.smtpAddress || r.emailAddress));
  }
  // Older stores keep only the display line (PR_DISPLAY_TO and friends).
  return (
    out.filter(Boolean).join(', ') ||
    display
      .split(';')
      .map((s) => s.trim())
      .filter(Boolean)
      .join(', ')
  );
}

function headerOf(headers: string, name: string): string {
  const unfolded = headers.replace(/\r?\n[ \t]+/g, ' ');
  return new RegExp(`^${name}:[ \\t]*(.*)$`, 'im').exec(unfolded)?.[1]?.trim() ?? '';
}

function attachmentBytes(attachment: PSTAttachment): Buffer | null {
  const stream = attachment.fileInputStream;
  if (!stream) return null;
  const out = Buffer.alloc(attachment.filesize);
  stream.readCompletely(out);
  return out;
}

/** One message as RFC 5322 bytes; nested messages to `depthLeft` levels. */
export async function messageToEml(
  message: PSTMessage,
  folderPath: string,
  depthLeft: number,
): Promise<Buffer> {
  const attachments: ComposeAttachment[] = [];
  for (let i = 0; i < message.numberOfAttachments; i += 1) {
    let attachment: PSTAttachment;
    try {
      attachment = message.getAttachment(i);
    } catch {
      continue;
    }
    const embedded = attachment.embeddedPSTMessage;
    if (embedded && depthLeft > 0) {
      attachments.push({
        filename: `${(embedded.subject || `message-${i + 1}`).slice(0, 100)}.eml`,
        content: await messageToEml(embedded, '', depthLeft - 1),
        contentType: 'message/rfc822',
      });
      continue;
    }
    const bytes = attachmentBytes(attachment);
    if (!bytes) continue;
    attachments.push({
      filename: attachment.longFilename || attachment.filename || `attachment-${i + 1}.bin`,
      content: bytes,
      contentType: attachment.mimeTag || 'application/octet-stream',
    });
  }
  const transport = message.transportMessageHeaders ?? '';
  const ids = (value: string) => (value.match(/<[^<>\s]+>/g) ?? []).join(' ');
  const messageId = ids(message.internetMessageId || headerOf(transport, 'Message-ID'));
  return composeEml(
    {
      from: mailbox(message.senderName, message.senderEmailAddress),
      to: recipients(message, 1, message.displayTo),
      cc: recipients(message, 2, message.displayCC),
      bcc: recipients(message, 3, message.displayBCC),
      subject: message.subject || null,
      sentAt: iso(message.clientSubmitTime) ?? iso(message.creationTime),
      receivedAt: iso(message.messageDeliveryTime),
      messageId: messageId || null,
      inReplyTo: ids(message.inReplyToId || headerOf(transport, 'In-Reply-To')) || null,
      references: ids(headerOf(transport, 'References')),
      text: message.body || '',
      html: message.body ? null : message.bodyHTML || null,
      headers: folderPath ? { 'X-Folder': folderPath } : {},
    },
    attachments,
  );
}

/** Writes each e-mail of a PST to `targetDir`, under its folder path. */
export async function expandPst(
  pstPath: string,
  targetDir: string,
  limits: ArchiveLimits,
): Promise<ExpandResult> {
  const { PSTFile } = await import('pst-extractor');
  let pst;
  try {
    pst = new PSTFile(pstPath);
  } catch {
    return { ok: false, reason: 'not a valid Outlook data file', detail: 'unreadable header' };
  }
  const files: ArchiveFile[] = [];
  const skipped: ArchiveSkipped[] = [];
  let unpackedBytes = 0;
  let failure: ExpandResult | null = null;
  const walk = async (folder: PSTFolder, parts: string[]): Promise<void> => {
    const folderPath = parts.join('/');
    if (folder.contentCount > 0) {
      let index = 0;
      for (let item = folder.getNextChild(); item; item = folder.getNextChild()) {
        index += 1;
        const base = `${folderPath ? `${folderPath}/` : ''}message-${String(index).padStart(5, '0')}.eml`;
        const messageClass = String((item as PSTMessage).messageClass ?? '');
        if (!/^IPM\.Note/i.test(messageClass)) {
          skipped.push({ relativePath: base, reason: 'unsupported type' });
          continue;
        }
        if (files.length + 1 > limits.maxArchiveEntries) {
          failure = {
            ok: false,
            reason: 'archive has too many files',
            detail: `more than ${limits.maxArchiveEntries} messages`,
          };
          return;
        }
        let bytes: Buffer;
        try {
          bytes = await messageToEml(item as PSTMessage, folderPath, limits.maxArchiveDepth);
        } catch {
          skipped.push({ relativePath: base, reason: 'file could not be read' });
          continue;
        }
        if (bytes.length > limits.maxFileBytes) {
          skipped.push({ relativePath: base, reason: 'file exceeds the size limit' });
          continue;
        }
        unpackedBytes += bytes.length;
        if (unpackedBytes > limits.maxArchiveUnpackedBytes) {
          failure = {
            ok: false,
            reason: 'archive exceeds the unpacked-size limit',
            detail: `${unpackedBytes} bytes`,
          };
          return;
        }
        const absolutePath = path.join(targetDir, ...base.split('/'));
        await mkdir(path.dirname(absolutePath), { recursive: true });
        await writeFile(absolutePath, bytes);
        files.push({ relativePath: base, absolutePath, size: bytes.length });
      }
    }
    if (folder.hasSubfolders) {
      for (const sub of folder.getSubFolders()) {
        // Folder names become path segments: unsafe characters are replaced, not trusted.
        const name =
          safeEntryPath((sub.displayName || 'folder').replace(/[/\\]/g, '_')) ?? 'folder';
        await walk(sub, [...parts, name]);
        if (failure) return;
      }
    }
  };
  try {
    await mkdir(targetDir, { recursive: true });
    await walk(pst.getRootFolder(), []);
  } catch {
    return { ok: false, reason: 'not a valid Outlook data file', detail: 'unreadable folder tree' };
  } finally {
    try {
      pst.close();
    } catch {
      // already closed
    }
  }
  if (failure) return failure;
  if (files.length === 0 && skipped.length === 0)
    return { ok: false, reason: 'mailbox holds no messages', detail: 'no e-mail items' };
  return { ok: true, files, skipped, unpackedBytes };
}
