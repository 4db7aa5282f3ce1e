import type { DevMailResponse } from '../../shared/schemas/dev';
import { devPagesEnabled } from '../config';
import { notFound } from '../http/errors';
import { defineRoute } from '../http/route';

export const devRoutes = [
  defineRoute({
    method: 'get',
    path: '/dev/mail',
    // Public so an invitee can open the link without signing in; exists only in demo/dev mode.
    access: 'public',
    summary: 'Messages the local fake SMTP server received (demo/dev mode only)',
    handler: ({ ctx }): DevMailResponse => {
      if (!devPagesEnabled(ctx.config)) throw notFound('API route GET /api/dev/mail');
      const messages = (ctx.mail.fake?.messages() ?? []).reverse();
      return { fakeSmtp: ctx.mail.fake !== null, messages };
    },
  }),
];
