import type { Request, Response } from 'express';
import { FIRM_PERMISSIONS, permissionsOf, type MatterRole } from '../../shared/roles';
import type { ChangePasswordReq, MeResponse, SignInReq } from '../../shared/schemas/auth';
import { actorOf, recordAudit } from '../audit/record';
import type { AppContext } from '../context';
import type { Db } from '../db/database';
import { HttpError, unauthenticated, validationError } from '../http/errors';
import type { SessionUser } from '../http/request-context';
import { listMattersOfUser } from '../matters/queries';
import { findUserByEmail, findUserById, updatePasswordHash } from '../users/queries';
import { userRowToApiUser } from '../users/service';
import { assertNewPassword, hashPassword, verifyAgainstDummy, verifyPassword } from './password';

/** The one message for every failed sign-in, so it never tells whether the e-mail exists. */
export const INVALID_CREDENTIALS_MESSAGE = 'The e-mail address or password is incorrect.';

export const TEMPORARY_PASSWORD_EXPIRED_MESSAGE =
  'This temporary password has expired. Ask a firm administrator to set up your account again.';

const isExpired = (at: string | null) => at !== null && new Date(at).getTime() <= Date.now();

export async function readMe(db: Db, userId: string): Promise<MeResponse> {
  const user = await findUserById(db, userId);
  if (!user) throw unauthenticated();
  const matters = await listMattersOfUser(db, userId);
  return {
    user: userRowToApiUser(user),
    passwordChangeRequired: user.password_must_change === 1,
    firmPermissions: user.is_admin === 1 ? [...FIRM_PERMISSIONS] : [],
    matters: matters.map((m) => ({
      id: m.id,
      name: m.name,
      controlPrefix: m.control_prefix,
      role: m.role as MatterRole,
      permissions: permissionsOf(m.role as MatterRole),
    })),
  };
}

/**
 * Checks the password (against a dummy hash when the account is unknown or disabled,
 * so timing matches), records the attempt, and starts a session on success.
 */
export async function signIn(
  ctx: AppContext,
  req: Request,
  res: Response,
  input: SignInReq,
  ip: string | null,
): Promise<MeResponse> {
  ctx.auth.throttle.assertAllowed(res, input.email, ip);
  const user = await findUserByEmail(ctx.db, input.email);
  const usable = user && user.disabled_at === null;
  const ok = usable
    ? await verifyPassword(user.password_hash, input.password)
    : await verifyAgainstDummy(input.password);
  if (!ok || !user) {
    ctx.auth.throttle.recordFailure(input.email, ip);
    await recordAudit(ctx.db, {
      actorId: user?.id ?? null,
      actorEmail: input.email,
      action: 'auth.sign_in_failed',
      detail: {
        reason: !user ? 'unknown_account' : usable ? 'wrong_password' : 'account_disabled',
      },
      ip,
    });
    throw new HttpError('invalid_credentials', INVALID_CREDENTIALS_MESSAGE);
  }
  if (user.password_must_change === 1 && isExpired(user.password_expires_at)) {
    await recordAudit(ctx.db, {
      ...actorOf(user, ip),
      action: 'auth.sign_in_failed',
      detail: { reason: 'temporary_password_expired' },
    });
    throw new HttpError('invalid_credentials', TEMPORARY_PASSWORD_EXPIRED_MESSAGE);
  }
  await ctx.auth.startSession(req, res, user.id);
  await recordAudit(ctx.db, { ...actorOf(user, ip), action: 'auth.sign_in' });
  return readMe(ctx.db, user.id);
}

export async function signOut(
  ctx: AppContext,
  req: Request,
  res: Response,
  ip: string | null,
): Promise<void> {
  const user = req.auth?.user;
  await ctx.auth.endSession(req, res);
  if (user) await recordAudit(ctx.db, { ...actorOf(user, ip), action: 'auth.sign_out' });
}

/**
 * Changes the password, ends every session of the user (other browsers are signed out
 * on their next request) and starts a fresh session for this browser.
 */
export async function changePassword(
  ctx: AppContext,
  req: Request,
  res: Response,
  sessionUser: SessionUser,
  input: ChangePasswordReq,
  ip: string | null,
): Promise<MeResponse> {
  const user = await findUserById(ctx.db, sessionUser.id);
  if (!user) throw unauthenticated();
  ctx.auth.throttle.assertAllowed(res, user.email, ip);
  if (!(await verifyPassword(user.password_hash, input.currentPassword))) {
    ctx.auth.throttle.recordFailure(user.email, ip);
    throw validationError('currentPassword', 'is incorrect');
  }
  await assertNewPassword('newPassword', input.newPassword, {
    email: user.email,
    name: user.name,
    current: input.currentPassword,
  });
  await updatePasswordHash(ctx.db, user.id, await hashPassword(input.newPassword));
  await ctx.auth.endAllSessions(user.id);
  await ctx.auth.startSession(req, res, user.id);
  await recordAudit(ctx.db, { ...actorOf(user, ip), action: 'auth.password_changed' });
  return readMe(ctx.db, user.id);
}
