// Term neighbours on the Cranfield 1400 collection (Cleverdon, Mills & Keen 1966; SMART
// files in ../shared/data/cranfield): the neighbours termNeighbours returns are checked
// against a brute-force float64 cosine over every term's row of U_k S_k.
import { describe, expect, it } from 'vitest';
import { requireShared } from '../../../tests/helpers/shared-data';
import { readCranfield } from '../eval/cranfield';
import { ConceptSpace } from '../index/concept-space';
import { analyze } from '../text/analyzer';
import { termNeighbours } from './neighbours';

const available = requireShared('term neighbours against brute-force cosine');

describe.runIf(available)('term neighbours on Cranfield (brute-force cosine reference)', () => {
  it('matches a brute-force cosine over all terms for several words', () => {
    const { docs } = readCranfield();
    const { space } = ConceptSpace.build(
      docs.map((d) => ({ id: d.id, title: d.title, text: d.text })),
      { k: 60 },
    );
    const k = space.k;
    const m = space.nTerms;
    // U_k S_k rows in float64 and their norms.
    const rows = new Float64Array(m * k);
    const norms = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      let s = 0;
      for (let c = 0; c < k; c++) {
        const v = space.termVectors[i * k + c] * space.sigma[c];
        rows[i * k + c] = v;
        s += v * v;
      }
      norms[i] = Math.sqrt(s);
    }
    for (const word of ['boundary', 'supersonic', 'heat', 'wing', 'buckling']) {
      const id = space.termId(analyze(word)[0])!;
      expect(id, word).toBeDefined();
      const brute: { i: number; cos: number }[] = [];
      for (let i = 0; i < m; i++) {
        if (i === id || norms[i] === 0) continue;
        let dot = 0;
        for (let c = 0; c < k; c++) dot += rows[id * k + c] * rows[i * k + c];
        brute.push({ i, cos: dot / (norms[id] * norms[i]) });
      }
      brute.sort((a, b) => b.cos - a.cos);
      const result = termNeighbours(space, word, 20);
      expect(result.notice).toBeNull();
      expect(result.neighbours).toHaveLength(20);
      result.neighbours.forEach((nb, r) => {
        // Float32 storage: similarities agree to ~1e-5; the order may swap only at near-ties.
        expect(nb.similarity).toBeCloseTo(brute[r].cos, 4);
        const gap = (other: number) =>
          other < 0 || other >= brute.length || Math.abs(brute[r].cos - brute[other].cos) > 1e-4;
        if (gap(r - 1) && gap(r + 1)) expect(nb.termId, `${word} #${r + 1}`).toBe(brute[r].i);
      });
      let matched = 0;
      result.neighbours.forEach((nb, r) => (matched += nb.termId === brute[r].i ? 1 : 0));
      expect(matched, word).toBeGreaterThanOrEqual(15);
      expect(result.neighbours.map((nb) => nb.label).every((l) => l.length > 0)).toBe(true);
    }
    const unknown = termNeighbours(space, 'zzyzxq', 20);
    expect(unknown.neighbours).toEqual([]);
    expect(unknown.notice).toMatch(/not in this matter's index/);
  }, 60_000);
});
