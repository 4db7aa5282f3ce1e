import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export function findSetupToken(db: Executor, tokenHash: string) {
  return db
    .selectFrom('account_setup_tokens as t')
    .innerJoin('users as u', 'u.id', 't.user_id')
    .selectAll('t')
    .select(['u.email', 'u.name'])
    .where('t.token_hash', '=', tokenHash)
    .executeTakeFirst();
}

export async function insertSetupToken(
  db: Executor,
  values: { userId: string; tokenHash: string; createdBy: string; expiresAt: string },
): Promise<void> {
  await db
    .insertInto('account_setup_tokens')
    .values({
      user_id: values.userId,
      token_hash: values.tokenHash,
      created_by: values.createdBy,
      created_at: new Date().toISOString(),
      expires_at: values.expiresAt,
    })
    .execute();
}

/** Marks the link used if it still is unused and unexpired: the single-use guarantee. */
export async function markSetupTokenUsed(db: Executor, id: number, now: string): Promise<boolean> {
  const result = await db
    .updateTable('account_setup_tokens')
    .set({ used_at: now })
    .where('id', '=', id)
    .where('used_at', 'is', null)
    .where('expires_at', '>', now)
    .executeTakeFirst();
  return Number(result.numUpdatedRows) === 1;
}
