import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export function listMemberRows(db: Executor, matterId: number) {
  return db
    .selectFrom('matter_members as mm')
    .innerJoin('users as u', 'u.id', 'mm.user_id')
    .leftJoin('users as g', 'g.id', 'mm.granted_by')
    .select([
      'mm.user_id',
      'u.name',
      'u.email',
      'mm.role',
      'mm.granted_at',
      'g.id as granted_by_id',
      'g.name as granted_by_name',
      'g.email as granted_by_email',
    ])
    .where('mm.matter_id', '=', matterId)
    .orderBy('u.name')
    .execute();
}

export type MemberListRow = Awaited<ReturnType<typeof listMemberRows>>[number];

export function findMemberRow(db: Executor, matterId: number, userId: string) {
  return db
    .selectFrom('matter_members')
    .selectAll()
    .where('matter_id', '=', matterId)
    .where('user_id', '=', userId)
    .executeTakeFirst();
}

export async function countLeads(db: Executor, matterId: number): Promise<number> {
  const row = await db
    .selectFrom('matter_members')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .where('matter_id', '=', matterId)
    .where('role', '=', 'lead')
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

export async function insertMember(
  db: Executor,
  values: { matterId: number; userId: string; role: string; grantedBy: string | null },
): Promise<void> {
  await db
    .insertInto('matter_members')
    .values({
      matter_id: values.matterId,
      user_id: values.userId,
      role: values.role,
      granted_by: values.grantedBy,
      granted_at: new Date().toISOString(),
    })
    .execute();
}

export async function updateMemberRole(
  db: Executor,
  matterId: number,
  userId: string,
  role: string,
): Promise<void> {
  await db
    .updateTable('matter_members')
    .set({ role })
    .where('matter_id', '=', matterId)
    .where('user_id', '=', userId)
    .execute();
}

export async function deleteMember(db: Executor, matterId: number, userId: string): Promise<void> {
  await db
    .deleteFrom('matter_members')
    .where('matter_id', '=', matterId)
    .where('user_id', '=', userId)
    .execute();
}

/** Invitations not yet accepted, revoked or expired. */
export function listPendingInvitationRows(db: Executor, matterId: number, now: string) {
  return db
    .selectFrom('invitations as i')
    .leftJoin('users as u', 'u.id', 'i.invited_by')
    .select([
      'i.id',
      'i.email',
      'i.role',
      'i.created_at',
      'i.expires_at',
      'u.id as invited_by_id',
      'u.name as invited_by_name',
      'u.email as invited_by_email',
    ])
    .where('i.matter_id', '=', matterId)
    .where('i.accepted_at', 'is', null)
    .where('i.revoked_at', 'is', null)
    .where('i.expires_at', '>', now)
    .orderBy('i.created_at', 'desc')
    .execute();
}

export type PendingInvitationRow = Awaited<ReturnType<typeof listPendingInvitationRows>>[number];
