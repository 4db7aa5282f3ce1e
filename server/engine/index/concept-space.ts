// The concept space of latent semantic indexing (Deerwester, Dumais, Furnas,
// Landauer & Harshman 1990, "Indexing by latent semantic analysis", JASIS 41(6)):
// the weighted terms x documents matrix A ~ U_k S_k V_k^T (Eckart & Young 1936:
// the best rank-k approximation in the 2- and Frobenius norms).
//
// Two ways to compare a query q (weighted like a document) with the documents:
//  - 'classic' (Deerwester et al. 1990): fold in q_hat = q^T U_k S_k^-1 and take the
//    cosine with the rows of V_k.
//  - 'projection': project both onto the concept axes, q^T U_k against the rows of
//    V_k S_k (= a_j^T U_k for an indexed document a_j). This equals comparing
//    q_hat S_k with V_k S_k, the scaling the blueprint suggests.
// docs/RETRIEVAL.md has the Cranfield numbers for both; 'projection' is the default.
import { analyze, ANALYZER_VERSION } from '../text/analyzer';
import { buildTermDocumentMatrix } from './term-document';
import type { CsrMatrix } from '../sparse/csr';
import { allocateRows } from '../search/simd-dot';
import { applyWeights, globalWeights, localWeight, WEIGHTINGS, type Weighting } from './weighting';
import { frobeniusNormSq } from '../sparse/csr';
import { numericalRank, truncatedSvd, type SvdOptions } from '../linalg/svd';
import { conditionNumber, energyKept, orthogonalityError } from '../linalg/diagnostics';

export type DocId = string | number;
export type Scaling = 'projection' | 'classic';
export const SCALINGS: readonly Scaling[] = ['projection', 'classic'];

/** Bad input to the engine (empty corpus, k out of range, ...): the message names the problem. */
export class EngineInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'EngineInputError';
  }
}

export interface SourceDocument {
  id: DocId;
  text: string;
  /** Indexed together with the text when given. */
  title?: string;
}

export interface ConceptSpaceOptions {
  /** Concept dimensions (default 200); clipped to the numerical rank with a notice. */
  k?: number;
  weighting?: Weighting;
  /** Minimum document frequency of a term (default 2). */
  minDf?: number;
  scaling?: Scaling;
  /** Throw instead of clipping when k exceeds the rank (the eval CLI wants this). */
  strictK?: boolean;
  svd?: Omit<Partial<SvdOptions>, 'k' | 'onProgress'>;
  onProgress?: (fraction: number) => void;
}

/** What an index version records about its build (stored in index_versions). */
export interface BuildDiagnostics {
  k: number;
  requestedK: number;
  nDocs: number;
  nTerms: number;
  nnz: number;
  /** sigma_1 >= ... >= sigma_k. */
  singularValues: Float64Array;
  /** ||A||_2 = sigma_1. */
  sigma1: number;
  /** sigma_1 / sigma_k. */
  conditionNumber: number;
  /** ||A||_F^2 of the weighted matrix. */
  frobeniusSq: number;
  /** sum_{i<=k} sigma_i^2 / ||A||_F^2 (Eckart-Young: the share of A the space keeps). */
  energy: number;
  /** max |(U^T U - I)_ab| and the same for V. */
  orthogonalityU: number;
  orthogonalityV: number;
  buildMs: number;
  svdMs: number;
  svdMethod: string;
  /** Peak resident set of the process during the build, MB. */
  peakRssMb: number;
  /** Documents with no index term (they get a zero vector and never match a concept search). */
  emptyDocuments: number;
  notices: string[];
}

export interface ConceptSpaceParams {
  formatVersion: 1;
  analyzer: string;
  k: number;
  requestedK: number;
  weighting: Weighting;
  minDf: number;
  scaling: Scaling;
}

/** Everything a concept space consists of (what persistence stores and loads). */
export interface ConceptSpaceData {
  params: ConceptSpaceParams;
  terms: string[];
  df: Int32Array;
  globalWeights: Float64Array;
  sigma: Float64Array;
  /** U_k, terms x k row-major. */
  termVectors: Float32Array;
  docIds: DocId[];
  /** One row of k per document: V_k S_k rows ('projection') or V_k rows ('classic'). */
  docVectors: Float32Array;
  /** 1 for documents folded in after the build. */
  foldedIn: Uint8Array;
  /** Display word per term (its most frequent surface form); the term itself when absent. */
  labels?: string[];
}

export interface WeightedTerms {
  /** Term ids, ascending. */
  ids: Int32Array;
  weights: Float64Array;
  /** Analysed terms not in the vocabulary. */
  unknown: string[];
}

export interface FoldedDocument {
  id: DocId;
  vector: Float32Array;
  /** 1 - ||U_k^T d||^2 / ||d||^2: the share of the document's weight outside the space. */
  drift: number;
  /** Index terms the document shares with the vocabulary. */
  knownTerms: number;
}

function checkOptions(options: ConceptSpaceOptions) {
  const k = options.k ?? 200;
  if (!Number.isInteger(k) || k < 1)
    throw new EngineInputError(`k must be a whole number above 0, got ${k}`);
  const weighting = options.weighting ?? 'log-entropy';
  if (!WEIGHTINGS.includes(weighting)) {
    throw new EngineInputError(
      `weighting must be one of ${WEIGHTINGS.join(', ')}, got "${weighting}"`,
    );
  }
  const scaling = options.scaling ?? 'projection';
  if (!SCALINGS.includes(scaling)) {
    throw new EngineInputError(`scaling must be one of ${SCALINGS.join(', ')}, got "${scaling}"`);
  }
  const minDf = options.minDf ?? 2;
  if (!Number.isInteger(minDf) || minDf < 1) {
    throw new EngineInputError(`minDf must be a whole number of at least 1, got ${minDf}`);
  }
  return { k, weighting, scaling, minDf };
}

function documentText(doc: SourceDocument): string {
  return doc.title ? `${doc.title}\n${doc.text}` : doc.text;
}

function peakRssMb(): number {
  return process.resourceUsage().maxRSS / 1024;
}

export class ConceptSpace {
  readonly params: ConceptSpaceParams;
  readonly terms: string[];
  readonly df: Int32Array;
  readonly globalWeights: Float64Array;
  readonly sigma: Float64Array;
  readonly termVectors: Float32Array;
  readonly k: number;
  /** Display word per term ("computer" for the stem "comput"). */
  readonly labels: string[];
  private readonly termIndex = new Map<string, number>();
  private ids: DocId[];
  private idIndex = new Map<DocId, number>();
  private vectors: Float32Array;
  private folded: Uint8Array;
  private count: number;
  private invNormCache = new Map<number, Float32Array>();

  constructor(data: ConceptSpaceData) {
    const k = data.params.k;
    if (data.sigma.length !== k)
      throw new Error(`sigma has ${data.sigma.length} values, expected k = ${k}`);
    if (data.termVectors.length !== data.terms.length * k)
      throw new Error('term vectors do not match terms x k');
    if (data.docVectors.length !== data.docIds.length * k)
      throw new Error('document vectors do not match docs x k');
    this.params = data.params;
    this.k = k;
    this.terms = data.terms;
    this.df = data.df;
    this.globalWeights = data.globalWeights;
    this.sigma = data.sigma;
    this.termVectors = data.termVectors;
    this.labels =
      data.labels && data.labels.length === data.terms.length ? data.labels : data.terms;
    data.terms.forEach((term, id) => this.termIndex.set(term, id));
    this.ids = data.docIds.slice();
    this.ids.forEach((id, index) => {
      if (this.idIndex.has(id))
        throw new EngineInputError(`document id ${String(id)} appears twice`);
      this.idIndex.set(id, index);
    });
    this.count = this.ids.length;
    // The document matrix lives where the SIMD cosine kernel can read it.
    this.vectors = allocateRows(this.count, k);
    this.vectors.set(data.docVectors);
    this.folded = data.foldedIn.length === this.count ? data.foldedIn : new Uint8Array(this.count);
  }

  /** Builds the space from documents; returns it with the build's diagnostics. */
  static build(
    docs: readonly SourceDocument[],
    options: ConceptSpaceOptions = {},
  ): { space: ConceptSpace; diagnostics: BuildDiagnostics } {
    const started = performance.now();
    const { minDf } = checkOptions(options);
    if (docs.length === 0)
      throw new EngineInputError('empty corpus: there are no documents to index');
    const seen = new Set<DocId>();
    for (const doc of docs) {
      if (seen.has(doc.id))
        throw new EngineInputError(`document id ${String(doc.id)} appears twice`);
      seen.add(doc.id);
    }
    const tdm = buildTermDocumentMatrix(
      docs.map((d) => documentText(d)),
      { minDf },
    );
    if (tdm.terms.length === 0) {
      throw new EngineInputError(
        `empty corpus: no term occurs in at least ${minDf} document${minDf === 1 ? '' : 's'}`,
      );
    }
    return ConceptSpace.fromCounts(
      tdm.terms,
      tdm.counts,
      docs.map((d) => d.id),
      options,
      { started, tokensPerDoc: tdm.tokensPerDoc, labels: tdm.labels, countsDisposable: true },
    );
  }

  /**
   * Builds the space from a raw-count terms x documents matrix whose rows are the
   * given (already analysed) terms. build() uses it; tests use it to reproduce
   * published matrices.
   */
  static fromCounts(
    terms: string[],
    counts: CsrMatrix,
    docIds: DocId[],
    options: ConceptSpaceOptions = {},
    extra: {
      started?: number;
      tokensPerDoc?: Int32Array;
      labels?: string[];
      /** The caller is done with `counts`: its values may be overwritten by the weights. */
      countsDisposable?: boolean;
    } = {},
  ): { space: ConceptSpace; diagnostics: BuildDiagnostics } {
    const started = extra.started ?? performance.now();
    const { k: requestedK, weighting, scaling, minDf } = checkOptions(options);
    const notices: string[] = [];
    if (counts.rows !== terms.length || counts.cols !== docIds.length) {
      throw new EngineInputError(
        `counts are ${counts.rows} x ${counts.cols}, expected ${terms.length} x ${docIds.length}`,
      );
    }
    const m = terms.length;
    const n = docIds.length;
    if (n === 0) throw new EngineInputError('empty corpus: there are no documents to index');
    if (m === 0) throw new EngineInputError('empty corpus: there are no index terms');
    const df = new Int32Array(m);
    for (let i = 0; i < m; i++) df[i] = counts.rowPtr[i + 1] - counts.rowPtr[i];
    const tokensPerDoc = extra.tokensPerDoc ?? new Int32Array(n);
    if (!extra.tokensPerDoc) {
      for (let p = 0; p < counts.rowPtr[m]; p++) tokensPerDoc[counts.colIdx[p]] += counts.values[p];
    }
    options.onProgress?.(0.05);
    const g = globalWeights(weighting, counts);
    const a = applyWeights(weighting, counts, g, extra.countsDisposable === true);
    const frobeniusSq = frobeniusNormSq(a);
    if (!(frobeniusSq > 0)) {
      throw new EngineInputError(
        'empty corpus: every term weight is zero (each term is spread evenly)',
      );
    }
    const bound = Math.min(m, n);
    if (requestedK > bound && options.strictK) {
      throw new EngineInputError(
        `k = ${requestedK} is above the rank of the ${m} x ${n} term-document matrix (at most ${bound})`,
      );
    }
    const svd = truncatedSvd(a, {
      seed: 1,
      ...options.svd,
      k: Math.min(requestedK, bound),
      onProgress: options.onProgress ? (f) => options.onProgress!(0.05 + 0.85 * f) : undefined,
    });
    const rank = numericalRank(svd.s, m, n);
    if (rank === 0) throw new EngineInputError('the term-document matrix has rank 0');
    let k = Math.min(requestedK, svd.k);
    if (rank < k) {
      if (options.strictK) {
        throw new EngineInputError(
          `k = ${requestedK} is above the numerical rank ${rank} of the term-document matrix`,
        );
      }
      k = rank;
    }
    if (k < requestedK) {
      notices.push(
        `k lowered from ${requestedK} to ${k}, the numerical rank of the ${m} x ${n} term-document matrix`,
      );
    }

    const sigma = svd.s.slice(0, k);
    const termVectors = new Float32Array(m * k);
    for (let i = 0; i < m; i++) {
      for (let c = 0; c < k; c++) termVectors[i * k + c] = svd.U[i * svd.k + c];
    }
    const docVectors = new Float32Array(n * k);
    for (let j = 0; j < n; j++) {
      for (let c = 0; c < k; c++) {
        const v = svd.V[j * svd.k + c];
        docVectors[j * k + c] = scaling === 'projection' ? v * sigma[c] : v;
      }
    }
    // Orthogonality of the kept k columns, in double precision; a copy only when k was
    // lowered below the SVD's (at 100k documents a copy of U is ~0.6 GB).
    const firstColumns = (q: Float64Array, rows: number) => {
      if (svd.k === k) return q;
      const out = new Float64Array(rows * k);
      for (let i = 0; i < rows; i++) out.set(q.subarray(i * svd.k, i * svd.k + k), i * k);
      return out;
    };
    const orthogonalityU = orthogonalityError(firstColumns(svd.U, m), m, k);
    const orthogonalityV = orthogonalityError(firstColumns(svd.V, n), n, k);
    let emptyDocuments = 0;
    for (let j = 0; j < n; j++) if (tokensPerDoc[j] === 0) emptyDocuments++;
    if (emptyDocuments > 0) notices.push(`${emptyDocuments} document(s) contain no index term`);

    const space = new ConceptSpace({
      params: {
        formatVersion: 1,
        analyzer: ANALYZER_VERSION,
        k,
        requestedK,
        weighting,
        minDf,
        scaling,
      },
      terms,
      df,
      globalWeights: g,
      sigma,
      termVectors,
      docIds,
      docVectors,
      foldedIn: new Uint8Array(n),
      labels: extra.labels,
    });
    options.onProgress?.(1);
    const diagnostics: BuildDiagnostics = {
      k,
      requestedK,
      nDocs: n,
      nTerms: m,
      nnz: a.rowPtr[m],
      singularValues: sigma,
      sigma1: sigma[0],
      conditionNumber: conditionNumber(sigma),
      frobeniusSq,
      energy: energyKept(sigma, frobeniusSq),
      orthogonalityU,
      orthogonalityV,
      buildMs: performance.now() - started,
      svdMs: svd.ms,
      svdMethod: svd.method,
      peakRssMb: peakRssMb(),
      emptyDocuments,
      notices,
    };
    return { space, diagnostics };
  }

  get nDocs(): number {
    return this.count;
  }

  get nTerms(): number {
    return this.terms.length;
  }

  get scaling(): Scaling {
    return this.params.scaling;
  }

  termId(term: string): number | undefined {
    return this.termIndex.get(term);
  }

  docId(index: number): DocId {
    return this.ids[index];
  }

  indexOf(id: DocId): number | undefined {
    return this.idIndex.get(id);
  }

  isFoldedIn(index: number): boolean {
    return this.folded[index] === 1;
  }

  /** Row `index` of the document matrix (a view: copy before keeping it). */
  docVector(index: number): Float32Array {
    return this.vectors.subarray(index * this.k, (index + 1) * this.k);
  }

  /** All document rows (count x k), a view. */
  get docMatrix(): Float32Array {
    return this.vectors.subarray(0, this.count * this.k);
  }

  /** Snapshot of the data (views, not copies) for persistence. */
  toData(): ConceptSpaceData {
    return {
      params: this.params,
      terms: this.terms,
      df: this.df,
      globalWeights: this.globalWeights,
      sigma: this.sigma,
      termVectors: this.termVectors,
      docIds: this.ids.slice(0, this.count),
      docVectors: this.docMatrix,
      foldedIn: this.folded.subarray(0, this.count),
      labels: this.labels,
    };
  }

  /** The text weighted as the index weights a document: log2(1+tf) * G(i) (or tf * idf). */
  weightTerms(analysed: readonly string[]): WeightedTerms {
    const tf = new Map<number, number>();
    const unknown: string[] = [];
    for (const term of analysed) {
      const id = this.termIndex.get(term);
      if (id === undefined) unknown.push(term);
      else tf.set(id, (tf.get(id) ?? 0) + 1);
    }
    const ids = Int32Array.from(tf.keys()).sort();
    const weights = new Float64Array(ids.length);
    ids.forEach((id, p) => {
      weights[p] = localWeight(this.params.weighting, tf.get(id)!) * this.globalWeights[id];
    });
    return { ids, weights, unknown: [...new Set(unknown)] };
  }

  /** U_k^T d for a sparse weighted vector d (length k, float64). */
  projectWeighted(w: WeightedTerms): Float64Array {
    const k = this.k;
    const out = new Float64Array(k);
    const u = this.termVectors;
    for (let p = 0; p < w.ids.length; p++) {
      const weight = w.weights[p];
      const o = w.ids[p] * k;
      for (let c = 0; c < k; c++) out[c] += weight * u[o + c];
    }
    return out;
  }

  /** The query's vector in the document space: q^T U_k, or q^T U_k S_k^-1 ('classic'). */
  queryVector(text: string): { vector: Float64Array; weighted: WeightedTerms; analysed: string[] } {
    const analysed = analyze(text);
    const weighted = this.weightTerms(analysed);
    const vector = this.projectWeighted(weighted);
    if (this.params.scaling === 'classic')
      for (let c = 0; c < this.k; c++) vector[c] /= this.sigma[c];
    return { vector, weighted, analysed };
  }

  /**
   * Folding-in (Deerwester et al. 1990, section 4): a new document's vector is
   * computed from the existing U_k and S_k and appended; the space is not rebuilt
   * (vocabulary and global weights stay as built). A document already present is
   * replaced. Returns the vectors so the caller can store them.
   */
  foldInDocuments(docs: readonly SourceDocument[]): FoldedDocument[] {
    const out: FoldedDocument[] = [];
    for (const doc of docs) {
      const weighted = this.weightTerms(analyze(documentText(doc)));
      const projected = this.projectWeighted(weighted);
      let normSq = 0;
      for (const w of weighted.weights) normSq += w * w;
      let projectedSq = 0;
      for (const v of projected) projectedSq += v * v;
      const drift = normSq > 0 ? Math.max(0, 1 - projectedSq / normSq) : 1;
      const vector = new Float32Array(this.k);
      for (let c = 0; c < this.k; c++) {
        vector[c] = this.params.scaling === 'classic' ? projected[c] / this.sigma[c] : projected[c];
      }
      this.putVector(doc.id, vector, true);
      out.push({ id: doc.id, vector, drift, knownTerms: weighted.ids.length });
    }
    return out;
  }

  /** Adds (or replaces) a stored vector, e.g. a folded-in document loaded from the database. */
  putVector(id: DocId, vector: ArrayLike<number>, foldedIn: boolean): number {
    if (vector.length !== this.k)
      throw new EngineInputError(`vector has ${vector.length} values, expected ${this.k}`);
    let index = this.idIndex.get(id);
    if (index === undefined) {
      index = this.count;
      if ((index + 1) * this.k > this.vectors.length) {
        const capacity = Math.max(16, Math.ceil((this.count + 1) * 1.5));
        const grown = allocateRows(capacity, this.k);
        grown.set(this.vectors.subarray(0, this.count * this.k));
        this.vectors = grown;
        const flags = new Uint8Array(capacity);
        flags.set(this.folded.subarray(0, this.count));
        this.folded = flags;
      }
      this.ids[index] = id;
      this.idIndex.set(id, index);
      this.count++;
    }
    this.vectors.set(vector, index * this.k);
    this.folded[index] = foldedIn ? 1 : 0;
    this.invNormCache.clear();
    return index;
  }

  /** 1 / ||row|| over the first `dims` concept axes for every document (0 for a zero row). */
  inverseNorms(dims = this.k): Float32Array {
    let cached = this.invNormCache.get(dims);
    if (!cached || cached.length !== this.count) {
      cached = new Float32Array(this.count);
      const k = this.k;
      const v = this.vectors;
      for (let j = 0; j < this.count; j++) {
        let s = 0;
        const o = j * k;
        for (let c = 0; c < dims; c++) s += v[o + c] * v[o + c];
        cached[j] = s > 0 ? 1 / Math.sqrt(s) : 0;
      }
      this.invNormCache.set(dims, cached);
    }
    return cached;
  }
}
