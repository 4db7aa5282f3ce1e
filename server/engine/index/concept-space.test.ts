import { describe, expect, it } from 'vitest';
import { csrFromDense } from '../sparse/csr';
import { analyze } from '../text/analyzer';
import { ConceptSpace, EngineInputError } from './concept-space';
import { search } from '../search/search';
import { explainMatch, nearestTerms } from '../search/explain';

// Deerwester, Dumais, Furnas, Landauer & Harshman (1990), "Indexing by latent
// semantic analysis", JASIS 41(6): the nine titles (c1-c5 human-computer
// interaction, m1-m4 graph theory) and the 12 x 9 raw-count matrix of Table 2.
const TITLES: Record<string, string> = {
  c1: 'Human machine interface for ABC computer applications',
  c2: 'A survey of user opinion of computer system response time',
  c3: 'The EPS user interface management system',
  c4: 'System and human system engineering testing of EPS',
  c5: 'Relation of user perceived response time to error measurement',
  m1: 'The generation of random, binary, ordered trees',
  m2: 'The intersection graph of paths in trees',
  m3: 'Graph minors IV: Widths of trees and well-quasi-ordering',
  m4: 'Graph minors: A survey',
};
const DOCS = Object.keys(TITLES);
const TERM_WORDS = [
  'human',
  'interface',
  'computer',
  'user',
  'system',
  'response',
  'time',
  'EPS',
  'survey',
  'trees',
  'graph',
  'minors',
];
// prettier-ignore
const TABLE_2 = [
  1, 0, 0, 1, 0, 0, 0, 0, 0, // human
  1, 0, 1, 0, 0, 0, 0, 0, 0, // interface
  1, 1, 0, 0, 0, 0, 0, 0, 0, // computer
  0, 1, 1, 0, 1, 0, 0, 0, 0, // user
  0, 1, 1, 2, 0, 0, 0, 0, 0, // system
  0, 1, 0, 0, 1, 0, 0, 0, 0, // response
  0, 1, 0, 0, 1, 0, 0, 0, 0, // time
  0, 0, 1, 1, 0, 0, 0, 0, 0, // EPS
  0, 1, 0, 0, 0, 0, 0, 0, 1, // survey
  0, 0, 0, 0, 0, 1, 1, 1, 0, // trees
  0, 0, 0, 0, 0, 0, 1, 1, 1, // graph
  0, 0, 0, 0, 0, 0, 0, 1, 1, // minors
];

function deerwesterSpace(scaling: 'classic' | 'projection') {
  // The terms go through the same analysis as queries (so "computer" is "comput").
  const terms = TERM_WORDS.map((w) => analyze(w)[0]);
  return ConceptSpace.fromCounts(terms, csrFromDense(12, 9, TABLE_2), DOCS, {
    k: 2,
    weighting: 'raw',
    scaling,
    svd: { method: 'lanczos' },
  });
}

describe('Deerwester et al. (1990) worked example, two dimensions', () => {
  for (const scaling of ['classic', 'projection'] as const) {
    it(`ranks c1-c5 above m1-m4 for "human computer interaction" (${scaling})`, () => {
      const { space, diagnostics } = deerwesterSpace(scaling);
      expect(diagnostics.k).toBe(2);
      const result = search(space, 'human computer interaction', { mode: 'concept', limit: 9 });
      expect(result.hits).toHaveLength(9);
      const order = result.hits.map((h) => String(h.id));
      expect(new Set(order.slice(0, 5))).toEqual(new Set(['c1', 'c2', 'c3', 'c4', 'c5']));
      // "interaction" is not an index term (it occurs in no title): reported, not fatal.
      expect(result.unknownTerms).toEqual(['interact']);
    });
  }

  it("folding in a document with c1's words reproduces c1's row (A^T U_k = V_k S_k) with drift in [0, 1]", () => {
    const { space } = deerwesterSpace('projection');
    const [folded] = space.foldInDocuments([{ id: 'new', text: 'human interface computer' }]);
    const c1 = space.docVector(space.indexOf('c1')!);
    for (let c = 0; c < 2; c++) expect(folded.vector[c]).toBeCloseTo(c1[c], 5);
    expect(folded.drift).toBeGreaterThan(0);
    expect(folded.drift).toBeLessThan(1);
    expect(space.nDocs).toBe(10);
    expect(space.isFoldedIn(space.indexOf('new')!)).toBe(true);
    const [alien] = space.foldInDocuments([{ id: 'alien', text: 'zebra quokka' }]);
    expect(alien.drift).toBe(1);
    expect(alien.knownTerms).toBe(0);
  });

  it('explains a hit: query-term contributions add up to the cosine', () => {
    const { space } = deerwesterSpace('projection');
    const e = explainMatch(space, 'human computer', 'c3', { documentText: TITLES.c3 });
    const hit = search(space, 'human computer', { mode: 'concept', limit: 9 }).hits.find(
      (h) => h.id === 'c3',
    )!;
    expect(e.cosine).toBeCloseTo(hit.score, 5);
    const sum = e.queryTerms.reduce((s, t) => s + t.contribution, 0);
    expect(sum).toBeCloseTo(e.cosine, 5);
    // c3 has neither "human" nor "computer": its match runs through user/interface/system.
    const docSum = e.documentTerms!.reduce((s, t) => s + t.contribution, 0);
    expect(docSum).toBeCloseTo(e.cosine, 4);
    expect(e.documentTerms!.map((t) => t.term)).toEqual(expect.arrayContaining(['user', 'system']));
  });

  it('nearest terms of "graph" are the graph-theory terms', () => {
    const { space } = deerwesterSpace('projection');
    const near = nearestTerms(space, 'graph', 2).map((t) => t.term);
    expect(new Set(near)).toEqual(new Set(['tree', 'minor']));
  });
});

describe('build from text', () => {
  it('keeps terms in >= minDf documents, sorted, and clips k to the rank with a notice', () => {
    const docs = Object.entries(TITLES).map(([id, text]) => ({ id, text }));
    const { space, diagnostics } = ConceptSpace.build(docs, { k: 50 });
    expect(space.terms).toEqual([...space.terms].sort());
    // Table 2's 12 terms plus "order" (Porter: ordered, ordering -> order, in m1 and m3).
    expect(space.terms).toEqual([
      'comput',
      'ep',
      'graph',
      'human',
      'interfac',
      'minor',
      'order',
      'respons',
      'survei',
      'system',
      'time',
      'tree',
      'user',
    ]);
    // Labels: the most frequent surface word; a tie goes to the shorter ("order" over "ordered").
    expect(space.labels[space.termId('comput')!]).toBe('computer');
    expect(space.labels[space.termId('survei')!]).toBe('survey');
    expect(space.labels[space.termId('tree')!]).toBe('trees');
    expect(diagnostics.k).toBeLessThanOrEqual(9);
    expect(diagnostics.notices.join(' ')).toMatch(/k lowered from 50/);
    expect(diagnostics.energy).toBeCloseTo(1, 6); // full rank kept: Eckart-Young energy 1
    expect(diagnostics.sigma1).toBe(diagnostics.singularValues[0]);
    expect(diagnostics.orthogonalityU).toBeLessThan(1e-8);
  });

  it('refuses an empty corpus and k above the rank when strict', () => {
    expect(() => ConceptSpace.build([])).toThrow(EngineInputError);
    expect(() =>
      ConceptSpace.build([
        { id: 1, text: 'alpha' },
        { id: 2, text: 'beta' },
      ]),
    ).toThrow(/no term occurs/);
    const docs = Object.entries(TITLES).map(([id, text]) => ({ id, text }));
    expect(() => ConceptSpace.build(docs, { k: 50, strictK: true })).toThrow(/above the rank/);
    expect(() => ConceptSpace.build(docs, { k: 0 })).toThrow(/k must be/);
  });
});
