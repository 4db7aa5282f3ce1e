import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const root = join(import.meta.dirname, '..', '..', '..');
const dir = mkdtempSync(join(tmpdir(), 'quarry-svd-cli-'));

function quarry(...args: string[]) {
  const r = spawnSync(
    process.execPath,
    ['--import', 'tsx', 'server/cli/quarry.ts', 'svd', ...args],
    {
      cwd: root,
      encoding: 'utf8',
    },
  );
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function file(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

// [[1,2],[3,4]]: sigma = 5.4650, 0.3660 (Golub & Van Loan, Matrix Computations, 2.4).
const twoByTwo =
  '%%MatrixMarket matrix coordinate real general\n2 2 4\n1 1 1\n1 2 2\n2 1 3\n2 2 4\n';

describe('quarry svd (command line)', () => {
  it('prints the singular values as JSON', () => {
    const r = quarry('--matrix', file('a.mtx', twoByTwo), '--k', '2', '--json');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout) as { singular_values: number[]; ms: number };
    expect(out.singular_values[0]).toBeCloseTo(5.465, 3);
    expect(out.singular_values[1]).toBeCloseTo(0.366, 3);
    expect(typeof out.ms).toBe('number');
  });

  it('prints a table with diagnostics without --json', () => {
    const r = quarry('--matrix', file('b.mtx', twoByTwo), '--k', '1');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/sigma_1\t5\.46498/);
    expect(r.stdout).toMatch(/energy kept/);
  });

  const cases: [string, () => string[], RegExp][] = [
    ['a missing file', () => ['--matrix', join(dir, 'nope.mtx'), '--k', '2'], /file not found/],
    [
      'a malformed line',
      () => [
        '--matrix',
        file('c.mtx', '%%MatrixMarket matrix coordinate real general\n2 2 1\n1 1 zz\n'),
        '--k',
        '1',
      ],
      /line 3: value "zz"/,
    ],
    ['k <= 0', () => ['--matrix', file('d.mtx', twoByTwo), '--k', '0'], /--k must be at least 1/],
    [
      'k above min(rows, cols)',
      () => ['--matrix', file('e.mtx', twoByTwo), '--k', '3'],
      /exceeds min\(rows, cols\) = 2/,
    ],
    [
      'k above the numerical rank',
      () => [
        '--matrix',
        file(
          'f.mtx',
          '%%MatrixMarket matrix coordinate real general\n2 2 4\n1 1 1\n1 2 2\n2 1 2\n2 2 4\n',
        ),
        '--k',
        '2',
      ],
      /exceeds the numerical rank 1/,
    ],
    [
      'an empty matrix',
      () => [
        '--matrix',
        file('g.mtx', '%%MatrixMarket matrix coordinate real general\n3 3 0\n'),
        '--k',
        '1',
      ],
      /the matrix is empty/,
    ],
  ];
  for (const [name, args, message] of cases) {
    it(`rejects ${name} with one line and a non-zero exit`, () => {
      const r = quarry(...args());
      expect(r.code).not.toBe(0);
      expect(r.stderr).toMatch(message);
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).not.toMatch(/\n\s+at /);
    });
  }
});
