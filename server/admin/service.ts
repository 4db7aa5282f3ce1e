import type { AdminUser, AdminUsersResponse, CreateUserReq } from '../../shared/schemas/admin';
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

export async function createUserByAdmin(
  db: Db,
  input: CreateUserReq,
  actor: { id: string; email: string; ip: string | null },
): Promise<AdminUser> {
  const row = await createAccount(db, {
    email: input.email,
    name: input.name,
    password: input.temporaryPassword,
    isAdmin: input.isAdmin,
  });
  await recordAudit(db, {
    actorId: actor.id,
    actorEmail: actor.email,
    ip: actor.ip,
    action: 'user.created',
    targetType: 'user',
    targetId: row.id,
    detail: { email: row.email, isAdmin: input.isAdmin },
  });
  const created = (await listUsersWithMatterCounts(db)).find((user) => user.id === row.id);
  return toAdminUser(created as UserListRow);
}
