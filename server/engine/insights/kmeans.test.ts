// k-means (Lloyd 1982 with k-means++ seeding, Arthur & Vassilvitskii 2007): the
// properties the method guarantees, checked by brute force rather than by stored results.
import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../linalg/random';
import { kmeans, KMeansInputError } from './kmeans';

function randomRows(n: number, d: number, seed: number): Float32Array {
  const rand = mulberry32(seed);
  return Float32Array.from({ length: n * d }, () => rand() * 2 - 1);
}

/** Three well-separated groups: noise around three orthogonal directions of R^6. */
function separated(perGroup: number, seed: number) {
  const rand = mulberry32(seed);
  const d = 6;
  const rows: number[] = [];
  const truth: number[] = [];
  for (let g = 0; g < 3; g++) {
    for (let p = 0; p < perGroup; p++) {
      for (let c = 0; c < d; c++) rows.push((c === g * 2 ? 1 : 0) + (rand() - 0.5) * 0.2);
      truth.push(g);
    }
  }
  return { rows: Float32Array.from(rows), truth, n: perGroup * 3, d };
}

/** Checks that every row sits with its nearest centre (brute force, unit-length rows). */
function everyRowAtNearestCentre(
  result: ReturnType<typeof kmeans>,
  n: number,
  d: number,
  groups: number,
) {
  let worst = 0;
  for (let i = 0; i < n; i++) {
    const dist = (g: number) => {
      let s = 0;
      for (let c = 0; c < d; c++) s += (result.points[i * d + c] - result.centres[g * d + c]) ** 2;
      return s;
    };
    const own = dist(result.assignment[i]);
    for (let g = 0; g < groups; g++) worst = Math.max(worst, own - dist(g));
  }
  return worst;
}

describe('k-means', () => {
  it('is deterministic with a seed, and a different seed may start elsewhere', () => {
    const rows = randomRows(300, 5, 7);
    const a = kmeans(rows, 300, 5, { groups: 6, seed: 11 });
    const b = kmeans(rows, 300, 5, { groups: 6, seed: 11 });
    expect(Array.from(a.assignment)).toEqual(Array.from(b.assignment));
    expect(Array.from(a.centres)).toEqual(Array.from(b.centres));
    const other = kmeans(rows, 300, 5, { groups: 6, seed: 12 });
    expect(other.converged).toBe(true);
  });

  it('gives the same grouping whatever order the rows come in (ids fix the order)', () => {
    const n = 250;
    const d = 4;
    const rows = randomRows(n, d, 3);
    const ids = Array.from({ length: n }, (_, i) => 1000 + i);
    const first = kmeans(rows, n, d, { groups: 5, seed: 5, ids });
    // Shuffle rows and ids together (Fisher-Yates with a seeded generator).
    const perm = Array.from({ length: n }, (_, i) => i);
    const rand = mulberry32(99);
    for (let i = n - 1; i > 0; i--) {
      const j = Math.floor(rand() * (i + 1));
      [perm[i], perm[j]] = [perm[j], perm[i]];
    }
    const shuffledRows = new Float32Array(n * d);
    perm.forEach((from, to) => shuffledRows.set(rows.subarray(from * d, (from + 1) * d), to * d));
    const shuffled = kmeans(shuffledRows, n, d, {
      groups: 5,
      seed: 5,
      ids: perm.map((p) => ids[p]),
    });
    perm.forEach((from, to) => expect(shuffled.assignment[to]).toBe(first.assignment[from]));
  });

  it('at convergence every document belongs to its nearest centre, and centres are the means', () => {
    const n = 400;
    const d = 8;
    const rows = randomRows(n, d, 21);
    const result = kmeans(rows, n, d, { groups: 9, seed: 2 });
    expect(result.converged).toBe(true);
    expect(everyRowAtNearestCentre(result, n, d, 9)).toBeLessThanOrEqual(1e-12);
    for (let g = 0; g < 9; g++) {
      const mean = new Float64Array(d);
      let size = 0;
      for (let i = 0; i < n; i++) {
        if (result.assignment[i] !== g) continue;
        size++;
        for (let c = 0; c < d; c++) mean[c] += result.points[i * d + c];
      }
      expect(size).toBe(result.sizes[g]);
      expect(size).toBeGreaterThan(0);
      for (let c = 0; c < d; c++) expect(result.centres[g * d + c]).toBeCloseTo(mean[c] / size, 10);
    }
    // Inertia is the sum of squared distances to the own centre.
    let inertia = 0;
    for (let i = 0; i < n; i++)
      for (let c = 0; c < d; c++)
        inertia += (result.points[i * d + c] - result.centres[result.assignment[i] * d + c]) ** 2;
    expect(result.inertia).toBeCloseTo(inertia, 6);
  });

  it('recovers well-separated synthetic groups exactly (up to numbering)', () => {
    const { rows, truth, n, d } = separated(40, 8);
    for (const seed of [1, 2, 3]) {
      const result = kmeans(rows, n, d, { groups: 3, seed });
      const map = new Map<number, number>();
      truth.forEach((t, i) => {
        const got = result.assignment[i];
        if (!map.has(got)) map.set(got, t);
        expect(map.get(got)).toBe(t);
      });
      expect(new Set(map.values()).size).toBe(3);
    }
  });

  it('restarts keep the seeding with the least inertia (and stay deterministic)', () => {
    const rows = randomRows(200, 3, 31);
    const single = [0, 1, 2, 3].map((r) =>
      kmeans(rows, 200, 3, { groups: 6, seed: (5 + Math.imul(r, 0x9e3779b9)) >>> 0 }),
    );
    const best = kmeans(rows, 200, 3, { groups: 6, seed: 5, restarts: 4 });
    expect(best.inertia).toBeCloseTo(Math.min(...single.map((s) => s.inertia)), 9);
    const again = kmeans(rows, 200, 3, { groups: 6, seed: 5, restarts: 4 });
    expect(Array.from(again.assignment)).toEqual(Array.from(best.assignment));
  });

  it('uses cosine geometry: a row and its multiple land together', () => {
    const rows = Float32Array.from([1, 0, 10, 0, 0, 1, 0, 7]);
    const result = kmeans(rows, 4, 2, { groups: 2, seed: 1 });
    expect(result.assignment[0]).toBe(result.assignment[1]);
    expect(result.assignment[2]).toBe(result.assignment[3]);
    expect(result.assignment[0]).not.toBe(result.assignment[2]);
  });

  it('refuses more groups than documents, with a clear message', () => {
    expect(() => kmeans(new Float32Array(6), 3, 2, { groups: 4 })).toThrow(KMeansInputError);
    expect(() => kmeans(new Float32Array(6), 3, 2, { groups: 4 })).toThrow(
      /4 groups need at least 4 documents/,
    );
  });

  it('copes with fewer distinct points than groups (duplicates)', () => {
    const rows = Float32Array.from([1, 0, 1, 0, 1, 0, 0, 1]);
    const result = kmeans(rows, 4, 2, { groups: 3, seed: 4 });
    expect(result.converged).toBe(true);
    expect(result.assignment[0]).toBe(result.assignment[1]);
    expect(result.assignment[3]).not.toBe(result.assignment[0]);
  });
});
