import type {
  AdminUser,
  AdminUsersResponse,
  CreateUserReq,
  CreateUserResponse,
  UpdateUserReq,
} from '../../shared/schemas/admin';
import { conflict, notFound } from '../http/errors';
import { createAccountWithSetupLink } from '../account-setup/service';
import type { AppContext } from '../context';
import { recordAudit } from '../audit/record';
import type { Db } from '../db/database';
import { findUserById, listUsersWithMatterCounts } from '../users/queries';
import { createAccount } from '../users/service';
import { assertNewPassword } from '../auth/password';

type UserListRow = Awaited<ReturnType<typeof listUsersWithMatterCounts>>[number];

function toAdminUser(row: UserListRow): AdminUser {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    isAdmin: row.is_admin === 1,
    disabled: row.disabled_at !== null,
    createdAt: row.created_at,
    matterCount: Number(row.matter_count),
  };
}

export async function listAdminUsers(db: Db): Promise<AdminUsersResponse> {
  return { users: (await listUsersWithMatterCounts(db)).map(toAdminUser) };
}

/**
 * Creates an account with the admin's temporary password, or, without one, an account
 * whose holder chooses the password through an e-mailed one-time set-up link.
 */
export async function createUserByAdmin(
  ctx: AppContext,
  input: CreateUserReq,
  actor: { id: string; email: string; name: string; ip: string | null },
  origin: string,
): Promise<CreateUserResponse> {
  if (input.temporaryPassword)
    await assertNewPassword('temporaryPassword', input.temporaryPassword, {
      email: input.email,
      name: input.name,
    });
  // A temporary password must be changed at first sign-in and stops working after
  // QUARRY_TEMPORARY_PASSWORD_HOURS (OWASP ASVS 4.0.3 V2.3.1).
  const temporaryUntil = new Date(
    Date.now() + ctx.config.temporaryPasswordHours * 60 * 60 * 1000,
  ).toISOString();
  const userId = input.temporaryPassword
    ? (
        await createAccount(ctx.db, {
          email: input.email,
          name: input.name,
          password: input.temporaryPassword,
          isAdmin: input.isAdmin,
          temporaryUntil,
        })
      ).id
    : (await createAccountWithSetupLink(ctx, input, actor, origin)).userId;
  const setupLinkSent = !input.temporaryPassword;
  await recordAudit(ctx.db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    action: 'user.created',
    targetType: 'user',
    targetId: userId,
    detail: { email: input.email, isAdmin: input.isAdmin, setupLinkSent },
  });
  const created = (await listUsersWithMatterCounts(ctx.db)).find((user) => user.id === userId);
  return { user: toAdminUser(created as UserListRow), setupLinkSent };
}

/** Disables/re-enables an account or changes its firm-admin flag (never one's own). */
export async function updateUserByAdmin(
  ctx: AppContext,
  userId: string,
  input: UpdateUserReq,
  actor: { id: string; email: string; ip: string | null },
): Promise<AdminUser> {
  const user = await findUserById(ctx.db, userId);
  if (!user) throw notFound('Account');
  if (userId === actor.id && (input.disabled === true || input.isAdmin === false)) {
    throw conflict('You cannot disable your own account or remove your own admin rights.');
  }
  const audit = {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    targetType: 'user',
    targetId: userId,
  };
  await ctx.db.transaction().execute(async (trx) => {
    if (input.disabled !== undefined && input.disabled !== (user.disabled_at !== null)) {
      await trx
        .updateTable('users')
        .set({ disabled_at: input.disabled ? new Date().toISOString() : null })
        .where('id', '=', userId)
        .execute();
      await recordAudit(trx, {
        ...audit,
        action: input.disabled ? 'user.disabled' : 'user.enabled',
        detail: { email: user.email },
      });
    }
    if (input.isAdmin !== undefined && input.isAdmin !== (user.is_admin === 1)) {
      await trx
        .updateTable('users')
        .set({ is_admin: input.isAdmin ? 1 : 0 })
        .where('id', '=', userId)
        .execute();
      await recordAudit(trx, {
        ...audit,
        action: 'user.admin_changed',
        detail: { email: user.email, isAdmin: input.isAdmin },
      });
    }
  });
  if (input.disabled) await ctx.auth.endAllSessions(userId);
  const updated = (await listUsersWithMatterCounts(ctx.db)).find((row) => row.id === userId);
  return toAdminUser(updated as UserListRow);
}
