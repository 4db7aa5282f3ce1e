// Hybrid search through the API, on two planted cases:
//  1. The demo matter's queries (corpus-demo/README.md, "Demo queries"): every expected
//     document concept mode ranks in its top 10 is in hybrid's top 10 too, although it
//     shares no word with the query (corpus-demo/corpus.test.ts checks that).
//  2. A query of three words, two of them unknown to the concept space (the documents
//     holding them were added after the build): the one document holding all three,
//     first in keyword mode, is first in hybrid mode as well.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { planDemoCorpus } from '../../corpus-demo/generate';
import { DEMO_QUERIES } from '../../corpus-demo/targets';
import { automaticK } from '../../shared/schemas/indexing';
import { createTestApp, type Agent, type TestApp } from '../../tests/helpers';
import { minDfFor } from '../indexing/build-core';
import { buildMemoMatter, indexMatter } from './test-fixture';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(() => t?.close());

async function addDocuments(
  matterId: number,
  prefix: string,
  docs: { key: string; text: string }[],
) {
  const sqlite = t.ctx.sqlite;
  const now = new Date().toISOString();
  const ids = new Map<string, number>();
  sqlite.transaction(() => {
    for (const [i, d] of docs.entries()) {
      const { id } = sqlite
        .prepare(
          `INSERT INTO documents (matter_id, control_number, original_name, sha256, size, extract_status, created_at)
           VALUES (?, ?, ?, ?, 1, 'extracted', ?) RETURNING id`,
        )
        .get(
          matterId,
          `${prefix}-${String(900000 + i)}`,
          d.key,
          `${prefix}${i}`.padEnd(64, '0'),
          now,
        ) as {
        id: number;
      };
      sqlite
        .prepare('INSERT INTO document_texts (document_id, title, body) VALUES (?, ?, ?)')
        .run(id, '', d.text);
      ids.set(d.key, id);
    }
  })();
  return ids;
}

const topIds = async (agent: Agent, matterId: number, query: string, mode: string, limit = 10) => {
  const res = await agent.post(`/api/matters/${matterId}/search`).send({ query, mode, limit });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return (res.body.hits as { documentId: number }[]).map((h) => h.documentId);
};

describe('hybrid does not bury what only concept search finds', () => {
  test('demo queries: concept top-10 targets stay in hybrid top 10', async () => {
    const matter = await t.buildMatter();
    const lead = await t.agentFor(matter.lead);
    const plan = planDemoCorpus().filter((d) => !d.brokenReason && d.text.length > 0);
    const ids = await addDocuments(
      matter.id,
      matter.controlPrefix,
      plan.map((d) => ({ key: d.path, text: d.text })),
    );
    // As the server builds a matter's first index: automatic k, log-entropy, minDf.
    await indexMatter(
      t,
      matter.id,
      plan.map((d) => ({ id: ids.get(d.path)!, text: d.text })),
      { k: automaticK(plan.length), weighting: 'log-entropy', minDf: minDfFor(plan.length) },
    );
    let checked = 0;
    for (const q of DEMO_QUERIES) {
      const concept = await topIds(lead, matter.id, q.query, 'concept');
      const hybrid = await topIds(lead, matter.id, q.query, 'hybrid');
      for (const path of q.expected) {
        const id = ids.get(path)!;
        if (!concept.includes(id)) continue;
        checked++;
        expect(hybrid, `"${q.query}": ${path} is in concept's top 10`).toContain(id);
      }
    }
    // The check is not empty: most targets are in concept's top 10.
    expect(checked).toBeGreaterThanOrEqual(3);
  }, 60_000);

  test('words the concept space does not know: keyword leads', async () => {
    const m = await buildMemoMatter(t);
    const lead = await t.agentFor(m.matter.lead);
    // Added after the index build: their words are unknown to the concept space.
    const added = await addDocuments(m.matter.id, m.matter.controlPrefix, [
      { key: 'all-three', text: 'Human quorvex blandishment' },
      { key: 'one-new', text: 'A quorvex note' },
    ]);
    const query = 'human quorvex blandishment';
    const keyword = await topIds(lead, m.matter.id, query, 'keyword');
    expect(keyword[0]).toBe(added.get('all-three'));
    const hybrid = await topIds(lead, m.matter.id, query, 'hybrid');
    expect(hybrid[0]).toBe(added.get('all-three'));
    // Documents matching the known word only (c1, c4) follow it.
    expect(hybrid.slice(1)).toEqual(expect.arrayContaining([m.ids.c1, m.ids.c4]));
  });
});
