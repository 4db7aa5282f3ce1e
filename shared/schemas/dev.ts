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

/**
 * GET /api/instance (public): how this installation runs. In demo mode every screen says
 * that the demo accounts' password is published. devMailbox: who may read GET
 * /api/dev/mail ('anyone' only under `npm run dev`, 'firm-admins' in demo mode, 'off').
 */
export interface InstanceInfoResponse {
  demoMode: boolean;
  devMailbox: 'anyone' | 'firm-admins' | 'off';
}
