// Match sets of the query language checked against SQLite FTS5 itself (SQLite FTS5
// docs, section 3 "Full-text Query Syntax": phrases, NEAR, prefix queries, AND/OR/NOT),
// run directly on a separate in-memory database holding the same texts, for Cranfield
// 1400 (Cleverdon, Mills & Keen 1966) and the demo matter's planned texts; and fielded
// and date queries against the documents' own metadata, filtered in the test.
import SQLite from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { planDemoCorpus } from '../../corpus-demo/generate';
import { createTestApp, type TestApp } from '../../tests/helpers';
import { cranfieldAvailable, readCranfield } from '../engine/index';
import { MatchSetEvaluator, matchSetOf, parseSearchQuery } from './boolean';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t?.close());

interface Row {
  title: string;
  body: string;
  from?: string;
  to?: string;
  cc?: string;
  bcc?: string;
  author?: string;
  lastAuthor?: string;
  name?: string;
  type?: string;
  sentAt?: string | null;
  custodians?: string[];
}

/** A matter holding the rows (extracted documents with their texts); the rows' ids in order. */
async function loadMatter(rows: Row[]) {
  const matter = await t.buildMatter();
  const sqlite = t.ctx.sqlite;
  const now = new Date().toISOString();
  const custodianIds = new Map<string, number>();
  const custodian = sqlite.prepare(
    'INSERT INTO custodians (matter_id, name, created_at) VALUES (?, ?, ?) RETURNING id',
  );
  const doc = sqlite.prepare(
    `INSERT INTO documents (matter_id, custodian_id, control_number, original_name, sha256, size,
       doc_type, title, author, last_author, email_from, email_to, email_cc, email_bcc, sent_at,
       extract_status, created_at)
     VALUES (?, ?, ?, ?, ?, 1, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'extracted', ?) RETURNING id`,
  );
  const text = sqlite.prepare(
    'INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)',
  );
  const held = sqlite.prepare(
    'INSERT OR IGNORE INTO document_custodians (document_id, custodian_id) VALUES (?, ?)',
  );
  const ids: number[] = [];
  sqlite.transaction(() => {
    rows.forEach((r, i) => {
      const cids = (r.custodians ?? []).map((name) => {
        let id = custodianIds.get(name);
        if (id === undefined) {
          id = (custodian.get(matter.id, name, now) as { id: number }).id;
          custodianIds.set(name, id);
        }
        return id;
      });
      const { id } = doc.get(
        matter.id,
        cids[0] ?? null,
        `${matter.controlPrefix}-${String(i + 1).padStart(6, '0')}`,
        r.name ?? `doc-${i + 1}.txt`,
        String(i).padStart(64, '0'),
        r.type ?? 'text',
        r.title,
        r.author ?? '',
        r.lastAuthor ?? '',
        r.from ?? '',
        r.to ?? '',
        r.cc ?? '',
        r.bcc ?? '',
        r.sentAt ?? null,
        now,
      ) as { id: number };
      text.run(id, r.title, r.body);
      for (const cid of cids.slice(1)) held.run(id, cid);
      ids.push(id);
    });
  })();
  return { matterId: matter.id, ids };
}

/** The same texts in a database of their own, with FTS5 tables as the migrations make them. */
function referenceFts(rows: Row[]) {
  const db = new SQLite(':memory:');
  db.exec(
    `CREATE VIRTUAL TABLE stemmed USING fts5(title, body, tokenize='porter unicode61 remove_diacritics 2')`,
  );
  db.exec(
    `CREATE VIRTUAL TABLE exact USING fts5(title, body, tokenize='unicode61 remove_diacritics 2')`,
  );
  const a = db.prepare('INSERT INTO stemmed (rowid, title, body) VALUES (?, ?, ?)');
  const b = db.prepare('INSERT INTO exact (rowid, title, body) VALUES (?, ?, ?)');
  db.transaction(() =>
    rows.forEach((r, i) => {
      a.run(i + 1, r.title, r.body);
      b.run(i + 1, r.title, r.body);
    }),
  )();
  return {
    /** Row positions (0-based) FTS5 matches for a MATCH expression. */
    match(table: 'stemmed' | 'exact', expression: string): Set<number> {
      return new Set(
        (
          db
            .prepare(`SELECT rowid FROM ${table} WHERE ${table} MATCH ?`)
            .pluck()
            .all(expression) as number[]
        ).map((rowid) => rowid - 1),
      );
    },
    close: () => db.close(),
  };
}

type Case = [query: string, table: 'stemmed' | 'exact', fts5: string];

async function checkAgainstFts5(rows: Row[], cases: Case[]) {
  const { matterId, ids } = await loadMatter(rows);
  const position = new Map(ids.map((id, i) => [id, i]));
  const reference = referenceFts(rows);
  const evaluator = new MatchSetEvaluator(t.ctx.sqlite, matterId);
  try {
    for (const [query, table, expression] of cases) {
      const parsed = parseSearchQuery(query);
      expect(parsed.structured, query).toBe(true);
      const ours = new Set(
        [...matchSetOf(t.ctx.sqlite, matterId, parsed, query, evaluator)].map((id) =>
          position.get(id)!,
        ),
      );
      const expected = reference.match(table, expression);
      expect(expected.size, `${query}: the reference matches something`).toBeGreaterThan(0);
      expect(expected.size, `${query}: the reference does not match everything`).toBeLessThan(
        rows.length,
      );
      expect(
        [...ours].sort((x, y) => x - y),
        query,
      ).toEqual([...expected].sort((x, y) => x - y));
    }
  } finally {
    reference.close();
  }
}

describe.runIf(cranfieldAvailable())('match sets equal FTS5 on Cranfield', () => {
  test('phrases, proximity, prefixes, exact forms, title, Boolean combinations', async () => {
    const { docs } = readCranfield();
    const rows = docs.map((d) => ({ title: d.title, body: d.text }));
    await checkAgainstFts5(rows, [
      ['"boundary layer"', 'stemmed', '"boundary layer"'],
      ['"heat transfer"', 'stemmed', '"heat transfer"'],
      ['"boundary layer"~3', 'stemmed', 'NEAR("boundary" "layer", 3)'],
      ['"shock wave"~10', 'stemmed', 'NEAR(shock wave, 10)'],
      ['superson*', 'exact', 'superson*'],
      ['"boundary lay*"', 'exact', '"boundary" + lay*'],
      ['exact:flows', 'exact', 'flows'],
      ['exact:"laminar flows"', 'exact', '"laminar flows"'],
      ['subject:wing', 'stemmed', 'title : wing'],
      ['heat AND transfer', 'stemmed', 'heat AND transfer'],
      ['heat OR transfer', 'stemmed', 'heat OR transfer'],
      ['heat NOT transfer', 'stemmed', 'heat NOT transfer'],
      [
        'heat AND transfer NOT (flow OR plate)',
        'stemmed',
        '(heat AND transfer) NOT (flow OR plate)',
      ],
      ['shock OR wave AND cone', 'stemmed', 'shock OR (wave AND cone)'],
      ['(shock OR wave) AND cone', 'stemmed', '(shock OR wave) AND cone'],
      ['"boundary layer" AND NOT laminar', 'stemmed', '"boundary layer" NOT laminar'],
      ['NOT NOT cone', 'stemmed', 'cone'],
    ]);
    // NOT alone: every document except those FTS5 matches.
    const { matterId, ids } = await loadMatter(rows);
    const reference = referenceFts(rows);
    try {
      const without = reference.match('stemmed', 'flow');
      const ours = matchSetOf(t.ctx.sqlite, matterId, parseSearchQuery('NOT flow'), 'NOT flow');
      expect(ours.size).toBe(rows.length - without.size);
      ids.forEach((id, i) => expect(ours.has(id)).toBe(!without.has(i)));
    } finally {
      reference.close();
    }
  }, 60_000);
});

describe('match sets equal FTS5 on the demo matter', () => {
  test('phrases, proximity, prefixes and Booleans', async () => {
    const rows = planDemoCorpus()
      .filter((d) => d.text.length > 0)
      .map((d) => ({ title: d.title, body: d.text }));
    await checkAgainstFts5(rows, [
      ['"loyalty credit"', 'stemmed', '"loyalty credit"'],
      ['"board meeting"~5', 'stemmed', 'NEAR(board meeting, 5)'],
      ['loyalty AND credit', 'stemmed', 'loyalty AND credit'],
      ['credit NOT loyalty', 'stemmed', 'credit NOT loyalty'],
      ['pric*', 'exact', 'pric*'],
      ['(price OR pricing) AND NOT loyalty', 'stemmed', '(price OR pricing) NOT loyalty'],
    ]);
  }, 30_000);
});

describe('fielded and date queries against the documents metadata', () => {
  const rows: Row[] = [
    {
      title: 'Budget review',
      body: 'numbers',
      from: 'Alice Archer <alice@north.example>',
      to: 'Bob Baker <bob@south.example>',
      sentAt: '2020-01-15T10:00:00.000Z',
      type: 'email',
      custodians: ['Avery Example'],
    },
    {
      title: 'Re: Budget review',
      body: 'more numbers',
      from: 'Bob Baker <bob@south.example>',
      to: 'Alice Archer <alice@north.example>',
      cc: 'Carol Cole <carol@west.example>',
      sentAt: '2020-06-30T23:00:00.000Z',
      type: 'email',
      custodians: ['Blake Example', 'Avery Example'],
    },
    {
      title: 'Supply plan',
      body: 'plan',
      bcc: 'Dan Dale <dan@east.example>',
      sentAt: '2020-07-01T00:00:00.000Z',
      type: 'email',
      custodians: ['Blake Example'],
    },
    {
      title: 'Draft contract',
      body: 'terms',
      author: 'Erin Example',
      lastAuthor: 'Frank Example',
      name: 'contract-draft.docx',
      type: 'docx',
      sentAt: null,
      custodians: ['Avery Example'],
    },
    {
      title: 'Notes',
      body: 'plain notes',
      name: 'notes.txt',
      type: 'text',
      sentAt: '2019-12-31T12:00:00.000Z',
    },
  ];
  let matterId: number;
  let ids: number[];
  beforeAll(async () => {
    ({ matterId, ids } = await loadMatter(rows));
  });
  const matching = (query: string) => {
    const found = matchSetOf(t.ctx.sqlite, matterId, parseSearchQuery(query), query);
    return ids.flatMap((id, i) => (found.has(id) ? [i] : []));
  };
  const where = (pred: (r: Row) => boolean) => rows.flatMap((r, i) => (pred(r) ? [i] : []));
  const has = (value: string | undefined, part: string) =>
    (value ?? '').toLowerCase().includes(part.toLowerCase());
  const day = (r: Row) => r.sentAt?.slice(0, 10) ?? null;

  test.each([
    ['from:alice', (r: Row) => has(r.from, 'alice')],
    ['to:ALICE', (r: Row) => has(r.to, 'alice')],
    ['cc:carol', (r: Row) => has(r.cc, 'carol')],
    ['bcc:dan@east', (r: Row) => has(r.bcc, 'dan@east')],
    ['from:"Bob Baker"', (r: Row) => has(r.from, 'Bob Baker')],
    ['author:frank', (r: Row) => has(r.author, 'frank') || has(r.lastAuthor, 'frank')],
    ['author:erin', (r: Row) => has(r.author, 'erin') || has(r.lastAuthor, 'erin')],
    ['filename:draft', (r: Row) => has(r.name, 'draft')],
    ['type:email', (r: Row) => r.type === 'email'],
    ['type:EMAIL NOT from:bob', (r: Row) => r.type === 'email' && !has(r.from, 'bob')],
    // Every custodian who held a copy, not only the first.
    ['custodian:avery', (r: Row) => (r.custodians ?? []).includes('Avery Example')],
    ['custodian:"blake example"', (r: Row) => (r.custodians ?? []).includes('Blake Example')],
    ['subject:budget', (r: Row) => has(r.title, 'budget')],
    [
      'date:[2020-01-01 TO 2020-06-30]',
      (r: Row) => day(r) !== null && day(r)! >= '2020-01-01' && day(r)! <= '2020-06-30',
    ],
    [
      'date:{2020-01-15 TO 2020-07-01}',
      (r: Row) => day(r) !== null && day(r)! > '2020-01-15' && day(r)! < '2020-07-01',
    ],
    ['date:[* TO 2019-12-31]', (r: Row) => day(r) !== null && day(r)! <= '2019-12-31'],
    ['date:2020-07-01', (r: Row) => day(r) === '2020-07-01'],
    ['NOT date:[* TO *]', (r: Row) => day(r) === null],
    ['from:alice OR cc:carol', (r: Row) => has(r.from, 'alice') || has(r.cc, 'carol')],
    [
      'numbers AND date:[2020-06-01 TO *]',
      (r: Row) => /numbers/.test(r.body) && day(r) !== null && day(r)! >= '2020-06-01',
    ],
  ] as const)('%s', (query, pred) => {
    const expected = where(pred);
    expect(expected.length).toBeGreaterThan(0);
    expect(matching(query)).toEqual(expected);
  });

  test('control numbers, exact and by prefix', async () => {
    const control = t.ctx.sqlite
      .prepare('SELECT control_number FROM documents WHERE id = ?')
      .pluck();
    const second = control.get(ids[1]) as string;
    expect(matching(`control:${second.toLowerCase()}`)).toEqual([1]);
    expect(matching(`control:${second.slice(0, -1)}*`)).toEqual(
      [0, 1, 2, 3, 4].filter((i) => i < 5),
    );
  });
});
