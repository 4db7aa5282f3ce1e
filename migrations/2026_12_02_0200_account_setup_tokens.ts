import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// One-time links a firm admin e-mails so a new account holder sets their own password.
// Only the SHA-256 of the token is stored.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`CREATE TABLE account_setup_tokens (
    id INTEGER PRIMARY KEY AUTOINCREMENT,
    user_id TEXT NOT NULL REFERENCES users(id) ON DELETE CASCADE,
    token_hash TEXT NOT NULL UNIQUE,
    created_by TEXT REFERENCES users(id),
    created_at TEXT NOT NULL,
    expires_at TEXT NOT NULL,
    used_at TEXT
  )`.execute(db);
  await sql`CREATE INDEX account_setup_tokens_user ON account_setup_tokens(user_id)`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP TABLE IF EXISTS account_setup_tokens`.execute(db);
}
