/** GET /api/dev/mail (demo/dev mode only): what the local fake SMTP server received, newest first. */
export interface DevMailMessage {
  id: number;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  links: string[];
  receivedAt: string;
}

export interface DevMailResponse {
  /** False when SMTP_URL is set (real mail; nothing is kept). */
  fakeSmtp: boolean;
  messages: DevMailMessage[];
}
