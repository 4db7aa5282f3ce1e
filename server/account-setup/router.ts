import { accountSetupParams, completeAccountSetupSchema } from '../../shared/schemas/auth';
import { defineRoute } from '../http/route';
import { completeAccountSetup, previewAccountSetup } from './service';

export const accountSetupRoutes = [
  defineRoute({
    method: 'get',
    path: '/account-setup/:token',
    access: 'public',
    schemas: { params: accountSetupParams },
    summary: 'Whose account a set-up link is for',
    handler: ({ ctx, params }) => previewAccountSetup(ctx, params.token),
  }),
  defineRoute({
    method: 'post',
    path: '/account-setup/:token',
    access: 'public',
    schemas: { params: accountSetupParams, body: completeAccountSetupSchema },
    summary: 'Choose the password of a new account (once) and sign in',
    handler: ({ ctx, req, res, params, body, ip }) =>
      completeAccountSetup(ctx, req, res, params.token, body, ip),
  }),
];
