import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { betaCdf, betaQuantile, normalCdf, normalQuantile } from './distributions';
import { clopperPearson, elusionEstimate, sampleSize, wilson, zFor } from './intervals';
import { simpleRandomSample } from './sample';

describe('distributions (reference: jStat 1.9.6, a general-purpose statistics package)', () => {
  it('normal quantile and cdf agree with jStat', () => {
    for (const p of [0.0005, 0.005, 0.025, 0.05, 0.1, 0.3, 0.5, 0.8, 0.95, 0.975, 0.995]) {
      expect(normalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 8);
    }
    for (const x of [-5, -2.5, -1, 0, 0.7, 1.96, 4.5])
      expect(normalCdf(x)).toBeCloseTo(jStat.normal.cdf(x, 0, 1), 12);
    // Published critical values (any statistics table): z_0.975 = 1.959964, z_0.995 = 2.575829.
    expect(zFor(0.95)).toBeCloseTo(1.959964, 6);
    expect(zFor(0.99)).toBeCloseTo(2.575829, 6);
    expect(zFor(0.9)).toBeCloseTo(1.644854, 6);
  });

  it('beta cdf and quantile agree with jStat', () => {
    for (const [a, b] of [
      [1, 1],
      [5, 381],
      [6, 380],
      [0.5, 0.5],
      [20, 3],
      [150, 250],
    ]) {
      for (const p of [0.005, 0.025, 0.5, 0.975, 0.995]) {
        const q = betaQuantile(p, a, b);
        // jStat's inverse stops its Newton steps near 1e-8 (Beta(1, 1): 0.50000003 for
        // the median 0.5); the round trip through our cdf checks ours to 1e-12.
        expect(q).toBeCloseTo(jStat.beta.inv(p, a, b), 7);
        expect(betaCdf(q, a, b)).toBeCloseTo(p, 12);
      }
    }
  });
});

describe('Clopper-Pearson and Wilson intervals', () => {
  it('x = 0 of 385: upper bound 1 - 0.025^(1/385) = 0.00954 (closed form)', () => {
    const ci = clopperPearson(0, 385, 0.95);
    expect(ci.low).toBe(0);
    expect(ci.high).toBeCloseTo(1 - Math.pow(0.025, 1 / 385), 14);
    expect(ci.high).toBeCloseTo(0.00954, 5);
  });

  it('x = 5 of 385: 0.00423 to 0.0300 (SciPy beta.ppf values quoted in the issue; jStat beta.inv)', () => {
    const ci = clopperPearson(5, 385, 0.95);
    expect(ci.low).toBeCloseTo(0.00423, 5);
    expect(ci.high).toBeCloseTo(0.03, 4);
    expect(ci.low).toBeCloseTo(jStat.beta.inv(0.025, 5, 381), 10);
    expect(ci.high).toBeCloseTo(jStat.beta.inv(0.975, 6, 380), 10);
  });

  it('agrees with jStat beta.inv across counts and confidence levels, and x = n is [., 1]', () => {
    for (const confidence of [0.9, 0.95, 0.99]) {
      const a = 1 - confidence;
      for (const [x, n] of [
        [1, 10],
        [3, 50],
        [17, 400],
        [40, 60],
      ]) {
        const ci = clopperPearson(x, n, confidence);
        expect(ci.low).toBeCloseTo(jStat.beta.inv(a / 2, x, n - x + 1), 9);
        expect(ci.high).toBeCloseTo(jStat.beta.inv(1 - a / 2, x + 1, n - x), 9);
      }
    }
    const full = clopperPearson(10, 10, 0.95);
    expect(full.high).toBe(1);
    expect(full.low).toBeCloseTo(Math.pow(0.025, 1 / 10), 12); // closed form at x = n
  });

  it('Wilson interval: Newcombe (Statistics in Medicine 1998) table I, 81/263 -> 0.2553 to 0.3662', () => {
    // Newcombe's worked example, method 3 (score without continuity correction); the
    // values are quoted from memory of that table and agree with the closed form.
    const ci = wilson(81, 263, 0.95);
    expect(ci.low).toBeCloseTo(0.2553, 4);
    expect(ci.high).toBeCloseTo(0.3662, 4);
    // Closed form at x = 0: high = z^2 / (n + z^2).
    const z = zFor(0.95);
    expect(wilson(0, 385).high).toBeCloseTo((z * z) / (385 + z * z), 14);
    expect(wilson(0, 385).low).toBe(0);
  });

  it('rejects counts that are not counts', () => {
    expect(() => clopperPearson(6, 5)).toThrow(/x must be/);
    expect(() => clopperPearson(1, 0)).toThrow(/n must be/);
    expect(() => wilson(1, 10, 1.5)).toThrow(/confidence/);
  });
});

describe('sample size n = z^2 p(1-p) / E^2 with the finite-population correction (Cochran 1977)', () => {
  const formula = (confidence: number, margin: number, N?: number) => {
    const z = jStat.normal.inv(1 - (1 - confidence) / 2, 0, 1);
    const n0 = (z * z * 0.25) / (margin * margin);
    return Math.ceil(N === undefined ? n0 : n0 / (1 + (n0 - 1) / N));
  };
  it('about 385 for plus or minus 5% at 95% (common practice)', () => {
    expect(sampleSize({ confidence: 0.95, margin: 0.05 })).toBe(385);
  });
  it('matches the formula for several margins, with and without the correction', () => {
    for (const confidence of [0.9, 0.95, 0.99])
      for (const margin of [0.01, 0.02, 0.025, 0.05, 0.1]) {
        expect(sampleSize({ confidence, margin })).toBe(formula(confidence, margin));
        for (const N of [500, 2000, 10000, 1000000])
          expect(sampleSize({ confidence, margin, population: N })).toBe(
            formula(confidence, margin, N),
          );
      }
    // Values common in sample-size tables (from memory; they follow from the formula): 95%, +-5%, N = 1000 -> 278; 95%, +-2%, infinite -> 2401; 99%, +-1% -> 16588.
    expect(sampleSize({ confidence: 0.95, margin: 0.05, population: 1000 })).toBe(278);
    expect(sampleSize({ confidence: 0.95, margin: 0.02 })).toBe(2401);
    expect(sampleSize({ confidence: 0.99, margin: 0.01 })).toBe(16588);
  });
  it('never exceeds the population and rejects a bad margin', () => {
    expect(sampleSize({ confidence: 0.95, margin: 0.01, population: 50 })).toBeLessThanOrEqual(50);
    expect(() => sampleSize({ confidence: 0.95, margin: 0 })).toThrow(/margin/);
  });
});

describe('elusion estimate', () => {
  it('carries the exact interval through to missed documents and recall', () => {
    // 5 responsive in 385 drawn from 20,000 discarded, 900 already coded responsive.
    const e = elusionEstimate(5, 385, 20000, 900);
    expect(e.rate).toBeCloseTo(5 / 385, 14);
    expect(e.estimatedMissed).toBeCloseTo((20000 * 5) / 385, 9);
    expect(e.recall!.point).toBeCloseTo(900 / (900 + (20000 * 5) / 385), 12);
    expect(e.recall!.low).toBeCloseTo(900 / (900 + 20000 * e.interval.high), 12);
    expect(e.recall!.high).toBeCloseTo(900 / (900 + 20000 * e.interval.low), 12);
    expect(elusionEstimate(5, 385, 20000, null).recall).toBeNull();
  });
});

describe('simple random sample', () => {
  const population = Array.from({ length: 5000 }, (_, i) => 3 * i + 7);
  it('is reproducible from its seed, whatever order the population comes in', () => {
    const a = simpleRandomSample(population, 385, 42);
    const b = simpleRandomSample([...population].reverse(), 385, 42);
    expect(b).toEqual(a);
    expect(simpleRandomSample(population, 385, 43)).not.toEqual(a);
  });
  it('draws only from the population, without repeats, of the asked size', () => {
    const s = simpleRandomSample(population, 385, 7);
    const members = new Set(population);
    expect(s).toHaveLength(385);
    expect(new Set(s).size).toBe(385);
    expect(s.every((id) => members.has(id))).toBe(true);
    expect(() => simpleRandomSample(population, 5001, 1)).toThrow(/larger than the population/);
  });
  it('gives each member about the same chance (chi-square over 2000 draws of 1 from 10)', () => {
    const counts = new Array(10).fill(0);
    for (let seed = 0; seed < 2000; seed++)
      counts[simpleRandomSample([0, 1, 2, 3, 4, 5, 6, 7, 8, 9], 1, seed)[0]]++;
    const chi = counts.reduce((s, c) => s + (c - 200) ** 2 / 200, 0);
    // 9 degrees of freedom: P(chi^2 > 27.88) = 0.001 (standard table).
    expect(chi).toBeLessThan(27.88);
  });
});
