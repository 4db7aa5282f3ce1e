// The search queries that return up to a whole matter's ids, against the plain SQL
// they replace: keyword matches aggregated into JSON arrays must be the same documents,
// in the same order, with bit-identical bm25 scores as the ORDER BY ... LIMIT rows
// (SQLite FTS5 bm25, read row by row); filter candidates must come from the covering
// index. Data: Cranfield 1400 (Cleverdon, Mills & Keen 1966, ../shared/data/cranfield)
// and its 225 queries, loaded as one matter's documents.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cranfieldAvailable, readCranfield } from '../../engine/eval/cranfield';
import { toFtsMatchExpression } from '../../engine/search/keyword';
import { createTestApp, type TestApp } from '../../tests/helpers';
import { documentsByIds, filteredDocumentIds, keywordMatches } from './queries';

const present = cranfieldAvailable();
let t: TestApp;
let matterId: number;
let custodians: number[];
let queries: string[];

beforeAll(async () => {
  if (!present) return;
  t = await createTestApp();
  const matter = await t.buildMatter();
  matterId = matter.id;
  const sqlite = t.ctx.sqlite;
  const now = new Date().toISOString();
  custodians = [1, 2, 3].map((c) =>
    Number(
      sqlite
        .prepare('INSERT INTO custodians (matter_id, name, created_at) VALUES (?, ?, ?)')
        .run(matterId, `Custodian ${c}`, now).lastInsertRowid,
    ),
  );
  const insertDoc = sqlite.prepare(
    `INSERT INTO documents (matter_id, custodian_id, control_number, original_name, sha256, doc_type, size, title, sent_at, extract_status, created_at)
     VALUES (?, ?, ?, ?, ?, 'text', ?, ?, ?, ?, ?)`,
  );
  const insertText = sqlite.prepare(
    'INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)',
  );
  const c = readCranfield();
  queries = c.queries.map((q) => q.text);
  sqlite.transaction(() => {
    c.docs.forEach((doc, i) => {
      // Every 50th document is still pending extraction: never a match.
      const status = i % 50 === 49 ? 'pending' : 'extracted';
      const day = `20${10 + (i % 10)}-0${1 + (i % 9)}-15T00:00:00.000Z`;
      const id = Number(
        insertDoc.run(
          matterId,
          custodians[i % 3],
          `CRAN-${doc.id}`,
          `${doc.id}.txt`,
          String(i).padStart(64, '0'),
          doc.text.length,
          doc.title,
          day,
          status,
          now,
        ).lastInsertRowid,
      );
      insertText.run(id, doc.title, doc.text);
    });
  })();
});
afterAll(() => t?.close());

/** The keyword query read row by row, as the search did before the JSON aggregate. */
function rowByRow(match: string, limit: number, custodianId?: number) {
  const rows = t.ctx.sqlite
    .prepare(
      `SELECT documents_fts.rowid AS id, -bm25(documents_fts) AS score
         FROM documents_fts JOIN documents d ON d.id = documents_fts.rowid
        WHERE documents_fts MATCH ? AND d.matter_id = ? AND d.extract_status = 'extracted'
          AND (? IS NULL OR d.custodian_id = ?)
        ORDER BY bm25(documents_fts) LIMIT ?`,
    )
    .raw(true)
    .all(match, matterId, custodianId ?? null, custodianId ?? null, limit) as [number, number][];
  return { ids: rows.map((r) => r[0]), scores: rows.map((r) => r[1]) };
}

describe.runIf(present)('search queries on Cranfield 1400', () => {
  it('keyword matches: same ids, order and bm25 bits as row-by-row reads, all 225 queries', () => {
    let capped = 0;
    for (const [i, text] of queries.entries()) {
      const match = toFtsMatchExpression(text)!;
      const limit = i % 2 === 0 ? 10_000 : 100;
      const got = keywordMatches(t.ctx.db, t.ctx.sqlite, matterId, match, {}, limit);
      const want = rowByRow(match, limit);
      expect(got.ids).toEqual(want.ids);
      expect(got.scores.every((s, r) => Object.is(s, want.scores[r]))).toBe(true);
      if (got.ids.length === 100) capped++;
    }
    expect(capped).toBeGreaterThan(50); // the limit was exercised
  });

  it('keyword matches honour filters like the row-by-row query', () => {
    const match = toFtsMatchExpression(queries[0])!;
    const got = keywordMatches(
      t.ctx.db,
      t.ctx.sqlite,
      matterId,
      match,
      {
        custodianIds: [custodians[1]],
      },
      10_000,
    );
    expect(got.ids.length).toBeGreaterThan(0);
    expect(got).toEqual(rowByRow(match, 10_000, custodians[1]));
  });

  it("listing fields by id: only the matter's documents, in any matter of the database", async () => {
    const ids = filteredDocumentIds(t.ctx.db, t.ctx.sqlite, matterId, {}).slice(0, 60);
    const rows = await documentsByIds(t.ctx.db, matterId, ids);
    expect(rows.map((r) => r.id).sort((a, b) => a - b)).toEqual([...ids].sort((a, b) => a - b));
    expect(await documentsByIds(t.ctx.db, matterId + 1000, ids)).toEqual([]);
  });

  it('a match with nothing found gives empty arrays', () => {
    expect(keywordMatches(t.ctx.db, t.ctx.sqlite, matterId, '"zzyzxnotaword"', {}, 10)).toEqual({
      ids: [],
      scores: [],
    });
  });

  it('filter candidates: the extracted documents passing the filters, from the covering index', () => {
    const filters = { custodianIds: [custodians[0]], dateFrom: '2012-01-01', dateTo: '2015-12-31' };
    const ids = filteredDocumentIds(t.ctx.db, t.ctx.sqlite, matterId, filters);
    const expected = t.ctx.sqlite
      .prepare(
        `SELECT id FROM documents WHERE matter_id = ? AND extract_status = 'extracted'
           AND custodian_id = ? AND sent_at >= '2012-01-01' AND sent_at < '2016-01-01'`,
      )
      .pluck()
      .all(matterId, custodians[0]) as number[];
    expect(expected.length).toBeGreaterThan(50);
    expect([...ids].sort((a, b) => a - b)).toEqual([...expected].sort((a, b) => a - b));
    const plan = t.ctx.sqlite
      .prepare(
        `EXPLAIN QUERY PLAN SELECT d.id FROM documents d WHERE d.matter_id = ? AND d.extract_status = 'extracted'
           AND d.custodian_id IN (?) AND d.sent_at >= ? AND d.sent_at < ?`,
      )
      .all(matterId, custodians[0], '2012-01-01', '2016-01-01') as { detail: string }[];
    expect(plan.map((p) => p.detail).join(' ')).toContain(
      'COVERING INDEX documents_search_filters',
    );
  });
});
