// "Why it matched": which terms carry a hit's concept-space cosine, and which
// terms lie near the query in the concept space.
//
// Contribution, precisely. Let M = I ('projection' scaling) or S_k^-1 ('classic'),
// u_i the i-th row of U_k, q the weighted query and d_hat the document's row in the
// space. The query's vector is q_hat = sum_i q_i (u_i M), so
//     cos(q_hat, d_hat) = sum_i  q_i (u_i M . d_hat) / (||q_hat|| ||d_hat||),
// and the i-th term of that sum is query term i's contribution: the share of the
// cosine that flows through that term's concept-space weight. The contributions
// add up to the cosine exactly; a negative one pulls the document down.
// Symmetrically, when the document's text is given, its weighted vector d (with
// d_hat = M U_k^T d, exact for an indexed document since A^T U_k = V_k S_k) gives
// document term j the contribution d_j (u_j M . q_hat) / (||q_hat|| ||d_hat||):
// the document's own words that carry the match, including synonyms the query
// never used. Those also sum to the cosine (up to Float32 rounding).
import type { ConceptSpace, DocId, WeightedTerms } from '../index/concept-space';
import { analyze } from '../text/analyzer';
import { topCosine } from './top-n';
import { allocateRows } from './simd-dot';

export interface TermContribution {
  /** The index term (a Porter stem) and the word to show for it. */
  term: string;
  label: string;
  /** The term's weight in the query (or document) vector. */
  weight: number;
  contribution: number;
}

export interface NearTerm {
  term: string;
  label: string;
  similarity: number;
}

export interface Explanation {
  id: DocId;
  cosine: number;
  queryTerms: TermContribution[];
  /** Only when the document's text was given. */
  documentTerms: TermContribution[] | null;
  nearestTerms: NearTerm[];
}

function norm(v: ArrayLike<number>): number {
  let s = 0;
  for (let c = 0; c < v.length; c++) s += v[c] * v[c];
  return Math.sqrt(s);
}

/** (u_i M) . x for term i. */
function termDot(space: ConceptSpace, termId: number, x: ArrayLike<number>): number {
  const k = space.k;
  const u = space.termVectors;
  const o = termId * k;
  let s = 0;
  if (space.scaling === 'classic')
    for (let c = 0; c < k; c++) s += (u[o + c] / space.sigma[c]) * x[c];
  else for (let c = 0; c < k; c++) s += u[o + c] * x[c];
  return s;
}

function contributions(
  space: ConceptSpace,
  weighted: WeightedTerms,
  other: ArrayLike<number>,
  scale: number,
  limit: number,
): TermContribution[] {
  const out: TermContribution[] = [];
  for (let p = 0; p < weighted.ids.length; p++) {
    const id = weighted.ids[p];
    const weight = weighted.weights[p];
    out.push({
      term: space.terms[id],
      label: space.labels[id],
      weight,
      contribution: scale * weight * termDot(space, id, other),
    });
  }
  out.sort((a, b) => b.contribution - a.contribution || (a.term < b.term ? -1 : 1));
  return out.slice(0, limit);
}

export function explainMatch(
  space: ConceptSpace,
  query: string,
  id: DocId,
  options: { documentText?: string; limit?: number; nearest?: number } = {},
): Explanation {
  const index = space.indexOf(id);
  if (index === undefined)
    throw new RangeError(`document ${String(id)} is not in the concept index`);
  const limit = options.limit ?? 10;
  const { vector: q, weighted } = space.queryVector(query);
  const d = space.docVector(index);
  const qn = norm(q);
  const dn = norm(d);
  const scale = qn > 0 && dn > 0 ? 1 / (qn * dn) : 0;
  let dot = 0;
  for (let c = 0; c < space.k; c++) dot += q[c] * d[c];
  const documentTerms =
    options.documentText === undefined
      ? null
      : contributions(space, space.weightTerms(analyze(options.documentText)), q, scale, limit);
  return {
    id,
    cosine: dot * scale,
    queryTerms: contributions(space, weighted, d, scale, limit),
    documentTerms,
    nearestTerms: qn > 0 ? nearestTerms(space, q, options.nearest ?? 10) : [],
  };
}

/**
 * Neighbours of a term, or of a query, in the concept space (Deerwester et al.
 * 1990, section 4): term-term by cosine of rows of U_k S_k; query (or document)
 * to terms by cosine of the pseudo-document's row of V_k S_k^1/2 with rows of
 * U_k S_k^1/2. `input` is a word (analysed; one known term gives its neighbours,
 * several are treated as a query) or a vector in the space's document coordinates
 * (what ConceptSpace.queryVector returns or a document row).
 */
export function nearestTerms(
  space: ConceptSpace,
  input: string | ArrayLike<number>,
  n = 10,
): NearTerm[] {
  const k = space.k;
  let x: Float64Array;
  let power: number;
  let exclude = -1;
  if (typeof input === 'string') {
    const ids = [
      ...new Set(
        analyze(input)
          .map((t) => space.termId(t))
          .filter((t) => t !== undefined),
      ),
    ];
    if (ids.length === 0) return [];
    if (ids.length === 1) {
      exclude = ids[0]!;
      x = new Float64Array(k);
      for (let c = 0; c < k; c++) x[c] = space.termVectors[exclude * k + c] * space.sigma[c];
      power = 1;
    } else {
      return nearestTerms(space, space.queryVector(input).vector, n);
    }
  } else {
    // Document coordinates -> V_k S_k^1/2 coordinates.
    x = new Float64Array(k);
    for (let c = 0; c < k; c++) {
      const s = space.sigma[c];
      x[c] = space.scaling === 'classic' ? input[c] * Math.sqrt(s) : input[c] / Math.sqrt(s);
    }
    power = 0.5;
  }
  const { rows, invNorms } = scaledTermRows(space, power);
  const top = topCosine(rows, k, space.nTerms, invNorms, x, n, { exclude, quantised: true });
  return Array.from(top.indices, (i, r) => ({
    term: space.terms[i],
    label: space.labels[i],
    similarity: top.scores[r],
  }));
}

const scaledCache = new WeakMap<
  ConceptSpace,
  Map<number, { rows: Float32Array; invNorms: Float32Array }>
>();

/** Rows of U_k S_k^power with their inverse norms, cached per space. */
function scaledTermRows(space: ConceptSpace, power: number) {
  let perSpace = scaledCache.get(space);
  if (!perSpace) {
    perSpace = new Map();
    scaledCache.set(space, perSpace);
  }
  let entry = perSpace.get(power);
  if (!entry) {
    const k = space.k;
    // In WebAssembly memory when possible, so topCosine takes the SIMD kernel: a term
    // vocabulary can be several times larger than the document set.
    const rows = allocateRows(space.nTerms, k);
    const invNorms = new Float32Array(space.nTerms);
    const scale = Float64Array.from(space.sigma, (s) => Math.pow(s, power));
    for (let i = 0; i < space.nTerms; i++) {
      let ss = 0;
      for (let c = 0; c < k; c++) {
        const v = space.termVectors[i * k + c] * scale[c];
        rows[i * k + c] = v;
        ss += v * v;
      }
      invNorms[i] = ss > 0 ? 1 / Math.sqrt(ss) : 0;
    }
    entry = { rows, invNorms };
    perSpace.set(power, entry);
  }
  return entry;
}
