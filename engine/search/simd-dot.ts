// Row dot products with WebAssembly SIMD (f32x4; the WebAssembly SIMD proposal,
// merged into the WebAssembly 2.0 specification). One small hand-assembled
// function, `dots(q, rows, n, k, out)`: out[j] = sum_c q[c] * rows[j*k + c] in
// Float32 with a 4-lane accumulator, k a multiple of 4. Rows must live in the
// module's memory, so matrices that want the fast path are allocated here
// (allocateRows); anything else uses the scalar loop in top-n.ts.

// prettier-ignore
const DOTS_HEADER = new Uint8Array([
  0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
  // type section: (i32 i32 i32 i32 i32) -> ()
  0x01, 0x09, 0x01, 0x60, 0x05, 0x7f, 0x7f, 0x7f, 0x7f, 0x7f, 0x00,
  // import section: env.mem, memory, min 1 page
  0x02, 0x0c, 0x01, 0x03, 0x65, 0x6e, 0x76, 0x03, 0x6d, 0x65, 0x6d, 0x02, 0x00, 0x01,
  // function section
  0x03, 0x02, 0x01, 0x00,
  // export section: "dots" = func 0
  0x07, 0x08, 0x01, 0x04, 0x64, 0x6f, 0x74, 0x73, 0x00, 0x00,
]);

// prettier-ignore
const DOTS_BODY = [
  0x03, 0x01, 0x7f, 0x01, 0x7b, 0x01, 0x7f, // locals: 5 i32 c, 6 v128 acc, 7 i32 kb
  0x20, 0x03, 0x41, 0x02, 0x74, 0x21, 0x07, // kb = k << 2
  0x02, 0x40, // block
  0x20, 0x02, 0x45, 0x0d, 0x00, // if n == 0 break
  0x03, 0x40, // loop rows
  0xfd, 0x0c, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0x21, 0x06, // acc = 0
  0x41, 0x00, 0x21, 0x05, // c = 0
  0x03, 0x40, // loop inner
  0x20, 0x06,
  0x20, 0x00, 0x20, 0x05, 0x6a, 0xfd, 0x00, 0x02, 0x00, // v128.load q + c
  0x20, 0x01, 0x20, 0x05, 0x6a, 0xfd, 0x00, 0x02, 0x00, // v128.load rows + c
  0xfd, 0xe6, 0x01, // f32x4.mul
  0xfd, 0xe4, 0x01, // f32x4.add
  0x21, 0x06,
  0x20, 0x05, 0x41, 0x10, 0x6a, 0x22, 0x05, // c += 16
  0x20, 0x07, 0x49, 0x0d, 0x00, // br_if c < kb
  0x0b, // end inner
  0x20, 0x04, // out address
  0x20, 0x06, 0xfd, 0x1f, 0x00,
  0x20, 0x06, 0xfd, 0x1f, 0x01, 0x92,
  0x20, 0x06, 0xfd, 0x1f, 0x02, 0x92,
  0x20, 0x06, 0xfd, 0x1f, 0x03, 0x92,
  0x38, 0x02, 0x00, // f32.store
  0x20, 0x01, 0x20, 0x07, 0x6a, 0x21, 0x01, // rows += kb
  0x20, 0x04, 0x41, 0x04, 0x6a, 0x21, 0x04, // out += 4
  0x20, 0x02, 0x41, 0x01, 0x6b, 0x22, 0x02, // n -= 1
  0x0d, 0x00, // br_if n != 0
  0x0b, // end rows loop
  0x0b, // end block
  0x0b, // end function
];

/** Unsigned LEB128, as WebAssembly encodes sizes. */
function leb128(value: number): number[] {
  const out: number[] = [];
  do {
    let byte = value & 0x7f;
    value >>>= 7;
    if (value !== 0) byte |= 0x80;
    out.push(byte);
  } while (value !== 0);
  return out;
}

const CODE_CONTENT = [0x01, ...leb128(DOTS_BODY.length), ...DOTS_BODY];
const DOTS_WASM = new Uint8Array([
  ...DOTS_HEADER,
  0x0a,
  ...leb128(CODE_CONTENT.length),
  ...CODE_CONTENT,
]);

const PAGE = 65536;
let module: WebAssembly.Module | null | undefined;

function dotsModule(): WebAssembly.Module | null {
  if (module === undefined) {
    try {
      module = WebAssembly.validate(DOTS_WASM) ? new WebAssembly.Module(DOTS_WASM) : null;
    } catch {
      module = null;
    }
  }
  return module;
}

interface Backing {
  dots: (q: number, rows: number, n: number, k: number, out: number) => void;
  memory: WebAssembly.Memory;
  /** Byte offsets: query (k floats), rows, scores (capacity floats). */
  query: number;
  rows: number;
  scores: number;
  capacity: number;
  k: number;
}

const backings = new WeakMap<ArrayBufferLike, Backing>();

/**
 * A zeroed Float32Array of capacityRows x k, placed in WebAssembly memory when SIMD
 * is available and k is a multiple of 4 (else an ordinary Float32Array).
 */
export function allocateRows(capacityRows: number, k: number): Float32Array {
  const mod = dotsModule();
  if (!mod || k % 4 !== 0 || capacityRows === 0) return new Float32Array(capacityRows * k);
  const query = 0;
  const rows = Math.ceil((k * 4) / 16) * 16;
  const scores = rows + capacityRows * k * 4;
  const bytes = scores + capacityRows * 4;
  // wasm32 memory tops out at 4 GiB (V8 may allow less): very large matrices stay scalar.
  if (bytes > 2 ** 31) return new Float32Array(capacityRows * k);
  let memory: WebAssembly.Memory;
  try {
    memory = new WebAssembly.Memory({ initial: Math.ceil(bytes / PAGE) });
  } catch {
    return new Float32Array(capacityRows * k);
  }
  const instance = new WebAssembly.Instance(mod, { env: { mem: memory } });
  const view = new Float32Array(memory.buffer, rows, capacityRows * k);
  backings.set(memory.buffer, {
    dots: instance.exports.dots as Backing['dots'],
    memory,
    query,
    rows,
    scores,
    capacity: capacityRows,
    k,
  });
  return view;
}

/**
 * Dot products of `query` with the first `count` rows, or null when `rows` was not
 * allocated by allocateRows for this stride. The result is a view valid until the next call.
 */
export function simdDots(
  rows: Float32Array,
  stride: number,
  count: number,
  query: ArrayLike<number>,
): Float32Array | null {
  const b = backings.get(rows.buffer);
  if (!b || b.k !== stride || rows.byteOffset !== b.rows || count > b.capacity) return null;
  new Float32Array(b.memory.buffer, b.query, stride).set(query);
  b.dots(b.query, b.rows, count, stride, b.scores);
  return new Float32Array(b.memory.buffer, b.scores, count);
}
