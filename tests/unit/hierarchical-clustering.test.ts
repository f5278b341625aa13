import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { hierarchicalClustering } from '../../src/lib/stats/hierarchical-clustering';
import { squareMatrixFromRows } from '../../src/lib/stats/types';

interface ClusterCase {
  call: string;
  dissimilarities: number[][];
  merge: [number, number][];
  height: number[];
  order: number[];
}
interface ClusterFixture {
  r_version: string;
  packages: Record<string, string>;
  cases: Record<string, ClusterCase>;
}
// Written by scripts/reference/hierarchical-clustering.R (R 4.2.2, psych 2.2.9).
const fixture = JSON.parse(readFileSync('fixtures/reference/hierarchical-clustering.json', 'utf8')) as ClusterFixture;

/** Merge heights agree with R to this (R's Fortran and this port do the same arithmetic in the same order). */
const HEIGHT_TOLERANCE = 1e-12;

describe('hierarchicalClustering (average linkage) against R', () => {
  for (const name of ['bfi', 'usarrests', 'ties', 'factor60']) {
    it(`matches hclust on the ${name} case: merges, heights and leaf order`, () => {
      const reference = fixture.cases[name];
      const input = squareMatrixFromRows(reference.dissimilarities);
      const frozen = Float64Array.from(input.data);
      const result = hierarchicalClustering(input);
      // R 4.2.2: <case>$call, e.g. hclust(as.dist(1 - abs(cor(psych::bfi[, 1:25], use = "pairwise.complete.obs"))), method = "average")$merge
      expect(result.merge).toEqual(reference.merge);
      // R 4.2.2: same call, $height
      expect(result.height.length).toBe(reference.height.length);
      result.height.forEach((h, i) => expect(Math.abs(h - reference.height[i]), `height ${i}`).toBeLessThan(HEIGHT_TOLERANCE * Math.max(1, reference.height[i])));
      // R 4.2.2: same call, $order (1-based; ours is 0-based)
      expect(result.order.map((i) => i + 1)).toEqual(reference.order);
      expect(input.data).toEqual(frozen);
    });
  }

  it('gives non-decreasing heights and a permutation as the order (average linkage is monotone)', () => {
    const result = hierarchicalClustering(squareMatrixFromRows(fixture.cases.factor60.dissimilarities));
    for (let i = 1; i < result.height.length; i++) expect(result.height[i]).toBeGreaterThanOrEqual(result.height[i - 1] - 1e-15);
    expect([...result.order].sort((a, b) => a - b)).toEqual(Array.from({ length: 60 }, (_, i) => i));
  });

  it('handles one and two objects', () => {
    expect(hierarchicalClustering(squareMatrixFromRows([[0]]))).toEqual({ merge: [], height: [], order: [0] });
    // By hand: two objects merge at their dissimilarity; R gives merge = (-1, -2), order = 1 2.
    expect(hierarchicalClustering(squareMatrixFromRows([[0, 0.3], [0.3, 0]]))).toEqual({ merge: [[-1, -2]], height: [0.3], order: [0, 1] });
  });

  it('refuses negative, non-finite and asymmetric input with the reason', () => {
    expect(() => hierarchicalClustering(squareMatrixFromRows([[0, -0.1], [-0.1, 0]]))).toThrow(/negative/);
    expect(() => hierarchicalClustering(squareMatrixFromRows([[0, Number.NaN], [Number.NaN, 0]]))).toThrow(/not finite/);
    expect(() => hierarchicalClustering(squareMatrixFromRows([[0, 0.2], [0.5, 0]]))).toThrow(/not symmetric/);
  });
});
