// The search term report's counts against sets computed here from the rows themselves
// (words by a plain regular expression, families from the parent links, custodians from
// the copies each row lists), and its CSV (RFC 4180) parsed back with csv-parse.
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type Agent, type TestApp } from '../../tests/helpers';

interface Row {
  key: string;
  body: string;
  parent?: string;
  duplicateOf?: string;
  from?: string;
  custodians: string[];
}
const ROWS: Row[] = [
  {
    key: 'E1',
    body: 'Invoice for the late payment',
    from: 'Alice <alice@example.com>',
    custodians: ['Avery', 'Blake'],
  },
  { key: 'A1', body: 'Shipment schedule', parent: 'E1', custodians: ['Avery'] },
  { key: 'A2', body: 'Nothing relevant here', parent: 'E1', custodians: ['Avery'] },
  { key: 'L1', body: 'Delivery of the invoice', custodians: ['Blake'] },
  { key: 'L2', body: 'Late payment notice', custodians: ['Casey'] },
  { key: 'D1', body: 'Delivery of the invoice', duplicateOf: 'L1', custodians: ['Casey'] },
  { key: 'L3', body: 'Weather report', custodians: [] },
];
const TERMS = [
  'invoice',
  '"late payment"',
  'shipment OR delivery',
  'invoice AND NOT late',
  'from:alice',
  'bad "quote',
  'colour:red',
];
/** Each well-formed term as a predicate on a row, written independently of the product. */
const words = (r: Row) => new Set(r.body.toLowerCase().match(/[a-z]+/g));
const PREDICATES: Record<string, (r: Row) => boolean> = {
  invoice: (r) => words(r).has('invoice'),
  '"late payment"': (r) => r.body.toLowerCase().includes('late payment'),
  'shipment OR delivery': (r) => words(r).has('shipment') || words(r).has('delivery'),
  'invoice AND NOT late': (r) => words(r).has('invoice') && !words(r).has('late'),
  'from:alice': (r) => (r.from ?? '').toLowerCase().includes('alice'),
};

let t: TestApp;
let lead: Agent;
let url: string;
beforeAll(async () => {
  t = await createTestApp();
  const matter = await t.buildMatter();
  lead = await t.agentFor(matter.lead);
  url = `/api/matters/${matter.id}/search-term-report`;
  const sqlite = t.ctx.sqlite;
  const now = new Date().toISOString();
  const custodianId = new Map<string, number>();
  for (const name of ['Avery', 'Blake', 'Casey'])
    custodianId.set(
      name,
      (
        sqlite
          .prepare(
            'INSERT INTO custodians (matter_id, name, created_at) VALUES (?, ?, ?) RETURNING id',
          )
          .get(matter.id, name, now) as { id: number }
      ).id,
    );
  const ids = new Map<string, number>();
  ROWS.forEach((r, i) => {
    const { id } = sqlite
      .prepare(
        `INSERT INTO documents (matter_id, custodian_id, parent_id, control_number, original_name,
           sha256, size, doc_type, email_from, extract_status, duplicate_of, created_at)
         VALUES (?, ?, ?, ?, ?, ?, 1, 'text', ?, ?, ?, ?) RETURNING id`,
      )
      .get(
        matter.id,
        r.custodians[0] ? custodianId.get(r.custodians[0]) : null,
        r.parent ? ids.get(r.parent) : null,
        `${matter.controlPrefix}-${String(i + 1).padStart(6, '0')}`,
        `${r.key}.txt`,
        (r.duplicateOf ?? r.key).padEnd(64, '0'),
        r.from ?? '',
        r.duplicateOf ? 'duplicate' : 'extracted',
        r.duplicateOf ? ids.get(r.duplicateOf) : null,
        now,
      ) as { id: number };
    ids.set(r.key, id);
    // A duplicate's text is its first copy's; only extracted documents are searched.
    if (!r.duplicateOf)
      sqlite
        .prepare('INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)')
        .run(id, '', r.body);
    for (const name of r.custodians.slice(1))
      sqlite
        .prepare(
          'INSERT OR IGNORE INTO document_custodians (document_id, custodian_id) VALUES (?, ?)',
        )
        .run(id, custodianId.get(name));
  });
});
afterAll(() => t?.close());

interface Report {
  rows: {
    term: string;
    documents: number;
    uniqueDocuments: number;
    withFamilies: number;
    byCustodian: { custodian: string; documents: number }[];
    error?: string;
  }[];
  total: { documents: number; withFamilies: number };
}

/** The expected report, from the rows alone. */
function expectedReport(includeDuplicates: boolean) {
  const eligible = ROWS.filter((r) => includeDuplicates || !r.duplicateOf);
  const searchable = ROWS.filter((r) => !r.duplicateOf);
  const root = (r: Row) => r.parent ?? r.key;
  const hitsOf = (term: string) => {
    const hits = new Set(searchable.filter(PREDICATES[term]).map((r) => r.key));
    if (includeDuplicates)
      for (const r of ROWS) if (r.duplicateOf && hits.has(r.duplicateOf)) hits.add(r.key);
    return hits;
  };
  const families = (hits: Set<string>) => {
    const roots = new Set(ROWS.filter((r) => hits.has(r.key)).map(root));
    return new Set([...hits, ...eligible.filter((r) => roots.has(root(r))).map((r) => r.key)]);
  };
  const valid = TERMS.filter((term) => PREDICATES[term]);
  const sets = new Map(valid.map((term) => [term, hitsOf(term)]));
  const all = new Set(valid.flatMap((term) => [...sets.get(term)!]));
  const rows = TERMS.map((term) => {
    const hits = sets.get(term);
    if (!hits) return { term, documents: 0, uniqueDocuments: 0, withFamilies: 0, byCustodian: {} };
    const others = new Set(valid.filter((o) => o !== term).flatMap((o) => [...sets.get(o)!]));
    const byCustodian: Record<string, number> = {};
    for (const r of ROWS)
      if (hits.has(r.key)) for (const c of r.custodians) byCustodian[c] = (byCustodian[c] ?? 0) + 1;
    return {
      term,
      documents: hits.size,
      uniqueDocuments: [...hits].filter((k) => !others.has(k)).length,
      withFamilies: families(hits).size,
      byCustodian,
    };
  });
  return { rows, total: { documents: all.size, withFamilies: families(all).size } };
}

const asRecord = (list: { custodian: string; documents: number }[]) =>
  Object.fromEntries(list.map((c) => [c.custodian, c.documents]));

describe('search term report', () => {
  test.each([false, true])(
    'counts equal independently computed sets (includeDuplicates %s)',
    async (includeDuplicates) => {
      const res = await lead.post(url).send({ terms: TERMS, filters: { includeDuplicates } });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      const report = res.body as Report;
      const expected = expectedReport(includeDuplicates);
      expect(report.total).toEqual(expected.total);
      report.rows.forEach((row, i) => {
        const want = expected.rows[i];
        expect(row.term).toBe(want.term);
        expect(
          {
            documents: row.documents,
            unique: row.uniqueDocuments,
            families: row.withFamilies,
            byCustodian: asRecord(row.byCustodian),
          },
          row.term,
        ).toEqual({
          documents: want.documents,
          unique: want.uniqueDocuments,
          families: want.withFamilies,
          byCustodian: want.byCustodian,
        });
      });
      // Sanity of the fixture: the checks are not all zero.
      expect(expected.rows[0].withFamilies).toBeGreaterThan(expected.rows[0].documents);
      expect(expected.rows.some((r) => r.uniqueDocuments > 0)).toBe(true);
    },
  );

  test('a term with a syntax error gets its own row with the message; the others still run', async () => {
    const res = await lead.post(url).send({ terms: TERMS });
    const rows = (res.body as Report).rows;
    expect(rows[5].error).toMatch(/Unclosed quote.*at character 5/);
    expect(rows[6].error).toMatch(/Unknown field "colour"/);
    expect(rows[0].documents).toBeGreaterThan(0);
  });

  test('bad requests are 400s naming the problem', async () => {
    const none = await lead.post(url).send({ terms: [] });
    expect(none.status).toBe(400);
    expect(none.body.error.message).toMatch(/at least one term/);
    const many = await lead
      .post(url)
      .send({ terms: Array.from({ length: 201 }, (_, i) => `t${i}`) });
    expect(many.status).toBe(400);
    expect(many.body.error.message).toMatch(/at most 200 terms/);
  });

  test('the CSV parses back to the same report, and the download is audited', async () => {
    const json = (await lead.post(url).send({ terms: TERMS })).body as Report;
    const res = await lead
      .post(`${url}.csv`)
      .send({ terms: TERMS })
      .buffer(true)
      .parse((r, cb) => {
        let data = '';
        r.setEncoding('utf8');
        r.on('data', (chunk: string) => (data += chunk));
        r.on('end', () => cb(null, data));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const records = parse(res.body as string, { bom: true }) as string[][];
    const [header, ...rest] = records;
    expect(header.slice(0, 5)).toEqual([
      'Term',
      'Documents',
      'Unique documents',
      'With families',
      'Error',
    ]);
    const custodians = header.slice(5).map((h) => h.replace(/^Custodian: /, ''));
    expect(custodians).toEqual(['Avery', 'Blake', 'Casey']);
    json.rows.forEach((row, i) => {
      const cells = rest[i];
      expect(cells[0]).toBe(row.term);
      expect(cells.slice(1, 4).map(Number)).toEqual([
        row.documents,
        row.uniqueDocuments,
        row.withFamilies,
      ]);
      expect(cells[4]).toBe(row.error ?? '');
      const counts = asRecord(row.byCustodian);
      expect(cells.slice(5).map(Number)).toEqual(custodians.map((c) => counts[c] ?? 0));
    });
    const total = rest[json.rows.length];
    expect(total[0]).toBe('Total (any term)');
    expect(Number(total[1])).toBe(json.total.documents);
    expect(Number(total[3])).toBe(json.total.withFamilies);
    const audited = t.ctx.sqlite
      .prepare("SELECT count(*) FROM audit_events WHERE action = 'export.search_term_report'")
      .pluck()
      .get();
    expect(audited).toBe(1);
  });
});
