import type { Kysely, Transaction } from 'kysely';
import type { Database, NewUserRow } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

// Account rows are shared by auth, admin, members and invitations.

export function findUserByEmail(db: Executor, email: string) {
  return db.selectFrom('users').selectAll().where('email', '=', email).executeTakeFirst();
}

export function findUserById(db: Executor, id: string) {
  return db.selectFrom('users').selectAll().where('id', '=', id).executeTakeFirst();
}

/** By id, or by e-mail when the reference contains "@". */
export function findUserByRef(db: Executor, ref: string) {
  return ref.includes('@')
    ? findUserByEmail(db, ref.trim().toLowerCase())
    : findUserById(db, ref.trim());
}

export async function insertUser(db: Executor, row: NewUserRow): Promise<void> {
  await db.insertInto('users').values(row).execute();
}

export async function updatePasswordHash(
  db: Executor,
  userId: string,
  passwordHash: string,
): Promise<void> {
  await db
    .updateTable('users')
    // A password the holder set themselves: no longer temporary.
    .set({
      password_hash: passwordHash,
      password_changed_at: new Date().toISOString(),
      password_must_change: 0,
      password_expires_at: null,
    })
    .where('id', '=', userId)
    .execute();
}

export function listUsersWithMatterCounts(db: Executor) {
  return db
    .selectFrom('users as u')
    .leftJoin('matter_members as m', 'm.user_id', 'u.id')
    .select(['u.id', 'u.email', 'u.name', 'u.is_admin', 'u.disabled_at', 'u.created_at'])
    .select((eb) => eb.fn.count<number>('m.matter_id').as('matter_count'))
    .groupBy('u.id')
    .orderBy('u.name')
    .execute();
}

export async function countUsers(db: Executor): Promise<number> {
  const row = await db
    .selectFrom('users')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  return Number(row.n);
}
