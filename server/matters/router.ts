import { matterParams } from '../../shared/schemas/common';
import { createMatterSchema, type CreateMatterResponse } from '../../shared/schemas/matters';
import { defineRoute } from '../http/route';
import { createMatter, listMyMatters, readMatterHome } from './service';

export const matterRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters',
    access: 'signed-in',
    summary: 'My matters with my role',
    handler: ({ ctx, user }) => listMyMatters(ctx.db, user.id),
  }),
  defineRoute({
    method: 'post',
    path: '/matters',
    access: { firm: 'admin.matters' },
    schemas: { body: createMatterSchema },
    status: 201,
    summary: 'Create a matter with its lead (firm admin)',
    handler: async ({ ctx, user, body, ip }): Promise<CreateMatterResponse> => ({
      matter: await createMatter(ctx.db, body, { id: user.id, email: user.email, ip }),
    }),
  }),
  defineRoute({
    method: 'get',
    path: '/matters/:matterId',
    access: { matter: 'matter.view' },
    schemas: { params: matterParams },
    summary: "The matter's home page",
    handler: ({ ctx, matter }) => readMatterHome(ctx.db, matter.matterId, matter.role),
  }),
];
