import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// - sessions.created_at (unix seconds, like expires_at): the start of a session, so its
//   extension on use never passes an absolute lifetime (OWASP ASVS 4.0.3 V3.3.2).
//   Sessions already open count from this migration.
// - users.password_must_change / password_expires_at: a temporary password set by a
//   firm admin must be changed at first sign-in and stops working when it expires
//   (ASVS V2.3.1). Existing accounts chose their own passwords: neither applies.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`ALTER TABLE sessions ADD COLUMN created_at INTEGER NOT NULL DEFAULT 0`.execute(db);
  await sql`UPDATE sessions SET created_at = CAST(strftime('%s', 'now') AS INTEGER)`.execute(db);
  await sql`ALTER TABLE users ADD COLUMN password_must_change INTEGER NOT NULL DEFAULT 0`.execute(
    db,
  );
  await sql`ALTER TABLE users ADD COLUMN password_expires_at TEXT`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`ALTER TABLE users DROP COLUMN password_expires_at`.execute(db);
  await sql`ALTER TABLE users DROP COLUMN password_must_change`.execute(db);
  await sql`ALTER TABLE sessions DROP COLUMN created_at`.execute(db);
}
