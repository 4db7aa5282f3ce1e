import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export function findInvitationByTokenHash(db: Executor, tokenHash: string) {
  return db
    .selectFrom('invitations as i')
    .innerJoin('matters as m', 'm.id', 'i.matter_id')
    .leftJoin('users as u', 'u.id', 'i.invited_by')
    .selectAll('i')
    .select(['m.name as matter_name', 'u.name as invited_by_name'])
    .where('i.token_hash', '=', tokenHash)
    .executeTakeFirst();
}

export type InvitationWithMatter = NonNullable<
  Awaited<ReturnType<typeof findInvitationByTokenHash>>
>;

export function findInvitationInMatter(db: Executor, matterId: number, id: number) {
  return db
    .selectFrom('invitations')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('id', '=', id)
    .executeTakeFirst();
}

export async function insertInvitation(
  db: Executor,
  values: {
    matterId: number;
    email: string;
    role: string;
    tokenHash: string;
    invitedBy: string;
    expiresAt: string;
  },
): Promise<number> {
  const row = await db
    .insertInto('invitations')
    .values({
      matter_id: values.matterId,
      email: values.email,
      role: values.role,
      token_hash: values.tokenHash,
      invited_by: values.invitedBy,
      created_at: new Date().toISOString(),
      expires_at: values.expiresAt,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** Revokes the pending invitations of one address on one matter; returns how many. */
export async function revokePendingFor(
  db: Executor,
  matterId: number,
  email: string,
): Promise<number> {
  const result = await db
    .updateTable('invitations')
    .set({ revoked_at: new Date().toISOString() })
    .where('matter_id', '=', matterId)
    .where('email', '=', email)
    .where('accepted_at', 'is', null)
    .where('revoked_at', 'is', null)
    .executeTakeFirst();
  return Number(result.numUpdatedRows);
}

export async function revokeInvitation(db: Executor, id: number): Promise<boolean> {
  const result = await db
    .updateTable('invitations')
    .set({ revoked_at: new Date().toISOString() })
    .where('id', '=', id)
    .where('accepted_at', 'is', null)
    .where('revoked_at', 'is', null)
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}

/** Marks the invitation used, only if it still is pending: the single-use guarantee. */
export async function markAccepted(
  db: Executor,
  id: number,
  userId: string,
  now: string,
): Promise<boolean> {
  const result = await db
    .updateTable('invitations')
    .set({ accepted_at: now, accepted_by: userId })
    .where('id', '=', id)
    .where('accepted_at', 'is', null)
    .where('revoked_at', 'is', null)
    .where('expires_at', '>', now)
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}
