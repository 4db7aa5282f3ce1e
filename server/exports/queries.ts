import type { Kysely, Transaction } from 'kysely';
import type { Database } from '../db/schema';

type Executor = Kysely<Database> | Transaction<Database>;

export function findMatterPrefix(db: Executor, matterId: number) {
  return db
    .selectFrom('matters')
    .select(['control_prefix'])
    .where('id', '=', matterId)
    .executeTakeFirst();
}
