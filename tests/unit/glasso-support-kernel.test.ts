import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { glassoSupportMemory, lassoPassKernel, solveOnSupportKernel } from '../../src/lib/stats/glasso-support-kernel';
import { createSeededRandom, type SeededRandomGenerator } from '../../src/lib/stats/seeded-random';
import { glassoSupportWasmBytes } from '../../scripts/make-glasso-support-wasm.mjs';

/**
 * The JavaScript `solveOnSupport` that the kernel replaced (graphical-lasso.ts before the
 * kernel), kept verbatim as the reference: row-by-row (left-looking) Cholesky, row-major factor.
 */
function referenceSolveOnSupport(
  j: number,
  p: number,
  penalty: number,
  s: Float64Array,
  w: Float64Array,
  beta: Float64Array,
  wb: Float64Array,
  blockMembers: Int32Array,
): number {
  const row = j * p;
  const size = blockMembers.length;
  const active = new Int32Array(p);
  const factor = new Float64Array(p * p);
  const solution = new Float64Array(p);
  const activeSigns = new Float64Array(p);
  let count = 0;
  for (let t = 0; t < size; t++) {
    const k = blockMembers[t];
    if (k !== j && beta[row + k] !== 0) active[count++] = k;
  }
  if (count === 0) return 0;
  for (let a = 0; a < count; a++) {
    const ka = active[a] * p;
    for (let b = 0; b <= a; b++) {
      let sum = w[ka + active[b]];
      for (let c = 0; c < b; c++) sum -= factor[a * count + c] * factor[b * count + c];
      if (a === b) {
        if (!(sum > 0)) return 0;
        factor[a * count + a] = Math.sqrt(sum);
      } else {
        factor[a * count + b] = sum / factor[b * count + b];
      }
    }
    const sign = beta[row + active[a]] > 0 ? 1 : -1;
    activeSigns[a] = sign;
    solution[a] = s[ka + j] - penalty * sign;
  }
  for (let a = 0; a < count; a++) {
    let sum = solution[a];
    for (let c = 0; c < a; c++) sum -= factor[a * count + c] * solution[c];
    solution[a] = sum / factor[a * count + a];
  }
  for (let a = count - 1; a >= 0; a--) {
    let sum = solution[a];
    for (let c = a + 1; c < count; c++) sum -= factor[c * count + a] * solution[c];
    solution[a] = sum / factor[a * count + a];
  }
  for (let a = 0; a < count; a++) if (!(solution[a] * activeSigns[a] > 0)) return 0;
  for (let a = 0; a < count; a++) beta[row + active[a]] = solution[a];
  let optimal = true;
  for (let t = 0; t < size; t++) {
    const k = blockMembers[t];
    if (k === j) continue;
    const wk = k * p;
    let sum = 0;
    for (let a = 0; a < count; a++) sum += w[wk + active[a]] * solution[a];
    wb[k] = sum;
    if (beta[row + k] === 0) {
      const partial = s[wk + j] - sum;
      if (Math.abs(partial) > penalty) optimal = false;
    }
  }
  return optimal ? 2 : 1;
}

/** The JavaScript `lassoPass` that the kernel replaced, verbatim but for returning the support flag. */
function referenceLassoPass(
  j: number,
  p: number,
  penalty: number,
  s: Float64Array,
  w: Float64Array,
  beta: Float64Array,
  wb: Float64Array,
  blockMembers: Int32Array,
): { largestStep: number; supportChanged: boolean } {
  const row = j * p;
  const size = blockMembers.length;
  let supportChanged = false;
  let largestStep = 0;
  for (let index = 0; index < size; index++) {
    const k = blockMembers[index];
    if (k === j) continue;
    const wk = k * p;
    const wkk = w[wk + k];
    const old = beta[row + k];
    const partial = s[wk + j] - wb[k] + wkk * old;
    const excess = Math.abs(partial) - penalty;
    const updated = excess > 0 ? ((partial > 0 ? 1 : -1) * excess) / wkk : 0;
    if (updated !== old) {
      if (updated === 0 || old === 0) supportChanged = true;
      const delta = updated - old;
      beta[row + k] = updated;
      for (let t = 0; t < size; t++) {
        const l = blockMembers[t];
        wb[l] += w[wk + l] * delta;
      }
      const step = Math.abs(delta) * wkk;
      if (step > largestStep) largestStep = step;
    }
  }
  return { largestStep, supportChanged };
}

interface Problem {
  readonly p: number;
  readonly j: number;
  readonly penalty: number;
  readonly members: Int32Array;
  readonly s: Float64Array;
  readonly w: Float64Array;
  readonly beta: Float64Array;
  readonly wb: Float64Array;
}

/**
 * A column's active-set problem. W = B Bᵀ / m + a ridge, then every element perturbed on its
 * own (so W is not symmetric and a transposed read would show); `kind` decides the rest:
 * 'face': s_Aj = W_AA β* + ρ σ for a β* of signs σ, so the face is taken (and optimal unless
 * some s_kj off the support is pushed past ρ); 'random': random signs and s (mostly not taken);
 * 'indefinite': W_AA with a negative direction (a pivot ≤ 0).
 */
function makeProblem(random: SeededRandomGenerator, kind: 'face' | 'random' | 'indefinite', p: number, supportShare: number): Problem {
  const members = Int32Array.from({ length: p }, (_, k) => k).filter(() => random.next() < 0.85);
  const block = members.length >= 2 ? members : Int32Array.of(0, 1);
  const j = block[random.nextInt(block.length)];
  const m = p + 3;
  const factor = Float64Array.from({ length: p * m }, () => random.nextNormal());
  const w = new Float64Array(p * p);
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < p; b++) {
      let sum = 0;
      for (let c = 0; c < m; c++) sum += factor[a * m + c] * factor[b * m + c];
      w[a * p + b] = sum / m + (a === b ? 0.3 : 0) + 1e-3 * random.nextNormal();
    }
  }
  if (kind === 'indefinite') for (let a = 0; a < p; a++) w[a * p + a] -= 2 + random.next();
  const penalty = 0.01 + 0.3 * random.next();
  const s = Float64Array.from({ length: p * p }, () => 0.6 * random.nextNormal());
  const beta = new Float64Array(p * p);
  const row = j * p;
  const support: number[] = [];
  for (const k of block) if (k !== j && random.next() < supportShare) support.push(k);
  const target = new Float64Array(p);
  for (const k of support) target[k] = (random.next() < 0.5 ? -1 : 1) * (0.05 + 0.5 * random.next());
  for (const k of support) beta[row + k] = kind === 'random' ? random.nextNormal() : Math.sign(target[k]) * random.next();
  if (kind === 'face') {
    const pushOut = random.next() < 0.5;
    for (const k of block) {
      if (k === j) continue;
      let sum = 0;
      for (const l of support) sum += w[k * p + l] * target[l];
      s[k * p + j] = support.includes(k) ? sum + penalty * Math.sign(target[k]) : sum + penalty * (pushOut && random.next() < 0.2 ? 1.5 : 0.9) * (2 * random.next() - 1);
    }
  }
  if (random.next() < 0.1 && support.length > 0) beta[row + support[0]] = -0; // −0 is off the support
  const wb = Float64Array.from({ length: p }, () => random.nextNormal());
  return { p, j, penalty, members: block, s, w, beta, wb };
}

/** The problem with W's lower triangle set to its upper one, and its block a run of items containing j. */
function symmetricRun(problem: Problem, random: SeededRandomGenerator): Problem {
  const { p, j } = problem;
  const w = Float64Array.from(problem.w);
  for (let a = 0; a < p; a++) for (let b = 0; b < a; b++) w[a * p + b] = w[b * p + a];
  const first = random.nextInt(j + 1);
  const last = j + random.nextInt(p - j);
  const members = Int32Array.from({ length: last - first + 1 }, (_, index) => first + index);
  return { ...problem, w, members: members.length >= 2 ? members : Int32Array.of(0, 1) };
}

function differing(actual: Float64Array, expected: Float64Array): number[] {
  const indices: number[] = [];
  for (let index = 0; index < expected.length; index++) if (!Object.is(actual[index], expected[index])) indices.push(index);
  return indices;
}

describe('solveOnSupportKernel', () => {
  it('holds the WebAssembly bytes that scripts/make-glasso-support-wasm.mjs assembles from its listing', () => {
    const source = readFileSync(new URL('../../src/lib/stats/glasso-support-kernel.ts', import.meta.url), 'utf8');
    const literal = /const WASM = Uint8Array\.of\(([\d,\s]+)\)/.exec(source);
    expect(literal).not.toBeNull();
    const embedded = (literal?.[1] ?? '').split(',').map((text) => text.trim()).filter((text) => text !== '').map(Number);
    expect(embedded).toEqual(Array.from(glassoSupportWasmBytes()));
    expect(WebAssembly.validate(Uint8Array.from(embedded))).toBe(true);
    // Small enough for a synchronous compile on a browser page's main thread (4 KB).
    expect(embedded.length).toBeLessThan(4096);
  });

  it('gives bit for bit the outcome, β and wb of the former JavaScript on random problems', () => {
    const random = createSeededRandom(20261203);
    const outcomes = [0, 0, 0];
    const kinds = ['face', 'face', 'random', 'indefinite'] as const;
    for (let trial = 0; trial < 600; trial++) {
      const kind = kinds[trial % kinds.length];
      // Orders 2-41 (odd and even active sets, the odd row of each two-row step), a few large.
      const p = trial % 50 === 7 ? 100 + random.nextInt(30) : 2 + random.nextInt(40);
      const made = makeProblem(random, kind, p, [0.2, 0.5, 0.9, 1][trial % 4]);
      // Every third trial: W made exactly symmetric and the block a run of items, where the
      // kernel may sum wb along rows of W.
      const symmetric = trial % 3 === 1;
      const problem = symmetric ? symmetricRun(made, random) : made;
      const beta = Float64Array.from(problem.beta);
      const wb = Float64Array.from(problem.wb);
      const expected = referenceSolveOnSupport(problem.j, p, problem.penalty, problem.s, problem.w, beta, wb, problem.members);

      const memory = glassoSupportMemory(p);
      memory.s.set(problem.s);
      memory.w.set(problem.w);
      memory.beta.set(problem.beta);
      memory.wb.set(problem.wb);
      memory.members.fill(-1).set(problem.members);
      const outcome = solveOnSupportKernel(memory, problem.j, problem.penalty, memory.members.subarray(0, problem.members.length), symmetric);
      expect(outcome, `trial ${trial}`).toBe(expected);
      expect(differing(memory.beta, beta), `trial ${trial}`).toEqual([]);
      expect(differing(memory.wb, wb), `trial ${trial}`).toEqual([]);
      expect(differing(memory.w, problem.w)).toEqual([]);
      expect(differing(memory.s, problem.s)).toEqual([]);
      outcomes[outcome]++;
    }
    // Every outcome met many times: not taken, taken, and taken as the solution.
    expect(Math.min(...outcomes)).toBeGreaterThan(60);
  });

  it('reads a block that is a later part of the members list, and leaves the rest of wb alone', () => {
    const random = createSeededRandom(7);
    const problem = makeProblem(random, 'face', 12, 0.6);
    const p = problem.p;
    const beta = Float64Array.from(problem.beta);
    const wb = Float64Array.from(problem.wb);
    const expected = referenceSolveOnSupport(problem.j, p, problem.penalty, problem.s, problem.w, beta, wb, problem.members);
    expect(expected).toBeGreaterThan(0);
    const memory = glassoSupportMemory(p);
    memory.s.set(problem.s);
    memory.w.set(problem.w);
    memory.beta.set(problem.beta);
    memory.wb.set(problem.wb);
    const first = p - problem.members.length;
    memory.members.fill(-1).set(problem.members, first);
    expect(solveOnSupportKernel(memory, problem.j, problem.penalty, memory.members.subarray(first), false)).toBe(expected);
    expect(differing(memory.beta, beta)).toEqual([]);
    expect(differing(memory.wb, wb)).toEqual([]);
  });

  it('runs coordinate-descent passes bit for bit as the former JavaScript, on runs of items and on scattered blocks', () => {
    const random = createSeededRandom(314159);
    let changedPasses = 0;
    let quietPasses = 0;
    for (let trial = 0; trial < 300; trial++) {
      const p = 2 + random.nextInt(45);
      const problem = makeProblem(random, trial % 3 === 2 ? 'random' : 'face', p, [0.1, 0.4, 0.8][trial % 3]);
      // A run of consecutive items (the usual single block) in two of three trials.
      const first = random.nextInt(p - 1);
      const run = Int32Array.from({ length: 2 + random.nextInt(p - 1 - first) }, (_, index) => first + index);
      const members = trial % 3 === 0 ? problem.members : run;
      const j = members[random.nextInt(members.length)];
      const beta = Float64Array.from(problem.beta);
      const wb = Float64Array.from(problem.wb);
      const memory = glassoSupportMemory(p);
      memory.s.set(problem.s);
      memory.w.set(problem.w);
      memory.beta.set(problem.beta);
      memory.wb.set(problem.wb);
      memory.members.fill(-1).set(members);
      const block = memory.members.subarray(0, members.length);
      for (let pass = 0; pass < 4; pass++) {
        const expected = referenceLassoPass(j, p, problem.penalty, problem.s, problem.w, beta, wb, members);
        memory.supportChanged[0] = 7;
        const largest = lassoPassKernel(memory, j, problem.penalty, block);
        expect(Object.is(largest, expected.largestStep), `trial ${trial} pass ${pass}`).toBe(true);
        expect(memory.supportChanged[0], `trial ${trial} pass ${pass}`).toBe(expected.supportChanged ? 1 : 0);
        expect(differing(memory.beta, beta), `trial ${trial} pass ${pass}`).toEqual([]);
        expect(differing(memory.wb, wb), `trial ${trial} pass ${pass}`).toEqual([]);
        if (expected.supportChanged) changedPasses++;
        else quietPasses++;
      }
    }
    expect(Math.min(changedPasses, quietPasses)).toBeGreaterThan(100);
  });

  it('takes the row-wise sums only when told that W is symmetric (on a W that is not, they differ)', () => {
    const random = createSeededRandom(99);
    let differ = 0;
    for (let trial = 0; trial < 40; trial++) {
      const problem = makeProblem(random, 'face', 10 + random.nextInt(20), 0.5);
      const run = Int32Array.from({ length: problem.p }, (_, index) => index);
      const memory = glassoSupportMemory(problem.p);
      const results = [false, true].map((symmetric) => {
        memory.s.set(problem.s);
        memory.w.set(problem.w);
        memory.beta.set(problem.beta);
        memory.wb.set(problem.wb);
        memory.members.set(run);
        const outcome = solveOnSupportKernel(memory, problem.j, problem.penalty, memory.members.subarray(0, problem.p), symmetric);
        return { outcome, wb: Float64Array.from(memory.wb) };
      });
      if (results[0].outcome > 0 && differing(results[1].wb, results[0].wb).length > 0) differ++;
    }
    expect(differ).toBeGreaterThan(10);
  });
});
