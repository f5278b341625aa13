/**
 * Assembles the WebAssembly function that applies the QL iteration's plane rotations to the rows
 * of the eigenvector matrix (src/lib/stats/plane-rotations-kernel.ts) from the readable listing
 * below, and prints the bytes to paste into that file. A unit test
 * (tests/unit/plane-rotations-kernel.test.ts) checks that the bytes in the kernel are the ones
 * this listing gives.
 *
 * The function, in WebAssembly text (WAT) terms:
 *   (func $rotate (param $rows i32) (param $stride i32) (param $sweeps i32) (param $sweepsEnd i32)
 *                 (param $rotations i32))
 * `rows` is a row-major matrix of f64 with `stride` bytes per row (a multiple of 64: eight
 * doubles, zero-padded); `sweeps .. sweepsEnd` holds pairs of i32 (top, count), one per QL
 * iteration; `rotations` holds (c, s) pairs of f64, `count` of them per sweep, one sweep after
 * the other. Sweep (top, count) applies, for i = top, top − 1, ..., top − count + 1 in this order,
 *   row[i + 1][k] ← s · row[i][k] + c · row[i + 1][k]
 *   row[i][k]     ← c · row[i][k] − s · row[i + 1][k]     (both from the values before the step)
 * which is the JavaScript loop of tql2 (`s * w[lower + k] + c * value`, `c * w[lower + k] -
 * s * value`). Eight columns are taken at a time through all the rotations of one sweep: row i's
 * new values stay in four f64x2 registers as the "upper" row of rotation i − 1, so each row is
 * loaded and stored once per rotation instead of twice. Columns never mix, and every element
 * goes through the same operations in the same order as in the JavaScript loop, each one IEEE-754
 * double multiply, add or subtract per lane (no fused multiply-add, the same operand order), so
 * every element is bit for bit what the loop gives. Every sweep must hold at least one rotation
 * and the call at least one sweep.
 *
 * Usage: node scripts/make-plane-rotations-wasm.mjs
 * References: WebAssembly Core Specification 2.0 (2022), §5 "Binary format" (the encoding),
 * and the fixed-width SIMD proposal's opcode table (v128.load 0x00, v128.load64_splat 0x0A,
 * v128.store 0x0B, f64x2.add 0xF0, f64x2.sub 0xF1, f64x2.mul 0xF2); Bowdler, Martin, Reinsch &
 * Wilkinson 1968, "The QR and QL algorithms for symmetric matrices" (tql2).
 */

import { unsigned, name, section, WASM_PREAMBLE, printWasmBytes, CONTROL_OPS } from './wasm-binary.mjs';

/** Columns (doubles) taken at a time: the row stride must be a multiple of this. */
export const PLANE_ROTATION_COLUMNS = 8;
const VECTORS = PLANE_ROTATION_COLUMNS / 2;

// Locals: parameters 0-4, then i32 5-9, then v128 10-16.
const ROWS = 0, STRIDE = 1, SWEEP = 2, SWEEPS_END = 3, ROTATION = 4;
const ROTATIONS_END = 5, CHUNK = 6, UPPER = 7, LOWER = 8, CURSOR = 9;
const CARRIED = 10; // 10..13: row i + 1's eight values (then row i's new ones), two per register
const C = 14, S = 15, X = 16;

const op = {
  ...CONTROL_OPS,
  // i32.load: memarg = alignment exponent 2, offset.
  loadI32: (offset) => [0x28, 2, ...unsigned(offset)],
  add: [0x6a],
  sub: [0x6b],
  mul: [0x6c],
  shl: [0x74],
  ltU: [0x49],
  // SIMD (prefix 0xFD); memarg = alignment exponent, offset.
  load: (offset) => [0xfd, ...unsigned(0x00), 4, ...unsigned(offset)],
  splat: (offset) => [0xfd, ...unsigned(0x0a), 3, ...unsigned(offset)],
  store: (offset) => [0xfd, ...unsigned(0x0b), 4, ...unsigned(offset)],
  f64x2Add: [0xfd, ...unsigned(0xf0)],
  f64x2Sub: [0xfd, ...unsigned(0xf1)],
  f64x2Mul: [0xfd, ...unsigned(0xf2)],
};

/** The body of $rotate. */
function rotateBody() {
  const code = [];
  const emit = (...parts) => {
    for (const part of parts) code.push(...part);
  };
  // do { one sweep } while (sweep < sweepsEnd)
  emit(op.loop);
  //   rotationsEnd = rotation + count * 16; chunk = 0
  emit(op.get(ROTATION), op.get(SWEEP), op.loadI32(4), op.const(4), op.shl, op.add, op.set(ROTATIONS_END));
  emit(op.const(0), op.set(CHUNK));
  //   do { eight columns through every rotation of the sweep } while (chunk < stride)
  emit(op.loop);
  //     upper = rows + (top + 1) * stride + chunk; carried = row top + 1's eight values
  emit(op.get(ROWS), op.get(SWEEP), op.loadI32(0), op.const(1), op.add, op.get(STRIDE), op.mul, op.add);
  emit(op.get(CHUNK), op.add, op.set(UPPER));
  for (let h = 0; h < VECTORS; h++) emit(op.get(UPPER), op.load(16 * h), op.set(CARRIED + h));
  emit(op.get(ROTATION), op.set(CURSOR));
  //     do { rotation i: rows i + 1 (upper, carried) and i (lower) } while (cursor < rotationsEnd)
  emit(op.loop);
  emit(op.get(CURSOR), op.splat(0), op.set(C));
  emit(op.get(CURSOR), op.splat(8), op.set(S));
  emit(op.get(UPPER), op.get(STRIDE), op.sub, op.set(LOWER));
  for (let h = 0; h < VECTORS; h++) {
    //   x = lower row; upper row ← s · x + c · carried; carried ← c · x − s · carried
    emit(op.get(LOWER), op.load(16 * h), op.set(X));
    emit(op.get(UPPER), op.get(S), op.get(X), op.f64x2Mul, op.get(C), op.get(CARRIED + h), op.f64x2Mul, op.f64x2Add, op.store(16 * h));
    emit(op.get(C), op.get(X), op.f64x2Mul, op.get(S), op.get(CARRIED + h), op.f64x2Mul, op.f64x2Sub, op.set(CARRIED + h));
  }
  emit(op.get(LOWER), op.set(UPPER));
  emit(op.get(CURSOR), op.const(16), op.add, op.tee(CURSOR), op.get(ROTATIONS_END), op.ltU, op.brIf(0));
  emit(op.end);
  //     the last rotation's lower row (row top − count + 1) gets its new values
  for (let h = 0; h < VECTORS; h++) emit(op.get(UPPER), op.get(CARRIED + h), op.store(16 * h));
  emit(op.get(CHUNK), op.const(8 * PLANE_ROTATION_COLUMNS), op.add, op.tee(CHUNK), op.get(STRIDE), op.ltU, op.brIf(0));
  emit(op.end);
  //   the next sweep's rotations follow this one's
  emit(op.get(ROTATIONS_END), op.set(ROTATION));
  emit(op.get(SWEEP), op.const(8), op.add, op.tee(SWEEP), op.get(SWEEPS_END), op.ltU, op.brIf(0));
  emit(op.end);
  emit(op.end);
  // Local declarations: 5 × i32, 7 × v128.
  const locals = [2, 5, 0x7f, 3 + VECTORS, 0x7b];
  return [...unsigned(locals.length + code.length), ...locals, ...code];
}

/**
 * The module: imports `env.memory`, exports `rotate`.
 * @returns {Uint8Array} The WebAssembly binary.
 */
export function planeRotationsWasmBytes() {
  const i32 = 0x7f;
  const type = section(1, [1, 0x60, 5, i32, i32, i32, i32, i32, 0]);
  const imports = section(2, [1, ...name('env'), ...name('memory'), 0x02, 0x00, 1]);
  const functions = section(3, [1, 0]);
  const exports = section(7, [1, ...name('rotate'), 0x00, 0]);
  const code = section(10, [1, ...rotateBody()]);
  return Uint8Array.from([...WASM_PREAMBLE, ...type, ...imports, ...functions, ...exports, ...code]);
}

if (import.meta.url === `file://${process.argv[1]}`) printWasmBytes(planeRotationsWasmBytes(), 'scripts/make-plane-rotations-wasm.mjs', '  ');
