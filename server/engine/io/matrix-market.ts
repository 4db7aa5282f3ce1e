// Matrix Market exchange format, coordinate storage, after Boisvert, Pozo & Remington,
// "The Matrix Market Exchange Formats: Initial Design" (NIST IR 5935, 1996):
//   %%MatrixMarket matrix coordinate <real|integer|pattern> <general|symmetric|skew-symmetric>
//   % comment lines
//   M N NNZ
//   i j [value]        (1-based indices, one entry per line)
// Symmetric and skew-symmetric files store the lower triangle; entries are mirrored.
// Errors name the line number and the problem.

import { readFileSync } from 'node:fs';
import { open } from 'node:fs/promises';
import { type CsrMatrix, csrFromTriplets } from '../sparse/csr';

export class MatrixMarketError extends Error {
  constructor(
    message: string,
    readonly line?: number,
  ) {
    super(line === undefined ? message : `line ${line}: ${message}`);
    this.name = 'MatrixMarketError';
  }
}

export type MatrixMarketField = 'real' | 'integer' | 'pattern';
export type MatrixMarketSymmetry = 'general' | 'symmetric' | 'skew-symmetric';

export interface MatrixMarketHeader {
  field: MatrixMarketField;
  symmetry: MatrixMarketSymmetry;
  rows: number;
  cols: number;
  entries: number;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eEdD][+-]?\d+)?$/;

/** Parses Matrix Market coordinate text into a CSR matrix (duplicates are summed). */
export function parseMatrixMarket(text: string): { matrix: CsrMatrix; header: MatrixMarketHeader } {
  if (text.length === 0) throw new MatrixMarketError('the file is empty');
  const lines = text.split(/\r?\n/);
  const banner = lines[0].trim().split(/\s+/);
  if (banner[0] !== '%%MatrixMarket') {
    throw new MatrixMarketError(
      `expected the banner "%%MatrixMarket matrix coordinate real general", found "${truncate(lines[0])}"`,
      1,
    );
  }
  const [, object, format, fieldRaw, symmetryRaw] = banner.map((t) => t.toLowerCase());
  if (object !== 'matrix')
    throw new MatrixMarketError(`object "${object ?? ''}" is not "matrix"`, 1);
  if (format === 'array') {
    throw new MatrixMarketError('dense "array" format is not supported; use "coordinate"', 1);
  }
  if (format !== 'coordinate')
    throw new MatrixMarketError(`format "${format ?? ''}" is not "coordinate"`, 1);
  if (fieldRaw === 'complex') throw new MatrixMarketError('complex matrices are not supported', 1);
  if (fieldRaw !== 'real' && fieldRaw !== 'integer' && fieldRaw !== 'pattern') {
    throw new MatrixMarketError(`field "${fieldRaw ?? ''}" is not real, integer or pattern`, 1);
  }
  if (symmetryRaw === 'hermitian')
    throw new MatrixMarketError('hermitian matrices are not supported', 1);
  if (
    symmetryRaw !== 'general' &&
    symmetryRaw !== 'symmetric' &&
    symmetryRaw !== 'skew-symmetric'
  ) {
    throw new MatrixMarketError(
      `symmetry "${symmetryRaw ?? ''}" is not general, symmetric or skew-symmetric`,
      1,
    );
  }
  const field: MatrixMarketField = fieldRaw;
  const symmetry: MatrixMarketSymmetry = symmetryRaw;
  let li = 1;
  while (li < lines.length && (lines[li].startsWith('%') || lines[li].trim() === '')) li++;
  if (li >= lines.length)
    throw new MatrixMarketError('the size line "rows cols entries" is missing', li);
  const size = lines[li].trim().split(/\s+/);
  if (size.length !== 3 || !size.every((t) => /^\d+$/.test(t))) {
    throw new MatrixMarketError(
      `the size line must be three whole numbers "rows cols entries", found "${truncate(lines[li])}"`,
      li + 1,
    );
  }
  const [rows, cols, entries] = size.map(Number);
  if (symmetry !== 'general' && rows !== cols) {
    throw new MatrixMarketError(
      `a ${symmetry} matrix must be square, got ${rows} x ${cols}`,
      li + 1,
    );
  }
  const cap = symmetry === 'general' ? entries : 2 * entries;
  const ri = new Int32Array(cap);
  const ci = new Int32Array(cap);
  const vs = new Float64Array(cap);
  let count = 0;
  let seen = 0;
  const expectTokens = field === 'pattern' ? 2 : 3;
  for (li = li + 1; li < lines.length; li++) {
    const raw = lines[li];
    const trimmed = raw.trim();
    if (trimmed === '' || trimmed.startsWith('%')) continue;
    const lineNo = li + 1;
    if (seen === entries) {
      throw new MatrixMarketError(
        `more entries than the ${entries} the size line declares`,
        lineNo,
      );
    }
    const tokens = trimmed.split(/\s+/);
    if (tokens.length !== expectTokens) {
      throw new MatrixMarketError(
        `expected ${expectTokens === 2 ? '"row col"' : '"row col value"'}, found "${truncate(raw)}"`,
        lineNo,
      );
    }
    if (!/^\d+$/.test(tokens[0]) || !/^\d+$/.test(tokens[1])) {
      throw new MatrixMarketError(
        `indices must be whole numbers, found "${truncate(raw)}"`,
        lineNo,
      );
    }
    const i = Number(tokens[0]);
    const j = Number(tokens[1]);
    if (i < 1 || i > rows) throw new MatrixMarketError(`row index ${i} outside 1..${rows}`, lineNo);
    if (j < 1 || j > cols)
      throw new MatrixMarketError(`column index ${j} outside 1..${cols}`, lineNo);
    let v = 1;
    if (field !== 'pattern') {
      const token = tokens[2];
      if (field === 'integer' ? !/^[+-]?\d+$/.test(token) : !NUMBER.test(token)) {
        throw new MatrixMarketError(
          `value "${token}" is not ${field === 'integer' ? 'an integer' : 'a real number'}`,
          lineNo,
        );
      }
      v = Number(token.replace(/[dD]/, 'e'));
      if (!Number.isFinite(v))
        throw new MatrixMarketError(`value "${token}" is not finite`, lineNo);
    }
    if (symmetry !== 'general' && j > i) {
      throw new MatrixMarketError(
        `entry (${i}, ${j}) is above the diagonal; a ${symmetry} file stores the lower triangle only`,
        lineNo,
      );
    }
    if (symmetry === 'skew-symmetric' && i === j) {
      throw new MatrixMarketError(
        `skew-symmetric matrices have no diagonal entries, found (${i}, ${j})`,
        lineNo,
      );
    }
    ri[count] = i - 1;
    ci[count] = j - 1;
    vs[count] = v;
    count++;
    if (symmetry !== 'general' && i !== j) {
      ri[count] = j - 1;
      ci[count] = i - 1;
      vs[count] = symmetry === 'skew-symmetric' ? -v : v;
      count++;
    }
    seen++;
  }
  if (seen < entries) {
    throw new MatrixMarketError(
      `the size line declares ${entries} entries but the file has ${seen}`,
      lines.length,
    );
  }
  const matrix = csrFromTriplets(
    rows,
    cols,
    ri.subarray(0, count),
    ci.subarray(0, count),
    vs.subarray(0, count),
  );
  return { matrix, header: { field, symmetry, rows, cols, entries } };
}

function truncate(line: string): string {
  const t = line.trim();
  return t.length > 60 ? `${t.slice(0, 57)}...` : t;
}

/** Reads a .mtx file; a missing or unreadable file is a MatrixMarketError naming the path. */
export function readMatrixMarket(path: string): { matrix: CsrMatrix; header: MatrixMarketHeader } {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new MatrixMarketError(
      code === 'ENOENT'
        ? `file not found: ${path}`
        : `cannot read ${path} (${code ?? String(error)})`,
    );
  }
  try {
    return parseMatrixMarket(text);
  } catch (error) {
    if (error instanceof MatrixMarketError)
      throw new MatrixMarketError(`${path}: ${error.message}`);
    throw error;
  }
}

/** Matrix Market coordinate real general text (1-based), values with 17 significant digits. */
export function formatMatrixMarket(a: CsrMatrix, comment?: string): string {
  const parts: string[] = ['%%MatrixMarket matrix coordinate real general'];
  if (comment) for (const line of comment.split('\n')) parts.push(`% ${line}`);
  parts.push(`${a.rows} ${a.cols} ${a.rowPtr[a.rows]}`);
  for (let i = 0; i < a.rows; i++) {
    for (let p = a.rowPtr[i]; p < a.rowPtr[i + 1]; p++) {
      parts.push(`${i + 1} ${a.colIdx[p] + 1} ${a.values[p].toPrecision(17)}`);
    }
  }
  return `${parts.join('\n')}\n`;
}

/** Streams a large matrix to a .mtx file without building one big string. */
export async function writeMatrixMarket(
  path: string,
  a: CsrMatrix,
  comment?: string,
): Promise<void> {
  const handle = await open(path, 'w');
  try {
    let chunk = '%%MatrixMarket matrix coordinate real general\n';
    if (comment) for (const line of comment.split('\n')) chunk += `% ${line}\n`;
    chunk += `${a.rows} ${a.cols} ${a.rowPtr[a.rows]}\n`;
    for (let i = 0; i < a.rows; i++) {
      for (let p = a.rowPtr[i]; p < a.rowPtr[i + 1]; p++) {
        chunk += `${i + 1} ${a.colIdx[p] + 1} ${a.values[p].toPrecision(17)}\n`;
      }
      if (chunk.length > 1 << 20) {
        await handle.write(chunk);
        chunk = '';
      }
    }
    await handle.write(chunk);
  } finally {
    await handle.close();
  }
}
