// One Outlook message (MS-OXMSG: a compound file of MAPI properties), read with
// @kenjiuno/msgreader. Header fields come from the transport headers when the message
// kept them (RFC 5322 text), else from the MAPI properties; attachments, including
// embedded messages, come back as children for the caller to store.
import { readFile } from 'node:fs/promises';
import type MsgReaderType from '@kenjiuno/msgreader';
import { blank, cleanString, isoOrNull, Refused, tidyText, type Fields } from './fields';
import type { ChildFile } from './types';

type MsgData = ReturnType<MsgReaderType['getFileData']>;

/** One header field of an RFC 5322 header block (unfolded, §2.2.3), or null. */
export function headerField(headers: string, name: string): string | null {
  const unfolded = headers.replace(/\r?\n[ \t]+/g, ' ');
  const match = new RegExp(`^${name}:[ \\t]*(.*)$`, 'im').exec(unfolded);
  return match ? cleanString(match[1]) : null;
}

const ids = (value: string | null) => (value?.match(/<[^<>\s]+>/g) ?? []).join(' ');

function recipientsOf(data: MsgData, type: 'to' | 'cc' | 'bcc'): string {
  return (data.recipients ?? [])
    .filter((r) => (r.recipType ?? 'to') === type)
    .map((r) => {
      const name = cleanString(r.name);
      const address = cleanString(r.smtpAddress ?? r.email);
      return name && address && name !== address ? `${name} <${address}>` : (address ?? name ?? '');
    })
    .filter(Boolean)
    .join(', ');
}

/** Builds the fields of a parsed message (also used for embedded messages). */
export function msgFields(data: MsgData, attachments: ChildFile[]): Fields {
  const fields = blank();
  const headers = data.headers ?? '';
  const senderName = cleanString(data.senderName);
  const senderAddress = cleanString(data.senderSmtpAddress ?? data.senderEmail);
  const from =
    senderName && senderAddress && senderName !== senderAddress
      ? `${senderName} <${senderAddress}>`
      : (senderAddress ?? senderName ?? '');
  const to = recipientsOf(data, 'to');
  const cc = recipientsOf(data, 'cc');
  fields.title = cleanString(data.subject);
  fields.author = cleanString(from);
  fields.recipients = { to, cc };
  fields.sentAt = isoOrNull(data.clientSubmitTime ?? headerField(headers, 'Date'));
  fields.createdAt = isoOrNull(data.creationTime);
  fields.modifiedAt = isoOrNull(data.lastModificationTime);
  fields.lastAuthor = cleanString(data.lastModifierName);
  fields.email = {
    from,
    to,
    cc,
    bcc: recipientsOf(data, 'bcc'),
    messageId: ids(headerField(headers, 'Message-ID')) || null,
    inReplyTo: ids(headerField(headers, 'In-Reply-To')) || null,
    references: ids(headerField(headers, 'References')),
    receivedAt: isoOrNull(data.messageDeliveryTime),
  };
  fields.text = tidyText(data.body ?? '');
  fields.attachments = attachments;
  return fields;
}

export async function extractMsg(filePath: string): Promise<Fields> {
  const MsgReader = (await import('@kenjiuno/msgreader')).default;
  let reader;
  let data: MsgData;
  try {
    const bytes = await readFile(filePath);
    reader = new MsgReader(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.length));
    data = reader.getFileData();
  } catch {
    throw new Refused('not a valid Outlook message');
  }
  if (data.error || data.dataType !== 'msg') throw new Refused('not a valid Outlook message');
  // A compound file with none of a message's properties (MS-OXMSG §2.1) is some other file.
  const empty =
    data.subject === undefined &&
    data.body === undefined &&
    data.senderName === undefined &&
    data.senderEmail === undefined &&
    !data.recipients?.length &&
    !data.attachments?.length;
  if (empty) throw new Refused('not a valid Outlook message');
  const attachments: ChildFile[] = [];
  for (const [index, attachment] of (data.attachments ?? []).entries()) {
    try {
      if (attachment.innerMsgContent) {
        // An embedded message: rebuilt as RFC 5322 text so it is read like any e-mail.
        const inner = attachment.innerMsgContentFields;
        if (!inner) continue;
        const { composeEml } = await import('./compose');
        const innerFields = msgFields(inner, []);
        const email = innerFields.email!;
        attachments.push({
          name: `${(cleanString(inner.subject) ?? `message-${index + 1}`).slice(0, 100)}.eml`,
          contentType: 'message/rfc822',
          inline: false,
          content: await composeEml(
            {
              ...email,
              subject: innerFields.title,
              sentAt: innerFields.sentAt,
              text: innerFields.text,
            },
            [],
          ),
        });
        continue;
      }
      const content = reader.getAttachment(attachment);
      attachments.push({
        name: cleanString(content.fileName) ?? `attachment-${index + 1}.bin`,
        contentType: cleanString(attachment.attachMimeTag) ?? 'application/octet-stream',
        inline: false,
        content: Buffer.from(content.content),
      });
    } catch {
      // One unreadable attachment must not lose the message.
    }
  }
  return msgFields(data, attachments);
}
