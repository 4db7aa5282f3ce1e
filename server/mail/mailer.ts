import nodemailer from 'nodemailer';
import type { Logger } from 'pino';
import type { Config } from '../config';
import { startFakeSmtp, type FakeSmtp } from './fake-smtp';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  /** The local fake SMTP server's mailbox when SMTP_URL is unset; null when real SMTP is used. */
  fake: FakeSmtp | null;
  close(): Promise<void>;
}

/** nodemailer over SMTP_URL, or over a local fake SMTP server when SMTP_URL is unset. */
export async function createMailer(config: Config, logger: Logger): Promise<Mailer> {
  const fake = config.smtpUrl ? null : await startFakeSmtp();
  const transport = fake
    ? nodemailer.createTransport({
        host: '127.0.0.1',
        port: fake.port,
        secure: false,
        ignoreTLS: true,
      })
    : nodemailer.createTransport(config.smtpUrl as string);
  if (fake) {
    logger.info(
      { port: fake.port },
      'SMTP_URL is unset: mail goes to a local fake SMTP server and is not delivered',
    );
  }
  return {
    fake,
    async send(mail) {
      await transport.sendMail({ from: config.mailFrom, ...mail });
      logger.info({ to: mail.to, subject: mail.subject }, 'mail sent');
    },
    async close() {
      transport.close();
      await fake?.close();
    },
  };
}
