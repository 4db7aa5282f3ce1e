import { randomUUID } from 'node:crypto';
import type { Request, Response } from 'express';
import type { MatterRole } from '../../shared/roles';
import type {
  AcceptInvitationReq,
  AcceptInvitationResponse,
  CreateInvitationReq,
  InvitationPreviewResponse,
} from '../../shared/schemas/invitations';
import { invitationNewPasswordSchema } from '../../shared/schemas/invitations';
import type { PendingInvitation } from '../../shared/schemas/members';
import { personNameSchema } from '../../shared/schemas/common';
import { recordAudit } from '../audit/record';
import { assertNewPassword, hashPassword, verifyPassword } from '../auth/password';
import type { AppContext } from '../context';
import {
  conflict,
  forbidden,
  HttpError,
  matterNotFound,
  notFound,
  validationError,
} from '../http/errors';
import { findMatterById } from '../matters/queries';
import { findMemberRow, insertMember } from '../members/queries';
import { findUserByEmail, findUserById, insertUser } from '../users/queries';
import { userRowToApiUser } from '../users/service';
import { invitationMail } from './mail';
import {
  findInvitationByTokenHash,
  findInvitationInMatter,
  insertInvitation,
  markAccepted,
  revokeInvitation,
  revokePendingFor,
  type InvitationWithMatter,
} from './queries';
import { hashInvitationToken, newInvitationToken } from './token';

export interface Actor {
  id: string;
  email: string;
  name: string;
  ip: string | null;
}

const DAY_MS = 24 * 60 * 60 * 1000;

/**
 * Why a token is refused (documented in docs/ARCHITECTURE.md):
 * unknown -> 404 not_found; revoked -> 410 invitation_revoked; expired -> 410
 * invitation_expired; already accepted -> 409 invitation_used.
 */
function assertUsable(
  invitation: InvitationWithMatter | undefined,
  now: Date,
): InvitationWithMatter {
  if (!invitation) throw notFound('Invitation');
  if (invitation.accepted_at)
    throw new HttpError('invitation_used', 'This invitation has already been used.');
  if (invitation.revoked_at)
    throw new HttpError('invitation_revoked', 'This invitation was withdrawn by the matter lead.');
  if (new Date(invitation.expires_at) <= now) {
    throw new HttpError(
      'invitation_expired',
      'This invitation has expired; ask the matter lead for a new one.',
    );
  }
  return invitation;
}

/** Creates an invitation (replacing this address's pending ones) and e-mails the one-time link. */
export async function createInvitation(
  ctx: AppContext,
  matterId: number,
  input: CreateInvitationReq,
  actor: Actor,
  origin: string,
): Promise<PendingInvitation> {
  const matter = await findMatterById(ctx.db, matterId);
  if (!matter) throw matterNotFound();
  const existing = await findUserByEmail(ctx.db, input.email);
  if (existing && (await findMemberRow(ctx.db, matterId, existing.id))) {
    throw conflict(`${input.email} is already a member of this matter.`, 'email');
  }
  const token = newInvitationToken();
  const expiresAt = new Date(Date.now() + ctx.config.invitationTtlDays * DAY_MS).toISOString();
  const id = await ctx.db.transaction().execute(async (trx) => {
    const replaced = await revokePendingFor(trx, matterId, input.email);
    const invitationId = await insertInvitation(trx, {
      matterId,
      email: input.email,
      role: input.role,
      tokenHash: hashInvitationToken(token),
      invitedBy: actor.id,
      expiresAt,
    });
    await recordAudit(trx, {
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip,
      matterId,
      action: 'invitation.sent',
      targetType: 'invitation',
      targetId: invitationId,
      detail: { email: input.email, role: input.role, replacedPending: replaced },
    });
    return invitationId;
  });
  const link = `${origin}/invitations/${token}`;
  try {
    await ctx.mail.send(
      invitationMail({
        to: input.email,
        matterName: matter.name,
        role: input.role,
        inviterName: actor.name,
        link,
        expiresAt,
      }),
    );
  } catch (error) {
    // An invitation nobody received must not stay usable.
    await revokeInvitation(ctx.db, id);
    ctx.logger.error({ err: error, to: input.email }, 'invitation mail failed');
    throw new HttpError(
      'internal_error',
      'The invitation e-mail could not be sent; nothing was kept. Try again later.',
      undefined,
      502,
    );
  }
  const row = await findInvitationInMatter(ctx.db, matterId, id);
  if (!row) throw notFound('Invitation');
  return {
    id,
    email: row.email,
    role: row.role as MatterRole,
    invitedBy: { id: actor.id, name: actor.name, email: actor.email },
    createdAt: row.created_at,
    expiresAt: row.expires_at,
  };
}

export async function previewInvitation(
  ctx: AppContext,
  token: string,
): Promise<InvitationPreviewResponse> {
  const invitation = assertUsable(
    await findInvitationByTokenHash(ctx.db, hashInvitationToken(token)),
    new Date(),
  );
  return {
    matterName: invitation.matter_name,
    role: invitation.role as MatterRole,
    email: invitation.email,
    invitedBy: invitation.invited_by_name ?? null,
    expiresAt: invitation.expires_at,
    accountExists: (await findUserByEmail(ctx.db, invitation.email)) !== undefined,
  };
}

/**
 * Accepts an invitation once: creates the account (name + password) or links the
 * existing account with the invitation's e-mail (signed in as it, or its password),
 * adds the membership, and signs this browser in as that account.
 */
export async function acceptInvitation(
  ctx: AppContext,
  req: Request,
  res: Response,
  token: string,
  input: AcceptInvitationReq,
  ip: string | null,
): Promise<AcceptInvitationResponse> {
  const invitation = assertUsable(
    await findInvitationByTokenHash(ctx.db, hashInvitationToken(token)),
    new Date(),
  );
  const existing = await findUserByEmail(ctx.db, invitation.email);
  let newUser: { id: string; name: string; passwordHash: string } | null = null;
  if (existing?.disabled_at) throw forbidden('This account is disabled; ask a firm administrator.');
  if (existing) {
    const signedInAsInvitee = req.auth?.user.id === existing.id;
    if (!signedInAsInvitee) {
      if (!input.password) {
        throw new HttpError(
          'validation_failed',
          'password: is required to link your existing account',
          'password',
        );
      }
      // The same throttle as sign-in: this is a password check too.
      ctx.auth.throttle.assertAllowed(res, existing.email, ip);
      if (!(await verifyPassword(existing.password_hash, input.password))) {
        ctx.auth.throttle.recordFailure(existing.email, ip);
        throw new HttpError(
          'invalid_credentials',
          `The password is not correct for ${existing.email}.`,
          'password',
        );
      }
    }
  } else {
    const name = personNameSchema.safeParse(input.name);
    if (!name.success) throw validationError('name', name.error.issues[0].message);
    const password = invitationNewPasswordSchema.safeParse(input.password);
    if (!password.success) throw validationError('password', password.error.issues[0].message);
    await assertNewPassword('password', password.data, {
      email: invitation.email,
      name: name.data,
    });
    newUser = {
      id: randomUUID(),
      name: name.data,
      passwordHash: await hashPassword(password.data),
    };
  }

  const userId = existing?.id ?? (newUser as { id: string }).id;
  const now = new Date().toISOString();
  const role = await ctx.db.transaction().execute(async (trx) => {
    if (newUser) {
      if (await findUserByEmail(trx, invitation.email))
        throw conflict('An account with this e-mail was just created.', 'email');
      await insertUser(trx, {
        id: newUser.id,
        email: invitation.email,
        name: newUser.name,
        password_hash: newUser.passwordHash,
        is_admin: 0,
        disabled_at: null,
        password_changed_at: now,
        created_at: now,
      });
    }
    if (!(await markAccepted(trx, invitation.id, userId, now))) {
      throw new HttpError('invitation_used', 'This invitation has already been used.');
    }
    const member = await findMemberRow(trx, invitation.matter_id, userId);
    if (!member) {
      await insertMember(trx, {
        matterId: invitation.matter_id,
        userId,
        role: invitation.role,
        grantedBy: invitation.invited_by,
      });
    }
    await recordAudit(trx, {
      actorId: userId,
      actorEmail: invitation.email,
      ip,
      matterId: invitation.matter_id,
      action: 'invitation.accepted',
      targetType: 'invitation',
      targetId: invitation.id,
      detail: {
        role: member?.role ?? invitation.role,
        accountCreated: newUser !== null,
        alreadyMember: Boolean(member),
      },
    });
    return (member?.role ?? invitation.role) as MatterRole;
  });

  if (req.auth?.user.id !== userId) await ctx.auth.startSession(req, res, userId);
  const user = await findUserById(ctx.db, userId);
  if (!user) throw notFound('Account');
  return {
    matterId: invitation.matter_id,
    role,
    user: userRowToApiUser(user),
    accountCreated: newUser !== null,
  };
}

export async function withdrawInvitation(
  ctx: AppContext,
  matterId: number,
  id: number,
  actor: Actor,
): Promise<void> {
  const invitation = await findInvitationInMatter(ctx.db, matterId, id);
  if (!invitation) throw notFound('Invitation');
  if (invitation.accepted_at)
    throw new HttpError(
      'invitation_used',
      'This invitation has already been accepted; revoke the member instead.',
    );
  if (!(await revokeInvitation(ctx.db, id)))
    throw new HttpError('invitation_revoked', 'This invitation was already revoked.');
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    matterId,
    action: 'invitation.revoked',
    targetType: 'invitation',
    targetId: id,
    detail: { email: invitation.email, role: invitation.role },
  });
}
