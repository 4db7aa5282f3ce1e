import { matterParams } from '../../shared/schemas/common';
import {
  acceptInvitationSchema,
  createInvitationSchema,
  invitationParams,
  invitationTokenParams,
  type CreateInvitationResponse,
} from '../../shared/schemas/invitations';
import { ownOrigin } from '../http/csrf';
import { defineRoute } from '../http/route';
import {
  acceptInvitation,
  createInvitation,
  previewInvitation,
  withdrawInvitation,
} from './service';

export const invitationRoutes = [
  defineRoute({
    method: 'post',
    path: '/matters/:matterId/invitations',
    access: { matter: 'members.manage' },
    schemas: { params: matterParams, body: createInvitationSchema },
    status: 201,
    summary: 'Invite a person by e-mail with a role',
    handler: async ({ ctx, req, matter, body, user, ip }): Promise<CreateInvitationResponse> => ({
      invitation: await createInvitation(
        ctx,
        matter.matterId,
        body,
        { ...user, ip },
        ctx.config.publicOrigin ?? ownOrigin(req),
      ),
    }),
  }),
  defineRoute({
    method: 'delete',
    path: '/matters/:matterId/invitations/:id',
    access: { matter: 'members.manage' },
    schemas: { params: invitationParams },
    summary: 'Revoke a pending invitation',
    handler: async ({ ctx, matter, params, user, ip }) => {
      await withdrawInvitation(ctx, matter.matterId, params.id, { ...user, ip });
    },
  }),
  defineRoute({
    method: 'get',
    path: '/invitations/:token',
    access: 'public',
    schemas: { params: invitationTokenParams },
    summary: 'What an invitation link offers',
    handler: ({ ctx, params }) => previewInvitation(ctx, params.token),
  }),
  defineRoute({
    method: 'post',
    path: '/invitations/:token/accept',
    access: 'public',
    schemas: { params: invitationTokenParams, body: acceptInvitationSchema },
    summary: 'Accept an invitation (creates or links the account, signs in)',
    handler: ({ ctx, req, res, params, body, ip }) =>
      acceptInvitation(ctx, req, res, params.token, body, ip),
  }),
];
