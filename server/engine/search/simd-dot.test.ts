import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../linalg/random';
import { allocateRows, DOTS8_WASM, DOTS_WASM, simdDots } from './simd-dot';

// The kernel's contract, emulated in JavaScript with Math.fround (IEEE 754 single
// precision, the f32x4 lane arithmetic of the WebAssembly 2.0 specification): lane l
// sums q[c] * row[c] for c = l, l + 4, ... in axis order, then the lanes are added
// ((0 + 1) + 2) + 3. The four-rows-per-pass loop must give exactly these bits.
function laneDot(q: Float32Array, rows: Float32Array, j: number, k: number, dims: number) {
  const summed = Math.max(4, Math.min(k, Math.ceil(dims / 4) * 4));
  const acc = [0, 0, 0, 0];
  for (let c = 0; c < summed; c++) {
    const qc = c < dims ? q[c] : 0;
    acc[c % 4] = Math.fround(acc[c % 4] + Math.fround(qc * rows[j * k + c]));
  }
  return Math.fround(Math.fround(Math.fround(acc[0] + acc[1]) + acc[2]) + acc[3]);
}

// Node 20+ runs WebAssembly 2.0 fixed-width SIMD, so the hand-built modules must
// validate; a mistake in their bytes fails here instead of quietly falling back to the
// JavaScript loops (which the product does only where a runtime lacks SIMD).
describe('hand-built SIMD modules', () => {
  it('validate on this Node (f32x4 dots, i16x8 dot products for int8 rows)', () => {
    expect(WebAssembly.validate(DOTS_WASM), 'DOTS_WASM').toBe(true);
    expect(WebAssembly.validate(DOTS8_WASM), 'DOTS8_WASM').toBe(true);
  });
});

describe('simdDots', () => {
  const rand = mulberry32(23);
  const k = 20;
  // 1003 rows: 250 passes of four rows, then three single rows.
  const n = 1003;
  const rows = allocateRows(n, k);
  for (let i = 0; i < n * k; i++) rows[i] = rand() - 0.5;
  const q = Float32Array.from({ length: k }, () => rand() - 0.5);

  it('runs in WebAssembly memory it allocated', () => {
    expect(simdDots(rows, k, 1, q)).not.toBeNull();
  });

  it('gives the bits of one-row lane arithmetic, every row count', () => {
    for (const count of [n, 1, 2, 3, 4, 5, 7, 8, 9]) {
      const out = Array.from(simdDots(rows, k, count, q)!);
      expect(out).toEqual(Array.from({ length: count }, (_, j) => laneDot(q, rows, j, k, k)));
    }
  });

  it('sums only the first dims axes (dims rounded up to whole lanes)', () => {
    for (const dims of [4, 7, 8, 12, 13]) {
      const out = Array.from(simdDots(rows, k, n, q, dims)!);
      expect(out).toEqual(Array.from({ length: n }, (_, j) => laneDot(q, rows, j, k, dims)));
    }
  });

  it('refuses rows it did not allocate', () => {
    expect(simdDots(new Float32Array(n * k), k, n, q)).toBeNull();
    expect(simdDots(rows, k, n + 1, q)).toBeNull();
  });
});
