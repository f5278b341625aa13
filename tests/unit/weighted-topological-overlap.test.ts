import { describe, expect, it } from 'vitest';
import { ebicGlasso } from '../../src/lib/stats/ebic-glasso';
import { weightedTopologicalOverlap } from '../../src/lib/stats/weighted-topological-overlap';
import { squareMatrixFromRows } from '../../src/lib/stats/types';
import { largestDifference, networkFixture } from './local-dependence-fixtures';

describe('weightedTopologicalOverlap', () => {
  it.each(networkFixture.ebic.map((c) => [c.name, c] as const))('matches the R formula of Nowick et al. 2009 on the EBICglasso network of %s', (_name, reference) => {
    const network = squareMatrixFromRows(reference.tight.network);
    const before = Float64Array.from(network.data);
    // R 4.2.2: wto(EBICglasso(S, n, 0.5, ..., thr = 1e-12)$optnet), base-R formula in scripts/reference/local-dependence-network.R
    expect(largestDifference(weightedTopologicalOverlap(network), reference.tight.wto.value)).toBeLessThan(1e-14);
    expect(network.data).toEqual(before);
  });

  it('on the network this core estimates for psych::bfi, agrees with R to 1e-9 and flags N1/N2', () => {
    const reference = networkFixture.ebic.find((c) => c.name === 'bfi-25-pairwise-pearson')!;
    const wto = weightedTopologicalOverlap(ebicGlasso(squareMatrixFromRows(reference.input), reference.n).absoluteNetwork);
    // R 4.2.2: same wto() as above
    expect(largestDifference(wto, reference.tight.wto.value)).toBeLessThan(1e-9);
    // N1 "Get angry easily" / N2 "Get irritated easily" are columns 15 and 16 of psych::bfi: the
    // pair Christensen, Garrido & Golino (2023) use as their example of local dependence.
    expect(wto.data[15 * 25 + 16]).toBeGreaterThan(0.25);
  });

  it('follows the formula on a hand-worked three-node network', () => {
    // a12 = .5, a13 = .2, a23 = .4: k = (.7, .9, .6);
    // wTO12 = (.2·.4 + .5) / (min(.7, .9) + 1 − .5) = .58 / 1.2 (hand computation from the formula)
    const network = squareMatrixFromRows([
      [0, 0.5, -0.2],
      [0.5, 0, 0.4],
      [-0.2, 0.4, 0],
    ]);
    const wto = weightedTopologicalOverlap(network);
    expect(wto.data[1]).toBeCloseTo(0.58 / 1.2, 14);
    expect(wto.data[3]).toBeCloseTo(0.58 / 1.2, 14);
    expect(wto.data[2]).toBeCloseTo((0.5 * 0.4 + 0.2) / (0.6 + 1 - 0.2), 14);
    expect(wto.data[5]).toBeCloseTo((0.5 * 0.2 + 0.4) / (0.6 + 1 - 0.4), 14);
    expect([wto.data[0], wto.data[4], wto.data[8]]).toEqual([0, 0, 0]);
  });

  it('rejects weights outside [-1, 1] and asymmetric input', () => {
    expect(() => weightedTopologicalOverlap(squareMatrixFromRows([[0, 1.5], [1.5, 0]]))).toThrow(/must lie in \[-1, 1\]/);
    expect(() => weightedTopologicalOverlap(squareMatrixFromRows([[0, 0.5], [0.4, 0]]))).toThrow(/not symmetric/);
  });
});
