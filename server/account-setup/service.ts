import { randomBytes } from 'node:crypto';
import type { Request, Response } from 'express';
import type { CreateUserReq } from '../../shared/schemas/admin';
import type {
  AccountSetupPreviewResponse,
  CompleteAccountSetupReq,
  MeResponse,
} from '../../shared/schemas/auth';
import { recordAudit } from '../audit/record';
import { assertNewPassword, hashPassword } from '../auth/password';
import { readMe } from '../auth/service';
import type { AppContext } from '../context';
import { HttpError, notFound } from '../http/errors';
import { hashInvitationToken, newInvitationToken } from '../invitations/token';
import { updatePasswordHash } from '../users/queries';
import { createAccount } from '../users/service';
import { findSetupToken, insertSetupToken, markSetupTokenUsed } from './queries';

const DAY_MS = 24 * 60 * 60 * 1000;

type SetupRow = NonNullable<Awaited<ReturnType<typeof findSetupToken>>>;

/** Same refusals as invitation links: 404 unknown, 409 used, 410 expired. */
function assertUsable(row: SetupRow | undefined, now: Date): SetupRow {
  if (!row) throw notFound('Set-up link');
  if (row.used_at)
    throw new HttpError('invitation_used', 'This set-up link has already been used.');
  if (new Date(row.expires_at) <= now) {
    throw new HttpError(
      'invitation_expired',
      'This set-up link has expired; ask a firm administrator for a new one.',
    );
  }
  return row;
}

/**
 * Creates an account whose password nobody knows and e-mails its holder a one-time
 * link to choose one. If the mail cannot be sent, the account is removed again.
 */
export async function createAccountWithSetupLink(
  ctx: AppContext,
  input: CreateUserReq,
  actor: { id: string; email: string; name: string },
  origin: string,
): Promise<{ userId: string }> {
  const row = await createAccount(ctx.db, {
    email: input.email,
    name: input.name,
    password: randomBytes(32).toString('base64url'),
    isAdmin: input.isAdmin,
  });
  const token = newInvitationToken();
  const expiresAt = new Date(Date.now() + ctx.config.invitationTtlDays * DAY_MS).toISOString();
  await insertSetupToken(ctx.db, {
    userId: row.id,
    tokenHash: hashInvitationToken(token),
    createdBy: actor.id,
    expiresAt,
  });
  const link = `${origin}/account-setup/${token}`;
  const text = [
    `${actor.name} created a Quarry account for you (${row.email}).`,
    '',
    `Choose your password here (the link works once and expires ${new Date(expiresAt).toUTCString()}):`,
    link,
    '',
    'If you did not expect this message, you can ignore it.',
  ].join('\n');
  try {
    await ctx.mail.send({ to: row.email, subject: 'Your Quarry account', text });
  } catch (error) {
    await ctx.db.deleteFrom('users').where('id', '=', row.id).execute();
    ctx.logger.error({ err: error, to: row.email }, 'account set-up mail failed');
    throw new HttpError(
      'internal_error',
      'The set-up e-mail could not be sent; the account was not created. Try again later.',
      undefined,
      502,
    );
  }
  return { userId: row.id };
}

export async function previewAccountSetup(
  ctx: AppContext,
  token: string,
): Promise<AccountSetupPreviewResponse> {
  const row = assertUsable(await findSetupToken(ctx.db, hashInvitationToken(token)), new Date());
  return { email: row.email, name: row.name, expiresAt: row.expires_at };
}

/** Sets the password once, ends any other session of the account, and signs this browser in. */
export async function completeAccountSetup(
  ctx: AppContext,
  req: Request,
  res: Response,
  token: string,
  input: CompleteAccountSetupReq,
  ip: string | null,
): Promise<MeResponse> {
  const row = assertUsable(await findSetupToken(ctx.db, hashInvitationToken(token)), new Date());
  await assertNewPassword('password', input.password, { email: row.email, name: row.name });
  const passwordHash = await hashPassword(input.password);
  await ctx.db.transaction().execute(async (trx) => {
    if (!(await markSetupTokenUsed(trx, row.id, new Date().toISOString()))) {
      throw new HttpError('invitation_used', 'This set-up link has already been used.');
    }
    await updatePasswordHash(trx, row.user_id, passwordHash);
    await recordAudit(trx, {
      actorId: row.user_id,
      actorEmail: row.email,
      ip,
      action: 'auth.password_changed',
      detail: { via: 'account_setup' },
    });
  });
  await ctx.auth.endAllSessions(row.user_id);
  await ctx.auth.startSession(req, res, row.user_id);
  return readMe(ctx.db, row.user_id);
}
