// The numerics the concept space needs, in one place (server/engine/sparse, server/engine/linalg).
export type { CsrMatrix } from '../sparse/csr';
export { frobeniusNormSq, transposeCsr } from '../sparse/csr';
export { truncatedSvd, numericalRank, type SvdOptions, type TruncatedSvd } from '../linalg/svd';
export { energyKept, conditionNumber, orthogonalityError } from '../linalg/diagnostics';
