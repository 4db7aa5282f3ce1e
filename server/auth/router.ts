import { changePasswordSchema, signInSchema } from '../../shared/schemas/auth';
import { defineRoute } from '../http/route';
import { changePassword, readMe, signIn, signOut } from './service';

export const authRoutes = [
  defineRoute({
    method: 'post',
    path: '/auth/sign-in',
    access: 'public',
    schemas: { body: signInSchema },
    summary: 'Sign in with e-mail and password',
    handler: ({ ctx, req, res, body, ip }) => signIn(ctx, req, res, body, ip),
  }),
  defineRoute({
    method: 'post',
    path: '/auth/sign-out',
    access: 'public',
    summary: 'End this browser session',
    handler: async ({ ctx, req, res, ip }) => {
      await signOut(ctx, req, res, ip);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/auth/me',
    access: 'signed-in',
    beforePasswordChange: true,
    summary: 'The signed-in user and their matters',
    handler: ({ ctx, user }) => readMe(ctx.db, user.id),
  }),
  defineRoute({
    method: 'post',
    path: '/auth/password',
    access: 'signed-in',
    beforePasswordChange: true,
    schemas: { body: changePasswordSchema },
    summary: 'Change my password (ends all my other sessions)',
    handler: ({ ctx, req, res, user, body, ip }) => changePassword(ctx, req, res, user, body, ip),
  }),
];
