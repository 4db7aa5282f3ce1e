import { type Kysely, sql } from 'kysely';

// Frozen in time: never import application code; never edit once released.
// Coding layouts: codes live in groups. A 'single' group allows one code per document
// (responsiveness: Responsive or Not responsive), a 'multi' group any number (issue
// codes, flags), and the 'privilege' group is single-choice with a privilege type and a
// basis kept in privilege_entries. A group may be required before a reviewer moves on,
// and may carry its coding to the document's family and exact duplicates.
// Existing matters' flat codes are sorted into groups by what the default set meant:
// Responsive / Not responsive -> Responsiveness; codes marking privilege -> Privilege
// (with a Not privileged code added, so a family member can be coded out of the log);
// every other code -> Flags. Documents already carrying both responsiveness codes keep
// them (a migration cannot tell which call was right); the next coding resolves them.
// Each code gets a colour name from the client's palette (shared/schemas/codes.ts).

const COLOURS: Record<string, string> = {
  responsive: 'green',
  'not responsive': 'slate',
  privileged: 'violet',
  'not privileged': 'teal',
  hot: 'red',
  'needs second look': 'amber',
};

export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`CREATE TABLE code_groups (
      id INTEGER PRIMARY KEY AUTOINCREMENT,
      matter_id INTEGER NOT NULL REFERENCES matters(id) ON DELETE CASCADE,
      name TEXT NOT NULL COLLATE NOCASE,
      kind TEXT NOT NULL CHECK (kind IN ('single', 'multi', 'privilege')),
      required INTEGER NOT NULL DEFAULT 0,
      follow_family INTEGER NOT NULL DEFAULT 0,
      follow_duplicates INTEGER NOT NULL DEFAULT 0,
      sort_order INTEGER NOT NULL DEFAULT 0,
      created_at TEXT NOT NULL,
      UNIQUE (matter_id, name)
    )`.execute(db);
  await sql`CREATE UNIQUE INDEX code_groups_one_privilege ON code_groups(matter_id) WHERE kind = 'privilege'`.execute(
    db,
  );
  await sql`ALTER TABLE codes ADD COLUMN group_id INTEGER REFERENCES code_groups(id)`.execute(db);
  await sql`ALTER TABLE codes ADD COLUMN colour TEXT NOT NULL DEFAULT 'slate'`.execute(db);
  await sql`ALTER TABLE privilege_entries ADD COLUMN privilege_type TEXT NOT NULL DEFAULT ''`.execute(
    db,
  );
  await sql`ALTER TABLE privilege_entries ADD COLUMN treatment TEXT NOT NULL DEFAULT 'withheld'
      CHECK (treatment IN ('withheld', 'redacted'))`.execute(db);

  const now = new Date().toISOString();
  const matters = await sql<{ id: number }>`SELECT id FROM matters`.execute(db);
  for (const { id: matterId } of matters.rows) {
    const group = async (
      name: string,
      kind: string,
      required: number,
      family: number,
      dups: number,
      order: number,
    ) => {
      const row = await sql<{ id: number }>`INSERT INTO code_groups
          (matter_id, name, kind, required, follow_family, follow_duplicates, sort_order, created_at)
          VALUES (${matterId}, ${name}, ${kind}, ${required}, ${family}, ${dups}, ${order}, ${now})
          RETURNING id`.execute(db);
      return row.rows[0].id;
    };
    const responsiveness = await group('Responsiveness', 'single', 1, 0, 1, 10);
    const privilege = await group('Privilege', 'privilege', 0, 0, 1, 20);
    const flags = await group('Flags', 'multi', 0, 0, 0, 30);
    await sql`UPDATE codes SET group_id = ${responsiveness}
        WHERE matter_id = ${matterId} AND name IN ('Responsive', 'Not responsive')`.execute(db);
    await sql`UPDATE codes SET group_id = ${privilege}
        WHERE matter_id = ${matterId} AND group_id IS NULL AND marks_privileged = 1`.execute(db);
    await sql`UPDATE codes SET group_id = ${flags}
        WHERE matter_id = ${matterId} AND group_id IS NULL`.execute(db);
    const taken = await sql<{ n: number }>`SELECT COUNT(*) AS n FROM codes
        WHERE matter_id = ${matterId} AND name = 'Not privileged'`.execute(db);
    if (Number(taken.rows[0].n) === 0) {
      const keyFree = await sql<{ n: number }>`SELECT COUNT(*) AS n FROM codes
          WHERE matter_id = ${matterId} AND shortcut = '6'`.execute(db);
      const order = await sql<{ m: number | null }>`SELECT MAX(sort_order) AS m FROM codes
          WHERE matter_id = ${matterId}`.execute(db);
      await sql`INSERT INTO codes (matter_id, name, shortcut, sort_order, marks_privileged,
            archived_at, created_at, group_id, colour)
          VALUES (${matterId}, 'Not privileged', ${Number(keyFree.rows[0].n) === 0 ? '6' : null},
            ${Number(order.rows[0].m ?? 0) + 10}, 0, NULL, ${now}, ${privilege}, 'teal')`.execute(
        db,
      );
    }
  }
  for (const [name, colour] of Object.entries(COLOURS)) {
    await sql`UPDATE codes SET colour = ${colour} WHERE lower(name) = ${name}`.execute(db);
  }
  await sql`CREATE INDEX codes_group ON codes(group_id)`.execute(db);
}

export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`DROP INDEX IF EXISTS codes_group`.execute(db);
  await sql`ALTER TABLE privilege_entries DROP COLUMN treatment`.execute(db);
  await sql`ALTER TABLE privilege_entries DROP COLUMN privilege_type`.execute(db);
  await sql`ALTER TABLE codes DROP COLUMN colour`.execute(db);
  await sql`ALTER TABLE codes DROP COLUMN group_id`.execute(db);
  await sql`DROP TABLE IF EXISTS code_groups`.execute(db);
}
