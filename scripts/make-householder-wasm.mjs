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
 * The rank-two update w[j][k] −= d[j]·e[k] + e[j]·d[k] for 0 <= j <= k < i, two columns k per
 * f64x2 (every element is its own result), a last odd column alone.
 *
 * Every operation is one IEEE-754 double multiply, add or subtract per lane (no fused
 * multiply-add, no reassociation), in the order of the JavaScript loop, so d, e and w come out
 * bit for bit the same.
 *
 * Usage: node scripts/make-householder-wasm.mjs
 * References: WebAssembly Core Specification 2.0 (2022), §5 "Binary format" (the encoding),
 * and the fixed-width SIMD proposal's opcode table (v128.load 0x00, v128.load64_splat 0x0a,
 * v128.store 0x0b, i8x16.shuffle 0x0d, f64x2.splat 0x14, f64x2.replace_lane 0x22, f64x2.add 0xf0,
 * f64x2.sub 0xf1, f64x2.mul 0xf2).
 */

/** Unsigned LEB128. */
function unsigned(value) {
  const bytes = [];
  do {
    let byte = value & 0x7f;
    value >>>= 7;
    if (value !== 0) byte |= 0x80;
    bytes.push(byte);
  } while (value !== 0);
  return bytes;
}

/** Signed LEB128 (small constants only). */
function signed(value) {
  const bytes = [];
  for (;;) {
    const byte = value & 0x7f;
    value >>= 7;
    if ((value === 0 && (byte & 0x40) === 0) || (value === -1 && (byte & 0x40) !== 0)) {
      bytes.push(byte);
      return bytes;
    }
    bytes.push(byte | 0x80);
  }
}

function name(text) {
  const bytes = [...Buffer.from(text, 'utf8')];
  return [...unsigned(bytes.length), ...bytes];
}

function section(id, content) {
  return [id, ...unsigned(content.length), ...content];
}

/** Byte indices of i8x16.shuffle: lane 0 of both operands, or lane 1 of both. */
const LOW_LANES = [0, 1, 2, 3, 4, 5, 6, 7, 16, 17, 18, 19, 20, 21, 22, 23];
const HIGH_LANES = [8, 9, 10, 11, 12, 13, 14, 15, 24, 25, 26, 27, 28, 29, 30, 31];

const op = {
  get: (index) => [0x20, ...unsigned(index)],
  set: (index) => [0x21, ...unsigned(index)],
  tee: (index) => [0x22, ...unsigned(index)],
  const: (value) => [0x41, ...signed(value)],
  add: [0x6a],
  sub: [0x6b],
  mul: [0x6c],
  shl: [0x74],
  eq: [0x46],
  gtU: [0x4b],
  geU: [0x4f],
  block: [0x02, 0x40],
  loop: [0x03, 0x40],
  if: [0x04, 0x40],
  br: (depth) => [0x0c, ...unsigned(depth)],
  brIf: (depth) => [0x0d, ...unsigned(depth)],
  end: [0x0b],
  // Scalar doubles; memarg = alignment exponent, offset.
  f64Load: (offset) => [0x2b, 3, ...unsigned(offset)],
  f64Store: (offset) => [0x39, 3, ...unsigned(offset)],
  f64Add: [0xa0],
  f64Sub: [0xa1],
  f64Mul: [0xa2],
  // SIMD (prefix 0xFD).
  load: (offset) => [0xfd, ...unsigned(0x00), 3, ...unsigned(offset)],
  loadSplat: (offset) => [0xfd, ...unsigned(0x0a), 3, ...unsigned(offset)],
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

/** $multiply: the pass e = A·u, blocks of four rows. */
function multiplyBody() {
  // i32 locals 5-15, f64 locals 16-25, v128 locals 26-39.
  const STRIDE = 5, J = 6, DJ = 7, EJ = 8, ROW = 9; // ROW .. ROW + 3: row j + r at column j, then k
  const PD = 13, PE = 14, END = 15;
  const F = 16; // F .. F + 3: d[j + r]
  const G = 20; // G .. G + 3: the corner's sums g_{j+r}
  const VALUE = 24, DK = 25;
  const SF = 26; // SF .. SF + 3: f64x2.splat(d[j + r])
  const G01 = 30, G23 = 31;
  const WV = 32; // WV .. WV + 3: w[j + r][k], w[j + r][k + 1]
  const DV = 36, EV = 37, P = 38, Q = 39;
  return body([[11, I32], [10, F64], [14, V128]], (emit) => {
    // stride = 8n; end = d + 8(i − 1) (the pairs run while k + 1 < i)
    emit(op.get(N), op.const(3), op.shl, op.set(STRIDE));
    emit(op.get(D), op.get(I), op.const(3), op.shl, op.add, op.const(8), op.sub, op.set(END));
    // for (j = 0; j + 3 < i; j += 4)   (j starts at 0: locals are zeroed; i < 4 runs nothing)
    emit(op.block, op.loop);
    emit(op.get(J), op.const(4), op.add, op.get(I), op.gtU, op.brIf(1));
    emit(op.get(D), op.get(J), op.const(3), op.shl, op.add, op.set(DJ));
    emit(op.get(E), op.get(J), op.const(3), op.shl, op.add, op.set(EJ));
    // row r at column j: w + (j + r)·stride + 8j
    emit(op.get(W), op.get(J), op.get(STRIDE), op.mul, op.add, op.get(J), op.const(3), op.shl, op.add, op.set(ROW));
    for (let r = 1; r < 4; r++) emit(op.get(ROW + r - 1), op.get(STRIDE), op.add, op.set(ROW + r));
    for (let r = 0; r < 4; r++) {
      emit(op.get(DJ), op.f64Load(8 * r), op.tee(F + r), op.splat, op.set(SF + r));
    }
    // The corner (k < j + 4), one row after the other:
    //   g_r = e[j + r] + w[j + r][j + r]·f_r; then for c > r: g_r += w[j + r][j + c]·d[j + c],
    //   e[j + c] += w[j + r][j + c]·f_r.
    for (let r = 0; r < 4; r++) {
      emit(op.get(EJ), op.f64Load(8 * r), op.get(ROW + r), op.f64Load(8 * r), op.get(F + r), op.f64Mul, op.f64Add, op.set(G + r));
      for (let c = r + 1; c < 4; c++) {
        emit(op.get(ROW + r), op.f64Load(8 * c), op.set(VALUE));
        emit(op.get(G + r), op.get(VALUE), op.get(DJ), op.f64Load(8 * c), op.f64Mul, op.f64Add, op.set(G + r));
        emit(op.get(EJ), op.get(EJ), op.f64Load(8 * c), op.get(VALUE), op.get(F + r), op.f64Mul, op.f64Add, op.f64Store(8 * c));
      }
    }
    // (g_j, g_{j+1}) and (g_{j+2}, g_{j+3}) as two f64x2
    emit(op.get(G), op.splat, op.get(G + 1), op.replaceLane(1), op.set(G01));
    emit(op.get(G + 2), op.splat, op.get(G + 3), op.replaceLane(1), op.set(G23));
    // k = j + 4
    for (let r = 0; r < 4; r++) emit(op.get(ROW + r), op.const(32), op.add, op.set(ROW + r));
    emit(op.get(DJ), op.const(32), op.add, op.set(PD));
    emit(op.get(EJ), op.const(32), op.add, op.set(PE));
    // while (k + 1 < i): columns k, k + 1
    emit(op.block, op.loop);
    emit(op.get(PD), op.get(END), op.geU, op.brIf(1));
    emit(op.get(PD), op.load(0), op.set(DV));
    for (let r = 0; r < 4; r++) emit(op.get(ROW + r), op.load(0), op.set(WV + r));
    //   (e[k], e[k + 1]) = (((e + w_j·f_j) + w_{j+1}·f_{j+1}) + w_{j+2}·f_{j+2}) + w_{j+3}·f_{j+3}
    emit(op.get(PE), op.load(0), op.set(EV));
    for (let r = 0; r < 4; r++) emit(op.get(EV), op.get(WV + r), op.get(SF + r), op.f64x2Mul, op.f64x2Add, op.set(EV));
    emit(op.get(PE), op.get(EV), op.store(0));
    //   rows (j, j + 1), then (j + 2, j + 3): g += w[·][k]·d[k], then g += w[·][k + 1]·d[k + 1]
    for (const [pair, first] of [[G01, 0], [G23, 2]]) {
      emit(op.get(WV + first), op.get(DV), op.f64x2Mul, op.set(P));
      emit(op.get(WV + first + 1), op.get(DV), op.f64x2Mul, op.set(Q));
      emit(op.get(pair), op.get(P), op.get(Q), op.shuffle(LOW_LANES), op.f64x2Add, op.set(pair));
      emit(op.get(pair), op.get(P), op.get(Q), op.shuffle(HIGH_LANES), op.f64x2Add, op.set(pair));
    }
    for (let r = 0; r < 4; r++) emit(op.get(ROW + r), op.const(16), op.add, op.set(ROW + r));
    emit(op.get(PD), op.const(16), op.add, op.set(PD));
    emit(op.get(PE), op.const(16), op.add, op.set(PE));
    emit(op.br(0), op.end, op.end);
    // if (k === i − 1): the last column alone
    emit(op.get(PD), op.get(END), op.eq, op.if);
    emit(op.get(PD), op.f64Load(0), op.set(DK));
    emit(op.get(PE), op.get(PE), op.f64Load(0));
    for (let r = 0; r < 4; r++) emit(op.get(ROW + r), op.f64Load(0), op.get(F + r), op.f64Mul, op.f64Add);
    emit(op.f64Store(0));
    for (const [pair, first] of [[G01, 0], [G23, 2]]) {
      emit(op.get(pair));
      emit(op.get(ROW + first), op.f64Load(0), op.splat, op.get(ROW + first + 1), op.f64Load(0), op.replaceLane(1));
      emit(op.get(DK), op.splat, op.f64x2Mul, op.f64x2Add, op.set(pair));
    }
    emit(op.end);
    // e[j .. j + 3] = g
    emit(op.get(EJ), op.get(G01), op.store(0));
    emit(op.get(EJ), op.get(G23), op.store(16));
    emit(op.get(J), op.const(4), op.add, op.set(J));
    emit(op.br(0), op.end, op.end);
  });
}

/** $update: the rank-two update, one row at a time, two columns per f64x2. */
function updateBody() {
  // i32 locals 5-11, f64 locals 12-13, v128 locals 14-15.
  const STRIDE = 5, J = 6, PW = 7, PD = 8, PE = 9, END = 10, ROW = 11;
  const F = 12, G = 13;
  const SF = 14, SG = 15;
  return body([[7, I32], [2, F64], [2, V128]], (emit) => {
    emit(op.get(N), op.const(3), op.shl, op.set(STRIDE));
    emit(op.get(D), op.get(I), op.const(3), op.shl, op.add, op.const(8), op.sub, op.set(END));
    // for (j = 0; j < i; j++); row j starts at column j
    emit(op.get(W), op.set(ROW));
    emit(op.block, op.loop);
    emit(op.get(J), op.get(I), op.geU, op.brIf(1));
    emit(op.get(ROW), op.get(J), op.const(3), op.shl, op.add, op.set(PW));
    emit(op.get(D), op.get(J), op.const(3), op.shl, op.add, op.tee(PD), op.f64Load(0), op.tee(F), op.splat, op.set(SF));
    emit(op.get(E), op.get(J), op.const(3), op.shl, op.add, op.tee(PE), op.f64Load(0), op.tee(G), op.splat, op.set(SG));
    // while (k + 1 < i): w[j][k .. k + 1] −= f·e[k .. k + 1] + g·d[k .. k + 1]
    emit(op.block, op.loop);
    emit(op.get(PD), op.get(END), op.geU, op.brIf(1));
    emit(op.get(PW), op.get(PW), op.load(0));
    emit(op.get(SF), op.get(PE), op.load(0), op.f64x2Mul, op.get(SG), op.get(PD), op.load(0), op.f64x2Mul, op.f64x2Add);
    emit(op.f64x2Sub, op.store(0));
    emit(op.get(PW), op.const(16), op.add, op.set(PW));
    emit(op.get(PD), op.const(16), op.add, op.set(PD));
    emit(op.get(PE), op.const(16), op.add, op.set(PE));
    emit(op.br(0), op.end, op.end);
    // if (k === i − 1): the last column alone
    emit(op.get(PD), op.get(END), op.eq, op.if);
    emit(op.get(PW), op.get(PW), op.f64Load(0));
    emit(op.get(F), op.get(PE), op.f64Load(0), op.f64Mul, op.get(G), op.get(PD), op.f64Load(0), op.f64Mul, op.f64Add);
    emit(op.f64Sub, op.f64Store(0));
    emit(op.end);
    emit(op.get(ROW), op.get(STRIDE), op.add, op.set(ROW));
    emit(op.get(J), op.const(1), op.add, op.set(J));
    emit(op.br(0), op.end, op.end);
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
  return Uint8Array.from([0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00, ...type, ...imports, ...functions, ...exports, ...code]);
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const bytes = householderWasmBytes();
  const lines = [];
  for (let start = 0; start < bytes.length; start += 32) lines.push(`  ${Array.from(bytes.subarray(start, start + 32)).join(', ')},`);
  console.log(`// ${bytes.length} bytes from scripts/make-householder-wasm.mjs\n${lines.join('\n')}`);
}
