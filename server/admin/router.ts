import {
  appointLeadSchema,
  createUserSchema,
  type AdminMattersResponse,
  type AppointLeadResponse,
  type CreateUserResponse,
} from '../../shared/schemas/admin';
import { matterParams } from '../../shared/schemas/common';
import { defineRoute } from '../http/route';
import { appointLead, listAdminMatters } from '../matters/service';
import { createUserByAdmin, listAdminUsers } from './service';

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
    summary: 'Create an account with a temporary password (firm admin)',
    handler: async ({ ctx, user, body, ip }): Promise<CreateUserResponse> => ({
      user: await createUserByAdmin(ctx.db, body, { id: user.id, email: user.email, ip }),
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
