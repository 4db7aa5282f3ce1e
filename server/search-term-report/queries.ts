import type SQLite from 'better-sqlite3';

// Whole-matter lookups the report needs once per run (plucked on the raw handle: a
// 100,000-document matter is 100,000 rows).

/** Every document's family (family_id: the top-level document's id), duplicates optional. */
export function familiesOf(
  sqlite: SQLite.Database,
  matterId: number,
  includeDuplicates: boolean,
): { id: number; family_id: number | null }[] {
  return sqlite
    .prepare(
      `SELECT id, family_id FROM documents
        WHERE matter_id = ? ${includeDuplicates ? '' : `AND extract_status != 'duplicate'`}`,
    )
    .all(matterId) as { id: number; family_id: number | null }[];
}

/** (document, custodian name) for every copy held, of the matter's documents. */
export function custodiansOfDocuments(
  sqlite: SQLite.Database,
  matterId: number,
): { document_id: number; name: string }[] {
  return sqlite
    .prepare(
      `SELECT dc.document_id AS document_id, c.name AS name
         FROM document_custodians dc
         JOIN custodians c ON c.id = dc.custodian_id
        WHERE c.matter_id = ?`,
    )
    .all(matterId) as { document_id: number; name: string }[];
}
