import SQLite from 'better-sqlite3';
import { afterAll, describe, expect, it } from 'vitest';
import { KEYWORD_TABLES_DDL, keywordSearch, toFtsMatchExpression } from './keyword';

// FTS5 query syntax (sqlite.org/fts5.html, section 3): bare words may be column
// filters (col:), operators (AND OR NOT NEAR), prefixes (*), initial-token (^) and
// groups; only a double-quoted string is taken literally. Every token is quoted.
const INJECTIONS = [
  'foo" OR 1=1 --',
  'title:secret',
  'alpha NOT beta',
  'NEAR(alpha beta, 1)',
  '{title body}: alpha',
  'alph*',
  '^alpha',
  '"unbalanced',
  ')(',
  'alpha AND',
  "'; DROP TABLE document_texts; --",
  '- + : ^ * " ( ) { }',
];

describe('toFtsMatchExpression', () => {
  it('quotes every token and joins them with OR', () => {
    expect(toFtsMatchExpression('Wing LIFT, wing!')).toBe('"wing" OR "lift"');
    expect(toFtsMatchExpression('title:secret')).toBe('"title" OR "secret"');
    // NOT is not in the stop list: it becomes the quoted word "not", never the operator.
    expect(toFtsMatchExpression('alpha NOT beta')).toBe('"alpha" OR "not" OR "beta"');
  });

  it('returns null when nothing is left to search', () => {
    expect(toFtsMatchExpression('')).toBeNull();
    expect(toFtsMatchExpression('- + : ^ * " ( ) { }')).toBeNull();
  });

  it('keeps stop words when they are all there is', () => {
    expect(toFtsMatchExpression('the')).toBe('"the"');
  });

  it('every injection string becomes quoted literals only', () => {
    for (const text of INJECTIONS) {
      const match = toFtsMatchExpression(text);
      if (match !== null) expect(match).toMatch(/^"[\p{L}\p{N}]+"( OR "[\p{L}\p{N}]+")*$/u);
    }
  });
});

describe('keywordSearch against the server-shaped FTS5 table', () => {
  const db = new SQLite(':memory:');
  for (const ddl of KEYWORD_TABLES_DDL) db.exec(ddl);
  const insert = db.prepare(
    'INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)',
  );
  insert.run(1, 'secret memo', 'alpha terms of the agreement');
  insert.run(2, 'title page', 'beta clause');
  insert.run(3, 'other', 'gamma delta');
  afterAll(() => db.close());

  it('runs every injection string without an FTS5 syntax error', () => {
    for (const text of INJECTIONS) expect(() => keywordSearch(db, text)).not.toThrow();
    expect(db.prepare('SELECT count(*) AS n FROM document_texts').get()).toEqual({ n: 3 });
  });

  it('treats operators as words: "alpha NOT beta" finds both documents', () => {
    const ids = keywordSearch(db, 'alpha NOT beta').map((h) => h.documentId);
    expect(new Set(ids)).toEqual(new Set([1, 2]));
  });

  it('treats a column filter as two words and stems with Porter', () => {
    expect(
      keywordSearch(db, 'title:secret')
        .map((h) => h.documentId)
        .sort(),
    ).toEqual([1, 2]);
    expect(keywordSearch(db, 'agreements').map((h) => h.documentId)).toEqual([1]);
  });

  it('scores best first (higher = better)', () => {
    const hits = keywordSearch(db, 'alpha secret beta');
    expect(hits[0].documentId).toBe(1);
    for (let i = 1; i < hits.length; i++)
      expect(hits[i - 1].score).toBeGreaterThanOrEqual(hits[i].score);
  });
});
