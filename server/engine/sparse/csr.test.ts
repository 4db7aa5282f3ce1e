import { describe, expect, it } from 'vitest';
import { csrFromTriplets, csrTimesBlock, csrToDense, frobeniusNormSq, transposeCsr } from './csr';

// CSR layout as in Saad, Iterative Methods for Sparse Linear Systems (2003), 3.4.
describe('CSR matrices', () => {
  it('builds from triplets, summing duplicates and sorting columns within rows', () => {
    const a = csrFromTriplets(2, 4, [1, 0, 0, 1, 0], [3, 2, 0, 3, 2], [1, 2, 3, 4, 5]);
    expect(Array.from(a.rowPtr)).toEqual([0, 2, 3]);
    expect(Array.from(a.colIdx)).toEqual([0, 2, 3]);
    expect(Array.from(a.values)).toEqual([3, 7, 5]);
  });
  it('drops entries that cancel and rejects bad indices and values', () => {
    expect(csrFromTriplets(1, 1, [0, 0], [0, 0], [1, -1]).rowPtr[1]).toBe(0);
    expect(() => csrFromTriplets(2, 2, [2], [0], [1])).toThrow(/row index 2 outside 0\.\.1/);
    expect(() => csrFromTriplets(2, 2, [0], [0], [NaN])).toThrow(/not a finite number/);
    expect(() => csrFromTriplets(2, 2, [0], [0, 1], [1])).toThrow(/differ in length/);
  });
  it('transposes and computes the Frobenius norm', () => {
    const a = csrFromTriplets(2, 3, [0, 0, 1], [0, 2, 1], [1, 2, 3]);
    const t = transposeCsr(a);
    expect(Array.from(csrToDense(t))).toEqual([1, 0, 0, 3, 2, 0]);
    expect(frobeniusNormSq(a)).toBe(14);
  });
  it('multiplies a row-major dense block (checked against the dense product)', () => {
    // 3 x 5 with rows of 0, 5 and 6 nonzeros (exercises the unrolled and remainder loops).
    const ri = [1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2];
    const ci = [0, 1, 2, 3, 4, 0, 1, 2, 3, 4, 0];
    const vs = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11];
    const a = csrFromTriplets(3, 5, ri, ci, vs);
    const b = 3;
    const x = Float64Array.from({ length: 15 }, (_, i) => (i % 7) - 3);
    const y = new Float64Array(9).fill(99);
    csrTimesBlock(a, x, b, y);
    const d = csrToDense(a);
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < b; j++) {
        let s = 0;
        for (let c = 0; c < 5; c++) s += d[i * 5 + c] * x[c * b + j];
        expect(y[i * b + j]).toBeCloseTo(s, 12);
      }
    }
  });
});
