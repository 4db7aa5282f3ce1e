import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// The metadata a review team filters, searches, logs and produces by: e-mail header
// fields kept apart (RFC 5322 section 3.6: From, To, Cc, Bcc, Message-ID, In-Reply-To,
// References), file dates and authors, the family date (the top-level item's date, so
// an attachment sorts with its e-mail), an OCR flag, and every custodian who held a copy
// (document_custodians; a de-duplicated copy adds its custodian to the kept document).
// Address lists are stored as display text ("Name <addr>, ..."), as the headers read.

const TEXT_COLUMNS = [
  'email_from',
  'email_to',
  'email_cc',
  'email_bcc',
  'email_references',
  'last_author',
];
const NULLABLE_COLUMNS = [
  'message_id',
  'in_reply_to',
  'received_at',
  'file_created_at',
  'file_modified_at',
  'family_date',
];

export async function up(db: Kysely<unknown>): Promise<void> {
  for (const column of TEXT_COLUMNS) {
    await sql`ALTER TABLE documents ADD COLUMN ${sql.raw(column)} TEXT NOT NULL DEFAULT ''`.execute(
      db,
    );
  }
  for (const column of NULLABLE_COLUMNS) {
    await sql`ALTER TABLE documents ADD COLUMN ${sql.raw(column)} TEXT`.execute(db);
  }
  await sql`ALTER TABLE documents ADD COLUMN ocr INTEGER NOT NULL DEFAULT 0`.execute(db);
  await sql`UPDATE documents SET family_date = COALESCE(
      (SELECT p.sent_at FROM documents p WHERE p.id = documents.family_id), documents.sent_at)`.execute(
    db,
  );
  // The family date follows the top-level item's date wherever it is set from.
  await sql`CREATE TRIGGER documents_family_date_on_insert AFTER INSERT ON documents
    BEGIN
      -- The root is found from the parent, not from NEW.family_id: the trigger that sets
      -- family_id may fire after this one.
      UPDATE documents SET family_date = COALESCE(
          (SELECT p.sent_at FROM documents p
            WHERE p.id = COALESCE((SELECT f.family_id FROM documents f WHERE f.id = NEW.parent_id), NEW.id)),
          NEW.sent_at)
        WHERE id = NEW.id;
    END`.execute(db);
  await sql`CREATE TRIGGER documents_family_date_on_update AFTER UPDATE OF sent_at ON documents
    BEGIN
      UPDATE documents SET family_date = NEW.sent_at
        WHERE matter_id = NEW.matter_id AND family_id = NEW.id;
      UPDATE documents SET family_date = COALESCE(
          (SELECT p.sent_at FROM documents p WHERE p.id = NEW.family_id), NEW.sent_at)
        WHERE id = NEW.id AND NEW.family_id IS NOT NULL AND NEW.family_id != NEW.id;
    END`.execute(db);
  await sql`CREATE INDEX documents_message_id ON documents(matter_id, message_id)`.execute(db);

  await sql`CREATE TABLE document_custodians (
      document_id INTEGER NOT NULL REFERENCES documents(id) ON DELETE CASCADE,
      custodian_id INTEGER NOT NULL REFERENCES custodians(id) ON DELETE CASCADE,
      PRIMARY KEY (document_id, custodian_id)
    ) WITHOUT ROWID`.execute(db);
  await sql`CREATE INDEX document_custodians_custodian ON document_custodians(custodian_id)`.execute(
    db,
  );
  await sql`INSERT INTO document_custodians (document_id, custodian_id)
    SELECT id, custodian_id FROM documents WHERE custodian_id IS NOT NULL`.execute(db);
  // A document always lists its own custodian; ingest adds the custodians of copies.
  await sql`CREATE TRIGGER documents_own_custodian AFTER INSERT ON documents
    WHEN NEW.custodian_id IS NOT NULL
    BEGIN
      INSERT OR IGNORE INTO document_custodians (document_id, custodian_id)
        VALUES (NEW.id, NEW.custodian_id);
    END`.execute(db);
  await sql`CREATE TRIGGER documents_own_custodian_update AFTER UPDATE OF custodian_id ON documents
    WHEN NEW.custodian_id IS NOT NULL
    BEGIN
      INSERT OR IGNORE INTO document_custodians (document_id, custodian_id)
        VALUES (NEW.id, NEW.custodian_id);
    END`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP TRIGGER IF EXISTS documents_family_date_on_update`.execute(db);
  await sql`DROP TRIGGER IF EXISTS documents_family_date_on_insert`.execute(db);
  await sql`DROP TRIGGER IF EXISTS documents_own_custodian_update`.execute(db);
  await sql`DROP TRIGGER IF EXISTS documents_own_custodian`.execute(db);
  await sql`DROP TABLE IF EXISTS document_custodians`.execute(db);
  await sql`DROP INDEX IF EXISTS documents_message_id`.execute(db);
  for (const column of ['ocr', ...NULLABLE_COLUMNS, ...TEXT_COLUMNS]) {
    await sql`ALTER TABLE documents DROP COLUMN ${sql.raw(column)}`.execute(db);
  }
}
