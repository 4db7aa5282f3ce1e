import {
  appointLeadSchema,
  createUserSchema,
  type AdminMattersResponse,
  type AppointLeadResponse,
  type CreateUserResponse,
  type UpdateUserResponse,
  updateUserSchema,
  userParams,
} from '../../shared/schemas/admin';
import { matterParams } from '../../shared/schemas/common';
import { ownOrigin } from '../http/csrf';
import { defineRoute } from '../http/route';
import { appointLead, listAdminMatters } from '../matters/service';
import { createUserByAdmin, listAdminUsers, updateUserByAdmin } from './service';

export const adminRoutes = [
  defineRoute({
    method: 'get',
    path: '/admin/users',
    access: { firm: 'admin.accounts' },
    summary: 'Every account (firm admin)',
    handler: ({ ctx }) => listAdminUsers(ctx.db),
  }),
  defineRoute({
    method: 'post',
    path: '/admin/users',
    access: { firm: 'admin.accounts' },
    schemas: { body: createUserSchema },
    status: 201,
    summary: 'Create an account with a temporary password or an e-mailed set-up link (firm admin)',
    handler: ({ ctx, req, user, body, ip }): Promise<CreateUserResponse> =>
      createUserByAdmin(ctx, body, { ...user, ip }, ctx.config.publicOrigin ?? ownOrigin(req)),
  }),
  defineRoute({
    method: 'patch',
    path: '/admin/users/:userId',
    access: { firm: 'admin.accounts' },
    schemas: { params: userParams, body: updateUserSchema },
    summary: 'Disable or re-enable an account, or change its admin flag (firm admin)',
    handler: async ({ ctx, user, params, body, ip }): Promise<UpdateUserResponse> => ({
      user: await updateUserByAdmin(ctx, params.userId, body, {
        id: user.id,
        email: user.email,
        ip,
      }),
    }),
  }),
  defineRoute({
    method: 'get',
    path: '/admin/matters',
    access: { firm: 'admin.matters' },
    summary: 'Every matter with its leads (firm admin)',
    handler: async ({ ctx }): Promise<AdminMattersResponse> => ({
      matters: await listAdminMatters(ctx.db),
    }),
  }),
  defineRoute({
    method: 'put',
    path: '/admin/matters/:matterId/lead',
    access: { firm: 'admin.matters' },
    schemas: { params: matterParams, body: appointLeadSchema },
    summary: 'Appoint a matter lead (firm admin)',
    handler: async ({ ctx, user, params, body, ip }): Promise<AppointLeadResponse> => ({
      matter: await appointLead(ctx.db, params.matterId, body.lead, {
        id: user.id,
        email: user.email,
        ip,
      }),
    }),
  }),
];
