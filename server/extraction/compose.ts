// Rebuilds a message read from an Outlook store (PST, or a message embedded in a .msg) as
// RFC 5322 / MIME text with nodemailer's MailComposer, so it is stored, shown and
// extracted like any other e-mail. Nothing is invented: fields the store did not have are
// left out (the composer's generated Message-ID and Date are removed again).
import MailComposer from 'nodemailer/lib/mail-composer';

export interface ComposeInput {
  from: string;
  to: string;
  cc: string;
  bcc: string;
  subject: string | null;
  sentAt: string | null;
  messageId: string | null;
  inReplyTo: string | null;
  references: string;
  receivedAt?: string | null;
  text: string;
  html?: string | null;
  /** Extra header fields (e.g. X-Folder for the store's folder path). */
  headers?: Record<string, string>;
}

export interface ComposeAttachment {
  filename: string;
  content: Buffer;
  contentType: string;
}

/** Removes one header field (with its folded lines) from the header block of a message. */
function dropHeader(message: Buffer, name: string): Buffer {
  const text = message.toString('latin1');
  const end = text.search(/\r?\n\r?\n/);
  if (end < 0) return message;
  const head = text
    .slice(0, end)
    .replace(new RegExp(`(^|\\r?\\n)${name}:[^\\r\\n]*(\\r?\\n[ \\t][^\\r\\n]*)*`, 'i'), '');
  return Buffer.from(head.replace(/^\r?\n/, '') + text.slice(end), 'latin1');
}

export async function composeEml(
  input: ComposeInput,
  attachments: ComposeAttachment[],
): Promise<Buffer> {
  const headers: Record<string, string> = { ...input.headers };
  if (input.receivedAt) headers['X-Received-Date'] = new Date(input.receivedAt).toUTCString();
  const composer = new MailComposer({
    from: input.from || undefined,
    to: input.to || undefined,
    cc: input.cc || undefined,
    bcc: input.bcc || undefined,
    subject: input.subject ?? undefined,
    date: input.sentAt ? new Date(input.sentAt) : undefined,
    messageId: input.messageId ?? undefined,
    inReplyTo: input.inReplyTo ?? undefined,
    references: input.references || undefined,
    text: input.text,
    html: input.html || undefined,
    headers,
    attachments: attachments.map((a) => ({
      filename: a.filename,
      content: a.content,
      contentType: a.contentType,
    })),
  });
  const node = composer.compile();
  node.keepBcc = true;
  let built = await node.build();
  if (!input.messageId) built = dropHeader(built, 'Message-ID');
  if (!input.sentAt) built = dropHeader(built, 'Date');
  return built;
}
