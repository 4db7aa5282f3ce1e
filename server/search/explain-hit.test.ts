// "Why it matched" adds up: on the path the search API runs (rankResultSet's query
// vector, the texts as stored, analyzedTerms over the highlight spans), the document
// terms' contributions sum to the hit's cosine, which the API reports as rawScore.
// The identity is the linear algebra of the cosine (Deerwester et al. 1990, section 4:
// a document's concept vector is the sum of its weighted terms' vectors), checked on
// the paper's nine memo titles and its worked query "human computer interaction".
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createTestApp, type TestApp } from '../../tests/helpers';
import { termContributions } from './explain-hit';
import { analyzedTerms, HIT_WINDOW_CHARS, termSpans } from './highlight';
import { textsByIds } from './queries';
import { rankResultSet } from './ranking';
import { isShownTerm } from './service';
import { buildMemoMatter, type MemoMatter } from './test-fixture';

let t: TestApp;
let m: MemoMatter;
beforeAll(async () => {
  t = await createTestApp();
  m = await buildMemoMatter(t);
});
afterAll(() => t?.close());

type Hit = { documentId: number; rawScore: number; why: { topTerms: { weight: number }[] } };

describe('why it matched', () => {
  test.each(['human computer interaction', 'graph minors survey'])(
    'contributions add up to the cosine the API reports: %s',
    async (query) => {
      const agent = await t.agentFor(m.matter.lead);
      const response = await agent
        .post(`/api/matters/${m.matter.id}/search`)
        .send({ query, mode: 'concept', limit: 50 });
      expect(response.status).toBe(200);
      const hits = response.body.hits as Hit[];
      expect(hits.length).toBeGreaterThan(2);

      const ranked = await rankResultSet(
        t.ctx,
        m.matter.id,
        { query, mode: 'concept', filters: {} },
        50,
      );
      const space = ranked.space!;
      const texts = new Map(
        (
          await textsByIds(
            t.ctx.db,
            hits.map((h) => h.documentId),
            HIT_WINDOW_CHARS,
          )
        ).map((r) => [r.document_id, r]),
      );
      for (const hit of hits) {
        const text = texts.get(hit.documentId)!;
        const terms = analyzedTerms(text.title, text.body, termSpans(text.body));
        const all = termContributions(
          space,
          ranked.queryVector!,
          space.indexOf(hit.documentId)!,
          terms,
        );
        const sum = all.reduce((s, c) => s + c.contribution, 0);
        // To float32 rounding: the concept space stores its vectors in single precision.
        expect(sum, `document ${hit.documentId}`).toBeCloseTo(hit.rawScore, 6);
        // The API shows the largest positive shares, in order, out of that same sum.
        // The page keeps the six largest and drops terms not shown to people (isShownTerm).
        const positive = all
          .filter((c) => c.contribution > 0)
          .sort((a, b) => b.contribution - a.contribution || (a.term < b.term ? -1 : 1))
          .slice(0, 6)
          .filter((c) => isShownTerm(c.term))
          .map((c) => c.contribution);
        const shown = hit.why.topTerms.map((term) => term.weight);
        expect(shown.length).toBeGreaterThan(0);
        shown.forEach((weight, i) => expect(weight).toBeCloseTo(positive[i], 12));
      }
    },
  );
});
