import { describe, expect, it } from 'vitest';
import { ConceptSpace } from '../index/concept-space';
import { mulberry32 } from '../linalg/random';
import { ANALYZER_VERSION } from '../text/analyzer';
import { prepareForSearch, search } from './search';
import { QUANTISED_MIN_ROWS } from './top-n';

// A seeded space large enough for the int8 first pass (QUANTISED_MIN_ROWS documents).
function seededSpace(nDocs: number, nTerms: number, k: number): ConceptSpace {
  const rand = mulberry32(77);
  const gaussianish = () => rand() + rand() + rand() - 1.5;
  return new ConceptSpace({
    params: {
      formatVersion: 1,
      analyzer: ANALYZER_VERSION,
      k,
      requestedK: k,
      weighting: 'log-entropy',
      minDf: 2,
      scaling: 'projection',
    },
    terms: Array.from(
      { length: nTerms },
      (_, i) => `term${String.fromCharCode(97 + (i % 26))}${i}`,
    ),
    df: new Int32Array(nTerms).fill(2),
    globalWeights: new Float64Array(nTerms).fill(1),
    sigma: Float64Array.from({ length: k }, (_, c) => k - c),
    termVectors: Float32Array.from({ length: nTerms * k }, gaussianish),
    docIds: Array.from({ length: nDocs }, (_, d) => d + 1),
    docVectors: Float32Array.from({ length: nDocs * k }, gaussianish),
    foldedIn: new Uint8Array(nDocs),
  });
}

describe('concept search on a space past the int8 first pass threshold', () => {
  const nDocs = QUANTISED_MIN_ROWS + 952;
  const query = 'termb1 termk10 termz25 termq42';

  it('ranks as a plain full sort of exact cosines does (common practice for top-N checks)', () => {
    const space = seededSpace(nDocs, 60, 24);
    const hits = search(space, query, { mode: 'concept', limit: 20 }).hits;
    const q = space.queryVector(query).vector;
    const docs = space.docMatrix;
    const k = space.k;
    const exact: { id: number; s: number }[] = [];
    for (let j = 0; j < nDocs; j++) {
      let dot = 0;
      let qq = 0;
      let dd = 0;
      for (let c = 0; c < k; c++) {
        dot += q[c] * docs[j * k + c];
        qq += q[c] * q[c];
        dd += docs[j * k + c] ** 2;
      }
      exact.push({ id: j + 1, s: dot / Math.sqrt(qq * dd) });
    }
    exact.sort((a, b) => b.s - a.s || a.id - b.id);
    expect(hits.map((h) => h.id)).toEqual(exact.slice(0, 20).map((e) => e.id));
    for (let r = 0; r < 20; r++) expect(hits[r].score).toBeCloseTo(exact[r].s, 5);
  });

  it('prepareForSearch changes no result: same ids and score bits as an unprepared space', () => {
    const prepared = seededSpace(nDocs, 60, 24);
    prepareForSearch(prepared);
    const plain = seededSpace(nDocs, 60, 24);
    const a = search(prepared, query, { mode: 'concept', limit: 30 }).hits;
    const b = search(plain, query, { mode: 'concept', limit: 30 }).hits;
    expect(a).toEqual(b);
  });
});
