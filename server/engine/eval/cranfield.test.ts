import { describe, expect, it } from 'vitest';
import { requireShared } from '../../../tests/helpers/shared-data';
import { readCranfield } from './cranfield';
import { prepareCollection, runEvaluation } from './evaluate';

// Cranfield 1400 (Cleverdon, Mills & Keen 1966), read from ../shared/data/cranfield.
// Reference figures measured with reference libraries and the same preprocessing
// (the retrieval brief): BM25 (SQLite FTS5) MAP 0.318, the best LSI 0.359
// (log-entropy, k = 200, projection onto U_k), a tuned hybrid 0.364.
const present = requireShared('Cranfield retrieval quality');

describe.runIf(present)('Cranfield retrieval quality (MAP over the 225 judged queries)', () => {
  it('reads 1400 documents, 225 queries numbered by position, graded qrels', () => {
    const { docs, queries, qrels } = readCranfield();
    expect(docs).toHaveLength(1400);
    expect(queries).toHaveLength(225);
    // cran.qry's .I ids skip numbers (e.g. 001, 002, 004); cranqrel counts 1..225.
    expect(queries[2].id).toBe('3');
    expect(qrels.size).toBe(225);
    // cranqrel's first row "1 184 2": code 2 -> grade 5 - 2 = 3.
    expect(qrels.get('1')!.get('184')).toBe(3);
  });

  it('keyword >= 0.30, concept >= 0.35, hybrid above both and >= 0.36', () => {
    const { docs, queries, qrels } = readCranfield();
    const prepared = prepareCollection(docs, { k: 200 }); // one build shared by the three modes
    try {
      const keyword = runEvaluation(prepared, queries, qrels, 'keyword').metrics;
      const concept = runEvaluation(prepared, queries, qrels, 'concept').metrics;
      const hybrid = runEvaluation(prepared, queries, qrels, 'hybrid').metrics;
      console.log(
        `Cranfield MAP: keyword ${keyword.map.toFixed(4)}, concept ${concept.map.toFixed(4)}, hybrid ${hybrid.map.toFixed(4)}`,
      );
      expect(keyword.queries).toBe(225);
      expect(keyword.map).toBeGreaterThanOrEqual(0.3);
      expect(concept.map).toBeGreaterThanOrEqual(0.35);
      expect(hybrid.map).toBeGreaterThan(keyword.map);
      expect(hybrid.map).toBeGreaterThan(concept.map);
      expect(hybrid.map).toBeGreaterThanOrEqual(0.36);
    } finally {
      prepared.close();
    }
  }, 120_000);
});
