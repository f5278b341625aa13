/**
 * Assembles the WebAssembly tile of the centred cross-products kernel
 * (src/lib/stats/centered-products-kernel.ts) from the readable listing below, and prints the
 * bytes to paste into that file. A unit test (tests/unit/centered-products-kernel.test.ts)
 * checks that the bytes in the kernel are the ones this listing gives.
 *
 * The function, in WebAssembly text (WAT) terms:
 *   (func $tile (param $block i32) (param $length i32) (param $padded i32) (param $tiles i32)
 * `block` holds `length` respondents, row-major with `padded` (a multiple of 4) values per
 * respondent; `tiles` is a row-major `padded × padded` array of f64. For every 4 × 4 tile of
 * items (j .. j+3, k .. k+3) with k >= j, each of the 16 sums Σ_i x_ij · x_ik over the
 * respondents, in order and starting from 0, is ADDED to its place in `tiles`. A pair of
 * items k, k+1 shares one f64x2 accumulator (two lanes, each its own running sum); every
 * operation is one IEEE-754 double multiply or add (no fused multiply-add), so each sum is
 * bit for bit the one of the scalar loop `s = 0; for (i ...) s += x[i] * y[i]`.
 *
 * Usage: node scripts/make-cross-products-wasm.mjs
 * References: WebAssembly Core Specification 2.0 (2022), §5 "Binary format" (the encoding),
 * and the fixed-width SIMD proposal's opcode table (v128 loads, f64x2.add 0xF0, f64x2.mul 0xF2).
 */

import { unsigned, name, section, WASM_PREAMBLE, printWasmBytes, CONTROL_OPS } from './wasm-binary.mjs';

// Locals: parameters 0-3, then i32 4-10, then v128 11-21.
const BLOCK = 0, LENGTH = 1, PADDED = 2, TILES = 3;
const STRIDE = 4, J = 5, K = 6, PX = 7, PY = 8, END = 9, T = 10;
const ACC = 11; // 11..18: acc[2 * r + h] is items (j + r) × (k + 2h, k + 2h + 1)
const Y01 = 19, Y23 = 20, X = 21;

const op = {
  ...CONTROL_OPS,
  add: [0x6a],
  mul: [0x6c],
  shl: [0x74],
  ltU: [0x49],
  // SIMD (prefix 0xFD); memarg = alignment exponent, offset.
  load: (offset) => [0xfd, ...unsigned(0x00), 3, ...unsigned(offset)],
  splat: (offset) => [0xfd, ...unsigned(0x0a), 3, ...unsigned(offset)],
  store: (offset) => [0xfd, ...unsigned(0x0b), 3, ...unsigned(offset)],
  zero: [0xfd, ...unsigned(0x0c), ...new Array(16).fill(0)],
  f64x2Add: [0xfd, ...unsigned(0xf0)],
  f64x2Mul: [0xfd, ...unsigned(0xf2)],
};

/** The body of $tile. */
function tileBody() {
  const code = [];
  const emit = (...parts) => {
    for (const part of parts) code.push(...part);
  };
  // stride = padded * 8 (bytes per respondent)
  emit(op.get(PADDED), op.const(3), op.shl, op.set(STRIDE));
  // for (j = 0; j < padded; j += 4)   (j starts at 0: locals are zeroed)
  emit(op.loop);
  //   for (k = j; k < padded; k += 4)
  emit(op.get(J), op.set(K), op.loop);
  for (let a = 0; a < 8; a++) emit(op.zero, op.set(ACC + a));
  //     px = block + 8j; py = block + 8k; end = py + length * stride
  emit(op.get(BLOCK), op.get(J), op.const(3), op.shl, op.add, op.set(PX));
  emit(op.get(BLOCK), op.get(K), op.const(3), op.shl, op.add, op.tee(PY));
  emit(op.get(LENGTH), op.get(STRIDE), op.mul, op.add, op.set(END));
  //     do { ... } while (py < end): one respondent per pass
  emit(op.loop);
  emit(op.get(PY), op.load(0), op.set(Y01));
  emit(op.get(PY), op.load(16), op.set(Y23));
  for (let r = 0; r < 4; r++) {
    emit(op.get(PX), op.splat(8 * r), op.set(X));
    emit(op.get(ACC + 2 * r), op.get(X), op.get(Y01), op.f64x2Mul, op.f64x2Add, op.set(ACC + 2 * r));
    emit(op.get(ACC + 2 * r + 1), op.get(X), op.get(Y23), op.f64x2Mul, op.f64x2Add, op.set(ACC + 2 * r + 1));
  }
  emit(op.get(PX), op.get(STRIDE), op.add, op.set(PX));
  emit(op.get(PY), op.get(STRIDE), op.add, op.tee(PY), op.get(END), op.ltU, op.brIf(0));
  emit(op.end);
  //     t = tiles + 8 (j * padded + k); tiles[j + r][k .. k + 3] += acc
  emit(op.get(TILES), op.get(J), op.get(PADDED), op.mul, op.get(K), op.add, op.const(3), op.shl, op.add, op.set(T));
  for (let r = 0; r < 4; r++) {
    emit(op.get(T), op.get(T), op.load(0), op.get(ACC + 2 * r), op.f64x2Add, op.store(0));
    emit(op.get(T), op.get(T), op.load(16), op.get(ACC + 2 * r + 1), op.f64x2Add, op.store(16));
    emit(op.get(T), op.get(STRIDE), op.add, op.set(T));
  }
  emit(op.get(K), op.const(4), op.add, op.tee(K), op.get(PADDED), op.ltU, op.brIf(0));
  emit(op.end);
  emit(op.get(J), op.const(4), op.add, op.tee(J), op.get(PADDED), op.ltU, op.brIf(0));
  emit(op.end);
  emit(op.end);
  // Local declarations: 7 × i32, 11 × v128.
  const locals = [2, 7, 0x7f, 11, 0x7b];
  return [...unsigned(locals.length + code.length), ...locals, ...code];
}

/**
 * The module: imports `env.memory`, exports `tile`.
 * @returns {Uint8Array} The WebAssembly binary.
 */
export function crossProductsWasmBytes() {
  const i32 = 0x7f;
  const type = section(1, [1, 0x60, 4, i32, i32, i32, i32, 0]);
  const imports = section(2, [1, ...name('env'), ...name('memory'), 0x02, 0x00, 1]);
  const functions = section(3, [1, 0]);
  const exports = section(7, [1, ...name('tile'), 0x00, 0]);
  const code = section(10, [1, ...tileBody()]);
  return Uint8Array.from([...WASM_PREAMBLE, ...type, ...imports, ...functions, ...exports, ...code]);
}

if (import.meta.url === `file://${process.argv[1]}`) printWasmBytes(crossProductsWasmBytes(), 'scripts/make-cross-products-wasm.mjs', '      ');
