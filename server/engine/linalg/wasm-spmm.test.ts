import { describe, expect, it } from 'vitest';
import { Matrix } from 'ml-matrix';
import { type CsrMatrix, csrFromTriplets, csrToDense } from '../sparse/csr';
import { mulberry32 } from './random';
import { SPMM_WASM, SpmmArena, spmmModule } from './wasm-spmm';
import { parallelCsrOperator } from './parallel';
import { serialRows } from './dense';

/**
 * Seeded sparse matrix whose rows hold 0 to 20 nonzeros, so every path of the kernel
 * (empty rows, groups of eight, the one-at-a-time tail) is taken.
 */
function ragged(rows: number, cols: number, seed: number): CsrMatrix {
  const rand = mulberry32(seed);
  const ri: number[] = [];
  const ci: number[] = [];
  const vs: number[] = [];
  for (let i = 0; i < rows; i++) {
    const count = i % 7 === 0 ? 0 : Math.floor(rand() * 21);
    for (let t = 0; t < count; t++) {
      ri.push(i);
      ci.push(Math.floor(rand() * cols));
      vs.push(1 - 2 * rand());
    }
  }
  return csrFromTriplets(rows, cols, ri, ci, vs);
}

function randomBlock(length: number, seed: number, into?: Float64Array): Float64Array {
  const rand = mulberry32(seed);
  const out = into ?? new Float64Array(length);
  for (let i = 0; i < length; i++) out[i] = 1 - 2 * rand();
  return out;
}

/** Reference: ml-matrix's dense product of A (densified) and X. */
function referenceProduct(a: CsrMatrix, x: Float64Array, b: number): Float64Array {
  const dense = csrToDense(a);
  const am = new Matrix(a.rows, a.cols);
  for (let i = 0; i < a.rows; i++)
    for (let j = 0; j < a.cols; j++) am.set(i, j, dense[i * a.cols + j]);
  const xm = new Matrix(a.cols, b);
  for (let i = 0; i < a.cols; i++) for (let j = 0; j < b; j++) xm.set(i, j, x[i * b + j]);
  const product = am.mmul(xm);
  const out = new Float64Array(a.rows * b);
  for (let i = 0; i < a.rows; i++) for (let j = 0; j < b; j++) out[i * b + j] = product.get(i, j);
  return out;
}

function maxAbsDifference(x: ArrayLike<number>, y: ArrayLike<number>): number {
  let max = 0;
  for (let i = 0; i < x.length; i++) max = Math.max(max, Math.abs(x[i] - y[i]));
  return max;
}

describe('WebAssembly SIMD sparse x dense block product (reference: ml-matrix mmul)', () => {
  it('is available on this Node (WebAssembly SIMD and shared memory)', () => {
    expect(WebAssembly.validate(SPMM_WASM), 'the hand-built SPMM_WASM bytes').toBe(true);
    expect(spmmModule()).not.toBeNull();
  });

  for (const b of [2, 4, 10, 64]) {
    it(`matches the dense product for block width ${b}`, () => {
      const a = ragged(90, 70, b);
      const arena = SpmmArena.create(0)!;
      const placed = arena.placeCsr(a)!;
      const x = randomBlock(a.cols * b, 100 + b, arena.float64(a.cols * b)!);
      const y = arena.float64(a.rows * b)!;
      y.fill(Number.NaN); // the kernel must overwrite, not accumulate into, y
      expect(arena.times(placed, x, b, y)).toBe(true);
      expect(maxAbsDifference(y, referenceProduct(a, x, b))).toBeLessThan(1e-12);
    });
  }

  it('computes only the requested row range', () => {
    const a = ragged(40, 30, 3);
    const arena = SpmmArena.create(0)!;
    const placed = arena.placeCsr(a)!;
    const x = randomBlock(30 * 6, 4, arena.float64(30 * 6)!);
    const y = arena.float64(40 * 6)!;
    y.fill(7);
    arena.times(placed, x, 6, y, 10, 25);
    const expected = referenceProduct(a, x, 6);
    expect(y.subarray(0, 60).every((v) => v === 7)).toBe(true);
    expect(y.subarray(150).every((v) => v === 7)).toBe(true);
    expect(maxAbsDifference(y.subarray(60, 150), expected.subarray(60, 150))).toBeLessThan(1e-12);
  });

  it('declines odd widths and arrays outside the arena, leaving y untouched', () => {
    const a = ragged(20, 10, 5);
    const arena = SpmmArena.create(0)!;
    const placed = arena.placeCsr(a)!;
    const y = arena.float64(20 * 3)!.fill(1);
    expect(arena.times(placed, arena.float64(10 * 3)!, 3, y)).toBe(false);
    expect(arena.times(placed, new Float64Array(10 * 4), 4, arena.float64(20 * 4)!)).toBe(false);
    expect(y.every((v) => v === 1)).toBe(true);
  });

  it('keeps earlier arrays valid when the arena grows', () => {
    const arena = SpmmArena.create(0)!;
    const first = arena.float64(1000)!.fill(3);
    const big = arena.float64(3 * 65536)!; // several pages: forces memory.grow
    big.fill(5);
    expect(first.every((v) => v === 3)).toBe(true);
    expect(arena.holds(first) && arena.holds(big)).toBe(true);
  });
});

describe('two-thread block operator', () => {
  it('A X and A^T X match the dense products, in the kernel and in the odd-width fallback', () => {
    const a = ragged(300, 200, 11);
    const op = parallelCsrOperator(a, 2);
    try {
      expect(op.kernel).toBe('wasm-simd kernel, 2 threads');
      for (const b of [8, 5]) {
        const x = randomBlock(a.cols * b, b, op.allocate(a.cols * b));
        const y = op.allocate(a.rows * b);
        op.times(x, b, y);
        expect(maxAbsDifference(y, referenceProduct(a, x, b))).toBeLessThan(1e-12);
        const xt = randomBlock(a.rows * b, 50 + b, op.allocate(a.rows * b));
        const yt = op.allocate(a.cols * b);
        op.timesTranspose(xt, b, yt);
        const at = csrFromTriplets(
          a.cols,
          a.rows,
          Array.from(a.colIdx),
          Array.from({ length: a.colIdx.length }, (_, p) => {
            let i = 0;
            while (a.rowPtr[i + 1] <= p) i++;
            return i;
          }),
          Array.from(a.values),
        );
        expect(maxAbsDifference(yt, referenceProduct(at, xt, b))).toBeLessThan(1e-12);
      }
    } finally {
      op.close();
    }
  });

  it('row-split dense kernels (Gram, Y M, cross product) agree with the one-thread kernels', () => {
    const op = parallelCsrOperator(ragged(50, 40, 2), 2);
    try {
      const n = 2001; // odd, so the halves differ and the 4-row tail is taken
      const b = 40;
      const y = randomBlock(n * b, 7, op.allocate(n * b));
      const z = randomBlock(n * b, 8, op.allocate(n * b));
      expect(maxAbsDifference(op.dense!.gram(y, n, b), serialRows.gram(y, n, b))).toBeLessThan(
        1e-11,
      );
      const mt = randomBlock(30 * b, 9);
      const out = op.allocate(n * 30);
      const expected = new Float64Array(n * 30);
      op.dense!.timesSmall(y, b, mt, 30, out, n);
      serialRows.timesSmall(y, b, mt, 30, expected, n);
      expect(maxAbsDifference(out, expected)).toBeLessThan(1e-12);
      const c = new Float64Array(b * b);
      const cExpected = new Float64Array(b * b);
      op.dense!.crossAccumulate(y, b, b, z, b, c, n);
      serialRows.crossAccumulate(y, b, b, z, b, cExpected, n);
      expect(maxAbsDifference(c, cExpected)).toBeLessThan(1e-11);
    } finally {
      op.close();
    }
  });
});
