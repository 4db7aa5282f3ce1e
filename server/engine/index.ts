// The concept engine's public surface, for the server, the worker thread and the CLI.
// Pure TypeScript over typed arrays; no Express, no server imports.
export {
  analyze,
  analyzeWithSurface,
  isStopWord,
  tokenize,
  ANALYZER_VERSION,
} from './text/analyzer';
export { PORTER_MAX_BYTES, TOKEN_MAX_BYTES } from './text/token-limits';
export { buildTermDocumentMatrix, type TermDocumentMatrix } from './index/term-document';
export {
  globalWeights,
  applyWeights,
  localWeight,
  WEIGHTINGS,
  type Weighting,
} from './index/weighting';
export {
  ConceptSpace,
  EngineInputError,
  SCALINGS,
  type BuildDiagnostics,
  type ConceptSpaceData,
  type ConceptSpaceOptions,
  type ConceptSpaceParams,
  type DocId,
  type FoldedDocument,
  type Scaling,
  type SourceDocument,
  type WeightedTerms,
} from './index/concept-space';
export {
  blobOf,
  copyVector,
  decodeDocumentBlobs,
  decodeParams,
  decodeSingularValues,
  decodeVocabulary,
  encodeDiagnostics,
  encodeParams,
  encodeSpaceBlobs,
  INDEX_FORMAT_VERSION,
  typedFrom,
} from './index/blob-codec';
export { topCosine, type TopN, type TopNOptions } from './search/top-n';
export {
  toFtsMatchExpression,
  keywordSearch,
  KEYWORD_TABLES_DDL,
  type KeywordHit,
  type KeywordSearchOptions,
} from './search/keyword';
export {
  coverageWeight,
  fuseScores,
  minMaxNormalise,
  type FusedHit,
  type Scored,
} from './search/fusion';
export {
  search,
  prepareForSearch,
  similarDocuments,
  conceptRanking,
  DEFAULT_HYBRID,
  SEARCH_MODES,
  type KeywordSource,
  type SearchHit,
  type SearchMode,
  type SearchOptions,
  type SearchResult,
} from './search/search';
export {
  explainMatch,
  nearestTerms,
  type Explanation,
  type NearTerm,
  type TermContribution,
} from './search/explain';
export {
  evaluateRanking,
  meanMetrics,
  type MeanMetrics,
  type QueryMetrics,
  type Qrels,
} from './eval/metrics';
export {
  readDocsJsonl,
  readQueriesJsonl,
  readQrels,
  parseDocsJsonl,
  parseQueriesJsonl,
  parseQrels,
  EvalInputError,
  type EvalDocument,
  type EvalQuery,
} from './eval/readers';
export {
  prepareCollection,
  runEvaluation,
  type PreparedCollection,
  type EvaluationRun,
} from './eval/evaluate';
export { cranfieldAvailable, cranfieldDir, readCranfield } from './eval/cranfield';
export { partsFor } from './eval/evaluate';
export { columnExtremes, columnLargestAbs, topTermsOfVector } from './insights/dimensions';
export { projectionDrift, summariseDrift, type DriftSummary } from './insights/drift';
export { assessHealth, DEFAULT_HEALTH_THRESHOLDS } from './insights/health';
export { kmeans, KMeansInputError } from './insights/kmeans';
export { mapCoordinates } from './insights/map';
export { termNeighbours } from './insights/neighbours';
export { cumulativeEnergy, energyShare } from './insights/spectrum';
export { writeMatrixMarket, MatrixMarketError, readMatrixMarket } from './io/matrix-market';
export { energyKept, orthogonalityError, conditionNumber } from './linalg/diagnostics';
export { mulberry32 } from './linalg/random';
export {
  truncatedSvd,
  type SvdOptions,
  type TruncatedSvd,
  numericalRank,
  validateK,
} from './linalg/svd';
export { KeywordIndex, keywordQueryTerms } from './search/keyword-index';
export { frobeniusNormSq, nnzOf, type CsrMatrix, csrFromTriplets } from './sparse/csr';
export {
  parseQuery,
  lexQuery,
  positiveLeaves,
  textLeafToFts,
  shiftDay,
  QuerySyntaxError,
  QUERY_FIELDS,
  type ParsedQuery,
  type QueryNode,
  type TextLeaf,
  type MetaLeaf,
  type DateLeaf,
  type QueryField,
} from './search/query-language';
export { ftsRawTokens, porterStem } from './search/fts5-tokens';
export {
  fitLogistic,
  predictProbabilities,
  type LogisticModel,
  type LogisticOptions,
  type SparseRows,
} from './learning/logistic';
export {
  strongestTerms,
  documentExample,
  textExample,
  featureRows,
  DEFAULT_TOP_TERMS,
  type FeatureExample,
  type TermWeights,
} from './learning/features';
export {
  trainRanker,
  scoreDocuments,
  topIndices,
  DEFAULT_RANKER_LAMBDA,
  type LabelledExample,
  type RankerModel,
  type RankerOptions,
} from './learning/ranker';
export {
  rocchioVector,
  rocchioRanking,
  ROCCHIO_DEFAULTS,
  type RocchioOptions,
} from './learning/rocchio';
export { betaCdf, betaQuantile, normalCdf, normalQuantile } from './stats/distributions';
export {
  clopperPearson,
  wilson,
  zFor,
  sampleSize,
  elusionEstimate,
  type ElusionEstimate,
  type Interval,
  type SampleSizeOptions,
} from './stats/intervals';
export { simpleRandomSample } from './stats/sample';
export {
  simulateReview,
  reviewedToReach,
  type QuerySimulation,
  type SimulationOptions,
  type SimulationResult,
} from './eval/review-simulation';
export {
  tuneFromCodes,
  type TuneCell,
  type TuneExample,
  type TuneOptions,
  type TuneResult,
} from './learning/tune';
