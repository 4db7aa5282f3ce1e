// Sampling statistics for recall validation: binomial confidence intervals, sample
// sizes, and the elusion-based recall estimate.
import { betaQuantile, normalQuantile } from './distributions';

export interface Interval {
  low: number;
  high: number;
}

function checkCounts(x: number, n: number): void {
  if (!Number.isInteger(n) || n < 1)
    throw new RangeError(`n must be a whole number >= 1, got ${n}`);
  if (!Number.isInteger(x) || x < 0 || x > n)
    throw new RangeError(`x must be a whole number between 0 and n (${n}), got ${x}`);
}

function checkConfidence(confidence: number): void {
  if (!(confidence > 0 && confidence < 1))
    throw new RangeError(`confidence must be between 0 and 1, got ${confidence}`);
}

/** The two-sided critical value z_{1 - alpha/2} for a confidence level 1 - alpha. */
export function zFor(confidence: number): number {
  checkConfidence(confidence);
  return normalQuantile(1 - (1 - confidence) / 2);
}

/**
 * Clopper & Pearson (Biometrika 1934) exact interval for a binomial proportion:
 * low = B^-1(alpha/2; x, n - x + 1), high = B^-1(1 - alpha/2; x + 1, n - x), with
 * low = 0 at x = 0 and high = 1 at x = n. At x = 0, high = 1 - (alpha/2)^(1/n).
 */
export function clopperPearson(x: number, n: number, confidence = 0.95): Interval {
  checkCounts(x, n);
  checkConfidence(confidence);
  const alpha = 1 - confidence;
  const low = x === 0 ? 0 : betaQuantile(alpha / 2, x, n - x + 1);
  const high =
    x === n
      ? 1
      : x === 0
        ? 1 - Math.pow(alpha / 2, 1 / n)
        : betaQuantile(1 - alpha / 2, x + 1, n - x);
  return { low, high };
}

/** Wilson (JASA 1927) score interval. */
export function wilson(x: number, n: number, confidence = 0.95): Interval {
  checkCounts(x, n);
  const z = zFor(confidence);
  const p = x / n;
  const z2n = (z * z) / n;
  const centre = (p + z2n / 2) / (1 + z2n);
  const half = (z / (1 + z2n)) * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
  return { low: Math.max(0, centre - half), high: Math.min(1, centre + half) };
}

export interface SampleSizeOptions {
  confidence: number;
  /** Half-width E of the interval, as a proportion (0.05 for plus or minus 5%). */
  margin: number;
  /** Assumed proportion; 0.5 (the default) gives the largest, safest size. */
  proportion?: number;
  /** Population size N for the finite-population correction; omit for an infinite population. */
  population?: number;
}

/**
 * n0 = z^2 p (1 - p) / E^2 (Cochran, Sampling Techniques, 3rd ed. 1977, eq. 4.2), and
 * with a population of N the finite-population correction n = n0 / (1 + (n0 - 1) / N)
 * (eq. 4.3), rounded up; never more than N. About 385 for plus or minus 5% at 95%.
 */
export function sampleSize(options: SampleSizeOptions): number {
  const { confidence, margin } = options;
  const p = options.proportion ?? 0.5;
  if (!(margin > 0 && margin < 1))
    throw new RangeError(`margin must be between 0 and 1, got ${margin}`);
  if (!(p > 0 && p < 1)) throw new RangeError(`proportion must be between 0 and 1, got ${p}`);
  const z = zFor(confidence);
  const n0 = (z * z * p * (1 - p)) / (margin * margin);
  const N = options.population;
  if (N === undefined) return Math.ceil(n0);
  if (!Number.isInteger(N) || N < 0)
    throw new RangeError(`population must be a whole number >= 0, got ${N}`);
  if (N === 0) return 0;
  // A tiny tolerance keeps values like 384.0000000001 (float noise) from rounding up.
  return Math.min(N, Math.ceil(n0 / (1 + (n0 - 1) / N) - 1e-9));
}

export interface ElusionEstimate {
  rate: number;
  interval: Interval;
  wilson: Interval;
  /** rate x population of the discard set. */
  estimatedMissed: number;
  /** found / (found + missed), with the interval carried through from the rate's interval. */
  recall: { point: number; low: number; high: number } | null;
}

/**
 * Elusion (common practice in technology-assisted review validation): x responsive
 * in a simple random sample of n from the N documents not to be produced; missed is
 * estimated as N x/n, and recall as found / (found + missed), where found counts the
 * documents already coded responsive. The recall interval maps the exact interval of
 * the rate through the same formula (monotone, so the ends swap).
 */
export function elusionEstimate(
  x: number,
  n: number,
  population: number,
  found: number | null,
  confidence = 0.95,
): ElusionEstimate {
  const interval = clopperPearson(x, n, confidence);
  const rate = x / n;
  const missed = rate * population;
  const recallOf = (m: number) => (found! + m > 0 ? found! / (found! + m) : 1);
  return {
    rate,
    interval,
    wilson: wilson(x, n, confidence),
    estimatedMissed: missed,
    recall:
      found === null
        ? null
        : {
            point: recallOf(missed),
            low: recallOf(interval.high * population),
            high: recallOf(interval.low * population),
          },
  };
}
