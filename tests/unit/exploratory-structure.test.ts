/**
 * The exploratory view's core: k-factor minres, oblimin rotation and omega hierarchical, against
 * fixtures/reference/exploratory-structure.json (scripts/reference/exploratory-structure.R;
 * R 4.x, psych 2.2.9, GPArotation 2022.10.2: the versions are in the fixture).
 * Rotation solutions are unique up to the order and sign of the factors: columns are aligned
 * before comparing.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { minresFactors } from '../../src/lib/stats/minres-factors';
import { obliminRotation } from '../../src/lib/stats/oblimin-rotation';
import { omegaHierarchical } from '../../src/lib/stats/omega-hierarchical';
import { squareMatrixFromRows } from '../../src/lib/stats/types';

interface Set {
  name: string; n: number; factors: number; items: string[];
  correlation: number[][]; unrotated: number[][];
  oblimin: { loadings: number[][]; phi: number[][] };
  faOblimin: { loadings: number[][]; phi: number[][] };
  omega: { omegaH: number; omegaTotal: number; g: number[] };
  slTight: { g: number[]; omegaH: number; omegaTotal: number; flipped: number[]; gFactorLoadings: number[] };
}
const fixture = JSON.parse(readFileSync('fixtures/reference/exploratory-structure.json', 'utf8')) as { sets: Set[] };

const flat = (rows: number[][]) => Float64Array.from(rows.flat());

/** For each reference column, our column (index and sign) that matches it best. */
function align(ours: Float64Array, reference: number[][], k: number): { column: number; sign: number }[] {
  const used = new Set<number>();
  return Array.from({ length: k }, (_, f) => {
    let best = { column: -1, sign: 1, distance: Infinity };
    for (let c = 0; c < k; c++) {
      if (used.has(c)) continue;
      for (const sign of [1, -1]) {
        let distance = 0;
        reference.forEach((row, i) => { distance += (sign * ours[i * k + c] - row[f]) ** 2; });
        if (distance < best.distance) best = { column: c, sign, distance };
      }
    }
    used.add(best.column);
    return best;
  });
}

function maxLoadingGap(ours: Float64Array, reference: number[][], k: number): number {
  const map = align(ours, reference, k);
  let gap = 0;
  reference.forEach((row, i) => row.forEach((value, f) => { gap = Math.max(gap, Math.abs(map[f].sign * ours[i * k + map[f].column] - value)); }));
  return gap;
}

function maxPhiGap(ours: Float64Array, loadings: Float64Array, reference: { loadings: number[][]; phi: number[][] }, k: number): number {
  const map = align(loadings, reference.loadings, k);
  let gap = 0;
  for (let a = 0; a < k; a++) for (let b = 0; b < k; b++) {
    const value = map[a].sign * map[b].sign * ours[map[a].column * k + map[b].column];
    gap = Math.max(gap, Math.abs(value - reference.phi[a][b]));
  }
  return gap;
}

describe.each(fixture.sets.map((set) => [set.name, set] as const))('exploratory structure on %s', (_name, set) => {
  const correlation = squareMatrixFromRows(set.correlation);
  const k = set.factors;
  const p = set.items.length;

  it('k-factor minres matches psych::fa(fm = "minres", rotate = "none") up to column signs', () => {
    const result = minresFactors(correlation, k);
    expect(result.converged).toBe(true);
    // R: psych::fa(R, nfactors = k, fm = "minres", rotate = "none")$loadings. psych stops its
    // L-BFGS-B search at a relative tolerance, so the agreement is to about 1e-4, not 1e-12.
    expect(maxLoadingGap(result.loadings, set.unrotated, k)).toBeLessThan(5e-4);
  });

  it('oblimin from R\'s own unrotated loadings matches GPArotation::oblimin to 1e-6', () => {
    const rotated = obliminRotation(flat(set.unrotated), p, k);
    expect(rotated.converged).toBe(true);
    // R: GPArotation::oblimin(unrotated, eps = 1e-8, maxit = 20000)$loadings and $Phi
    expect(maxLoadingGap(rotated.loadings, set.oblimin.loadings, k)).toBeLessThan(1e-6);
    expect(maxPhiGap(rotated.factorCorrelations, rotated.loadings, set.oblimin, k)).toBeLessThan(1e-6);
    // Identities: Φ has a unit diagonal; structure = Λ Φ.
    for (let f = 0; f < k; f++) expect(rotated.factorCorrelations[f * k + f]).toBeCloseTo(1, 12);
  });

  it('the whole chain (our minres, our oblimin) matches psych::fa(rotate = "oblimin") to 1e-3', () => {
    const result = minresFactors(correlation, k);
    const rotated = obliminRotation(result.loadings, p, k);
    expect(rotated.converged).toBe(true);
    // R: psych::fa(R, k, fm = "minres", rotate = "oblimin")$loadings, $Phi (psych's eps = 1e-5 and its minres tolerance)
    expect(maxLoadingGap(rotated.loadings, set.faOblimin.loadings, k)).toBeLessThan(1e-3);
    expect(maxPhiGap(rotated.factorCorrelations, rotated.loadings, set.faOblimin, k)).toBeLessThan(1e-3);
  });

  it('Schmid-Leiman omega hierarchical on the tight oblimin matches the R steps to 1e-6 and psych::omega to 1e-4', () => {
    const rotated = obliminRotation(flat(set.unrotated), p, k);
    const communalities = set.unrotated.map((row) => row.reduce((sum, value) => sum + value * value, 0));
    const omega = omegaHierarchical(correlation, rotated, communalities);
    // R: psych::schmid's steps on GPArotation::oblimin(unrotated, eps = 1e-8) (slTight in the fixture)
    expect(Math.abs(omega.omegaHierarchical - set.slTight.omegaH)).toBeLessThan(1e-6);
    expect(Math.abs(omega.omegaTotal - set.slTight.omegaTotal)).toBeLessThan(1e-6);
    expect(omega.flipped).toEqual(set.slTight.flipped);
    // The second-order loadings come from psych::fa(Phi, fm = "minres") with its optimizer's tolerance: 1e-5.
    omega.general.forEach((g, i) => expect(Math.abs(g - set.slTight.g[i])).toBeLessThan(1e-5));
    // R: psych::omega(R, nfactors = k, fm = "minres")$omega_h and $omega.tot (its oblimin stops at eps = 1e-5)
    expect(Math.abs(omega.omegaHierarchical - set.omega.omegaH)).toBeLessThan(1e-4);
    expect(Math.abs(omega.omegaTotal - set.omega.omegaTotal)).toBeLessThan(1e-4);
    if (k === 2) expect(omega.notices.map((notice) => notice.code)).toContain('two-factors');
  });
});

describe('input checks', () => {
  it('refuses a single factor and mismatched sizes', () => {
    expect(() => obliminRotation([1, 2, 3], 3, 1)).toThrow(RangeError);
    expect(() => obliminRotation([1, 2, 3], 2, 2)).toThrow(RangeError);
    expect(() => minresFactors(squareMatrixFromRows([[1, 0.5], [0.5, 1]]), 2)).toThrow(RangeError);
  });
});
