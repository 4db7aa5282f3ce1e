// Near-duplicate detection by MinHash with locality-sensitive banding.
// Broder, "On the resemblance and containment of documents" (1997): the resemblance of two
// documents is the Jaccard coefficient of their sets of word shingles, and for a random
// min-wise permutation P(min h(A) = min h(B)) = J(A, B), so the share of agreeing
// positions among k independent hash functions estimates J with standard error
// sqrt(J(1 - J) / k) <= 1 / (2 sqrt(k)). Banding (Leskovec, Rajaraman and Ullman, "Mining
// of Massive Datasets", ch. 3.4): split the signature into b bands of r rows; two
// documents become candidates when any band agrees, with probability 1 - (1 - J^r)^b.

/** Words per shingle (common practice for near-duplicate text: 3 to 5). */
export const SHINGLE_WORDS = 4;
/** Hash functions per signature: error about 1/sqrt(128) = 0.09 at worst, 0.035 near J = 0.8. */
export const HASHES = 128;
/** 32 bands of 4 rows: candidate probability 0.98 at J = 0.8, 0.04 at J = 0.4. */
export const BANDS = 32;
export const ROWS = HASHES / BANDS;

/** Lower-cased words (letters and digits of any script). */
export function words(text: string): string[] {
  return text.toLowerCase().match(/[\p{L}\p{N}]+/gu) ?? [];
}

/** FNV-1a 32-bit over a string's UTF-16 code units (Fowler, Noll, Vo). */
function fnv1a(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i += 1) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** 32-bit finaliser of MurmurHash3 (Appleby): spreads the bits of a 32-bit value. */
function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/**
 * The set of shingle hashes of a text (a short text is one shingle of all its words). Each
 * word is hashed once; a shingle's hash combines its words' hashes in order (no string
 * per shingle is built).
 */
export function shingles(text: string, size = SHINGLE_WORDS): Set<number> {
  const list = words(text);
  const out = new Set<number>();
  if (list.length === 0) return out;
  const hashed = list.map(fnv1a);
  const count = Math.max(1, list.length - size + 1);
  const span = Math.min(size, list.length);
  for (let i = 0; i < count; i += 1) {
    let h = 0x811c9dc5;
    for (let j = 0; j < span; j += 1)
      h = fmix32((h ^ hashed[i + j]) >>> 0) ^ Math.imul(j + 1, 0x9e3779b9);
    out.add(h >>> 0);
  }
  return out;
}

/** Exact Jaccard coefficient |A ∩ B| / |A ∪ B| (1 for two empty sets). */
export function jaccard(a: Set<number>, b: Set<number>): number {
  if (a.size === 0 && b.size === 0) return 1;
  let common = 0;
  for (const x of a) if (b.has(x)) common += 1;
  return common / (a.size + b.size - common);
}

/**
 * MinHash signature: for each hash function, the least hash over the shingles. Hash i of
 * a shingle x is h1(x) + i * h2(x) mod 2^32 with h1, h2 two independent mixes of x
 * (Kirsch and Mitzenmacher, "Less hashing, same performance", 2006: two hashes simulate
 * k), one multiply-add per function instead of a full mix; the accuracy test in
 * minhash.test.ts checks the estimates against exact Jaccard.
 */
export function signature(set: Set<number>, hashes = HASHES): Uint32Array {
  const sig = new Uint32Array(hashes).fill(0xffffffff);
  for (const x of set) {
    const h1 = fmix32(x);
    const h2 = fmix32((x ^ 0x5bd1e995) >>> 0) | 1;
    for (let i = 0; i < hashes; i += 1) {
      const h = (h1 + Math.imul(i, h2)) >>> 0;
      if (h < sig[i]) sig[i] = h;
    }
  }
  return sig;
}

export const signatureOfText = (text: string) => signature(shingles(text));

/** Share of positions where two signatures agree: the estimate of Jaccard. */
export function estimate(a: Uint32Array, b: Uint32Array): number {
  let same = 0;
  for (let i = 0; i < a.length; i += 1) if (a[i] === b[i]) same += 1;
  return same / a.length;
}

export const signatureToBytes = (sig: Uint32Array): Uint8Array =>
  new Uint8Array(sig.buffer.slice(sig.byteOffset, sig.byteOffset + sig.byteLength));

export function signatureFromBytes(bytes: Uint8Array): Uint32Array {
  const copy = new Uint8Array(bytes); // aligned copy
  return new Uint32Array(copy.buffer, 0, copy.byteLength / 4);
}

export interface SignedDocument {
  id: number;
  signature: Uint32Array;
  /** Text length in words: the longest member of a group is its principal. */
  length: number;
}

export interface NearDuplicateMember {
  id: number;
  groupId: number;
  /** Estimated Jaccard resemblance to the group's principal (1 for the principal). */
  similarity: number;
}

/**
 * Groups documents whose estimated resemblance reaches `threshold`. Candidates come from
 * LSH banding; a pair joins only when its signature estimate reaches the threshold. Groups
 * are the connected components; the principal is the longest member (ties: lowest id);
 * members that fall below the threshold against the principal itself (a chain A~B~C with
 * A and C apart) stay with the group, their own similarity shown.
 */
export function groupNearDuplicates(
  docs: SignedDocument[],
  threshold: number,
): NearDuplicateMember[] {
  const n = docs.length;
  const parent = Int32Array.from({ length: n }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i]];
      i = parent[i];
    }
    return i;
  };
  const union = (a: number, b: number) => {
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
  };
  const hashes = docs[0]?.signature.length ?? HASHES;
  const rows = Math.max(1, Math.floor(hashes / BANDS));
  for (let band = 0; band * rows < hashes; band += 1) {
    const buckets = new Map<string, number[]>();
    for (let i = 0; i < n; i += 1) {
      const sig = docs[i].signature;
      let key = '';
      for (let r = band * rows; r < Math.min(hashes, (band + 1) * rows); r += 1)
        key += `${sig[r]},`;
      const bucket = buckets.get(key);
      if (bucket) bucket.push(i);
      else buckets.set(key, [i]);
    }
    for (const bucket of buckets.values()) {
      if (bucket.length < 2) continue;
      // Compare each member with the bucket's first members until joined (buckets of
      // exact copies can be large; one match is enough to join a component).
      for (let x = 1; x < bucket.length; x += 1) {
        const i = bucket[x];
        for (let y = 0; y < x; y += 1) {
          const j = bucket[y];
          if (find(i) === find(j)) break;
          if (estimate(docs[i].signature, docs[j].signature) >= threshold) {
            union(i, j);
            break;
          }
        }
      }
    }
  }
  const components = new Map<number, number[]>();
  for (let i = 0; i < n; i += 1) {
    const root = find(i);
    const list = components.get(root);
    if (list) list.push(i);
    else components.set(root, [i]);
  }
  const out: NearDuplicateMember[] = [];
  for (const members of components.values()) {
    if (members.length < 2) continue;
    let principal = members[0];
    for (const m of members) {
      const a = docs[m];
      const p = docs[principal];
      if (a.length > p.length || (a.length === p.length && a.id < p.id)) principal = m;
    }
    const groupId = docs[principal].id;
    for (const m of members) {
      out.push({
        id: docs[m].id,
        groupId,
        similarity: m === principal ? 1 : estimate(docs[m].signature, docs[principal].signature),
      });
    }
  }
  return out;
}
