import { mulberry32 } from '../engine/index';

/**
 * A reproducible simple random sample of `n` items: a Fisher-Yates shuffle (Durstenfeld
 * 1964; Knuth, TAOCP vol. 2, 3.4.2 Algorithm P) stopped after n steps, driven by the
 * seeded mulberry32 generator. The population is sorted first, so the same seed over the
 * same population always yields the same sample, in the same order.
 */
export function drawSample(population: readonly number[], n: number, seed: number): number[] {
  const items = [...population].sort((a, b) => a - b);
  const take = Math.min(n, items.length);
  const rand = mulberry32(seed);
  for (let i = 0; i < take; i++) {
    const j = i + Math.floor(rand() * (items.length - i));
    [items[i], items[j]] = [items[j], items[i]];
  }
  return items.slice(0, take);
}

/** Documents a share of the population is: rounded up, so a non-zero share is never empty. */
export const sizeOfShare = (population: number, share: number) =>
  Math.min(population, Math.ceil(population * share - 1e-9));

export interface CheckedCall {
  reviewerId: string | null;
  codeId: number;
  verdict: 'confirmed' | 'overturned' | null;
}

/** Overturned / checked per key, counting only decided calls. */
export function overturnRates<K>(calls: readonly CheckedCall[], keyOf: (c: CheckedCall) => K) {
  const out = new Map<K, { checked: number; overturned: number; rate: number | null }>();
  for (const c of calls) {
    if (c.verdict === null) continue;
    const key = keyOf(c);
    const r = out.get(key) ?? { checked: 0, overturned: 0, rate: null };
    r.checked += 1;
    if (c.verdict === 'overturned') r.overturned += 1;
    r.rate = r.overturned / r.checked;
    out.set(key, r);
  }
  return out;
}
