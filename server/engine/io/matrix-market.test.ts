import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  formatMatrixMarket,
  parseMatrixMarket,
  readMatrixMarket,
  writeMatrixMarket,
} from './matrix-market';
import { csrToDense, csrFromDense } from '../sparse/csr';

// The 5 x 5 example of Boisvert, Pozo & Remington, "The Matrix Market Exchange Formats:
// Initial Design" (NIST IR 5935, 1996), section 3 (coordinate format), as printed there.
const specExample = `%%MatrixMarket matrix coordinate real general
%=================================================================================
%
% This ASCII file represents a sparse MxN matrix with L
% nonzeros in the following Matrix Market format:
%
%=================================================================================
  5  5  8
    1     1   1.000e+00
    2     2   1.050e+01
    3     3   1.500e-02
    1     4   6.000e+00
    4     2   2.505e+02
    4     4  -2.800e+02
    4     5   3.332e+01
    5     5   1.200e+01
`;

describe('Matrix Market reader (NIST IR 5935 coordinate format)', () => {
  it('reads the specification example', () => {
    const { matrix, header } = parseMatrixMarket(specExample);
    expect(header).toEqual({ field: 'real', symmetry: 'general', rows: 5, cols: 5, entries: 8 });
    const d = csrToDense(matrix);
    const at = (i: number, j: number) => d[(i - 1) * 5 + (j - 1)];
    expect(at(1, 1)).toBe(1);
    expect(at(2, 2)).toBe(10.5);
    expect(at(3, 3)).toBe(0.015);
    expect(at(1, 4)).toBe(6);
    expect(at(4, 2)).toBe(250.5);
    expect(at(4, 4)).toBe(-280);
    expect(at(4, 5)).toBe(33.32);
    expect(at(5, 5)).toBe(12);
    expect(matrix.rowPtr[5]).toBe(8);
  });

  it('reads integer and pattern fields and mirrors symmetric storage', () => {
    const int = parseMatrixMarket(
      '%%MatrixMarket matrix coordinate integer general\n2 3 2\n1 3 7\n2 1 -2\n',
    );
    expect(Array.from(csrToDense(int.matrix))).toEqual([0, 0, 7, -2, 0, 0]);
    const pat = parseMatrixMarket(
      '%%MatrixMarket matrix coordinate pattern general\n2 2 2\n1 2\n2 1\n',
    );
    expect(Array.from(csrToDense(pat.matrix))).toEqual([0, 1, 1, 0]);
    const sym = parseMatrixMarket(
      '%%MatrixMarket matrix coordinate real symmetric\n3 3 3\n1 1 4\n3 1 2\n3 3 5\n',
    );
    expect(Array.from(csrToDense(sym.matrix))).toEqual([4, 0, 2, 0, 0, 0, 2, 0, 5]);
    const skew = parseMatrixMarket(
      '%%MatrixMarket matrix coordinate real skew-symmetric\n2 2 1\n2 1 3\n',
    );
    expect(Array.from(csrToDense(skew.matrix))).toEqual([0, -3, 3, 0]);
  });

  it('sums duplicate entries (assembly rule of coordinate formats)', () => {
    const { matrix } = parseMatrixMarket(
      '%%MatrixMarket matrix coordinate real general\n1 2 2\n1 2 1.5\n1 2 2\n',
    );
    expect(Array.from(csrToDense(matrix))).toEqual([0, 3.5]);
  });

  const bad: [string, string, RegExp][] = [
    ['empty file', '', /the file is empty/],
    ['missing banner', '5 5 1\n1 1 1\n', /line 1: expected the banner/],
    [
      'array format',
      '%%MatrixMarket matrix array real general\n2 2\n1\n2\n3\n4\n',
      /line 1: dense "array"/,
    ],
    [
      'complex field',
      '%%MatrixMarket matrix coordinate complex general\n1 1 1\n1 1 1 0\n',
      /line 1: complex/,
    ],
    [
      'bad size line',
      '%%MatrixMarket matrix coordinate real general\n% c\n5 five 1\n',
      /line 3: the size line/,
    ],
    [
      'non-number value',
      '%%MatrixMarket matrix coordinate real general\n2 2 2\n1 1 1.0\n2 2 abc\n',
      /line 4: value "abc" is not a real number/,
    ],
    [
      'row out of range',
      '%%MatrixMarket matrix coordinate real general\n2 2 1\n3 1 1.0\n',
      /line 3: row index 3 outside 1\.\.2/,
    ],
    [
      'column zero',
      '%%MatrixMarket matrix coordinate real general\n2 2 1\n1 0 1.0\n',
      /line 3: column index 0 outside 1\.\.2/,
    ],
    [
      'missing value',
      '%%MatrixMarket matrix coordinate real general\n2 2 1\n1 1\n',
      /line 3: expected "row col value"/,
    ],
    [
      'too few entries',
      '%%MatrixMarket matrix coordinate real general\n2 2 3\n1 1 1\n2 2 1\n',
      /declares 3 entries but the file has 2/,
    ],
    [
      'too many entries',
      '%%MatrixMarket matrix coordinate real general\n2 2 1\n1 1 1\n2 2 1\n',
      /line 4: more entries than the 1/,
    ],
    [
      'upper triangle in symmetric',
      '%%MatrixMarket matrix coordinate real symmetric\n2 2 1\n1 2 1\n',
      /line 3: entry \(1, 2\) is above the diagonal/,
    ],
    [
      'integer field with a fraction',
      '%%MatrixMarket matrix coordinate integer general\n1 1 1\n1 1 1.5\n',
      /line 3: value "1.5" is not an integer/,
    ],
  ];
  for (const [name, text, message] of bad) {
    it(`rejects ${name} with a message naming the line and problem`, () => {
      expect(() => parseMatrixMarket(text)).toThrow(message);
    });
  }

  it('round-trips through the writer, in memory and streamed to disk', async () => {
    const a = csrFromDense(3, 4, [0, 1.25, 0, -1 / 3, 2e-300, 0, 0, 0, 0, 0, 7, 1e10]);
    const again = parseMatrixMarket(formatMatrixMarket(a, 'round trip')).matrix;
    expect(Array.from(csrToDense(again))).toEqual(Array.from(csrToDense(a)));
    const dir = mkdtempSync(join(tmpdir(), 'quarry-mtx-'));
    const path = join(dir, 'a.mtx');
    await writeMatrixMarket(path, a, 'streamed');
    expect(Array.from(csrToDense(readMatrixMarket(path).matrix))).toEqual(
      Array.from(csrToDense(a)),
    );
    writeFileSync(
      join(dir, 'bad.mtx'),
      '%%MatrixMarket matrix coordinate real general\n1 1 1\n1 1 x\n',
    );
    expect(() => readMatrixMarket(join(dir, 'bad.mtx'))).toThrow(/bad\.mtx: line 3: value "x"/);
    expect(() => readMatrixMarket(join(dir, 'missing.mtx'))).toThrow(
      /file not found: .*missing\.mtx/,
    );
  });
});
