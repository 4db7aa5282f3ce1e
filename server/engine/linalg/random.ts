// Deterministic seeded random numbers for the randomized range finder: mulberry32
// (a 32-bit generator in the xorshift/multiply family, public domain, common practice)
// with Box-Muller normal deviates (Box & Muller 1958).

export function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Fills out with independent standard normal deviates. */
export function fillGaussian(out: Float64Array, seed: number): void {
  const rand = mulberry32(seed);
  for (let i = 0; i < out.length; i += 2) {
    const u1 = 1 - rand(); // (0, 1], avoids log(0)
    const u2 = rand();
    const radius = Math.sqrt(-2 * Math.log(u1));
    out[i] = radius * Math.cos(2 * Math.PI * u2);
    if (i + 1 < out.length) out[i + 1] = radius * Math.sin(2 * Math.PI * u2);
  }
}

/**
 * Fills out with independent random signs (+1 / -1, Rademacher), 32 per generator
 * call: a test matrix for randomized range finders (Achlioptas 2003; Martinsson &
 * Tropp, Acta Numerica 2020, sec. 9) far cheaper to draw than Gaussians.
 */
export function fillRademacher(out: Float64Array, seed: number): void {
  const rand = mulberry32(seed);
  for (let i = 0; i < out.length; i += 32) {
    const bits = (rand() * 4294967296) >>> 0;
    const end = Math.min(32, out.length - i);
    for (let j = 0; j < end; j++) out[i + j] = (bits >>> j) & 1 ? 1 : -1;
  }
}
