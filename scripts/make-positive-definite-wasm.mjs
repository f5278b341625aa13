/**
 * Assembles the WebAssembly module of the positive-definite kernels
 * (src/lib/stats/positive-definite-kernels.ts) from the readable listing below, and prints the
 * bytes to paste into that file. A unit test (tests/unit/positive-definite-kernels.test.ts)
 * checks that the bytes in the kernels module are the ones this listing gives.
 *
 * Matrices live in the imported memory, row-major, order n, stride n doubles; every address is a
 * byte offset. The exported functions, in WebAssembly text (WAT) terms:
 *   (func $cholesky (param $a i32) (param $n i32) (result i32))
 *     The upper Cholesky factor R (A = RᵀR) in place of the upper triangle of A (the strict lower
 *     triangle is neither read nor written); 1 when every pivot is positive, else 0 (the factor
 *     is then incomplete). Row b of R, one after another: each element R[b][a] (a ≥ b) starts
 *     from A[b][a] and receives its subtractions R[c][b]·R[c][a] for c = 0, 1, ..., b − 1 in
 *     that order, then the diagonal is the square root of what is left and the rest of the row is
 *     divided by it. Element by element these are the operations, in the same order, of the
 *     left-looking loop `s = A[i][j]; for (k < j) s -= L[i][k]·L[j][k]; L[i][j] = s / L[j][j]`
 *     with L = Rᵀ (a product of two doubles does not depend on the order of its operands).
 *   (func $invert (param $r i32) (param $out i32) (param $n i32) (param $lowerOnly i32))
 *     A⁻¹ = R⁻¹R⁻ᵀ from the factor: Y = L⁻¹ row by row (row i is e_i minus R[k][i] times row k
 *     of Y for k = 0 .. i − 1, then divided by R[i][i]), then X = L⁻ᵀY from the last row up
 *     (row i is row i of Y minus R[i][k] times row k of X for k = i + 1 .. n − 1, then divided by
 *     R[i][i]). With `lowerOnly` = 1 the backward pass does only the columns c ≤ i of row i: they
 *     need only the columns c ≤ i < k of the rows below, so the lower triangle (diagonal
 *     included) is the same as in the full inverse, in a third of the backward products; the
 *     strict upper triangle is left with the zeros of Y. Each element keeps its own subtractions in that order; the rows are done for all
 *     columns at once. In the forward pass, a chunk of columns starting at c0 skips the rows
 *     k < c0, whose entries there are zeros of Y; the rows c0 ≤ k < c inside a chunk add the
 *     product of a finite factor and a stored +0, which leaves a running sum unchanged (a sum here
 *     is never −0: x − y is −0 only for x = −0).
 *   (func $solve (param $r i32) (param $b i32) (param $x i32) (param $n i32))
 *     x = A⁻¹b from the factor: x_i = (b_i − Σ_{k<i} R[k][i]·x_k) / R[i][i] for i ascending, then
 *     x_i = (x_i − Σ_{k>i} R[i][k]·x_k) / R[i][i] for i descending, k ascending in both sums.
 *     `x` may be `b`.
 *   (func $scaledSquares (param $source i32) (param $target i32) (param $n i32) (param $scale f64))
 *     target[j][i] = (scale · source[i][j]) · source[i][j] for j ≤ i: the scaled squares of the
 *     lower triangle into the upper one (with source = M⁻¹, the Hessian of −scale·log det M in
 *     M's diagonal, where $cholesky reads it).
 * The first three are built on one internal function:
 *   (func $subtractProducts (param $target i32) (param $rows i32) (param $rowStride i32)
 *         (param $scalars i32) (param $scalarStride i32) (param $count i32) (param $width i32)
 *         (param $triangular i32))
 *     For each column c < width, target[c] −= scalars[t]·rows[t][c] for t = 0, 1, ..., count − 1
 *     in that order (rows[t] at rows + t·rowStride, scalars[t] at scalars + t·scalarStride).
 *     Columns are taken eight at a time in four f64x2 running sums held in registers, then the
 *     remaining 1-7 in one more pass (f64x2 pairs and, for an odd remainder, one f64); with
 *     `triangular` = 1 a chunk starting at column c0 begins at t = c0.
 * Every operation is one IEEE-754 double multiply, subtract, divide or square root (f64x2 lanes
 * are independent IEEE doubles; WebAssembly has no fused multiply-add), so each element is bit
 * for bit the one of the scalar loops.
 *
 * Usage: node scripts/make-positive-definite-wasm.mjs
 * References: WebAssembly Core Specification 2.0 (2022), §5 "Binary format" (the encoding) and
 * §4.3 (f64 and f64x2 arithmetic is IEEE-754); Golub & Van Loan 2013, "Matrix Computations",
 * 4th ed., §4.2 (Cholesky) and §3.1 (triangular systems).
 */

import { unsigned, signed, name, section, vector, WASM_PREAMBLE, printWasmBytes } from './wasm-binary.mjs';

const I32 = 0x7f;
const F64 = 0x7c;
const V128 = 0x7b;
const VOID = 0x40;

/** Little-endian bytes of a double. */
function f64Bytes(value) {
  return [...new Uint8Array(Float64Array.of(value).buffer)];
}

/**
 * A function under construction: named parameters and locals, and an `emit` that takes
 * instructions as byte arrays.
 */
function functionBuilder(parameters, locals) {
  const index = new Map();
  [...parameters, ...locals].forEach(([localName], position) => index.set(localName, position));
  const code = [];
  const local = (localName) => {
    const position = index.get(localName);
    if (position === undefined) throw new Error(`no local ${localName}`);
    return unsigned(position);
  };
  const op = {
    get: (localName) => [0x20, ...local(localName)],
    set: (localName) => [0x21, ...local(localName)],
    tee: (localName) => [0x22, ...local(localName)],
    i32: (value) => [0x41, ...signed(value)],
    f64: (value) => [0x44, ...f64Bytes(value)],
    call: (functionIndex) => [0x10, ...unsigned(functionIndex)],
    block: [0x02, VOID],
    loop: [0x03, VOID],
    if: [0x04, VOID],
    end: [0x0b],
    br: (depth) => [0x0c, ...unsigned(depth)],
    brIf: (depth) => [0x0d, ...unsigned(depth)],
    return: [0x0f],
    drop: [0x1a],
    select: [0x1b],
    i32Eqz: [0x45],
    i32Eq: [0x46],
    i32GeU: [0x4f],
    i32GtU: [0x4b],
    i32LtU: [0x49],
    i32LeU: [0x4d],
    i32Add: [0x6a],
    i32Sub: [0x6b],
    i32Mul: [0x6c],
    i32Shl: [0x74],
    f64Gt: [0x64],
    f64Load: [0x2b, 3, 0],
    f64LoadAt: (offset) => [0x2b, 3, ...unsigned(offset)],
    f64StoreAt: (offset) => [0x39, 3, ...unsigned(offset)],
    f64Store: [0x39, 3, 0],
    f64Sqrt: [0x9f],
    f64Sub: [0xa1],
    f64Mul: [0xa2],
    f64Div: [0xa3],
    // SIMD (prefix 0xFD); memarg = alignment exponent, offset.
    v128Load: (offset) => [0xfd, ...unsigned(0x00), 3, ...unsigned(offset)],
    v128Store: (offset) => [0xfd, ...unsigned(0x0b), 3, ...unsigned(offset)],
    loadSplat: [0xfd, ...unsigned(0x0a), 3, 0],
    f64x2Splat: [0xfd, ...unsigned(0x14)],
    f64x2Sub: [0xfd, ...unsigned(0xf1)],
    f64x2Mul: [0xfd, ...unsigned(0xf2)],
    f64x2Div: [0xfd, ...unsigned(0xf3)],
  };
  const emit = (...parts) => {
    for (const part of parts) code.push(...part);
  };
  const body = () => {
    // Local declarations, one run per local (the decoder accepts runs of 1).
    const declarations = locals.map(([, type]) => [1, type]);
    const content = [...vector(declarations), ...code, 0x0b];
    return [...unsigned(content.length), ...content];
  };
  const type = (results) => [0x60, ...vector(parameters.map(([, type]) => [type])), ...vector(results.map((result) => [result]))];
  return { op, emit, body, type };
}

// Function indices (no imported functions): the internal ones first.
const SUBTRACT_PRODUCTS = 0;
const DIVIDE_ROW = 1;
const CHOLESKY = 2;
const INVERT = 3;
const SOLVE = 4;
const SCALED_SQUARES = 5;

/** Columns per register chunk of $subtractProducts: CHUNK_PAIRS f64x2 running sums. */
const CHUNK_PAIRS = 4;

/** $subtractProducts: target[c] −= Σ_t scalars[t]·rows[t][c], t ascending, for c < width. */
function subtractProducts() {
  const sums = Array.from({ length: CHUNK_PAIRS }, (_, q) => [`sum${q}`, V128]);
  const f = functionBuilder(
    [['target', I32], ['rows', I32], ['rowStride', I32], ['scalars', I32], ['scalarStride', I32], ['count', I32], ['width', I32], ['triangular', I32]],
    [['column', I32], ['remainder', I32], ['first', I32], ['scalar', I32], ['end', I32], ['row', I32], ['place', I32], ['factor', V128], ['single', F64], ...sums],
  );
  const { op, emit } = f;
  // end = scalars + count · scalarStride (one past the last scalar)
  emit(op.get('scalars'), op.get('count'), op.get('scalarStride'), op.i32Mul, op.i32Add, op.set('end'));

  /**
   * One pass over a chunk of `pairs` f64x2 columns and `single` (0 or 1) scalar column after
   * them, starting at `column`: load the running sums from the target, subtract every row's
   * products in order, store them back, and advance `column`.
   */
  const chunk = (pairs, single) => {
    const columns = 2 * pairs + single;
    // place = target + 8·column; first = triangular · column
    emit(op.get('target'), op.get('column'), op.i32(3), op.i32Shl, op.i32Add, op.set('place'));
    emit(op.get('triangular'), op.get('column'), op.i32Mul, op.set('first'));
    for (let q = 0; q < pairs; q++) emit(op.get('place'), op.v128Load(16 * q), op.set(`sum${q}`));
    if (single) emit(op.get('place'), op.f64LoadAt(16 * pairs), op.set('single'));
    // scalar = scalars + first · scalarStride; row = rows + first · rowStride + 8 · column
    emit(op.get('scalars'), op.get('first'), op.get('scalarStride'), op.i32Mul, op.i32Add, op.set('scalar'));
    emit(op.get('rows'), op.get('first'), op.get('rowStride'), op.i32Mul, op.i32Add, op.get('column'), op.i32(3), op.i32Shl, op.i32Add, op.set('row'));
    // while (scalar < end) { sums −= scalars[t] · rows[t][column ..]; scalar += scalarStride; row += rowStride }
    emit(op.block, op.loop);
    emit(op.get('scalar'), op.get('end'), op.i32GeU, op.brIf(1));
    if (pairs > 0) emit(op.get('scalar'), op.loadSplat, op.set('factor'));
    for (let q = 0; q < pairs; q++) {
      emit(op.get(`sum${q}`), op.get('factor'), op.get('row'), op.v128Load(16 * q), op.f64x2Mul, op.f64x2Sub, op.set(`sum${q}`));
    }
    if (single) emit(op.get('single'), op.get('scalar'), op.f64LoadAt(0), op.get('row'), op.f64LoadAt(16 * pairs), op.f64Mul, op.f64Sub, op.set('single'));
    emit(op.get('scalar'), op.get('scalarStride'), op.i32Add, op.set('scalar'));
    emit(op.get('row'), op.get('rowStride'), op.i32Add, op.set('row'));
    emit(op.br(0), op.end, op.end);
    for (let q = 0; q < pairs; q++) emit(op.get('place'), op.get(`sum${q}`), op.v128Store(16 * q));
    if (single) emit(op.get('place'), op.get('single'), op.f64StoreAt(16 * pairs));
    emit(op.get('column'), op.i32(columns), op.i32Add, op.set('column'));
  };

  // while (column + 2·CHUNK_PAIRS ≤ width) a full chunk
  emit(op.block, op.loop);
  emit(op.get('column'), op.i32(2 * CHUNK_PAIRS), op.i32Add, op.get('width'), op.i32GtU, op.brIf(1));
  chunk(CHUNK_PAIRS, 0);
  emit(op.br(0), op.end, op.end);
  // the remaining 1 .. 2·CHUNK_PAIRS − 1 columns in one pass: pairs, then a single column if odd
  emit(op.get('width'), op.get('column'), op.i32Sub, op.set('remainder'));
  for (let remainder = 1; remainder < 2 * CHUNK_PAIRS; remainder++) {
    emit(op.get('remainder'), op.i32(remainder), op.i32Eq, op.if);
    chunk(remainder >> 1, remainder & 1);
    emit(op.end);
  }
  return f;
}

/** $divideRow(place, width, divisor): place[c] = place[c] / divisor for c < width. */
function divideRow() {
  const f = functionBuilder([['place', I32], ['width', I32], ['divisor', F64]], [['end', I32], ['divisors', V128]]);
  const { op, emit } = f;
  emit(op.get('divisor'), op.f64x2Splat, op.set('divisors'));
  emit(op.get('place'), op.get('width'), op.i32(3), op.i32Shl, op.i32Add, op.set('end'));
  // while (place + 16 ≤ end) a pair
  emit(op.block, op.loop);
  emit(op.get('place'), op.i32(16), op.i32Add, op.get('end'), op.i32GtU, op.brIf(1));
  emit(op.get('place'), op.get('place'), op.v128Load(0), op.get('divisors'), op.f64x2Div, op.v128Store(0));
  emit(op.get('place'), op.i32(16), op.i32Add, op.set('place'));
  emit(op.br(0), op.end, op.end);
  emit(op.get('place'), op.get('end'), op.i32LtU, op.if);
  emit(op.get('place'), op.get('place'), op.f64Load, op.get('divisor'), op.f64Div, op.f64Store);
  emit(op.end);
  return f;
}

/** $cholesky(a, n) → 1 when positive definite: the upper factor in place, row by row. */
function cholesky() {
  const f = functionBuilder([['a', I32], ['n', I32]], [['stride', I32], ['b', I32], ['diagonalPlace', I32], ['columnTop', I32], ['pivot', F64]]);
  const { op, emit } = f;
  emit(op.get('n'), op.i32(3), op.i32Shl, op.set('stride'));
  emit(op.block, op.loop);
  emit(op.get('b'), op.get('n'), op.i32GeU, op.brIf(1));
  // columnTop = a + 8b (R[0][b]); diagonalPlace = columnTop + b · stride (R[b][b])
  emit(op.get('a'), op.get('b'), op.i32(3), op.i32Shl, op.i32Add, op.tee('columnTop'));
  emit(op.get('b'), op.get('stride'), op.i32Mul, op.i32Add, op.set('diagonalPlace'));
  // R[b][b ..] −= Σ_{c<b} R[c][b] · R[c][b ..]
  emit(op.get('diagonalPlace'), op.get('columnTop'), op.get('stride'), op.get('columnTop'), op.get('stride'), op.get('b'));
  emit(op.get('n'), op.get('b'), op.i32Sub, op.i32(0), op.call(SUBTRACT_PRODUCTS));
  // if (!(pivot > 0)) return 0
  emit(op.get('diagonalPlace'), op.f64Load, op.tee('pivot'), op.f64(0), op.f64Gt, op.i32Eqz, op.if, op.i32(0), op.return, op.end);
  emit(op.get('diagonalPlace'), op.get('pivot'), op.f64Sqrt, op.tee('pivot'), op.f64Store);
  // R[b][b + 1 ..] /= R[b][b]
  emit(op.get('diagonalPlace'), op.i32(8), op.i32Add, op.get('n'), op.get('b'), op.i32Sub, op.i32(1), op.i32Sub, op.get('pivot'), op.call(DIVIDE_ROW));
  emit(op.get('b'), op.i32(1), op.i32Add, op.set('b'));
  emit(op.br(0), op.end, op.end);
  emit(op.i32(1));
  return f;
}

/** $invert(r, out, n): out = A⁻¹ from the upper factor R at r. */
function invert() {
  const f = functionBuilder([['r', I32], ['out', I32], ['n', I32], ['lowerOnly', I32]], [['stride', I32], ['i', I32], ['row', I32], ['place', I32], ['end', I32], ['width', I32]]);
  const { op, emit } = f;
  const diagonal = () => [...op.get('r'), ...op.get('i'), ...op.get('stride'), ...op.i32Mul, ...op.get('i'), ...op.i32(3), ...op.i32Shl, ...op.i32Add, ...op.i32Add, ...op.f64Load];
  emit(op.get('n'), op.i32(3), op.i32Shl, op.set('stride'));
  // Forward: for (i = 0; i < n; i++) row i of Y
  emit(op.block, op.loop);
  emit(op.get('i'), op.get('n'), op.i32GeU, op.brIf(1));
  emit(op.get('out'), op.get('i'), op.get('stride'), op.i32Mul, op.i32Add, op.tee('row'), op.set('place'));
  //   the row is e_i: zeros, then 1 at column i
  emit(op.get('row'), op.get('stride'), op.i32Add, op.set('end'));
  emit(op.block, op.loop);
  emit(op.get('place'), op.get('end'), op.i32GeU, op.brIf(1));
  emit(op.get('place'), op.f64(0), op.f64Store);
  emit(op.get('place'), op.i32(8), op.i32Add, op.set('place'));
  emit(op.br(0), op.end, op.end);
  emit(op.get('row'), op.get('i'), op.i32(3), op.i32Shl, op.i32Add, op.f64(1), op.f64Store);
  //   Y[i][c] −= Σ_{k<i} R[k][i] · Y[k][c] for c < i, a chunk at c0 from k = c0
  emit(op.get('row'), op.get('out'), op.get('stride'), op.get('r'), op.get('i'), op.i32(3), op.i32Shl, op.i32Add, op.get('stride'));
  emit(op.get('i'), op.get('i'), op.i32(1), op.call(SUBTRACT_PRODUCTS));
  //   Y[i][c] /= R[i][i] for c ≤ i
  emit(op.get('row'), op.get('i'), op.i32(1), op.i32Add, diagonal(), op.call(DIVIDE_ROW));
  emit(op.get('i'), op.i32(1), op.i32Add, op.set('i'));
  emit(op.br(0), op.end, op.end);
  // Backward: for (i = n − 1; i ≥ 0; i−−) row i of X; i counts down from n (unsigned test i > 0).
  emit(op.block, op.loop);
  emit(op.get('i'), op.i32Eqz, op.brIf(1));
  emit(op.get('i'), op.i32(1), op.i32Sub, op.set('i'));
  emit(op.get('out'), op.get('i'), op.get('stride'), op.i32Mul, op.i32Add, op.set('row'));
  //   width = lowerOnly ? i + 1 : n (the lower triangle of X needs only the lower triangle of the rows below)
  emit(op.get('i'), op.i32(1), op.i32Add, op.get('n'), op.get('lowerOnly'), op.select, op.set('width'));
  //   X[i][c] −= Σ_{k>i} R[i][k] · X[k][c] for c < width
  emit(op.get('row'), op.get('row'), op.get('stride'), op.i32Add, op.get('stride'));
  emit(op.get('r'), op.get('i'), op.get('stride'), op.i32Mul, op.i32Add, op.get('i'), op.i32(1), op.i32Add, op.i32(3), op.i32Shl, op.i32Add, op.i32(8));
  emit(op.get('n'), op.get('i'), op.i32Sub, op.i32(1), op.i32Sub, op.get('width'), op.i32(0), op.call(SUBTRACT_PRODUCTS));
  emit(op.get('row'), op.get('width'), diagonal(), op.call(DIVIDE_ROW));
  emit(op.br(0), op.end, op.end);
  return f;
}

/** $solve(r, b, x, n): x = A⁻¹b from the upper factor R at r. */
function solve() {
  const f = functionBuilder([['r', I32], ['b', I32], ['x', I32], ['n', I32]], [['stride', I32], ['i', I32], ['place', I32], ['diagonalPlace', I32]]);
  const { op, emit } = f;
  emit(op.get('n'), op.i32(3), op.i32Shl, op.set('stride'));
  // Forward: x_i = (b_i − Σ_{k<i} R[k][i] · x_k) / R[i][i]
  emit(op.block, op.loop);
  emit(op.get('i'), op.get('n'), op.i32GeU, op.brIf(1));
  emit(op.get('x'), op.get('i'), op.i32(3), op.i32Shl, op.i32Add, op.tee('place'));
  emit(op.get('b'), op.get('i'), op.i32(3), op.i32Shl, op.i32Add, op.f64Load, op.f64Store);
  emit(op.get('place'), op.get('x'), op.i32(8), op.get('r'), op.get('i'), op.i32(3), op.i32Shl, op.i32Add, op.get('stride'));
  emit(op.get('i'), op.i32(1), op.i32(0), op.call(SUBTRACT_PRODUCTS));
  emit(op.get('r'), op.get('i'), op.get('stride'), op.i32Mul, op.i32Add, op.get('i'), op.i32(3), op.i32Shl, op.i32Add, op.set('diagonalPlace'));
  emit(op.get('place'), op.i32(1), op.get('diagonalPlace'), op.f64Load, op.call(DIVIDE_ROW));
  emit(op.get('i'), op.i32(1), op.i32Add, op.set('i'));
  emit(op.br(0), op.end, op.end);
  // Backward: x_i = (x_i − Σ_{k>i} R[i][k] · x_k) / R[i][i], i from n − 1 down
  emit(op.block, op.loop);
  emit(op.get('i'), op.i32Eqz, op.brIf(1));
  emit(op.get('i'), op.i32(1), op.i32Sub, op.set('i'));
  emit(op.get('r'), op.get('i'), op.get('stride'), op.i32Mul, op.i32Add, op.get('i'), op.i32(3), op.i32Shl, op.i32Add, op.set('diagonalPlace'));
  emit(op.get('x'), op.get('i'), op.i32(3), op.i32Shl, op.i32Add, op.tee('place'));
  emit(op.get('place'), op.i32(8), op.i32Add, op.i32(8), op.get('diagonalPlace'), op.i32(8), op.i32Add, op.i32(8));
  emit(op.get('n'), op.get('i'), op.i32Sub, op.i32(1), op.i32Sub, op.i32(1), op.i32(0), op.call(SUBTRACT_PRODUCTS));
  emit(op.get('place'), op.i32(1), op.get('diagonalPlace'), op.f64Load, op.call(DIVIDE_ROW));
  emit(op.br(0), op.end, op.end);
  return f;
}

/** $scaledSquares(source, target, n, scale): target[j][i] = (scale · source[i][j]) · source[i][j] for j ≤ i. */
function scaledSquares() {
  const f = functionBuilder(
    [['source', I32], ['target', I32], ['n', I32], ['scale', F64]],
    [['stride', I32], ['i', I32], ['from', I32], ['to', I32], ['end', I32], ['value', F64]],
  );
  const { op, emit } = f;
  emit(op.get('n'), op.i32(3), op.i32Shl, op.set('stride'));
  emit(op.block, op.loop);
  emit(op.get('i'), op.get('n'), op.i32GeU, op.brIf(1));
  // from = source + i · stride (row i, j = 0); end = from + 8 (i + 1); to = target + 8i (column i, j = 0)
  emit(op.get('source'), op.get('i'), op.get('stride'), op.i32Mul, op.i32Add, op.tee('from'));
  emit(op.get('i'), op.i32(1), op.i32Add, op.i32(3), op.i32Shl, op.i32Add, op.set('end'));
  emit(op.get('target'), op.get('i'), op.i32(3), op.i32Shl, op.i32Add, op.set('to'));
  emit(op.block, op.loop);
  emit(op.get('from'), op.get('end'), op.i32GeU, op.brIf(1));
  emit(op.get('to'), op.get('scale'), op.get('from'), op.f64Load, op.tee('value'), op.f64Mul, op.get('value'), op.f64Mul, op.f64Store);
  emit(op.get('from'), op.i32(8), op.i32Add, op.set('from'));
  emit(op.get('to'), op.get('stride'), op.i32Add, op.set('to'));
  emit(op.br(0), op.end, op.end);
  emit(op.get('i'), op.i32(1), op.i32Add, op.set('i'));
  emit(op.br(0), op.end, op.end);
  return f;
}

/**
 * The module: imports `env.memory`, exports `cholesky`, `invert`, `solve` and `scaledSquares`.
 * @returns {Uint8Array} The WebAssembly binary.
 */
export function positiveDefiniteWasmBytes() {
  const functions = [
    [subtractProducts(), []],
    [divideRow(), []],
    [cholesky(), [I32]],
    [invert(), []],
    [solve(), []],
    [scaledSquares(), []],
  ];
  const type = section(1, vector(functions.map(([f, results]) => f.type(results))));
  const imports = section(2, vector([[...name('env'), ...name('memory'), 0x02, 0x00, 1]]));
  const declared = section(3, vector(functions.map((_, position) => unsigned(position))));
  const exported = [
    ['cholesky', CHOLESKY],
    ['invert', INVERT],
    ['solve', SOLVE],
    ['scaledSquares', SCALED_SQUARES],
  ];
  const exports = section(7, vector(exported.map(([exportName, position]) => [...name(exportName), 0x00, ...unsigned(position)])));
  const code = section(10, vector(functions.map(([f]) => f.body())));
  return Uint8Array.from([...WASM_PREAMBLE, ...type, ...imports, ...declared, ...exports, ...code]);
}

if (import.meta.url === `file://${process.argv[1]}`) printWasmBytes(positiveDefiniteWasmBytes(), 'scripts/make-positive-definite-wasm.mjs', '  ');
