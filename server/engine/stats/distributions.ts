// Special functions behind the sampling statistics: the standard normal distribution
// and the regularised incomplete beta function, with their inverses. Plain float64;
// checked against jStat and published values in stats.test.ts.

const SQRT2 = Math.SQRT2;
const TWO_OVER_SQRT_PI = 2 / Math.sqrt(Math.PI);

/**
 * erfc(x) for x >= 0. Below 4: erf from its all-positive series
 * erf(x) = 2/sqrt(pi) e^{-x^2} sum_n 2^n x^{2n+1} / (1*3*...*(2n+1))
 * (Abramowitz & Stegun 7.1.6), which has no cancellation; above it the continued
 * fraction for erfc (A&S 7.1.14) evaluated by the modified Lentz method.
 */
function erfcPositive(x: number): number {
  if (x < 4) {
    let term = x;
    let sum = x;
    for (let n = 1; n < 500; n++) {
      term *= (2 * x * x) / (2 * n + 1);
      sum += term;
      if (term < sum * 1e-17) break;
    }
    return 1 - TWO_OVER_SQRT_PI * Math.exp(-x * x) * sum;
  }
  // erfc(x) = e^{-x^2}/sqrt(pi) * 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + ...)))))
  const tiny = 1e-300;
  let f = x;
  let c = x;
  let d = 0;
  for (let n = 1; n < 500; n++) {
    const a = n / 2;
    d = x + a * d;
    d = Math.abs(d) < tiny ? tiny : d;
    c = x + a / c;
    c = Math.abs(c) < tiny ? tiny : c;
    d = 1 / d;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.exp(-x * x) / Math.sqrt(Math.PI) / f;
}

/** Standard normal cumulative distribution Phi(x). */
export function normalCdf(x: number): number {
  const t = Math.abs(x) / SQRT2;
  const tail = 0.5 * erfcPositive(t); // P(Z > |x|)
  return x >= 0 ? 1 - tail : tail;
}

/** Phi^-1(p): bisection to bracket, then Newton steps on Phi (density exp(-x^2/2)/sqrt(2 pi)). */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`probability must be between 0 and 1, got ${p}`);
  if (p === 0.5) return 0;
  // Work in the lower tail for accuracy, then reflect.
  const q = Math.min(p, 1 - p);
  let lo = -40;
  let hi = 0;
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    if (normalCdf(mid) < q) lo = mid;
    else hi = mid;
  }
  let x = (lo + hi) / 2;
  for (let i = 0; i < 5; i++) {
    const density = Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
    if (density === 0) break;
    const step = (normalCdf(x) - q) / density;
    x -= step;
    if (Math.abs(step) < 1e-15 * Math.max(1, Math.abs(x))) break;
  }
  return p < 0.5 ? x : -x;
}

// Lanczos approximation of ln Gamma (g = 7, n = 9; the coefficients in common use,
// e.g. Press et al., Numerical Recipes 3rd ed. section 6.1 gives the g = 5 set),
// accurate to about 1e-15 for x > 0.
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
];

export function logGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  const z = x - 1;
  let a = LANCZOS[0];
  const t = z + 7.5;
  for (let i = 1; i < 9; i++) a += LANCZOS[i] / (z + i);
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(a);
}

/** Continued fraction for I_x(a, b) (Numerical Recipes 3rd ed. 6.4, modified Lentz). */
function betaContinuedFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  d = Math.abs(d) < tiny ? tiny : d;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 10000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    d = Math.abs(d) < tiny ? tiny : d;
    c = 1 + aa / c;
    c = Math.abs(c) < tiny ? tiny : c;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    d = Math.abs(d) < tiny ? tiny : d;
    c = 1 + aa / c;
    c = Math.abs(c) < tiny ? tiny : c;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return h;
}

/** Regularised incomplete beta I_x(a, b), the Beta(a, b) cumulative distribution. */
export function betaCdf(x: number, a: number, b: number): number {
  if (!(a > 0 && b > 0)) throw new RangeError(`beta parameters must be positive, got ${a}, ${b}`);
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const logFront =
    logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log1p(-x);
  const front = Math.exp(logFront);
  // The continued fraction converges fast for x < (a + 1) / (a + b + 2); use symmetry otherwise.
  if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(x, a, b)) / a;
  return 1 - (front * betaContinuedFraction(1 - x, b, a)) / b;
}

/**
 * The p-quantile of Beta(a, b): bisection on betaCdf (monotone), 200 halvings at
 * most, so the answer is exact to the last bits of float64 without depending on a
 * starting guess.
 */
export function betaQuantile(p: number, a: number, b: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`probability must be in [0, 1], got ${p}`);
  if (p === 0) return 0;
  if (p === 1) return 1;
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (mid === lo || mid === hi) break;
    if (betaCdf(mid, a, b) < p) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
