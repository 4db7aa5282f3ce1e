import { matterParams } from '../../shared/schemas/common';
import { addPasswordSchema, passwordParams } from '../../shared/schemas/passwords';
import { defineRoute } from '../http/route';
import { addPassword, listPasswords, removePassword } from './service';

export const passwordRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/passwords',
    access: { matter: 'passwords.manage' },
    schemas: { params: matterParams },
    summary: "The matter's password list for encrypted files (labels only, never the passwords)",
    handler: ({ ctx, matter }) => listPasswords(ctx, matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/passwords',
    access: { matter: 'passwords.manage' },
    schemas: { params: matterParams, body: addPasswordSchema },
    status: 201,
    summary: 'Add a password to the list (stored encrypted; retry failed files to use it)',
    handler: ({ ctx, matter, body, user, ip }) =>
      addPassword(ctx, matter.matterId, body, { id: user.id, email: user.email, ip }),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/passwords/:passwordId',
    access: { matter: 'passwords.manage' },
    schemas: { params: passwordParams },
    summary: 'Remove a password from the list',
    handler: async ({ ctx, matter, params, user, ip }) => {
      await removePassword(ctx, matter.matterId, params.passwordId, {
        id: user.id,
        email: user.email,
        ip,
      });
      return undefined;
    },
  }),
];
