import { describe, expect, it } from 'vitest';
import { PLANE_ROTATIONS_WASM, PlaneRotationBatch } from '../../src/lib/stats/plane-rotations-kernel';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { planeRotationsWasmBytes } from '../../scripts/make-plane-rotations-wasm.mjs';

interface Sweep {
  readonly top: number;
  readonly rotations: readonly (readonly [number, number])[];
}

/** Seeded sweeps as tql2 makes them: rows top .. bottom, c² + s² = 1 up to rounding. */
function randomSweeps(order: number, count: number, seed: number): Sweep[] {
  const random = createSeededRandom(seed);
  const sweeps: Sweep[] = [];
  for (let t = 0; t < count; t++) {
    const bottom = Math.floor(random.next() * (order - 1));
    const top = bottom + Math.floor(random.next() * (order - 1 - bottom));
    const rotations: (readonly [number, number])[] = [];
    for (let i = top; i >= bottom; i--) {
      const angle = 2 * Math.PI * random.next();
      rotations.push([Math.cos(angle), Math.sin(angle)]);
    }
    sweeps.push({ top, rotations });
  }
  return sweeps;
}

/** The JavaScript loop of tql2, verbatim. */
function rotateInJavaScript(w: Float64Array, n: number, sweeps: readonly Sweep[]): void {
  for (const { top, rotations } of sweeps) {
    rotations.forEach(([c, s], step) => {
      const i = top - step;
      const upper = (i + 1) * n;
      const lower = i * n;
      for (let k = 0; k < n; k++) {
        const value = w[upper + k];
        w[upper + k] = s * w[lower + k] + c * value;
        w[lower + k] = c * w[lower + k] - s * value;
      }
    });
  }
}

function rotateInWebAssembly(w: Float64Array, n: number, sweeps: readonly Sweep[]): void {
  const batch = new PlaneRotationBatch(w, n);
  for (const { top, rotations } of sweeps) {
    batch.startSweep(top, rotations.length);
    for (const [c, s] of rotations) batch.add(c, s);
  }
  batch.finish();
}

function randomRows(n: number, seed: number): Float64Array {
  const random = createSeededRandom(seed);
  return Float64Array.from({ length: n * n }, () => random.nextNormal());
}

function differing(a: Float64Array, b: Float64Array): number[] {
  const indices: number[] = [];
  for (let index = 0; index < a.length; index++) if (!Object.is(a[index], b[index])) indices.push(index);
  return indices;
}

describe('PlaneRotationBatch: the QL rotations in WebAssembly SIMD', () => {
  it('gives bit for bit the rows of the JavaScript loop, for orders around the eight-column passes', () => {
    // Orders in a mixed sequence (large, small, large): the memory grows and the padding of an
    // earlier, wider order must not leak into the rows.
    for (const n of [2, 3, 7, 8, 9, 15, 16, 17, 40, 101, 5, 130, 12]) {
      const start = randomRows(n, 10 * n);
      const sweeps = randomSweeps(n, 3 * n, 20 * n);
      const expected = Float64Array.from(start);
      rotateInJavaScript(expected, n, sweeps);
      const actual = Float64Array.from(start);
      rotateInWebAssembly(actual, n, sweeps);
      expect(differing(actual, expected), `order ${n}`).toEqual([]);
      // The rotations did change the rows (the comparison is not of untouched input).
      expect(differing(actual, start).length, `order ${n}`).toBeGreaterThan(n);
    }
  });

  it('applies a full buffer and carries on in order (more rotations than one buffer holds)', () => {
    const n = 60;
    const sweeps = randomSweeps(n, 400, 7); // about 8,000 rotations, the buffer holds 4,096
    expect(sweeps.reduce((total, sweep) => total + sweep.rotations.length, 0)).toBeGreaterThan(4096);
    const expected = randomRows(n, 8);
    const actual = Float64Array.from(expected);
    rotateInJavaScript(expected, n, sweeps);
    rotateInWebAssembly(actual, n, sweeps);
    expect(differing(actual, expected)).toEqual([]);
  });

  it('differs from the loop when the rotations are applied in another order (the comparison can fail)', () => {
    const n = 24;
    const sweeps = randomSweeps(n, 40, 9);
    const expected = randomRows(n, 10);
    const actual = Float64Array.from(expected);
    rotateInJavaScript(expected, n, sweeps);
    rotateInWebAssembly(actual, n, [...sweeps].reverse());
    expect(differing(actual, expected).length).toBeGreaterThan(0);
  });

  it('leaves the rows untouched until finish, and refuses an order below 2 or a wrong length', () => {
    const rows = randomRows(9, 3);
    const before = Float64Array.from(rows);
    const batch = new PlaneRotationBatch(rows, 9);
    batch.startSweep(4, 1);
    batch.add(0, 1);
    expect(differing(rows, before)).toEqual([]);
    batch.finish();
    // c = 0, s = 1 swaps rows 4 and 5 with one sign change: row 5 ← row 4, row 4 ← −row 5.
    for (let k = 0; k < 9; k++) {
      expect(rows[5 * 9 + k]).toBe(before[4 * 9 + k]);
      expect(rows[4 * 9 + k]).toBe(-before[5 * 9 + k]);
    }
    expect(() => new PlaneRotationBatch(new Float64Array(1), 1)).toThrow(/order >= 2/);
    expect(() => new PlaneRotationBatch(new Float64Array(5), 2)).toThrow(/got order 2 and 5 values/);
  });

  it('holds the WebAssembly bytes that scripts/make-plane-rotations-wasm.mjs assembles from its listing', () => {
    expect(Array.from(PLANE_ROTATIONS_WASM)).toEqual(Array.from(planeRotationsWasmBytes()));
    expect(WebAssembly.validate(PLANE_ROTATIONS_WASM)).toBe(true);
  });
});
