// `quarry svd --matrix <file.mtx> --k N [--json] [--method auto|block-krylov|randomized|lanczos]`:
// top-N singular values of a Matrix Market matrix, with the usual diagnostics.
import { parseCommandArgs } from '../args';
import { CliError } from '../cli-error';
import { MatrixMarketError, readMatrixMarket } from '../../engine/index';
import { truncatedSvd, numericalRank, validateK } from '../../engine/index';
import { conditionNumber, energyKept, orthogonalityError } from '../../engine/index';
import { frobeniusNormSq, nnzOf } from '../../engine/index';

export async function run(argv: string[]): Promise<void> {
  const { values } = parseCommandArgs(argv, {
    matrix: { type: 'string' },
    k: { type: 'string' },
    json: { type: 'boolean', default: false },
    method: { type: 'string', default: 'auto' },
    'power-iterations': { type: 'string' },
    oversample: { type: 'string' },
  });
  if (!values.matrix) throw new CliError('--matrix <file.mtx> is required');
  if (values.k === undefined) throw new CliError('--k N is required');
  if (!/^-?\d+$/.test(values.k))
    throw new CliError(`--k must be a whole number, got "${values.k}"`);
  const k = Number(values.k);
  if (k <= 0) throw new CliError(`--k must be at least 1, got ${k}`);
  const method = values.method;
  if (
    method !== 'auto' &&
    method !== 'block-krylov' &&
    method !== 'randomized' &&
    method !== 'lanczos'
  ) {
    throw new CliError(
      `--method must be auto, block-krylov, randomized or lanczos, got "${method}"`,
    );
  }
  const powerIterations = positiveIntegerOrZero(values['power-iterations'], 'power-iterations');
  const oversample = positiveIntegerOrZero(values.oversample, 'oversample');

  let matrix;
  try {
    matrix = readMatrixMarket(values.matrix).matrix;
  } catch (error) {
    if (error instanceof MatrixMarketError) throw new CliError(error.message);
    throw error;
  }
  if (matrix.rows === 0 || matrix.cols === 0 || nnzOf(matrix) === 0) {
    throw new CliError(
      `${values.matrix}: the matrix is empty (${matrix.rows} x ${matrix.cols}, ${nnzOf(matrix)} nonzeros)`,
    );
  }
  try {
    validateK(k, matrix.rows, matrix.cols);
  } catch (error) {
    throw new CliError(error instanceof Error ? error.message : String(error));
  }
  const svd = truncatedSvd(matrix, {
    k,
    method: method === 'auto' ? undefined : method,
    powerIterations,
    oversample,
  });
  const rank = numericalRank(svd.s, matrix.rows, matrix.cols);
  if (rank < k) {
    throw new CliError(
      `k = ${k} exceeds the numerical rank ${rank} of the matrix (singular values above max(rows, cols) * eps * sigma_1)`,
    );
  }
  const singularValues = Array.from(svd.s);
  if (values.json) {
    console.log(JSON.stringify({ singular_values: singularValues, ms: Math.round(svd.ms) }));
    return;
  }
  const fro = frobeniusNormSq(matrix);
  console.log(
    `${matrix.rows} x ${matrix.cols}, ${nnzOf(matrix)} nonzeros; ${svd.method}, ${Math.round(svd.ms)} ms`,
  );
  singularValues.forEach((s, i) => console.log(`sigma_${i + 1}\t${s.toPrecision(10)}`));
  console.log(`||A||_2 = sigma_1\t${singularValues[0].toPrecision(10)}`);
  console.log(`condition sigma_1/sigma_k\t${conditionNumber(svd.s).toPrecision(6)}`);
  console.log(`energy kept\t${energyKept(svd.s, fro).toFixed(6)}`);
  console.log(
    `orthogonality error (max-abs of Q^T Q - I)\tU ${orthogonalityError(svd.U, svd.rows, k).toExponential(2)}\tV ${orthogonalityError(svd.V, svd.cols, k).toExponential(2)}`,
  );
}

function positiveIntegerOrZero(value: string | undefined, name: string): number | undefined {
  if (value === undefined) return undefined;
  if (!/^\d+$/.test(value)) throw new CliError(`--${name} must be a whole number, got "${value}"`);
  return Number(value);
}
