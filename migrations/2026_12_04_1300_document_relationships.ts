import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// Relationships between documents that review reads by:
// - email_hash: SHA-256 of an e-mail's normalised header fields and body, so the same
//   message collected twice (different bytes, e.g. from two mailboxes) is de-duplicated;
// - threads (RFC 5322 section 3.6.4): thread_id is the id of the thread's first message,
//   thread_parent_id the message this one replies to, inclusive 1 when the message's text
//   is not contained in a later reply of its branch (null for documents that are not e-mail);
// - near-duplicates (MinHash, Broder 1997): near_dup_group_id is the group principal's id,
//   near_dup_similarity the estimated Jaccard resemblance to it; the signature of each
//   document is kept so a regrouping does not re-read every text;
// - a matter's near-duplicate threshold (Jaccard, 0.8 unless the lead changes it) and its
//   password list for encrypted files (AES-256-GCM ciphertext only).

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`ALTER TABLE documents ADD COLUMN email_hash TEXT`.execute(db);
  await sql`ALTER TABLE documents ADD COLUMN thread_id INTEGER`.execute(db);
  await sql`ALTER TABLE documents ADD COLUMN thread_parent_id INTEGER`.execute(db);
  await sql`ALTER TABLE documents ADD COLUMN inclusive INTEGER`.execute(db);
  await sql`ALTER TABLE documents ADD COLUMN near_dup_group_id INTEGER`.execute(db);
  await sql`ALTER TABLE documents ADD COLUMN near_dup_similarity REAL`.execute(db);
  await sql`CREATE INDEX documents_email_hash ON documents(matter_id, email_hash)`.execute(db);
  await sql`CREATE INDEX documents_thread ON documents(matter_id, thread_id)`.execute(db);
  await sql`CREATE INDEX documents_near_dup ON documents(matter_id, near_dup_group_id)`.execute(db);
  await sql`CREATE TABLE document_minhash (
      document_id INTEGER PRIMARY KEY REFERENCES documents(id) ON DELETE CASCADE,
      signature BLOB NOT NULL
    )`.execute(db);
  await sql`ALTER TABLE matters ADD COLUMN near_dup_threshold REAL NOT NULL DEFAULT 0.8`.execute(
    db,
  );
  await sql`CREATE TABLE matter_passwords (
      id INTEGER PRIMARY KEY AUTOINCREMENT,
      matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
      label TEXT NOT NULL DEFAULT '',
      ciphertext BLOB NOT NULL,
      iv BLOB NOT NULL,
      tag BLOB NOT NULL,
      created_by TEXT,
      created_at TEXT NOT NULL
    )`.execute(db);
  await sql`CREATE INDEX matter_passwords_matter ON matter_passwords(matter_id)`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP TABLE IF EXISTS matter_passwords`.execute(db);
  await sql`ALTER TABLE matters DROP COLUMN near_dup_threshold`.execute(db);
  await sql`DROP TABLE IF EXISTS document_minhash`.execute(db);
  await sql`DROP INDEX IF EXISTS documents_near_dup`.execute(db);
  await sql`DROP INDEX IF EXISTS documents_thread`.execute(db);
  await sql`DROP INDEX IF EXISTS documents_email_hash`.execute(db);
  for (const column of [
    'near_dup_similarity',
    'near_dup_group_id',
    'inclusive',
    'thread_parent_id',
    'thread_id',
    'email_hash',
  ]) {
    await sql`ALTER TABLE documents DROP COLUMN ${sql.raw(column)}`.execute(db);
  }
}
