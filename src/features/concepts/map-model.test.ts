import { describe, expect, it } from 'vitest';
import type { MapResponse } from '@shared/schemas/concepts';
import { hitTest, prepareMap, transformFor, zoomAt } from './map-model';

// The document map's grid hit-test is checked against a brute-force scan over every
// point (the reference), on a seeded pseudo-random cloud of 100,000 points, the size
// the issue asks the map to stay responsive at.

/** Mulberry32, a small seeded generator (common practice for reproducible test data). */
function random(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function cloud(n: number, seed: number): MapResponse {
  const next = random(seed);
  const x: number[] = [];
  const y: number[] = [];
  const custodian: number[] = [];
  const codeIds: number[][] = [];
  for (let i = 0; i < n; i++) {
    // Clustered like real maps: a few dense blobs plus a thin spread.
    const blob = Math.floor(next() * 4);
    const spread = blob === 3 ? 0.9 : 0.08;
    x.push(Math.max(-1, Math.min(1, (blob - 1.5) * 0.4 + (next() - 0.5) * spread)));
    y.push(Math.max(-1, Math.min(1, (blob % 2 ? 0.3 : -0.2) + (next() - 0.5) * spread)));
    custodian.push(i % 7 === 0 ? -1 : i % 3);
    codeIds.push(i % 5 === 0 ? [] : i % 2 ? [12, 11] : [13]);
  }
  return {
    indexId: 1,
    version: 1,
    k: 10,
    dims: [1, 2],
    count: n,
    x,
    y,
    ids: x.map((_, i) => i + 1),
    controlNumbers: x.map((_, i) => `DOC-${i + 1}`),
    titles: x.map(() => ''),
    custodian,
    codeIds,
    foldedIn: x.map(() => 0),
    custodians: [
      { id: 1, name: 'A' },
      { id: 2, name: 'B' },
      { id: 3, name: 'C' },
    ],
    codes: [
      { id: 11, name: 'Responsive' },
      { id: 12, name: 'Hot' },
      { id: 13, name: 'Privileged' },
    ],
  };
}

function bruteForce(
  data: MapResponse,
  category: Uint16Array,
  hidden: Set<number>,
  t: { scaleX: number; scaleY: number; ox: number; oy: number },
  px: number,
  py: number,
  radius: number,
): number {
  let best = -1;
  let bestD = radius * radius;
  for (let i = 0; i < data.count; i++) {
    if (hidden.has(category[i])) continue;
    const ex = t.ox + Math.fround(data.x[i]) * t.scaleX - px;
    const ey = t.oy - Math.fround(data.y[i]) * t.scaleY - py;
    const d = ex * ex + ey * ey;
    if (d <= bestD) {
      bestD = d;
      best = i;
    }
  }
  return best;
}

describe('document map model', () => {
  const data = cloud(100_000, 7);

  it('groups points by category with counts that add up', () => {
    const map = prepareMap(data, 'custodian');
    expect(map.categories.map((c) => c.name)).toEqual(['A', 'B', 'C', 'No custodian']);
    expect(map.categories.reduce((s, c) => s + c.count, 0)).toBe(100_000);
    expect(map.categories[3].count).toBe(Math.ceil(100_000 / 7));
    let misplaced = 0;
    for (let c = 0; c < map.categories.length; c++) {
      for (let k = map.catStart[c]; k < map.catStart[c + 1]; k++) {
        if (map.category[map.order[k]] !== c) misplaced++;
      }
    }
    expect(misplaced).toBe(0);
    // Codes: a document takes its first code in the code set's order; none is "Uncoded".
    const byCode = prepareMap(data, 'code');
    expect(byCode.categories.map((c) => c.name)).toEqual([
      'Responsive',
      'Hot',
      'Privileged',
      'Uncoded',
    ]);
    expect(byCode.category[1]).toBe(0); // [12, 11] -> Responsive (11 comes first in the set)
    expect(byCode.category[0]).toBe(3);
    // Each of the first seven categories has its own mark.
    expect(new Set(map.categories.map((c) => c.shape)).size).toBe(map.categories.length);
  });

  it('finds the same nearest point as a scan over all 100,000, zoomed and not, with a hidden category', () => {
    const map = prepareMap(data, 'custodian');
    const next = random(99);
    const views = [
      { zoom: 1, panX: 0, panY: 0 },
      zoomAt({ zoom: 1, panX: 0, panY: 0 }, 7, 300, 200, 900, 560, map.bounds),
    ];
    for (const view of views) {
      const t = transformFor(900, 560, map.bounds, view);
      for (const hidden of [new Set<number>(), new Set([0])]) {
        let hits = 0;
        for (let probe = 0; probe < 100; probe++) {
          const px = next() * 900;
          const py = next() * 560;
          const expected = bruteForce(data, map.category, hidden, t, px, py, 8);
          const got = hitTest(map, t, hidden, px, py, 8);
          if (expected >= 0) hits++;
          // Ties at an equal distance may pick either point; the distance must match.
          if (got !== expected) {
            const dist = (i: number) =>
              Math.hypot(t.ox + map.x[i] * t.scaleX - px, t.oy - map.y[i] * t.scaleY - py);
            expect(got).toBeGreaterThanOrEqual(0);
            expect(dist(got)).toBeCloseTo(dist(expected), 9);
          }
        }
        expect(hits).toBeGreaterThan(0);
      }
    }
  });

  it('zooming keeps the data point under the cursor in place', () => {
    const map = prepareMap(data, 'custodian');
    const before = { zoom: 2, panX: 30, panY: -12 };
    const t0 = transformFor(800, 560, map.bounds, before);
    const [px, py] = [210, 340];
    const dx = (px - t0.ox) / t0.scaleX;
    const dy = (t0.oy - py) / t0.scaleY;
    const t1 = transformFor(800, 560, map.bounds, zoomAt(before, 3, px, py, 800, 560, map.bounds));
    expect(t1.scaleX).toBeCloseTo(t0.scaleX * 3, 9);
    expect(t1.scaleY).toBeCloseTo(t0.scaleY * 3, 9);
    expect(t1.ox + dx * t1.scaleX).toBeCloseTo(px, 6);
    expect(t1.oy - dy * t1.scaleY).toBeCloseTo(py, 6);
  });
});
