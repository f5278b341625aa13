/**
 * Assembles the WebAssembly function that sums the arcsine quadrature of Φ2 (branch 0 of
 * `bivariateNormalCdfFromRule`, |ρ| < 0.925) for many grid corners at once
 * (src/lib/stats/bivariate-quadrature-kernel.ts) from the readable listing below, and prints the
 * bytes to paste into that file. A unit test (tests/unit/bivariate-quadrature-kernel.test.ts)
 * checks that the bytes in the kernel are the ones this listing gives.
 *
 * The function, in WebAssembly text (WAT) terms:
 *   (func $sums (param $weights i32) (param $first i32) (param $second i32) (param $nodeBytes i32)
 *               (param $products i32) (param $halves i32) (param $sums i32) (param $exponents i32)
 *               (param $exponentials i32) (param $cellBytes i32) (result i32))
 * `weights`, `first` and `second` hold the rule's nodes (f64, `nodeBytes` = 8 × count, count ≥ 1);
 * `products`, `halves` and `exponents` hold, per corner, h·k, (h·h + k·k)/2 and the density's
 * exponent −(h² − 2ρhk + k²)/(2(1 − ρ²)) (f64, `cellBytes` a multiple of 16: corners two at a
 * time, one per f64x2 lane). For each corner it computes, in this order,
 *   sum = 0;  for i = 0, 1, ..., count − 1:  sum = sum + weights[i] · exp(first[i]·product − second[i]·half)
 * which is the JavaScript loop `sum += weights[i] * Math.exp(first[i] * product - second[i] *
 * halfSumOfSquares)`, and stores sum in `sums`, and exp(exponent) in `exponentials`. Lanes are
 * corners, never nodes, so each corner's terms are added one after the other in node order, as in
 * JavaScript.
 *
 * exp is fdlibm's __ieee754_exp (e_exp.c, Sun Microsystems 1993) in the form V8 runs for Math.exp
 * (base::ieee754::exp, after FreeBSD's msun: the result scaled by multiplying with 2^k), written
 * per lane with the same IEEE-754 double operations in the same order:
 *   if |x| > 0.5 ln2 (high word above 0x3FD62E42):  t = trunc(x/ln2 ± 0.5), hi = x − t·ln2HI, lo = t·ln2LO
 *   else t = 0 (then hi = x, lo = 0);  r = hi − lo;  s = r·r
 *   c = r − s·(P1 + s·(P2 + s·(P3 + s·(P4 + s·P5))));  y = 1 − ((lo − (r·c)/(2 − c)) − hi);  y · 2^t
 * For 0.5 ln2 < |x| < 1.5 ln2, fdlibm takes k = ±1 and hi = x ∓ ln2HI directly; t comes out ±1
 * there (x/ln2 ± 0.5 is well inside (1, 2) in magnitude) and t·ln2HI, t·ln2LO are then exact, so
 * the values are the same. For |x| ≤ 0.5 ln2 fdlibm returns 1 − ((x·c)/(c − 2) − x); with t = 0,
 * lo − (r·c)/(2 − c) is exactly (x·c)/(c − 2) (IEEE-754 subtraction and division are symmetric
 * in sign), and y · 1 = y. |x| < 2^−28 gives 1 + x and x = 1 gives fdlibm's E (V8's special
 * case), both by a lane select. Lanes with |x| ≥ 707 (overflow, underflow, subnormal results,
 * scaling that fdlibm does in two steps) or NaN are not computed here: the function returns 1
 * when any lane met one, and the caller then computes the whole grid in JavaScript; it returns 0
 * otherwise. No fused multiply-add exists in WebAssembly's f64x2 arithmetic.
 *
 * Usage: node scripts/make-bivariate-quadrature-wasm.mjs
 * References: Sun Microsystems 1993, fdlibm e_exp.c (__ieee754_exp); WebAssembly Core
 * Specification 2.0 (2022), §5 "Binary format" (the encoding) and §4.3.2 (f64x2 arithmetic is
 * IEEE-754 per lane); Genz 2004, "Numerical computation of rectangular bivariate and trivariate
 * normal and t probabilities" (the quadrature).
 */

import { unsigned, name, section, WASM_PREAMBLE, printWasmBytes, CONTROL_OPS } from './wasm-binary.mjs';

// fdlibm e_exp.c's constants (their bit patterns in its comments).
const INVLN2 = 1.4426950408889634; // 0x3FF71547652B82FE
const LN2HI = 6.93147180369123816490e-1; // 0x3FE62E42FEE00000
const LN2LO = 1.90821492927058770002e-10; // 0x3DEA39EF35793C76
const P1 = 1.66666666666666019037e-1;
const P2 = -2.77777777770155933842e-3;
const P3 = 6.61375632143793436117e-5;
const P4 = -1.65339022054652515390e-6;
const P5 = 4.13813679705723846039e-8;
const E = 2.718281828459045; // 0x4005BF0A8B145769
/** |x| from which fdlibm reduces the argument: the double whose high word is 0x3FD62E43. */
const REDUCE_FROM = 0x3fd62e43n << 32n;
/** |x| below which fdlibm returns 1 + x: 2^−28 (high word 0x3E300000). */
const TINY_BELOW = 2 ** -28;
/** |x| from which the caller computes in JavaScript (k would leave −1020..1020, or x is not finite). */
const LARGE_FROM = 707;
/** 2^52 + 1023: added to an integer t of at most 1020 in magnitude, its low bits are t + 1023. */
const EXPONENT_MAGIC = 2 ** 52 + 1023;

// Locals: parameters 0-9, then i32 10-11, then v128 12-24.
const WEIGHTS = 0, FIRST = 1, SECOND = 2, NODE_BYTES = 3, PRODUCTS = 4, HALVES = 5, SUMS = 6, EXPONENTS = 7, EXPONENTIALS = 8, CELL_BYTES = 9;
const CELL = 10, NODE = 11;
const P = 12, Q = 13, SUM = 14, X = 15, AX = 16, T = 17, HI = 18, LO = 19, R = 20, S = 21, C = 22, Y = 23, LARGE = 24;

/** Both lanes of a v128.const: one f64, or one 64-bit pattern (a bigint). */
function constant(value) {
  const bytes = Buffer.alloc(16);
  if (typeof value === 'bigint') {
    bytes.writeBigUInt64LE(value, 0);
    bytes.writeBigUInt64LE(value, 8);
  } else {
    bytes.writeDoubleLE(value, 0);
    bytes.writeDoubleLE(value, 8);
  }
  return [0xfd, ...unsigned(0x0c), ...bytes];
}

const simd = (opcode) => [0xfd, ...unsigned(opcode)];
const op = {
  ...CONTROL_OPS,
  add: [0x6a],
  ltU: [0x49],
  geU: [0x4f],
  constant,
  // SIMD (prefix 0xFD); memarg = alignment exponent, offset.
  load: simd(0x00).concat([4, 0]),
  splat: simd(0x0a).concat([3, 0]),
  store: simd(0x0b).concat([4, 0]),
  eq: simd(0x47),
  lt: simd(0x49),
  ge: simd(0x4c),
  not: simd(0x4d),
  and: simd(0x4e),
  or: simd(0x50),
  bitselect: simd(0x52),
  anyTrue: simd(0x53),
  trunc: simd(0x7a),
  shl: simd(0xcb),
  abs: simd(0xec),
  f64x2Add: simd(0xf0),
  f64x2Sub: simd(0xf1),
  f64x2Mul: simd(0xf2),
  f64x2Div: simd(0xf3),
};

/**
 * Emits exp of local X into local Y (fdlibm's steps, per lane), and marks in LARGE the lanes
 * whose |x| is 707 or more, or NaN.
 */
function emitExp(emit) {
  const { get, set } = op;
  emit(get(X), op.abs, set(AX));
  // large |= !(|x| < 707)   (NaN too)
  emit(get(LARGE), get(AX), op.constant(LARGE_FROM), op.lt, op.not, op.or, set(LARGE));
  // t = trunc(invln2 · x + (±0.5 by the sign of x)), or 0 where |x| ≤ 0.5 ln2
  emit(op.constant(INVLN2), get(X), op.f64x2Mul);
  emit(get(X), op.constant(0x8000000000000000n), op.and, op.constant(0.5), op.or, op.f64x2Add, op.trunc);
  emit(get(AX), op.constant(REDUCE_FROM), op.ge, op.and, set(T));
  // hi = x − t · ln2HI;  lo = t · ln2LO;  r = hi − lo;  s = r · r
  emit(get(X), get(T), op.constant(LN2HI), op.f64x2Mul, op.f64x2Sub, set(HI));
  emit(get(T), op.constant(LN2LO), op.f64x2Mul, set(LO));
  emit(get(HI), get(LO), op.f64x2Sub, set(R));
  emit(get(R), get(R), op.f64x2Mul, set(S));
  // c = r − s · (P1 + s · (P2 + s · (P3 + s · (P4 + s · P5))))
  emit(get(R), get(S));
  emit(op.constant(P1), get(S), op.constant(P2), get(S), op.constant(P3), get(S), op.constant(P4), get(S), op.constant(P5));
  emit(op.f64x2Mul, op.f64x2Add, op.f64x2Mul, op.f64x2Add, op.f64x2Mul, op.f64x2Add, op.f64x2Mul, op.f64x2Add, op.f64x2Mul);
  emit(op.f64x2Sub, set(C));
  // y = 1 − ((lo − (r · c) / (2 − c)) − hi), times 2^t (the bits of t + 1023 shifted into the exponent)
  emit(op.constant(1), get(LO), get(R), get(C), op.f64x2Mul, op.constant(2), get(C), op.f64x2Sub, op.f64x2Div, op.f64x2Sub);
  emit(get(HI), op.f64x2Sub, op.f64x2Sub);
  emit(get(T), op.constant(EXPONENT_MAGIC), op.f64x2Add, op.const(52), op.shl, op.f64x2Mul, set(Y));
  // |x| < 2^−28: 1 + x;  x = 1: E
  emit(op.constant(1), get(X), op.f64x2Add, get(Y), get(AX), op.constant(TINY_BELOW), op.lt, op.bitselect, set(Y));
  emit(op.constant(E), get(Y), get(X), op.constant(1), op.eq, op.bitselect, set(Y));
}

/** The body of $sums. */
function sumsBody() {
  const code = [];
  const emit = (...parts) => {
    for (const part of parts) code.push(...part);
  };
  const { get, set } = op;
  emit(op.constant(0n), set(LARGE));
  emit(op.const(0), set(CELL));
  // while (cell < cellBytes) { two corners }
  emit(op.block, op.loop);
  emit(get(CELL), get(CELL_BYTES), op.geU, op.brIf(1));
  emit(get(PRODUCTS), get(CELL), op.add, op.load, set(P));
  emit(get(HALVES), get(CELL), op.add, op.load, set(Q));
  emit(op.constant(0), set(SUM));
  emit(op.const(0), set(NODE));
  //   do { one node } while (node < nodeBytes)
  emit(op.loop);
  //     x = first[i] · product − second[i] · half
  emit(get(FIRST), get(NODE), op.add, op.splat, get(P), op.f64x2Mul);
  emit(get(SECOND), get(NODE), op.add, op.splat, get(Q), op.f64x2Mul, op.f64x2Sub, set(X));
  emitExp(emit);
  //     sum = sum + weights[i] · exp(x)
  emit(get(SUM), get(WEIGHTS), get(NODE), op.add, op.splat, get(Y), op.f64x2Mul, op.f64x2Add, set(SUM));
  emit(get(NODE), op.const(8), op.add, op.tee(NODE), get(NODE_BYTES), op.ltU, op.brIf(0));
  emit(op.end);
  emit(get(SUMS), get(CELL), op.add, get(SUM), op.store);
  //   the density's exponential: exponentials = exp(exponents)
  emit(get(EXPONENTS), get(CELL), op.add, op.load, set(X));
  emitExp(emit);
  emit(get(EXPONENTIALS), get(CELL), op.add, get(Y), op.store);
  emit(get(CELL), op.const(16), op.add, set(CELL), op.br(0));
  emit(op.end, op.end);
  emit(get(LARGE), op.anyTrue);
  emit(op.end);
  // Local declarations: 2 × i32, 13 × v128.
  const locals = [2, 2, 0x7f, 13, 0x7b];
  return [...unsigned(locals.length + code.length), ...locals, ...code];
}

/**
 * The module: imports `env.memory`, exports `sums`.
 * @returns {Uint8Array} The WebAssembly binary.
 */
export function bivariateQuadratureWasmBytes() {
  const i32 = 0x7f;
  const type = section(1, [1, 0x60, 10, i32, i32, i32, i32, i32, i32, i32, i32, i32, i32, 1, i32]);
  const imports = section(2, [1, ...name('env'), ...name('memory'), 0x02, 0x00, 1]);
  const functions = section(3, [1, 0]);
  const exports = section(7, [1, ...name('sums'), 0x00, 0]);
  const code = section(10, [1, ...sumsBody()]);
  return Uint8Array.from([...WASM_PREAMBLE, ...type, ...imports, ...functions, ...exports, ...code]);
}

if (import.meta.url === `file://${process.argv[1]}`) {
  printWasmBytes(bivariateQuadratureWasmBytes(), 'scripts/make-bivariate-quadrature-wasm.mjs', '  ');
}
