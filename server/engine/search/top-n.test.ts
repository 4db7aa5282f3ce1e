import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../linalg/random';
import { allocateRows } from './simd-dot';
import { quantisedTop, topCosine } from './top-n';

// Checked against a plain full sort of exact (Float64) cosines: common practice for
// testing a partial-selection top-N.
function reference(
  rows: Float32Array,
  k: number,
  n: number,
  q: Float64Array,
  limit: number,
  dims = k,
) {
  const scores: { j: number; s: number }[] = [];
  let qn = 0;
  for (let c = 0; c < dims; c++) qn += q[c] * q[c];
  for (let j = 0; j < n; j++) {
    let dot = 0;
    let dn = 0;
    for (let c = 0; c < dims; c++) {
      dot += q[c] * rows[j * k + c];
      dn += rows[j * k + c] ** 2;
    }
    scores.push({ j, s: dn > 0 ? dot / Math.sqrt(qn * dn) : 0 });
  }
  return scores.sort((a, b) => b.s - a.s || a.j - b.j).slice(0, limit);
}

function inverseNorms(rows: Float32Array, k: number, n: number, dims = k) {
  const inv = new Float32Array(n);
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let c = 0; c < dims; c++) s += rows[j * k + c] ** 2;
    inv[j] = s > 0 ? 1 / Math.sqrt(s) : 0;
  }
  return inv;
}

describe('topCosine', () => {
  const n = 2000;
  const k = 12;
  const rand = mulberry32(11);
  for (const backing of ['scalar', 'simd'] as const) {
    const rows = backing === 'simd' ? allocateRows(n, k) : new Float32Array(n * k);
    for (let i = 0; i < n * k; i++) rows[i] = rand() - 0.5;
    for (let c = 0; c < k; c++) rows[5 * k + c] = 0; // a zero row scores 0
    const q = Float64Array.from({ length: k }, () => rand() - 0.5);

    it(`matches a full sort (${backing})`, () => {
      const top = topCosine(rows, k, n, inverseNorms(rows, k, n), q, 25);
      const ref = reference(rows, k, n, q, 25);
      expect(Array.from(top.indices)).toEqual(ref.map((r) => r.j));
      top.scores.forEach((s, r) => expect(s).toBeCloseTo(ref[r].s, 5));
    });

    it(`over a prefix of the axes (${backing})`, () => {
      const top = topCosine(rows, k, n, inverseNorms(rows, k, n, 8), q, 10, { dims: 8 });
      expect(Array.from(top.indices)).toEqual(reference(rows, k, n, q, 10, 8).map((r) => r.j));
    });

    it(`keeps only scores at or above minScore, the same as cutting the full sort (${backing})`, () => {
      const floor = 0.3;
      const top = topCosine(rows, k, n, inverseNorms(rows, k, n), q, 40, { minScore: floor });
      const ref = reference(rows, k, n, q, n).filter((r) => r.s >= floor + 1e-6);
      expect(ref.length).toBeGreaterThan(40);
      expect(Array.from(top.indices)).toEqual(ref.slice(0, 40).map((r) => r.j));
      const few = topCosine(rows, k, n, inverseNorms(rows, k, n), q, n, { minScore: 0.6 });
      const refFew = reference(rows, k, n, q, n).filter((r) => r.s >= 0.6);
      expect(few.indices.length).toBe(refFew.length);
      for (const s of few.scores) expect(s).toBeGreaterThanOrEqual(0.6);
    });

    it(`orders the whole set with ties by lower row first (${backing})`, () => {
      // Rows 40..79 repeat rows 0..39: every score is tied with another row's.
      const m = 80;
      const tied = backing === 'simd' ? allocateRows(m, k) : new Float32Array(m * k);
      for (let i = 0; i < 40 * k; i++) tied[i] = tied[i + 40 * k] = rows[i];
      const top = topCosine(tied, k, m, inverseNorms(tied, k, m), q, m);
      const ref = reference(tied, k, m, q, m);
      expect(Array.from(top.indices)).toEqual(ref.map((r) => r.j));
      for (let r = 1; r < m; r++) expect(top.scores[r]).toBeLessThanOrEqual(top.scores[r - 1]);
    });

    it(`honours the candidate mask and the excluded row (${backing})`, () => {
      const allow = new Uint8Array(n);
      for (let j = 0; j < n; j += 7) allow[j] = 1;
      const best = reference(rows, k, n, q, 1)[0].j;
      const top = topCosine(rows, k, n, inverseNorms(rows, k, n), q, 50, { allow, exclude: 0 });
      expect(top.indices.length).toBe(50);
      for (const j of top.indices) {
        expect(allow[j]).toBe(1);
        expect(j).not.toBe(0);
      }
      const all = topCosine(rows, k, n, inverseNorms(rows, k, n), q, 1, { exclude: best });
      expect(all.indices[0]).not.toBe(best);
    });
  }

  it('returns nothing for a zero query', () => {
    const rows = allocateRows(3, 4);
    expect(topCosine(rows, 4, 3, new Float32Array(3), new Float64Array(4), 5).indices.length).toBe(
      0,
    );
  });
});

// The int8 first pass must change nothing: same rows, same order, same score bits as
// the full Float32 pass, whatever the limit, prefix, mask, excluded row or cut-off.
describe('topCosine with the int8 first pass', () => {
  const n = 6000;
  const k = 24;
  const rand = mulberry32(29);
  const rows = allocateRows(n, k);
  // Clustered rows (60 centres plus noise), so many cosines sit close together.
  const centres = Array.from({ length: 60 }, () => Array.from({ length: k }, () => rand() - 0.5));
  for (let j = 0; j < n; j++) {
    const centre = centres[j % 60];
    for (let c = 0; c < k; c++) rows[j * k + c] = centre[c] + 0.15 * (rand() - 0.5);
  }
  for (let c = 0; c < k; c++) rows[17 * k + c] = 0; // a zero row
  for (let c = 0; c < k; c++) rows[18 * k + c] = rows[19 * k + c]; // an exact tie
  const allow = new Uint8Array(n);
  for (let j = 0; j < n; j += 3) allow[j] = 1;
  const cases = [
    { limit: 10 },
    { limit: 1 },
    { limit: 200, dims: 16 },
    { limit: 50, dims: 13 },
    { limit: 1000, minScore: 0.6 },
    { limit: 5000, minScore: 0.7 },
    { limit: 40, allow, exclude: 3 },
  ];
  for (const [i, options] of cases.entries()) {
    it(`case ${i + 1}: ${JSON.stringify({ ...options, allow: options.allow ? 'every third' : undefined })}`, () => {
      // Near one row, as a "more like this" query is: its cluster scores high.
      const q = Float64Array.from(
        { length: k },
        (_, c) => rows[(i * 7 + 100) * k + c] + 0.1 * (rand() - 0.5),
      );
      const dims = options.dims ?? k;
      const inv = inverseNorms(rows, k, n, dims);
      const plain = topCosine(rows, k, n, inv, q, options.limit, options);
      const viaInt8 = topCosine(rows, k, n, inv, q, options.limit, { ...options, quantised: true });
      expect(Array.from(viaInt8.indices)).toEqual(Array.from(plain.indices));
      expect(Array.from(viaInt8.scores)).toEqual(Array.from(plain.scores));
      expect(plain.indices.length).toBeGreaterThan(0);
      // The first pass itself answered (it did not fall back to the full pass).
      let qn = 0;
      for (let c = 0; c < dims; c++) qn += q[c] * q[c];
      const unit = Float64Array.from({ length: dims }, (_, c) => q[c] / Math.sqrt(qn));
      const direct = quantisedTop(
        rows,
        k,
        n,
        inv,
        unit,
        options.limit,
        dims,
        options.allow,
        options.exclude ?? -1,
        options.minScore ?? -Infinity,
      );
      expect(direct).not.toBeNull();
      expect(Array.from(direct!.indices)).toEqual(Array.from(plain.indices));
    });
  }
});
