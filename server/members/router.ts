import { matterParams } from '../../shared/schemas/common';
import {
  changeRoleSchema,
  grantMemberSchema,
  memberParams,
  type MemberResponse,
} from '../../shared/schemas/members';
import { defineRoute } from '../http/route';
import { changeRole, grantMember, listMembers, revokeMember } from './service';

export const memberRoutes = [
  defineRoute({
    method: 'get',
    path: '/matters/:matterId/members',
    access: { matter: 'members.view' },
    schemas: { params: matterParams },
    summary: 'Members and pending invitations',
    handler: ({ ctx, matter }) => listMembers(ctx.db, matter.matterId),
  }),
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/members',
    access: { matter: 'members.manage' },
    schemas: { params: matterParams, body: grantMemberSchema },
    status: 201,
    summary: 'Grant an existing account a role',
    handler: async ({ ctx, matter, body, user, ip }): Promise<MemberResponse> => ({
      member: await grantMember(ctx.db, matter.matterId, body, {
        id: user.id,
        email: user.email,
        ip,
      }),
    }),
  }),
  defineRoute({
    method: 'patch',
    path: '/matters/:matterId/members/:userId',
    access: { matter: 'members.manage' },
    schemas: { params: memberParams, body: changeRoleSchema },
    summary: "Change a member's role",
    handler: async ({ ctx, matter, params, body, user, ip }): Promise<MemberResponse> => ({
      member: await changeRole(ctx.db, matter.matterId, params.userId, body, {
        id: user.id,
        email: user.email,
        ip,
      }),
    }),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/members/:userId',
    access: { matter: 'members.manage' },
    schemas: { params: memberParams },
    summary: "Revoke a member's access",
    handler: async ({ ctx, matter, params, user, ip }) => {
      await revokeMember(ctx.db, matter.matterId, params.userId, {
        id: user.id,
        email: user.email,
        ip,
      });
    },
  }),
];
