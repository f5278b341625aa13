/**
 * Assembles the WebAssembly module of the Householder reduction's kernel
 * (src/lib/stats/householder-reduction-kernel.ts) from the readable listing below, and prints the
 * bytes to paste into that file. A unit test (tests/unit/householder-reduction-kernel.test.ts)
 * checks that the bytes in the kernel are the ones this listing gives.
 *
 * The module imports `env.memory` and exports two functions over byte offsets into it; `w` is the
 * row-major n × n working matrix of `householderReduction` (symmetric-eigen.ts), `d` and `e` its
 * two vectors of n doubles, and `i` the step (the rows and columns 0 .. i − 1 take part).
 *
 *   (func $multiply (param $w i32) (param $n i32) (param $i i32) (param $d i32) (param $e i32))
 * The pass e = A·u over the stored triangle for the rows j .. j + 3 of every whole block of four
 * (j + 3 < i); the caller runs the last i mod 4 rows. Per block: the corner (columns k < j + 4)
 * one row after the other in scalar f64, exactly as the JavaScript writes it; then the columns
 * k >= j + 4 two at a time: e[k], e[k + 1] (independent results) are one f64x2 to which the four
 * rows' terms are added in row order, and the four running sums g_j .. g_{j+3} (each sequential
 * in k) are two f64x2 (rows j, j + 1 and rows j + 2, j + 3), to which the products of column k
 * are added before those of column k + 1 (an unpack of the lanes pairs them across rows); a last
 * odd column is done alone. The sums g are then stored into e[j .. j + 3].
 *
 *   (func $update (param $w i32) (param $n i32) (param $i i32) (param $d i32) (param $e i32))
 * The rank-two update w[j][k] −= d[j]·e[k] + e[j]·d[k] for 0 <= j <= k < i: four rows per pass
 * (sharing the loads of e and d; the corner, row j + r at the columns j + r .. j + 2, in scalar
 * f64), two columns k per f64x2 (every element is its own result), a last odd column alone; the
 * last i mod 4 rows one at a time. It only reads d and e, so the order of the elements is free;
 * each is the JavaScript's w − (f·e[k] + g·d[k]). After each group of rows, as the JavaScript
 * does after each row, d[j] = w[j][i − 1] and w[j][i] = 0 (later rows read d from their own
 * column on).
 *
 * Every operation is one IEEE-754 double multiply, add or subtract per lane (no fused
 * multiply-add, no reassociation), in the order of the JavaScript loop, so d, e and w come out
 * bit for bit the same.
 *
 * Usage: node scripts/make-householder-wasm.mjs
 * References: WebAssembly Core Specification 2.0 (2022), §5 "Binary format" (the encoding),
 * and the fixed-width SIMD proposal's opcode table (v128.load 0x00, v128.store 0x0b,
 * i8x16.shuffle 0x0d, f64x2.splat 0x14, f64x2.replace_lane 0x22, f64x2.add 0xf0,
 * f64x2.sub 0xf1, f64x2.mul 0xf2).
 */

import { unsigned, name, section, WASM_PREAMBLE, printWasmBytes, CONTROL_OPS } from './wasm-binary.mjs';

/** Byte indices of i8x16.shuffle: lane 0 of both operands, or lane 1 of both. */
const LOW_LANES = [0, 1, 2, 3, 4, 5, 6, 7, 16, 17, 18, 19, 20, 21, 22, 23];
const HIGH_LANES = [8, 9, 10, 11, 12, 13, 14, 15, 24, 25, 26, 27, 28, 29, 30, 31];

const op = {
  ...CONTROL_OPS,
  add: [0x6a],
  sub: [0x6b],
  mul: [0x6c],
  shl: [0x74],
  eq: [0x46],
  gtU: [0x4b],
  geU: [0x4f],
  // Scalar doubles; memarg = alignment exponent, offset.
  f64Load: (offset) => [0x2b, 3, ...unsigned(offset)],
  f64Store: (offset) => [0x39, 3, ...unsigned(offset)],
  f64Add: [0xa0],
  f64Sub: [0xa1],
  f64Mul: [0xa2],
  f64Zero: [0x44, 0, 0, 0, 0, 0, 0, 0, 0],
  // SIMD (prefix 0xFD).
  load: (offset) => [0xfd, ...unsigned(0x00), 3, ...unsigned(offset)],
  store: (offset) => [0xfd, ...unsigned(0x0b), 3, ...unsigned(offset)],
  shuffle: (lanes) => [0xfd, ...unsigned(0x0d), ...lanes],
  splat: [0xfd, ...unsigned(0x14)],
  replaceLane: (lane) => [0xfd, ...unsigned(0x22), lane],
  f64x2Add: [0xfd, ...unsigned(0xf0)],
  f64x2Sub: [0xfd, ...unsigned(0xf1)],
  f64x2Mul: [0xfd, ...unsigned(0xf2)],
};

/** A function body: its code and its local declarations (runs of [count, type]). */
function body(locals, build) {
  const code = [];
  const emit = (...parts) => {
    for (const part of parts) code.push(...part);
  };
  build(emit);
  emit(op.end);
  const declarations = [...unsigned(locals.length), ...locals.flatMap(([count, type]) => [...unsigned(count), type])];
  return [...unsigned(declarations.length + code.length), ...declarations, ...code];
}

const I32 = 0x7f;
const F64 = 0x7c;
const V128 = 0x7b;

// Parameters of both functions.
const W = 0, N = 1, I = 2, D = 3, E = 4;

/** $multiply: the pass e = A·u, blocks of four rows (eight per block were slower: too many live registers). */
function multiplyBody() {
  const ROWS = 4;
  // i32 locals from 5, then f64 locals from F, then v128 locals from SF.
  const STRIDE = 5, J = 6, DJ = 7, EJ = 8, PD = 9, PE = 10, END = 11;
  const ROW = 12; // ROW + r: row j + r at column j, then at column k
  const F = ROW + ROWS; // F + r: d[j + r]
  const G = F + ROWS; // G + r: the corner's sum g_{j+r}
  const VALUE = G + ROWS, DK = VALUE + 1;
  const SF = DK + 1; // SF + r: f64x2.splat(d[j + r])
  const GV = SF + ROWS; // GV + p: (g_{j+2p}, g_{j+2p+1})
  const WV = GV + ROWS / 2; // WV + r: w[j + r][k], w[j + r][k + 1]
  const DV = WV + ROWS, EV = DV + 1, P = EV + 1, Q = P + 1;
  /** for (; j + rows <= i; j += rows): the rows j .. j + rows − 1. */
  const rowGroup = (emit, rows) => {
    emit(op.block, op.loop);
    emit(op.get(J), op.const(rows), op.add, op.get(I), op.gtU, op.brIf(1));
    emit(op.get(D), op.get(J), op.const(3), op.shl, op.add, op.set(DJ));
    emit(op.get(E), op.get(J), op.const(3), op.shl, op.add, op.set(EJ));
    // row r at column j: w + (j + r)·stride + 8j
    emit(op.get(W), op.get(J), op.get(STRIDE), op.mul, op.add, op.get(J), op.const(3), op.shl, op.add, op.set(ROW));
    for (let r = 1; r < rows; r++) emit(op.get(ROW + r - 1), op.get(STRIDE), op.add, op.set(ROW + r));
    for (let r = 0; r < rows; r++) {
      emit(op.get(DJ), op.f64Load(8 * r), op.tee(F + r), op.splat, op.set(SF + r));
    }
    // The corner (k < j + rows), one row after the other:
    //   g_r = e[j + r] + w[j + r][j + r]·f_r; then for c > r: g_r += w[j + r][j + c]·d[j + c],
    //   e[j + c] += w[j + r][j + c]·f_r.
    for (let r = 0; r < rows; r++) {
      emit(op.get(EJ), op.f64Load(8 * r), op.get(ROW + r), op.f64Load(8 * r), op.get(F + r), op.f64Mul, op.f64Add, op.set(G + r));
      for (let c = r + 1; c < rows; c++) {
        emit(op.get(ROW + r), op.f64Load(8 * c), op.set(VALUE));
        emit(op.get(G + r), op.get(VALUE), op.get(DJ), op.f64Load(8 * c), op.f64Mul, op.f64Add, op.set(G + r));
        emit(op.get(EJ), op.get(EJ), op.f64Load(8 * c), op.get(VALUE), op.get(F + r), op.f64Mul, op.f64Add, op.f64Store(8 * c));
      }
    }
    // (g_{j+2p}, g_{j+2p+1}) as one f64x2
    for (let p = 0; p < rows / 2; p++) emit(op.get(G + 2 * p), op.splat, op.get(G + 2 * p + 1), op.replaceLane(1), op.set(GV + p));
    // k = j + rows
    for (let r = 0; r < rows; r++) emit(op.get(ROW + r), op.const(8 * rows), op.add, op.set(ROW + r));
    emit(op.get(DJ), op.const(8 * rows), op.add, op.set(PD));
    emit(op.get(EJ), op.const(8 * rows), op.add, op.set(PE));
    // while (k + 1 < i): columns k, k + 1
    emit(op.block, op.loop);
    emit(op.get(PD), op.get(END), op.geU, op.brIf(1));
    emit(op.get(PD), op.load(0), op.set(DV));
    for (let r = 0; r < rows; r++) emit(op.get(ROW + r), op.load(0), op.set(WV + r));
    //   (e[k], e[k + 1]) = (((e + w_j·f_j) + w_{j+1}·f_{j+1}) + ...) + w_{j+rows−1}·f_{j+rows−1}
    emit(op.get(PE), op.load(0), op.set(EV));
    for (let r = 0; r < rows; r++) emit(op.get(EV), op.get(WV + r), op.get(SF + r), op.f64x2Mul, op.f64x2Add, op.set(EV));
    emit(op.get(PE), op.get(EV), op.store(0));
    //   rows (j + 2p, j + 2p + 1): g += w[·][k]·d[k], then g += w[·][k + 1]·d[k + 1]
    for (let p = 0; p < rows / 2; p++) {
      emit(op.get(WV + 2 * p), op.get(DV), op.f64x2Mul, op.set(P));
      emit(op.get(WV + 2 * p + 1), op.get(DV), op.f64x2Mul, op.set(Q));
      emit(op.get(GV + p), op.get(P), op.get(Q), op.shuffle(LOW_LANES), op.f64x2Add, op.set(GV + p));
      emit(op.get(GV + p), op.get(P), op.get(Q), op.shuffle(HIGH_LANES), op.f64x2Add, op.set(GV + p));
    }
    for (let r = 0; r < rows; r++) emit(op.get(ROW + r), op.const(16), op.add, op.set(ROW + r));
    emit(op.get(PD), op.const(16), op.add, op.set(PD));
    emit(op.get(PE), op.const(16), op.add, op.set(PE));
    emit(op.br(0), op.end, op.end);
    // if (k === i − 1): the last column alone
    emit(op.get(PD), op.get(END), op.eq, op.if);
    emit(op.get(PD), op.f64Load(0), op.set(DK));
    emit(op.get(PE), op.get(PE), op.f64Load(0));
    for (let r = 0; r < rows; r++) emit(op.get(ROW + r), op.f64Load(0), op.get(F + r), op.f64Mul, op.f64Add);
    emit(op.f64Store(0));
    for (let p = 0; p < rows / 2; p++) {
      emit(op.get(GV + p));
      emit(op.get(ROW + 2 * p), op.f64Load(0), op.splat, op.get(ROW + 2 * p + 1), op.f64Load(0), op.replaceLane(1));
      emit(op.get(DK), op.splat, op.f64x2Mul, op.f64x2Add, op.set(GV + p));
    }
    emit(op.end);
    // e[j .. j + rows − 1] = g
    for (let p = 0; p < rows / 2; p++) emit(op.get(EJ), op.get(GV + p), op.store(16 * p));
    emit(op.get(J), op.const(rows), op.add, op.set(J));
    emit(op.br(0), op.end, op.end);
  };
  return body([[F - 5, I32], [SF - F, F64], [Q + 1 - SF, V128]], (emit) => {
    // stride = 8n; end = d + 8(i − 1) (the pairs run while k + 1 < i); j starts at 0 (locals are zeroed)
    emit(op.get(N), op.const(3), op.shl, op.set(STRIDE));
    emit(op.get(D), op.get(I), op.const(3), op.shl, op.add, op.const(8), op.sub, op.set(END));
    rowGroup(emit, ROWS);
  });
}

/** $update: the rank-two update, four rows per pass (they share the loads of e and d), then single rows; two columns per f64x2. */
function updateBody() {
  // i32 locals 5-14, f64 locals 15-22, v128 locals 23-32.
  const STRIDE = 5, J = 6, PD = 7, PE = 8, END = 9, ROW = 10, PW = 11; // PW + r: row j + r
  const F = 15, G = 19; // F + r = d[j + r], G + r = e[j + r]
  const SF = 23, SG = 27; // their splats
  const EV = 31, DV = 32;
  /** Element (j + r, column at `pointer` + offset) −= f_r·e + g_r·d, in scalar f64. */
  const scalar = (emit, r, offset) => {
    emit(op.get(PW + r), op.get(PW + r), op.f64Load(offset));
    emit(op.get(F + r), op.get(PE), op.f64Load(offset), op.f64Mul, op.get(G + r), op.get(PD), op.f64Load(offset), op.f64Mul, op.f64Add);
    emit(op.f64Sub, op.f64Store(offset));
  };
  /** for (; j + rows <= i; j += rows): the rows j .. j + rows − 1, which start at columns j .. j + rows − 1. */
  const rowGroup = (emit, rows) => {
    emit(op.block, op.loop);
    emit(op.get(J), op.const(rows), op.add, op.get(I), op.gtU, op.brIf(1));
    // pointers at column j
    emit(op.get(D), op.get(J), op.const(3), op.shl, op.add, op.set(PD));
    emit(op.get(E), op.get(J), op.const(3), op.shl, op.add, op.set(PE));
    emit(op.get(ROW), op.get(J), op.const(3), op.shl, op.add, op.set(PW));
    for (let r = 1; r < rows; r++) emit(op.get(PW + r - 1), op.get(STRIDE), op.add, op.set(PW + r));
    for (let r = 0; r < rows; r++) {
      emit(op.get(PD), op.f64Load(8 * r), op.tee(F + r), op.splat, op.set(SF + r));
      emit(op.get(PE), op.f64Load(8 * r), op.tee(G + r), op.splat, op.set(SG + r));
    }
    // The corner: row j + r alone at the columns j + r .. j + rows − 2.
    for (let r = 0; r + 1 < rows; r++) for (let c = r; c + 1 < rows; c++) scalar(emit, r, 8 * c);
    for (let r = 0; r < rows; r++) emit(op.get(PW + r), op.const(8 * (rows - 1)), op.add, op.set(PW + r));
    emit(op.get(PD), op.const(8 * (rows - 1)), op.add, op.set(PD));
    emit(op.get(PE), op.const(8 * (rows - 1)), op.add, op.set(PE));
    // while (k + 1 < i): w[j + r][k .. k + 1] −= f_r·e[k .. k + 1] + g_r·d[k .. k + 1]
    emit(op.block, op.loop);
    emit(op.get(PD), op.get(END), op.geU, op.brIf(1));
    emit(op.get(PE), op.load(0), op.set(EV));
    emit(op.get(PD), op.load(0), op.set(DV));
    for (let r = 0; r < rows; r++) {
      emit(op.get(PW + r), op.get(PW + r), op.load(0));
      emit(op.get(SF + r), op.get(EV), op.f64x2Mul, op.get(SG + r), op.get(DV), op.f64x2Mul, op.f64x2Add);
      emit(op.f64x2Sub, op.store(0));
      emit(op.get(PW + r), op.const(16), op.add, op.set(PW + r));
    }
    emit(op.get(PD), op.const(16), op.add, op.set(PD));
    emit(op.get(PE), op.const(16), op.add, op.set(PE));
    emit(op.br(0), op.end, op.end);
    // if (k === i − 1): the last column alone
    emit(op.get(PD), op.get(END), op.eq, op.if);
    for (let r = 0; r < rows; r++) scalar(emit, r, 0);
    emit(op.end);
    // d[j + r] = w[j + r][i − 1]; w[j + r][i] = 0 (later rows read d only from their own column on)
    emit(op.get(D), op.get(J), op.const(3), op.shl, op.add, op.set(PD));
    emit(op.get(ROW), op.get(END), op.add, op.get(D), op.sub, op.set(PW));
    for (let r = 1; r < rows; r++) emit(op.get(PW + r - 1), op.get(STRIDE), op.add, op.set(PW + r));
    for (let r = 0; r < rows; r++) {
      emit(op.get(PD), op.get(PW + r), op.f64Load(0), op.f64Store(8 * r));
      emit(op.get(PW + r), op.f64Zero, op.f64Store(8));
    }
    emit(op.get(ROW), op.get(STRIDE), op.const(rows), op.mul, op.add, op.set(ROW));
    emit(op.get(J), op.const(rows), op.add, op.set(J));
    emit(op.br(0), op.end, op.end);
  };
  return body([[10, I32], [8, F64], [10, V128]], (emit) => {
    emit(op.get(N), op.const(3), op.shl, op.set(STRIDE));
    emit(op.get(D), op.get(I), op.const(3), op.shl, op.add, op.const(8), op.sub, op.set(END));
    // row j's pointer at column 0 (j starts at 0: locals are zeroed)
    emit(op.get(W), op.set(ROW));
    rowGroup(emit, 4);
    rowGroup(emit, 1);
  });
}

/**
 * The module: imports `env.memory`, exports `multiply` and `update`.
 * @returns {Uint8Array} The WebAssembly binary.
 */
export function householderWasmBytes() {
  const type = section(1, [1, 0x60, 5, I32, I32, I32, I32, I32, 0]);
  const imports = section(2, [1, ...name('env'), ...name('memory'), 0x02, 0x00, 1]);
  const functions = section(3, [2, 0, 0]);
  const exports = section(7, [2, ...name('multiply'), 0x00, 0, ...name('update'), 0x00, 1]);
  const code = section(10, [2, ...multiplyBody(), ...updateBody()]);
  return Uint8Array.from([...WASM_PREAMBLE, ...type, ...imports, ...functions, ...exports, ...code]);
}

if (import.meta.url === `file://${process.argv[1]}`) printWasmBytes(householderWasmBytes(), 'scripts/make-householder-wasm.mjs', '  ');
