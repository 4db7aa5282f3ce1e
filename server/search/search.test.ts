// Search API over HTTP on a real SQLite matter: the nine memo titles of Deerwester et al.
// (1990), "Indexing by latent semantic analysis", JASIS 41(6), Table 1, indexed as in the
// paper (raw counts, terms in two or more titles, k = 2). The paper's worked query "human
// computer interaction" retrieves c1-c5 in the concept space, including c3 and c5, which
// share no word with the query, and none of the graph-theory memos m1-m4 (section 4,
// Figure 4). The keyword expectations follow from reading the titles: only c1, c2 and c4
// contain "human" or "computer", and no title contains "interaction".
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type Agent, type TestApp } from '../../tests/helpers';
import { buildMemoMatter, DEERWESTER_TITLES, type MemoKey, type MemoMatter } from './test-fixture';

let t: TestApp;
let m: MemoMatter;
let lead: Agent;
let url: string;

type Hit = {
  documentId: number;
  controlNumber: string;
  title: string;
  sentAt: string | null;
  custodian: string;
  docType: string;
  score: number;
  rawScore: number;
  duplicateOf: number | null;
  codes: { id: number; name: string }[];
  snippet: { text: string; mark?: string }[];
  why: { topTerms: { term: string }[]; nearestQueryTerms: { term: string }[] };
};

beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t);
  lead = await t.agentFor(m.matter.lead);
  url = `/api/matters/${m.matter.id}/search`;
});
afterAll(() => t?.close());

const keysOf = (hits: Hit[]) => {
  const byId = new Map(Object.entries(m.ids).map(([k, id]) => [id, k]));
  return hits.map((h) => byId.get(h.documentId) ?? `dup:${h.duplicateOf}`);
};
const search = async (body: Record<string, unknown>) => {
  const res = await lead.post(url).send(body);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as {
    total: number;
    mode: string;
    hits: Hit[];
    notice?: string;
    tookMs: number;
    knownTerms: string[];
    unknownTerms: string[];
  };
};
const QUERY = 'human computer interaction';

describe('modes (Deerwester et al. 1990, section 4)', () => {
  test('concept: c1-c5 and no m memo, including c3 and c5 that share no query word', async () => {
    const r = await search({ query: QUERY, mode: 'concept' });
    expect(r.mode).toBe('concept');
    expect(new Set(keysOf(r.hits))).toEqual(new Set(['c1', 'c2', 'c3', 'c4', 'c5']));
    expect(r.total).toBe(5);
    expect(r.unknownTerms).toEqual(['interaction']);
    for (const hit of r.hits) {
      expect(hit.score).toBeGreaterThanOrEqual(0);
      expect(hit.score).toBeLessThanOrEqual(1);
    }
    // Score order.
    const raw = r.hits.map((h) => h.rawScore);
    expect(raw).toEqual([...raw].sort((a, b) => b - a));
  });

  test('keyword: exactly the titles holding a query word (c1, c2, c4)', async () => {
    const r = await search({ query: QUERY, mode: 'keyword' });
    expect(r.mode).toBe('keyword');
    expect(new Set(keysOf(r.hits))).toEqual(new Set(['c1', 'c2', 'c4']));
    // c1 holds both words: bm25 ranks it first; the bar is normalised to the best hit.
    expect(keysOf(r.hits)[0]).toBe('c1');
    expect(r.hits[0].score).toBe(1);
  });

  test('hybrid (the default): every keyword hit plus the concept-only c3 and c5', async () => {
    const r = await search({ query: QUERY });
    expect(r.mode).toBe('hybrid');
    const keys = new Set(keysOf(r.hits));
    for (const k of ['c1', 'c2', 'c4', 'c3', 'c5']) expect(keys.has(k)).toBe(true);
    expect([...keys].some((k) => k.startsWith('m'))).toBe(false);
  });

  test('a query with no known term is an empty result with a notice, not an error', async () => {
    const r = await search({ query: 'zeppelin', mode: 'concept' });
    expect(r.total).toBe(0);
    expect(r.hits).toEqual([]);
    expect(r.notice).toMatch(/concept index/);
  });

  test('a malformed query is a 400 naming the problem and its position, never a 500', async () => {
    const res = await lead
      .post(url)
      .send({ query: 'human" OR NEAR(* graph) NOT', mode: 'keyword' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/Unclosed quote.*at character 6/);
    const field = await lead.post(url).send({ query: 'colour:red', mode: 'hybrid' });
    expect(field.status).toBe(400);
    expect(field.body.error.message).toMatch(/Unknown field "colour".*at character 1/);
  });

  test.each([
    ['human AND computer', ['c1']],
    ['human NOT computer', ['c4']],
    ['"user interface"', ['c3']],
    ['graph*', ['m2', 'm3', 'm4']],
    ['custodian:blake AND trees', ['m2', 'm3']],
    ['NOT (human OR computer OR graph OR trees)', ['c3', 'c5']],
  ])(
    'a Boolean query lists exactly the satisfying documents in every mode: %s',
    async (query, keys) => {
      for (const mode of ['keyword', 'hybrid', 'concept']) {
        const r = await search({ query, mode });
        expect(new Set(keysOf(r.hits)), `${mode}: ${query}`).toEqual(new Set(keys));
        expect(r.total).toBe(keys.length);
      }
    },
  );

  test('Boolean hits are ranked by bm25 over the positive words', async () => {
    // c4 says "system" twice, c2 and c3 once; c5 none (matched through NOT only... not here).
    const r = await search({ query: 'system AND NOT graph', mode: 'keyword' });
    expect(keysOf(r.hits)[0]).toBe('c4');
    expect(new Set(keysOf(r.hits))).toEqual(new Set(['c2', 'c3', 'c4']));
  });

  test('FTS5 syntax inside a phrase is searched as words (no injection)', async () => {
    // The phrase's tokens are near, graph: no title holds them in sequence.
    const r = await search({ query: 'human OR "NEAR(* graph)"', mode: 'keyword' });
    expect(new Set(keysOf(r.hits))).toEqual(new Set(['c1', 'c4']));
    // Plain words with FTS5 punctuation stay a ranked any-word search.
    const plain = await search({ query: 'human NEAR (graph) -', mode: 'keyword' });
    expect(new Set(keysOf(plain.hits))).toEqual(new Set(['c1', 'c4', 'm2', 'm3', 'm4']));
  });

  test('snippets are text segments marking query and concept terms; why names terms', async () => {
    const r = await search({ query: QUERY, mode: 'concept' });
    const c1 = r.hits.find((h) => h.documentId === m.ids.c1)!;
    expect(c1.snippet.map((s) => s.text).join('')).toBe(DEERWESTER_TITLES.c1);
    expect(c1.snippet.filter((s) => s.mark === 'query').map((s) => s.text)).toEqual([
      'Human',
      'computer',
    ]);
    const c3 = r.hits.find((h) => h.documentId === m.ids.c3)!;
    // c3 matched through its own words (user, interface, system, EPS), marked as concept terms.
    expect(c3.snippet.some((s) => s.mark === 'concept')).toBe(true);
    expect(c3.snippet.some((s) => s.mark === 'query')).toBe(false);
    const c3Words = new Set(DEERWESTER_TITLES.c3.toLowerCase().split(/\W+/));
    expect(c3.why.topTerms.length).toBeGreaterThan(0);
    for (const term of c3.why.topTerms) expect(c3Words.has(term.term)).toBe(true);
    expect(c3.why.nearestQueryTerms.length).toBeGreaterThan(0);
  });

  test('bad input names the field', async () => {
    const bad = await lead.post(url).send({ query: 'x', mode: 'fuzzy' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.field).toBe('mode');
    const both = await lead.post(url).send({ query: 'x', similarTo: { passage: 'y' } });
    expect(both.status).toBe(400);
    expect(both.body.error.field).toBe('query');
    const dates = await lead.post(url).send({ query: 'x', filters: { dateFrom: '2021-13-01' } });
    expect(dates.status).toBe(400);
    expect(dates.body.error.field).toBe('filters.dateFrom');
  });
});

describe('filters apply to every mode', () => {
  test('custodian (concept)', async () => {
    const r = await search({
      query: QUERY,
      mode: 'concept',
      filters: { custodianIds: [m.custodians['Avery Example']] },
    });
    expect(new Set(keysOf(r.hits))).toEqual(new Set(['c1', 'c2', 'c3']));
    expect(r.hits.every((h) => h.custodian === 'Avery Example')).toBe(true);
  });

  test('date range, inclusive of both days (keyword)', async () => {
    const r = await search({
      query: QUERY,
      mode: 'keyword',
      filters: { dateFrom: '2021-02-10', dateTo: '2021-04-20' },
    });
    expect(new Set(keysOf(r.hits))).toEqual(new Set(['c2', 'c4']));
  });

  test('document type (hybrid)', async () => {
    const r = await search({ query: QUERY, mode: 'hybrid', filters: { docTypes: ['pdf'] } });
    expect(new Set(keysOf(r.hits))).toEqual(new Set(['c3', 'c4']));
  });

  test('codes and uncoded only', async () => {
    const codes = (await lead.get(`/api/matters/${m.matter.id}/codes`)).body.codes as {
      id: number;
      name: string;
    }[];
    const responsive = codes.find((c) => c.name === 'Responsive')!.id;
    const matter = m.matter.id;
    const coded = await lead
      .post(`/api/matters/${matter}/codes/bulk`)
      .send({ documentIds: [m.ids.c1, m.ids.c3], add: [responsive] });
    expect(coded.status).toBe(200);
    const withCode = await search({
      query: QUERY,
      mode: 'concept',
      filters: { codeIds: [responsive] },
    });
    expect(new Set(keysOf(withCode.hits))).toEqual(new Set(['c1', 'c3']));
    expect(withCode.hits[0].codes).toEqual([{ id: responsive, name: 'Responsive' }]);
    const uncoded = await search({ query: QUERY, mode: 'keyword', filters: { uncodedOnly: true } });
    expect(new Set(keysOf(uncoded.hits))).toEqual(new Set(['c2', 'c4']));
    await lead
      .post(`/api/matters/${matter}/codes/bulk`)
      .send({ documentIds: [m.ids.c1, m.ids.c3], remove: [responsive] });
  });

  test('duplicates are hidden by default and listed after their first copy on request', async () => {
    const hidden = await search({ query: QUERY, mode: 'keyword' });
    expect(hidden.hits.some((h) => h.documentId === m.duplicateOfC1)).toBe(false);
    const shown = await search({
      query: QUERY,
      mode: 'keyword',
      filters: { includeDuplicates: true },
    });
    const at = shown.hits.findIndex((h) => h.documentId === m.ids.c1);
    expect(shown.hits[at + 1].documentId).toBe(m.duplicateOfC1);
    expect(shown.hits[at + 1].duplicateOf).toBe(m.ids.c1);
    expect(shown.hits[at + 1].custodian).toBe('Blake Example');
    expect(shown.total).toBe(hidden.total + 1);
  });
});

describe('paging and sorting on the server', () => {
  const GRAPH = 'graph minors trees survey';

  test('pages concatenate to the whole list; the total stays the same', async () => {
    const all = await search({ query: QUERY, mode: 'concept', limit: 50 });
    const pages: Hit[] = [];
    for (let offset = 0; offset < all.total; offset += 2) {
      const page = await search({ query: QUERY, mode: 'concept', limit: 2, offset });
      expect(page.total).toBe(all.total);
      pages.push(...page.hits);
    }
    expect(pages.map((h) => h.documentId)).toEqual(all.hits.map((h) => h.documentId));
  });

  test.each([
    ['controlNumber', 'asc'],
    ['controlNumber', 'desc'],
    ['title', 'asc'],
    ['docType', 'asc'],
    ['custodian', 'desc'],
  ] as const)('sort by %s %s', async (field, direction) => {
    const r = await search({ query: QUERY, mode: 'concept', sort: { field, direction } });
    const key = (h: Hit) =>
      field === 'title' ? h.title.toLowerCase() : field === 'custodian' ? h.custodian : h[field];
    const ordered = [...r.hits].sort((a, b) => {
      const c =
        key(a) < key(b) ? -1 : key(a) > key(b) ? 1 : a.controlNumber < b.controlNumber ? -1 : 1;
      return direction === 'asc' ? c : key(a) === key(b) ? c : -c;
    });
    expect(r.hits.map((h) => h.documentId)).toEqual(ordered.map((h) => h.documentId));
  });

  test('sort by date puts documents without a date last, both ways', async () => {
    const desc = await search({
      query: GRAPH,
      mode: 'keyword',
      sort: { field: 'date', direction: 'desc' },
    });
    expect(keysOf(desc.hits)).toEqual(['m3', 'm2', 'm1', 'c2', 'm4']);
    const asc = await search({
      query: GRAPH,
      mode: 'keyword',
      sort: { field: 'date', direction: 'asc' },
    });
    expect(keysOf(asc.hits)).toEqual(['c2', 'm1', 'm2', 'm3', 'm4']);
  });

  test('score ascending is score descending reversed', async () => {
    const desc = await search({ query: QUERY, mode: 'concept' });
    const asc = await search({
      query: QUERY,
      mode: 'concept',
      sort: { field: 'score', direction: 'asc' },
    });
    expect(asc.hits.map((h) => h.documentId)).toEqual(desc.hits.map((h) => h.documentId).reverse());
  });
});

describe('more like this', () => {
  test('from a document: its nearest documents, never itself', async () => {
    const res = await lead.get(`/api/matters/${m.matter.id}/documents/${m.ids.m4}/similar`);
    expect(res.status).toBe(200);
    const keys = keysOf(res.body.hits as Hit[]);
    expect(keys).not.toContain('m4');
    expect(new Set(keys.slice(0, 3))).toEqual(new Set(['m1', 'm2', 'm3']));
  });

  test('from a passage, with filters', async () => {
    const r = await search({
      similarTo: { passage: 'paths in a graph of trees' },
      filters: { custodianIds: [m.custodians['Blake Example']] },
    });
    expect(r.mode).toBe('concept');
    expect(keysOf(r.hits).slice(0, 3).sort()).toEqual(['m2', 'm3', 'm4']);
  });

  test('an unknown document is a 404', async () => {
    const res = await lead.get(`/api/matters/${m.matter.id}/documents/999999/similar`);
    expect(res.status).toBe(404);
    expect(res.body.error.message).toBe('Document not found.');
  });
});

describe('defensibility: every search is audited', () => {
  test('one search.run row per search with mode, query, hit count and filters', async () => {
    const before = await t.ctx.db
      .selectFrom('audit_events')
      .select('id')
      .where('action', '=', 'search.run')
      .execute();
    const filters = { docTypes: ['pdf'] };
    const r = await search({ query: QUERY, mode: 'keyword', filters });
    await search({ similarTo: { documentId: m.ids.c1 } });
    const rows = await t.ctx.db
      .selectFrom('audit_events')
      .selectAll()
      .where('action', '=', 'search.run')
      .where('id', '>', before.length ? Math.max(...before.map((b) => b.id)) : 0)
      .orderBy('id')
      .execute();
    expect(rows).toHaveLength(2);
    const detail = JSON.parse(rows[0].detail);
    expect(rows[0].actor_id).toBe(m.matter.lead.id);
    expect(rows[0].matter_id).toBe(m.matter.id);
    expect(detail).toMatchObject({ mode: 'keyword', query: QUERY, hits: r.total, filters });
    expect(JSON.parse(rows[1].detail).similarTo).toEqual({ documentId: m.ids.c1 });
  });

  test("recent searches: the caller's own, distinct, newest first", async () => {
    const other = await t.buildUser();
    await t.addMember(m.matter, other, 'reviewer');
    const agent = await t.agentFor(other);
    for (const q of ['graph', 'trees', 'graph'])
      expect((await agent.post(url).send({ query: q })).status).toBe(200);
    const res = await agent.get(`/api/matters/${m.matter.id}/searches/recent`);
    expect(res.status).toBe(200);
    expect(res.body.searches.map((s: { query: string }) => s.query)).toEqual(['graph', 'trees']);
  });
});

describe('before the first index build', () => {
  test('concept is refused with 409 naming the reason; hybrid runs as keyword with a notice', async () => {
    const bare = await buildMemoMatter(t, { withoutIndex: true });
    const agent = await t.agentFor(bare.matter.lead);
    const u = `/api/matters/${bare.matter.id}/search`;
    const concept = await agent.post(u).send({ query: QUERY, mode: 'concept' });
    expect(concept.status).toBe(409);
    expect(concept.body.error.message).toMatch(/no concept index yet/);
    const hybrid = await agent.post(u).send({ query: QUERY });
    expect(hybrid.status).toBe(200);
    expect(hybrid.body.mode).toBe('keyword');
    expect(hybrid.body.notice).toMatch(/keyword/);
    expect(hybrid.body.total).toBe(3);
    const similar = await agent.get(
      `/api/matters/${bare.matter.id}/documents/${bare.ids.c1}/similar`,
    );
    expect(similar.status).toBe(409);
  });
});

export type { MemoKey };
