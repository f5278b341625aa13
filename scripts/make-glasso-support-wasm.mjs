/**
 * Assembles the WebAssembly kernel of the graphical lasso's active-set solve and coordinate-descent
 * pass (src/lib/stats/glasso-support-kernel.ts) from the readable listing below, and prints the bytes
 * to paste into that file. A unit test (tests/unit/glasso-support-kernel.test.ts) checks that
 * the bytes in the kernel are the ones this listing gives.
 *
 * The pass, `$pass(j, p, penalty: f64, size, members, s, w, beta, wb, flag) → f64`, is described
 * at `passBody` below. The active-set solve, in WebAssembly text (WAT) terms:
 *   (func $support (param $j i32) (param $p i32) (param $penalty f64) (param $size i32)
 *     (param $members i32) (param $s i32) (param $w i32) (param $beta i32) (param $wb i32)
 *     (param $active i32) (param $factor i32) (param $solution i32) (param $signs i32)
 *     (param $others i32) (param $symmetric i32) (result i32))
 * Every pointer is a byte offset into the imported memory: `s`, `w` and `beta` are row-major
 * p × p f64 arrays (S, W and the coefficients, row j holding column j's β), `members` the
 * `size` items of j's block (i32, ascending), `wb` a length-p f64 vector, and `active`,
 * `factor`, `solution`, `signs`, `others` scratch (p i32, p × p f64, p f64, p f64, p i32).
 * It is `solveOnSupport` of graphical-lasso.ts, operation for operation:
 *   1. A = the members k ≠ j with β_jk ≠ 0, in order (none: return 0);
 *   2. the Cholesky factor L of W_AA, stored column-major (L[a, c] at a + c·n). It is the
 *      right-looking (outer-product) form: for c = 0, 1, …: the pivot (0 returned unless > 0),
 *      its square root, the column below it divided by it, and L[a, b] −= L[a, c] · L[b, c] for
 *      c < b ≤ a. Each element thus receives its subtractions in the order c = 0, 1, …, b − 1, as
 *      in the row-by-row (left-looking) loop of the JavaScript, and then the same division: the
 *      same rounded values. The update of a column runs two rows at a time (f64x2), and the
 *      pivots are taken two at a time (c, then c + 1 after column c + 1's update by c), so that
 *      each later element is loaded once for its two subtractions, done in the order c, c + 1;
 *   3. the right-hand side s_kj − ρ·sign(β_jk), the forward solve L y = r column by column
 *      (y_a −= L[a, c] · y_c for c = 0, 1, … and then ÷ L[a, a]: per element the JavaScript's
 *      order, two rows at a time), and the back solve Lᵀ x = y one scalar dot product at a time
 *      (c ascending from a + 1, as in the JavaScript);
 *   4. 0 returned unless every x_a · sign_a > 0; else β written, wb_k = Σ_a w_{k, A_a} x_a for
 *      every member k ≠ j (a sum from 0, a ascending; four outputs k at a time in two f64x2, or,
 *      when `symmetric` is 1 (W exactly symmetric) and the block a run of items, along rows of W),
 *      and 2 returned when |s_kj − wb_k| ≤ ρ for every k off the support, 1 otherwise.
 * Every operation is one IEEE-754 double multiply, add, subtract, divide or square root (no
 * fused multiply-add; f64x2 lanes are IEEE-754 doubles), so every value is bit for bit the
 * JavaScript's.
 *
 * Usage: node scripts/make-glasso-support-wasm.mjs
 * References: WebAssembly Core Specification 2.0 (2022), §5 "Binary format" (the encoding), and
 * the fixed-width SIMD opcode table (v128.load 0x00, v128.load64_splat 0x0A, v128.store 0x0B,
 * f64x2.splat 0x14, f64x2.extract_lane 0x21, v128.load64_lane 0x57, f64x2.add/sub/mul/div
 * 0xF0-0xF3); Golub & Van Loan 2013, "Matrix Computations", 4th ed., §4.2 (the outer-product
 * Cholesky and its equivalence to the other orderings).
 */

import { unsigned, signed, name, section, WASM_PREAMBLE, printWasmBytes, CONTROL_OPS } from './wasm-binary.mjs';

// Parameters 0-14 (2 is f64, the rest i32), then i32 locals 15-32, f64 33-36, v128 37-40.
const J = 0, P = 1, PENALTY = 2, SIZE = 3, MEMBERS = 4, S = 5, W = 6, BETA = 7, WB = 8, ACTIVE = 9, FACTOR = 10, SOLUTION = 11, SIGNS = 12, OTHERS = 13, SYMMETRIC = 14;
const ROW = 15, N = 16, M = 17, T = 18, K = 19, A = 20, B = 21, C = 22, COLC = 23, COLB = 24, ADDR = 25, OPTIMAL = 26;
const ROWS = [27, 28, 29, 30]; // rows of W of up to four outputs wb_k
const COLD = 31, FIRST = 32;
const X = 33, Y = 34, SUM = 35, SIGN = 36;
const VX = 37, VY = 38, ACC = [39, 40];
const I32_LOCALS = 18, F64_LOCALS = 4, V128_LOCALS = 4;

const f64Bytes = (value) => [...new Uint8Array(Float64Array.of(value).buffer)];

const op = {
  ...CONTROL_OPS,
  i32: (value) => [0x41, ...signed(value)],
  f64: (value) => [0x44, ...f64Bytes(value)],
  return: [0x0f],
  select: [0x1b],
  i32Load: [0x28, 2, 0],
  f64Load: [0x2b, 3, 0],
  i32Store: [0x36, 2, 0],
  f64Store: [0x39, 3, 0],
  i32Eqz: [0x45],
  i32Eq: [0x46],
  i32Ne: [0x47],
  i32LtS: [0x48],
  i32GeS: [0x4e],
  f64Eq: [0x61],
  f64Ne: [0x62],
  i32And: [0x71],
  i32Or: [0x72],
  f64Gt: [0x64],
  i32Add: [0x6a],
  i32Sub: [0x6b],
  i32Mul: [0x6c],
  i32Shl: [0x74],
  f64Abs: [0x99],
  f64Sqrt: [0x9f],
  f64Add: [0xa0],
  f64Sub: [0xa1],
  f64Mul: [0xa2],
  f64Div: [0xa3],
  // SIMD (prefix 0xFD); memarg = alignment exponent, offset.
  v128Load: [0xfd, ...unsigned(0x00), 3, 0],
  load64Splat: [0xfd, ...unsigned(0x0a), 3, 0],
  v128Store: [0xfd, ...unsigned(0x0b), 3, 0],
  zero: [0xfd, ...unsigned(0x0c), ...new Array(16).fill(0)],
  f64x2Splat: [0xfd, ...unsigned(0x14)],
  extractLane: (lane) => [0xfd, ...unsigned(0x21), lane],
  load64Lane: (lane) => [0xfd, ...unsigned(0x57), 3, 0, lane],
  f64x2Add: [0xfd, ...unsigned(0xf0)],
  f64x2Sub: [0xfd, ...unsigned(0xf1)],
  f64x2Mul: [0xfd, ...unsigned(0xf2)],
  f64x2Div: [0xfd, ...unsigned(0xf3)],
};

const flat = (...parts) => parts.flat(Infinity);

/** Byte address base + (index << shift), with `index` the code of an i32. */
const address = (base, index, shift = 3) => flat(op.get(base), index, op.i32(shift), op.i32Shl, op.i32Add);

/** for (v = start; v < limit; v += step) body, with start and limit given as code of an i32. */
function forLoop(variable, start, limit, step, body) {
  return flat(
    start, op.set(variable),
    op.block, op.loop,
    op.get(variable), limit, op.i32GeS, op.brIf(1),
    body,
    op.get(variable), op.i32(step), op.i32Add, op.set(variable),
    op.br(0),
    op.end, op.end,
  );
}

/**
 * Rows a = start, start + 1, … < n of a column, two at a time and then the odd one:
 * column[a] = column[a] / x.
 */
function columnDivide(target, start, vector, scalar) {
  return flat(
    forLoop(A, start, flat(op.get(N), op.i32(1), op.i32Sub), 2, flat(
      address(target, op.get(A)), op.tee(ADDR), op.get(ADDR), op.v128Load, op.get(vector), op.f64x2Div, op.v128Store,
    )),
    op.get(A), op.get(N), op.i32LtS, op.if,
    address(target, op.get(A)), op.tee(ADDR), op.get(ADDR), op.f64Load, op.get(scalar), op.f64Div, op.f64Store,
    op.end,
  );
}

/**
 * Rows a = start, start + 1, … < n of a column, two at a time and then the odd one:
 * column[a] = (column[a] − source₁[a] · x₁) − source₂[a] · x₂ … for the terms in order, each
 * product rounded and subtracted on its own. A term is [source column, x as f64x2, x as f64].
 */
function columnSubtract(target, terms, start) {
  const pair = [address(target, op.get(A)), op.tee(ADDR), op.get(ADDR), op.v128Load];
  const single = [address(target, op.get(A)), op.tee(ADDR), op.get(ADDR), op.f64Load];
  for (const [source, vector, scalar] of terms) {
    pair.push(address(source, op.get(A)), op.v128Load, op.get(vector), op.f64x2Mul, op.f64x2Sub);
    single.push(address(source, op.get(A)), op.f64Load, op.get(scalar), op.f64Mul, op.f64Sub);
  }
  return flat(
    forLoop(A, start, flat(op.get(N), op.i32(1), op.i32Sub), 2, flat(pair, op.v128Store)),
    op.get(A), op.get(N), op.i32LtS, op.if, single, op.f64Store, op.end,
  );
}

/**
 * Pivot `index` of the column at byte address `column`: 0 returned unless it is > 0; else its
 * square root stored and the rows below divided by it.
 */
function pivot(column, index) {
  return flat(
    address(column, index), op.tee(ADDR), op.f64Load, op.tee(X),
    op.f64(0), op.f64Gt, op.i32Eqz, op.if, op.i32(0), op.return, op.end,
    op.get(ADDR), op.get(X), op.f64Sqrt, op.tee(X), op.f64Store,
    op.get(X), op.f64x2Splat, op.set(VX),
    columnDivide(column, flat(index, op.i32(1), op.i32Add), VX, X),
  );
}

/**
 * wb_k for the `count` (2 or 4) other members others[t], others[t + 1], …: each a sum from 0 over
 * a = 0, 1, … of w[k p + active[a]] · x_a, in its own f64x2 lane.
 */
function outputs(count) {
  const code = [];
  for (let r = 0; r < count; r++) code.push(address(W, flat(address(OTHERS, flat(op.get(T), op.i32(r), op.i32Add), 2), op.i32Load, op.get(P), op.i32Mul)), op.set(ROWS[r]));
  for (let h = 0; h < count / 2; h++) code.push(op.zero, op.set(ACC[h]));
  const step = [address(ACTIVE, op.get(A), 2), op.i32Load, op.i32(3), op.i32Shl, op.set(ADDR), address(SOLUTION, op.get(A)), op.load64Splat, op.set(VX)];
  for (let h = 0; h < count / 2; h++) {
    // [address of row 2h + 1, row 2h's element in both lanes] → lane 1 replaced by row 2h + 1's.
    step.push(
      op.get(ACC[h]),
      op.get(ROWS[2 * h + 1]), op.get(ADDR), op.i32Add,
      op.get(ROWS[2 * h]), op.get(ADDR), op.i32Add, op.load64Splat,
      op.load64Lane(1), op.get(VX), op.f64x2Mul, op.f64x2Add, op.set(ACC[h]),
    );
  }
  code.push(forLoop(A, op.i32(0), op.get(N), 1, flat(step)));
  for (let r = 0; r < count; r++) code.push(address(WB, flat(address(OTHERS, flat(op.get(T), op.i32(r), op.i32Add), 2), op.i32Load)), op.get(ACC[r >> 1]), op.extractLane(r & 1), op.f64Store);
  return flat(code);
}

/** The body of $support. */
function supportBody() {
  const code = flat(
    // row = beta + 8 j p (the coefficients of column j)
    op.get(J), op.get(P), op.i32Mul, op.i32(3), op.i32Shl, op.get(BETA), op.i32Add, op.set(ROW),
    // The active set and the other members, in the members' order.
    forLoop(T, op.i32(0), op.get(SIZE), 1, flat(
      address(MEMBERS, op.get(T), 2), op.i32Load, op.tee(K), op.get(J), op.i32Ne, op.if,
      address(OTHERS, op.get(M), 2), op.get(K), op.i32Store,
      op.get(M), op.i32(1), op.i32Add, op.set(M),
      address(ROW, op.get(K)), op.f64Load, op.f64(0), op.f64Ne, op.if,
      address(ACTIVE, op.get(N), 2), op.get(K), op.i32Store,
      op.get(N), op.i32(1), op.i32Add, op.set(N),
      op.end,
      op.end,
    )),
    op.get(N), op.i32Eqz, op.if, op.i32(0), op.return, op.end,
    // W_AA's lower triangle, column-major: factor[a + b n] = w[active[a] p + active[b]] (a ≥ b).
    forLoop(B, op.i32(0), op.get(N), 1, flat(
      address(FACTOR, flat(op.get(B), op.get(N), op.i32Mul)), op.set(COLB),
      forLoop(A, op.get(B), op.get(N), 1, flat(
        address(COLB, op.get(A)),
        address(W, flat(address(ACTIVE, op.get(A), 2), op.i32Load, op.get(P), op.i32Mul, address(ACTIVE, op.get(B), 2), op.i32Load, op.i32Add)),
        op.f64Load, op.f64Store,
      )),
    )),
    // The right-hand side s_kj − ρ sign(β_jk) and the signs.
    forLoop(A, op.i32(0), op.get(N), 1, flat(
      address(ACTIVE, op.get(A), 2), op.i32Load, op.set(K),
      op.f64(1), op.f64(-1), address(ROW, op.get(K)), op.f64Load, op.f64(0), op.f64Gt, op.select, op.set(SIGN),
      address(SIGNS, op.get(A)), op.get(SIGN), op.f64Store,
      address(SOLUTION, op.get(A)),
      address(S, flat(op.get(K), op.get(P), op.i32Mul, op.get(J), op.i32Add)), op.f64Load,
      op.get(PENALTY), op.get(SIGN), op.f64Mul, op.f64Sub, op.f64Store,
    )),
    // Right-looking Cholesky, two columns c, c + 1 per step: column c's pivot and division, column
    // c + 1's update by column c, its pivot and division, then every later column b updated by
    // c and then by c + 1 (L[a, b] − L[a, c] L[b, c] − L[a, c+1] L[b, c+1], left to right).
    forLoop(C, op.i32(0), op.get(N), 2, flat(
      address(FACTOR, flat(op.get(C), op.get(N), op.i32Mul)), op.set(COLC),
      pivot(COLC, op.get(C)),
      op.get(C), op.i32(1), op.i32Add, op.get(N), op.i32LtS, op.if,
      op.get(COLC), op.get(N), op.i32(3), op.i32Shl, op.i32Add, op.set(COLB),
      address(COLC, flat(op.get(C), op.i32(1), op.i32Add)), op.f64Load, op.tee(X), op.f64x2Splat, op.set(VX),
      columnSubtract(COLB, [[COLC, VX, X]], flat(op.get(C), op.i32(1), op.i32Add)),
      pivot(COLB, flat(op.get(C), op.i32(1), op.i32Add)),
      forLoop(B, flat(op.get(C), op.i32(2), op.i32Add), op.get(N), 1, flat(
        address(FACTOR, flat(op.get(B), op.get(N), op.i32Mul)), op.set(COLD),
        address(COLC, op.get(B)), op.f64Load, op.tee(X), op.f64x2Splat, op.set(VX),
        address(COLB, op.get(B)), op.f64Load, op.tee(Y), op.f64x2Splat, op.set(VY),
        columnSubtract(COLD, [[COLC, VX, X], [COLB, VY, Y]], op.get(B)),
      )),
      op.end,
    )),
    // Forward solve L y = r, column by column.
    forLoop(C, op.i32(0), op.get(N), 1, flat(
      address(FACTOR, flat(op.get(C), op.get(N), op.i32Mul)), op.set(COLC),
      address(SOLUTION, op.get(C)), op.tee(ADDR), op.f64Load, address(COLC, op.get(C)), op.f64Load, op.f64Div, op.set(X),
      op.get(ADDR), op.get(X), op.f64Store,
      op.get(X), op.f64x2Splat, op.set(VX),
      columnSubtract(SOLUTION, [[COLC, VX, X]], flat(op.get(C), op.i32(1), op.i32Add)),
    )),
    // Back solve Lᵀ x = y: for a = n − 1 … 0, a dot product over c = a + 1 … n − 1 in order.
    op.get(N), op.set(A),
    op.block, op.loop,
    op.get(A), op.i32Eqz, op.brIf(1),
    op.get(A), op.i32(1), op.i32Sub, op.set(A),
    address(FACTOR, flat(op.get(A), op.get(N), op.i32Mul)), op.set(COLC),
    address(SOLUTION, op.get(A)), op.f64Load, op.set(SUM),
    forLoop(C, flat(op.get(A), op.i32(1), op.i32Add), op.get(N), 1, flat(
      op.get(SUM), address(COLC, op.get(C)), op.f64Load, address(SOLUTION, op.get(C)), op.f64Load, op.f64Mul, op.f64Sub, op.set(SUM),
    )),
    address(SOLUTION, op.get(A)), op.get(SUM), address(COLC, op.get(A)), op.f64Load, op.f64Div, op.f64Store,
    op.br(0),
    op.end, op.end,
    // Every sign must agree.
    forLoop(A, op.i32(0), op.get(N), 1, flat(
      address(SOLUTION, op.get(A)), op.f64Load, address(SIGNS, op.get(A)), op.f64Load, op.f64Mul, op.f64(0), op.f64Gt,
      op.i32Eqz, op.if, op.i32(0), op.return, op.end,
    )),
    // β_j,active[a] = x_a.
    forLoop(A, op.i32(0), op.get(N), 1, flat(
      address(ROW, flat(address(ACTIVE, op.get(A), 2), op.i32Load)), address(SOLUTION, op.get(A)), op.f64Load, op.f64Store,
    )),
    // wb_k = Σ_a w[k p + active[a]] x_a for the other members. When W is symmetric (the caller
    // says so: then w[k p + l] = w[l p + k] exactly) and the block is a run of items first,
    // first + 1, …, the same sums are formed along rows of W: every member's sum starts at 0 in
    // the signs' scratch (free by now) and gains w[active[a] p + k] x_a for a = 0, 1, … in turn,
    // two members per f64x2; the other members' sums are then copied to wb.
    op.get(MEMBERS), op.i32Load, op.set(FIRST),
    op.get(SYMMETRIC),
    address(MEMBERS, flat(op.get(SIZE), op.i32(1), op.i32Sub), 2), op.i32Load, op.get(FIRST), op.i32Sub,
    op.get(SIZE), op.i32(1), op.i32Sub, op.i32Eq, op.i32And, op.if,
    forLoop(T, op.i32(0), op.get(SIZE), 1, flat(address(SIGNS, op.get(T)), op.f64(0), op.f64Store)),
    forLoop(A, op.i32(0), op.get(N), 1, flat(
      address(SOLUTION, op.get(A)), op.f64Load, op.tee(X), op.f64x2Splat, op.set(VX),
      address(W, flat(address(ACTIVE, op.get(A), 2), op.i32Load, op.get(P), op.i32Mul, op.get(FIRST), op.i32Add)), op.set(ROWS[0]),
      forLoop(T, op.i32(0), flat(op.get(SIZE), op.i32(1), op.i32Sub), 2, flat(
        address(SIGNS, op.get(T)), op.tee(ADDR), op.get(ADDR), op.v128Load,
        address(ROWS[0], op.get(T)), op.v128Load, op.get(VX), op.f64x2Mul, op.f64x2Add, op.v128Store,
      )),
      op.get(T), op.get(SIZE), op.i32LtS, op.if,
      address(SIGNS, op.get(T)), op.tee(ADDR), op.get(ADDR), op.f64Load,
      address(ROWS[0], op.get(T)), op.f64Load, op.get(X), op.f64Mul, op.f64Add, op.f64Store,
      op.end,
    )),
    forLoop(T, op.i32(0), op.get(M), 1, flat(
      address(OTHERS, op.get(T), 2), op.i32Load, op.set(K),
      address(WB, op.get(K)), address(SIGNS, flat(op.get(K), op.get(FIRST), op.i32Sub)), op.f64Load, op.f64Store,
    )),
    op.else,
    // Otherwise by gathers: four members at a time (two f64x2 sums, one member per lane), then
    // two, then one.
    forLoop(T, op.i32(0), flat(op.get(M), op.i32(3), op.i32Sub), 4, outputs(4)),
    op.get(T), flat(op.get(M), op.i32(1), op.i32Sub), op.i32LtS, op.if, outputs(2), op.get(T), op.i32(2), op.i32Add, op.set(T), op.end,
    op.get(T), op.get(M), op.i32LtS, op.if,
    address(W, flat(address(OTHERS, op.get(T), 2), op.i32Load, op.get(P), op.i32Mul)), op.set(ROWS[0]),
    op.f64(0), op.set(SUM),
    forLoop(A, op.i32(0), op.get(N), 1, flat(
      op.get(SUM), address(ROWS[0], flat(address(ACTIVE, op.get(A), 2), op.i32Load)), op.f64Load, address(SOLUTION, op.get(A)), op.f64Load, op.f64Mul, op.f64Add, op.set(SUM),
    )),
    address(WB, flat(address(OTHERS, op.get(T), 2), op.i32Load)), op.get(SUM), op.f64Store,
    op.end,
    op.end,
    // Optimal unless a coordinate off the support has |s_kj − wb_k| > ρ.
    op.i32(2), op.set(OPTIMAL),
    forLoop(T, op.i32(0), op.get(M), 1, flat(
      address(OTHERS, op.get(T), 2), op.i32Load, op.set(K),
      address(ROW, op.get(K)), op.f64Load, op.f64(0), op.f64Eq, op.if,
      address(S, flat(op.get(K), op.get(P), op.i32Mul, op.get(J), op.i32Add)), op.f64Load, address(WB, op.get(K)), op.f64Load, op.f64Sub, op.f64Abs,
      op.get(PENALTY), op.f64Gt, op.if, op.i32(1), op.set(OPTIMAL), op.end,
      op.end,
    )),
    op.get(OPTIMAL),
    op.end,
  );
  const locals = [3, I32_LOCALS, 0x7f, F64_LOCALS, 0x7c, V128_LOCALS, 0x7b];
  return [...unsigned(locals.length + code.length), ...locals, ...code];
}

// $pass: parameters 0-9 (2 is f64), then i32 locals 10-19, f64 20-26, v128 27.
const PJ = 0, PP = 1, PPENALTY = 2, PSIZE = 3, PMEMBERS = 4, PS = 5, PW = 6, PBETA = 7, PWB = 8, PFLAG = 9;
const PROW = 10, PT = 11, PK = 12, PWK = 13, PU = 14, PL = 15, PFIRST = 16, PCONTIGUOUS = 17, PWROW = 18, PWBROW = 19;
const PWKK = 20, POLD = 21, PPARTIAL = 22, PEXCESS = 23, PUPDATED = 24, PDELTA = 25, PLARGEST = 26;
const PVD = 27;

/**
 * The body of $pass: one coordinate-descent pass of column j's lasso (`lassoPass` of
 * graphical-lasso.ts, operation for operation). For each member k ≠ j in order:
 * partial = (s_kj − wb_k) + w_kk β_jk, excess = |partial| − ρ, the new β_jk = (±1 · excess) / w_kk
 * when excess > 0 (the sign of partial) and 0 otherwise; when it differs from the old one, the
 * flag at `flag` is set to 1 if a coordinate entered or left the support (it is 0 otherwise), β
 * is written, wb_l += w_kl · Δ for every member l (two l per f64x2 when the block is a run of
 * consecutive items, else one at a time: each wb_l its own running sum either way), and
 * |Δ| w_kk is compared with the largest so far, which is returned.
 */
function passBody() {
  const row = (index) => flat(op.get(index), op.i32(3), op.i32Shl);
  const code = flat(
    op.get(PJ), op.get(PP), op.i32Mul, op.i32(3), op.i32Shl, op.get(PBETA), op.i32Add, op.set(PROW),
    op.get(PFLAG), op.i32(0), op.i32Store,
    // first member, and whether the members are first, first + 1, …
    op.get(PMEMBERS), op.i32Load, op.set(PFIRST),
    address(PMEMBERS, flat(op.get(PSIZE), op.i32(1), op.i32Sub), 2), op.i32Load, op.get(PFIRST), op.i32Sub,
    op.get(PSIZE), op.i32(1), op.i32Sub, op.i32Eq, op.set(PCONTIGUOUS),
    forLoop(PT, op.i32(0), op.get(PSIZE), 1, flat(
      address(PMEMBERS, op.get(PT), 2), op.i32Load, op.tee(PK), op.get(PJ), op.i32Ne, op.if,
      address(PW, flat(op.get(PK), op.get(PP), op.i32Mul)), op.set(PWK),
      address(PWK, op.get(PK)), op.f64Load, op.set(PWKK),
      address(PROW, op.get(PK)), op.f64Load, op.set(POLD),
      address(PS, flat(op.get(PK), op.get(PP), op.i32Mul, op.get(PJ), op.i32Add)), op.f64Load,
      address(PWB, op.get(PK)), op.f64Load, op.f64Sub,
      op.get(PWKK), op.get(POLD), op.f64Mul, op.f64Add, op.tee(PPARTIAL),
      op.f64Abs, op.get(PPENALTY), op.f64Sub, op.set(PEXCESS),
      // updated = excess > 0 ? ((partial > 0 ? 1 : −1) · excess) / w_kk : 0
      op.f64(1), op.f64(-1), op.get(PPARTIAL), op.f64(0), op.f64Gt, op.select,
      op.get(PEXCESS), op.f64Mul, op.get(PWKK), op.f64Div,
      op.f64(0), op.get(PEXCESS), op.f64(0), op.f64Gt, op.select, op.tee(PUPDATED),
      op.get(POLD), op.f64Ne, op.if,
      op.get(PUPDATED), op.f64(0), op.f64Eq, op.get(POLD), op.f64(0), op.f64Eq, op.i32Or, op.if,
      op.get(PFLAG), op.i32(1), op.i32Store,
      op.end,
      op.get(PUPDATED), op.get(POLD), op.f64Sub, op.set(PDELTA),
      address(PROW, op.get(PK)), op.get(PUPDATED), op.f64Store,
      op.get(PCONTIGUOUS), op.if,
      op.get(PWK), row(PFIRST), op.i32Add, op.set(PWROW),
      op.get(PWB), row(PFIRST), op.i32Add, op.set(PWBROW),
      op.get(PDELTA), op.f64x2Splat, op.set(PVD),
      forLoop(PU, op.i32(0), flat(op.get(PSIZE), op.i32(1), op.i32Sub), 2, flat(
        address(PWBROW, op.get(PU)), op.tee(PL), op.get(PL), op.v128Load,
        address(PWROW, op.get(PU)), op.v128Load, op.get(PVD), op.f64x2Mul, op.f64x2Add, op.v128Store,
      )),
      op.get(PU), op.get(PSIZE), op.i32LtS, op.if,
      address(PWBROW, op.get(PU)), op.tee(PL), op.get(PL), op.f64Load,
      address(PWROW, op.get(PU)), op.f64Load, op.get(PDELTA), op.f64Mul, op.f64Add, op.f64Store,
      op.end,
      op.else,
      forLoop(PU, op.i32(0), op.get(PSIZE), 1, flat(
        address(PMEMBERS, op.get(PU), 2), op.i32Load, op.i32(3), op.i32Shl, op.set(PL),
        op.get(PWB), op.get(PL), op.i32Add, op.tee(PWBROW), op.get(PWBROW), op.f64Load,
        op.get(PWK), op.get(PL), op.i32Add, op.f64Load, op.get(PDELTA), op.f64Mul, op.f64Add, op.f64Store,
      )),
      op.end,
      // step = |Δ| w_kk; largest = max
      op.get(PDELTA), op.f64Abs, op.get(PWKK), op.f64Mul, op.tee(PDELTA), op.get(PLARGEST), op.f64Gt, op.if,
      op.get(PDELTA), op.set(PLARGEST),
      op.end,
      op.end,
      op.end,
    )),
    op.get(PLARGEST),
    op.end,
  );
  const locals = [3, 10, 0x7f, 7, 0x7c, 1, 0x7b];
  return [...unsigned(locals.length + code.length), ...locals, ...code];
}

/**
 * The module: imports `env.memory`, exports `support` and `pass`.
 * @returns {Uint8Array} The WebAssembly binary.
 */
export function glassoSupportWasmBytes() {
  const i32 = 0x7f;
  const f64 = 0x7c;
  const params = [i32, i32, f64, i32, i32, i32, i32, i32, i32, i32, i32, i32, i32, i32, i32];
  const passParams = [i32, i32, f64, i32, i32, i32, i32, i32, i32, i32];
  const type = section(1, [2, 0x60, params.length, ...params, 1, i32, 0x60, passParams.length, ...passParams, 1, f64]);
  const imports = section(2, [1, ...name('env'), ...name('memory'), 0x02, 0x00, 1]);
  const functions = section(3, [2, 0, 1]);
  const exports = section(7, [2, ...name('support'), 0x00, 0, ...name('pass'), 0x00, 1]);
  const code = section(10, [2, ...supportBody(), ...passBody()]);
  return Uint8Array.from([...WASM_PREAMBLE, ...type, ...imports, ...functions, ...exports, ...code]);
}

if (import.meta.url === `file://${process.argv[1]}`) printWasmBytes(glassoSupportWasmBytes(), 'scripts/make-glasso-support-wasm.mjs', '    ');
