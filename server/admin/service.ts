import type {
  AdminUser,
  AdminUsersResponse,
  CreateUserReq,
  CreateUserResponse,
} from '../../shared/schemas/admin';
import { createAccountWithSetupLink } from '../account-setup/service';
import type { AppContext } from '../context';
import { recordAudit } from '../audit/record';
import type { Db } from '../db/database';
import { listUsersWithMatterCounts } from '../users/queries';
import { createAccount } from '../users/service';

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
  const userId = input.temporaryPassword
    ? (
        await createAccount(ctx.db, {
          email: input.email,
          name: input.name,
          password: input.temporaryPassword,
          isAdmin: input.isAdmin,
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
