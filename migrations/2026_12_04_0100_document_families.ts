import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// A family is a top-level item with everything inside it (an e-mail and its
// attachments, to any depth). family_id is the top-level document's id (its own id
// for a top-level document); a trigger sets it on every insert, so no code path can
// forget it, and families are read with one indexed lookup instead of a walk.

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`ALTER TABLE documents ADD COLUMN family_id INTEGER`.execute(db);
  await sql`WITH RECURSIVE fam(id, root) AS (
      SELECT id, id FROM documents WHERE parent_id IS NULL
      UNION ALL
      SELECT d.id, fam.root FROM documents d JOIN fam ON d.parent_id = fam.id
    )
    UPDATE documents SET family_id = (SELECT root FROM fam WHERE fam.id = documents.id)`.execute(
    db,
  );
  await sql`CREATE INDEX documents_family ON documents(matter_id, family_id)`.execute(db);
  await sql`CREATE TRIGGER documents_family_on_insert AFTER INSERT ON documents
    WHEN NEW.family_id IS NULL
    BEGIN
      UPDATE documents
        SET family_id = COALESCE((SELECT family_id FROM documents WHERE id = NEW.parent_id), NEW.id)
        WHERE id = NEW.id;
    END`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP TRIGGER IF EXISTS documents_family_on_insert`.execute(db);
  await sql`DROP INDEX IF EXISTS documents_family`.execute(db);
  await sql`ALTER TABLE documents DROP COLUMN family_id`.execute(db);
}
