import { describe, expect, it } from 'vitest';
import { ConceptSpace } from '../index/concept-space';
import { cranfieldAvailable, readCranfield } from './cranfield';
import { reviewedToReach, simulateReview } from './review-simulation';

describe('reviewedToReach', () => {
  it('counts documents reviewed until each recall target (worked by hand)', () => {
    // Relevant 1, 3, 4, 7 sit at positions 2, 4, 5, 8: 75% recall = ceil(3) = 3 found
    // (position 5), 90% = ceil(3.6) = 4 found (position 8).
    expect(
      reviewedToReach([0, 1, 2, 3, 4, 5, 6, 7], new Set([1, 3, 4, 7]), [0.75, 0.9], 8),
    ).toEqual([5, 8]);
    expect(reviewedToReach([7, 3, 1, 4, 0], new Set([1, 3, 4, 7]), [0.5, 1], 8)).toEqual([2, 4]);
  });
});

// Cranfield 1400 (Cleverdon, Mills & Keen 1966) at a small scale: k = 60 and the
// first queries with at least 10 relevant documents. The full run, in
// docs/RETRIEVAL.md, is scripts/bench/review-simulation.ts.
describe.runIf(cranfieldAvailable())(
  'simulated prioritised review on Cranfield (small scale)',
  () => {
    it('needs fewer documents than reviewing in BM25 order to reach 75% and 90% recall', () => {
      const { docs, queries, qrels } = readCranfield();
      const { space } = ConceptSpace.build(
        docs.map((d) => ({ id: d.id, title: d.title, text: d.text })),
        { k: 60 },
      );
      const result = simulateReview(space, docs, queries, qrels, { maxQueries: 5 });
      expect(result.queries).toHaveLength(5);
      for (const q of result.queries) expect(q.relevant).toBeGreaterThanOrEqual(10);
      for (let t = 0; t < 2; t++) {
        expect(result.mean.prioritised[t]).toBeLessThan(result.mean.bm25[t]);
      }
    }, 120_000);
  },
);
