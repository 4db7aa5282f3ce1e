import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';

/** One message the fake SMTP server received. */
export interface ReceivedMail {
  id: number;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  /** Every http(s) URL found in the text and HTML parts, in order, without duplicates. */
  links: string[];
  receivedAt: string;
}

export interface FakeSmtp {
  port: number;
  messages(): ReceivedMail[];
  clear(): void;
  /** Resolves with the first message (already received or arriving within timeoutMs) that matches. */
  waitFor(match: (mail: ReceivedMail) => boolean, timeoutMs?: number): Promise<ReceivedMail>;
  close(): Promise<void>;
}

const MAX_KEPT = 500;

function addresses(value: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(value) ? value : value ? [value] : [];
  return list.flatMap((group) => group.value.map((entry) => entry.address ?? '').filter(Boolean));
}

function findLinks(...parts: (string | null)[]): string[] {
  const found = new Set<string>();
  for (const part of parts) {
    for (const match of (part ?? '').matchAll(/https?:\/\/[^\s"'<>]+/g))
      found.add(match[0].replace(/[.,;)]+$/, ''));
  }
  return [...found];
}

/**
 * A local SMTP server (smtp-server) on 127.0.0.1 and a random port, with
 * authentication off, that keeps what it receives in memory (parsed by mailparser).
 * Used when SMTP_URL is unset so invitations can be followed end to end.
 */
export async function startFakeSmtp(): Promise<FakeSmtp> {
  const kept: ReceivedMail[] = [];
  const waiters = new Set<{
    match: (mail: ReceivedMail) => boolean;
    resolve: (mail: ReceivedMail) => void;
  }>();
  let nextId = 1;

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const html = typeof parsed.html === 'string' ? parsed.html : null;
          const mail: ReceivedMail = {
            id: nextId++,
            from:
              addresses(parsed.from)[0] ??
              (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            to: session.envelope.rcptTo.map((rcpt) => rcpt.address),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html,
            links: findLinks(parsed.text ?? '', html),
            receivedAt: new Date().toISOString(),
          };
          kept.push(mail);
          if (kept.length > MAX_KEPT) kept.shift();
          for (const waiter of waiters) {
            if (waiter.match(mail)) {
              waiters.delete(waiter);
              waiter.resolve(mail);
            }
          }
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => resolve());
  });
  const port = (server.server.address() as AddressInfo).port;

  return {
    port,
    messages: () => [...kept],
    clear: () => {
      kept.length = 0;
    },
    waitFor(match, timeoutMs = 5000) {
      const already = kept.find(match);
      if (already) return Promise.resolve(already);
      return new Promise((resolve, reject) => {
        const waiter = { match, resolve };
        waiters.add(waiter);
        setTimeout(() => {
          if (waiters.delete(waiter)) reject(new Error(`no matching mail within ${timeoutMs} ms`));
        }, timeoutMs).unref();
      });
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
