import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

/** The user's current role on the matter, or undefined when they are not a member. */
export async function findMemberRole(
  db: Executor,
  matterId: number,
  userId: string,
): Promise<string | undefined> {
  const row = await db
    .selectFrom('matter_members')
    .select('role')
    .where('matter_id', '=', matterId)
    .where('user_id', '=', userId)
    .executeTakeFirst();
  return row?.role;
}

/** The matter a job belongs to (for routes addressed by job id). */
export function findJobMatterId(db: Executor, jobId: number) {
  return db.selectFrom('jobs').select('matter_id').where('id', '=', jobId).executeTakeFirst();
}
