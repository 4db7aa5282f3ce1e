import type { DevMailResponse, InstanceInfoResponse } from '../../shared/schemas/dev';
import { devMailboxAccess, devPagesEnabled } from '../config';
import { notFound } from '../http/errors';
import { defineRoute } from '../http/route';

export const devRoutes = [
  defineRoute({
    method: 'get',
    path: '/dev/mail',
    // The mailbox holds every invitation and set-up link, which are credentials: outside
    // `npm run dev` only a signed-in firm admin may read it (anyone else: 401 or 403).
    access: { firm: 'admin.accounts' },
    devAccess: 'public',
    summary:
      'Messages the local fake SMTP server received (development, or firm admins in demo mode)',
    handler: ({ ctx }): DevMailResponse => {
      if (!devPagesEnabled(ctx.config)) throw notFound('API route GET /api/dev/mail');
      const messages = (ctx.mail.fake?.messages() ?? []).reverse();
      return { fakeSmtp: ctx.mail.fake !== null, messages };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/instance',
    access: 'public',
    summary: 'How this installation runs (demo mode, who may read the demo mailbox)',
    handler: ({ ctx }): InstanceInfoResponse => ({
      demoMode: ctx.config.demoMode,
      devMailbox: devMailboxAccess(ctx.config),
    }),
  }),
];
