// Seeded simple random sampling without replacement for validation samples.
import { mulberry32 } from '../linalg/random';

/**
 * A simple random sample of `size` ids from `population`, reproducible from `seed`:
 * the population is put in ascending order first (so the same set gives the same
 * sample whatever order it was read in), then a partial Fisher-Yates shuffle
 * (Knuth, TAOCP vol. 2, Algorithm 3.4.2P) driven by mulberry32(seed) picks the first
 * `size` positions. Every subset of that size is equally likely.
 */
export function simpleRandomSample(
  population: readonly number[],
  size: number,
  seed: number,
): number[] {
  if (!Number.isInteger(size) || size < 0)
    throw new RangeError(`size must be a whole number >= 0, got ${size}`);
  if (size > population.length)
    throw new RangeError(`size ${size} is larger than the population (${population.length})`);
  const ids = Int32Array.from(new Set(population)).sort();
  if (ids.length !== population.length) throw new RangeError('population has repeated ids');
  const random = mulberry32(seed);
  for (let i = 0; i < size; i++) {
    const j = i + Math.floor(random() * (ids.length - i));
    const t = ids[i];
    ids[i] = ids[j];
    ids[j] = t;
  }
  return Array.from(ids.subarray(0, size));
}
