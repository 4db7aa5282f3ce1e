// CSV exports over HTTP, parsed back with csv-parse and compared with the database.
// CSV rules: RFC 4180 (CRLF record ends; a field holding a comma, quote or line break is
// quoted, with quotes doubled). The byte-order mark EF BB BF is the UTF-8 encoding of
// U+FEFF (Unicode Standard, section 23.8). Formula neutralising follows OWASP "CSV Injection".
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import {
  createTestApp,
  type Agent,
  type TestApp,
  type TestUser,
  bytesBody,
} from '../../tests/helpers';
import { buildMemoMatter, type MemoMatter } from '../search/test-fixture';

let t: TestApp;
let m: MemoMatter;
let base: string;
let lead: Agent;
let attorney: Agent;
let reviewer: TestUser;

beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t);
  base = `/api/matters/${m.matter.id}`;
  lead = await t.agentFor(m.matter.lead);
  const att = await t.buildUser();
  await t.addMember(m.matter, att, 'attorney');
  attorney = await t.agentFor(att);
  reviewer = await t.buildUser();
  await t.addMember(m.matter, reviewer, 'reviewer');
});
afterAll(() => t?.close());

/** Downloads as raw bytes (supertest would otherwise decode and hide the BOM). */
async function download(agent: Agent, path: string, query: Record<string, string> = {}) {
  const res = await agent.get(path).query(query).buffer(true).parse(bytesBody);
  return { res, bytes: res.body as Buffer };
}

function parseCsv(bytes: Buffer): string[][] {
  return parse(bytes, { bom: true, relax_column_count: false }) as string[][];
}

describe('results.csv', () => {
  test('the whole result set, in rank order, matching the database and the search API', async () => {
    const codes = (await lead.get(`${base}/codes`)).body.codes as { id: number; name: string }[];
    const hot = codes.find((c) => c.name === 'Hot')!.id;
    const responsive = codes.find((c) => c.name === 'Responsive')!.id;
    await lead.put(`${base}/documents/${m.ids.c1}/codes`).send({ codeIds: [responsive, hot] });
    const filters = {
      custodianIds: [m.custodians['Avery Example'], m.custodians['Blake Example']],
    };
    const { res, bytes } = await download(attorney, `${base}/exports/results.csv`, {
      query: 'human computer interaction',
      mode: 'concept',
      filters: JSON.stringify(filters),
    });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toMatch(
      /^attachment; filename="[A-Z0-9]+-search-results-\d{4}-\d{2}-\d{2}\.csv"$/,
    );
    expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const text = bytes.subarray(3).toString('utf8');
    expect(text.split('\r\n').length).toBeGreaterThan(2);
    expect(text.replaceAll('\r\n', '')).not.toMatch(/\n/);

    const [header, ...rows] = parseCsv(bytes);
    // The columns docs/SEARCH.md promises ("Exports"), written out rather than read back
    // from the constant the export itself uses.
    expect(header).toEqual([
      'Rank',
      'Control number',
      'Title',
      'Custodian',
      'Date',
      'Document type',
      'Score',
      'Codes',
      'Family ID',
      'Family date',
      'From',
      'To',
      'Cc',
      'Bcc',
      'Sent',
      'Received',
      'Message-ID',
      'In-Reply-To',
      'File created',
      'File modified',
      'Author',
      'Last author',
      'Source path',
      'All custodians',
      'Thread ID',
      'Inclusive',
      'Near-duplicate group',
      'Near-duplicate similarity',
      'OCR',
    ]);
    // Same set and order as the search API's full result set (all pages).
    const api = await attorney
      .post(`${base}/search`)
      .send({ query: 'human computer interaction', mode: 'concept', filters, limit: 500 });
    expect(rows.map((r) => r[1])).toEqual(
      api.body.hits.map((h: { controlNumber: string }) => h.controlNumber),
    );
    expect(rows).toHaveLength(api.body.total);
    const dbRows = await t.ctx.db
      .selectFrom('documents as d')
      .leftJoin('custodians as c', 'c.id', 'd.custodian_id')
      .select([
        'd.id',
        'd.control_number',
        'd.title',
        'd.sent_at',
        'd.doc_type',
        'c.name as custodian',
      ])
      .where('d.matter_id', '=', m.matter.id)
      .execute();
    const byControl = new Map(dbRows.map((r) => [r.control_number, r]));
    rows.forEach((row, i) => {
      const d = byControl.get(row[1])!;
      expect(row[0]).toBe(String(i + 1));
      expect(row.slice(2, 6)).toEqual([
        d.title,
        d.custodian,
        d.sent_at?.slice(0, 10) ?? '',
        d.doc_type,
      ]);
      expect(Number(row[6])).toBeCloseTo(api.body.hits[i].score, 4);
    });
    expect(rows.find((r) => r[1] === m.controlNumbers[m.ids.c1])![7]).toBe('Responsive; Hot');
    const audit = await t.ctx.db
      .selectFrom('audit_events')
      .select('detail')
      .where('action', '=', 'export.results')
      .execute();
    expect(audit).toHaveLength(1);
    expect(JSON.parse(audit[0].detail)).toMatchObject({
      query: 'human computer interaction',
      mode: 'concept',
      rows: rows.length,
    });
  });

  test('sorted exports and bad filters', async () => {
    const { bytes } = await download(lead, `${base}/exports/results.csv`, {
      query: 'graph trees',
      mode: 'keyword',
      sort: 'controlNumber',
    });
    const controls = parseCsv(bytes)
      .slice(1)
      .map((r) => r[1]);
    expect(controls).toEqual([...controls].sort());
    const bad = await lead
      .get(`${base}/exports/results.csv`)
      .query({ query: 'x', filters: '{not json' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.field).toBe('filters');
    const missing = await lead.get(`${base}/exports/results.csv`);
    expect(missing.status).toBe(400);
    expect(missing.body.error.field).toBe('query');
  });

  test('reviewers and paralegals may not export (exports.create)', async () => {
    const res = await (await t.agentFor(reviewer)).get(`${base}/exports/privilege-log.csv`);
    expect(res.status).toBe(403);
  });
});

describe('privilege-log.csv', () => {
  test('parsed back and compared with the database, family rows under their parent', async () => {
    const codes = (await lead.get(`${base}/codes`)).body.codes as { id: number; name: string }[];
    const code = (name: string) => codes.find((c) => c.name === name)!.id;
    // c1: an e-mail with two attachments, c2 (Word) and c3 (PDF); c3 is coded Not privileged.
    const db = t.ctx.db;
    await db
      .updateTable('documents')
      .set({
        doc_type: 'email',
        mime: 'message/rfc822',
        email_from: 'Ana Counsel <ana@firm.example>',
        email_to: 'Bo Client <bo@client.example>, Cy Client <cy@client.example>',
        email_cc: 'Di Paralegal <di@firm.example>',
        email_bcc: 'Ed Partner <ed@firm.example>',
      })
      .where('id', '=', m.ids.c1)
      .execute();
    for (const [child, type, mime] of [
      [m.ids.c2, 'docx', 'application/vnd.openxmlformats-officedocument.wordprocessingml.document'],
      [m.ids.c3, 'pdf', 'application/pdf'],
    ] as const)
      await db
        .updateTable('documents')
        .set({ parent_id: m.ids.c1, family_id: m.ids.c1, doc_type: type, mime })
        .where('id', '=', child)
        .execute();
    const tricky = 'Advice on "response time", line one\nline two';
    expect(
      (
        await lead.put(`${base}/documents/${m.ids.c1}/codes`).send({
          codeIds: [code('Privileged')],
          privilege: {
            type: 'Attorney-client privilege',
            basis: 'Legal advice',
            description: tricky,
          },
        })
      ).status,
    ).toBe(200);
    await lead
      .put(`${base}/documents/${m.ids.c3}/codes`)
      .send({ codeIds: [code('Not privileged')] });
    await lead.put(`${base}/documents/${m.ids.c5}/codes`).send({
      codeIds: [code('Privileged')],
      privilege: {
        type: 'Work product',
        basis: 'Prepared for litigation',
        description: '=HYPERLINK("x")',
        treatment: 'redacted',
      },
    });

    const { res, bytes } = await download(lead, `${base}/exports/privilege-log.csv`);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toMatch(
      /attachment; filename=".+-privilege-log-\d{4}-\d{2}-\d{2}\.csv"/,
    );
    const raw = bytes.subarray(3).toString('utf8');
    // RFC 4180 section 2, rules 6 and 7: the field is quoted and its quotes doubled.
    expect(raw).toContain('"Advice on ""response time"", line one\nline two"');
    const [header, ...rows] = parseCsv(bytes);
    expect(header).toEqual([
      'Control number',
      'Family begin',
      'Family end',
      'Family relation',
      'Date',
      'Author',
      'From',
      'To',
      'Cc',
      'Bcc',
      'Subject or title',
      'Custodian',
      'Document type',
      'Privilege type',
      'Basis',
      'Description',
      'Withheld or redacted',
    ]);
    // Expected rows written out from the database (the labels a person reads, not extensions).
    const docs = await db
      .selectFrom('documents as d')
      .leftJoin('custodians as c', 'c.id', 'd.custodian_id')
      .select([
        'd.id',
        'd.control_number',
        'd.sent_at',
        'd.author',
        'd.email_from',
        'd.email_to',
        'd.email_cc',
        'd.email_bcc',
        'd.title',
        'c.name as custodian',
      ])
      .where('d.id', 'in', [m.ids.c1, m.ids.c2, m.ids.c3, m.ids.c5, m.duplicateOfC1])
      .execute();
    const d = new Map(docs.map((x) => [x.id, x]));
    const cn = (id: number) => d.get(id)!.control_number;
    const row = (id: number, family: [string, string, string], type: string, priv: string[]) => {
      const x = d.get(id)!;
      return [
        x.control_number,
        ...family,
        x.sent_at?.slice(0, 10) ?? '',
        x.author,
        x.email_from,
        x.email_to,
        x.email_cc,
        x.email_bcc,
        x.title,
        x.custodian ?? '',
        type,
        ...priv,
      ];
    };
    const family: [string, string] = [cn(m.ids.c1), cn(m.ids.c3)];
    expect(rows).toEqual([
      row(m.ids.c1, [...family, 'Parent'], 'E-mail', [
        'Attorney-client privilege',
        'Legal advice',
        tricky,
        'Withheld',
      ]),
      // The Word attachment is on the log under its parent, with the parent's type and basis;
      // the PDF attachment coded Not privileged is not.
      row(m.ids.c2, [...family, 'Attachment'], 'Word document', [
        'Attorney-client privilege',
        'Legal advice',
        '',
        'Withheld',
      ]),
      row(m.ids.c5, ['', '', ''], 'Word document', [
        'Work product',
        'Prepared for litigation',
        `'=HYPERLINK("x")`,
        'Redacted',
      ]),
      // c1's exact duplicate took Privileged (the Privilege group follows duplicates) and its entry.
      row(m.duplicateOfC1, ['', '', ''], 'E-mail', [
        'Attorney-client privilege',
        'Legal advice',
        tricky,
        'Withheld',
      ]),
    ]);
    expect(rows[0][6]).toBe('Ana Counsel <ana@firm.example>');
    const audit = await db
      .selectFrom('audit_events')
      .select(['detail', 'actor_id'])
      .where('action', '=', 'export.privilege_log')
      .execute();
    expect(audit).toHaveLength(1);
    expect(JSON.parse(audit[0].detail)).toMatchObject({ rows: 4, familyRows: 2 });

    // The in-app log shows the same rows, and a description is edited in place (audited).
    const screen = await attorney.get(`${base}/privilege-log`);
    expect(screen.body.rows.map((r: { controlNumber: string }) => r.controlNumber)).toEqual(
      rows.map((r) => r[0]),
    );
    expect(screen.body.rows[1].inherited).toBe(true);
    const patched = await attorney
      .patch(`${base}/privilege-log/${m.ids.c2}`)
      .send({ description: 'Draft agreement attached to counsel advice' });
    expect(patched.status).toBe(200);
    expect(patched.body.row).toMatchObject({
      description: 'Draft agreement attached to counsel advice',
      basis: 'Legal advice',
    });
    const offLog = await attorney
      .patch(`${base}/privilege-log/${m.ids.c3}`)
      .send({ description: 'x' });
    expect(offLog.status).toBe(404);
    expect(offLog.body.error.message).toBe('Privilege log entry not found.');
    expect((await (await t.agentFor(reviewer)).get(`${base}/privilege-log`)).status).toBe(403);
  });
});
