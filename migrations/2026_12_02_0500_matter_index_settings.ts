import { type Kysely, sql } from 'kysely';

// Frozen in time. A matter's chosen concept-space settings: the k and weighting a lead
// asked for in the last requested rebuild. NULL means "not chosen": k then follows the
// matter's size at every build.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`ALTER TABLE matters ADD COLUMN index_k INTEGER`.execute(db);
  await sql`ALTER TABLE matters ADD COLUMN index_weighting TEXT`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`ALTER TABLE matters DROP COLUMN index_weighting`.execute(db);
  await sql`ALTER TABLE matters DROP COLUMN index_k`.execute(db);
}
