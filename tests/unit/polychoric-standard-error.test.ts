/**
 * The standard error beside a polychoric / tetrachoric r: the two-step estimator's own (the
 * information in ρ with the thresholds fixed, Olsson 1979), checked against
 * polycor::polychor(x, y, std.err = TRUE, ML = FALSE), whose variance is the inverse of the
 * numerical Hessian of the same likelihood in ρ (optim, BFGS). Fixture:
 * scripts/reference/real-questionnaires.R → fixtures/reference/real-polychoric-se.json
 * (psych::bfi items with missing answers; psych::lsat6 0/1 items, i.e. tetrachoric).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { correlationMatrix, fisherZInterval, itemMatrixFromColumns, polychoricCorrelation, waldCorrelationInterval } from '../../src/lib/stats';

interface Pair { data: string; a: string; b: string; x: (number | null)[]; y: (number | null)[]; n: number; rho: number; se: number; call: string }
const fixture = JSON.parse(readFileSync(join(import.meta.dirname, '..', '..', 'fixtures', 'reference', 'real-polychoric-se.json'), 'utf8')) as { pairs: Pair[] };
const vector = (values: (number | null)[]) => Float64Array.from(values, (value) => value ?? Number.NaN);

describe('polychoric and tetrachoric standard errors against polycor 0.8.1', () => {
  for (const pair of fixture.pairs) {
    it(`${pair.data} ${pair.a}–${pair.b}`, () => {
      const result = polychoricCorrelation(vector(pair.x), vector(pair.y));
      // pair.call, e.g. polycor::polychor(bfi$A1, bfi$A2, std.err = TRUE, ML = FALSE); sqrt(fit$var)
      expect(result.n).toBe(pair.n);
      // rho: polycor::polychor(x, y, ML = FALSE) (optimise)
      expect(result.rho).toBeCloseTo(pair.rho, 4);
      // R's Hessian is a finite difference taken by optim; ours is analytic: agreement to 0.02% of the SE.
      expect(Math.abs((result.standardError as number) / pair.se - 1)).toBeLessThan(2e-4);
    });
  }

  it('the matrix carries the same standard errors, and the interval beside r uses them', () => {
    const pairs = fixture.pairs.filter((pair) => pair.data === 'lsat6');
    const first = pairs[0];
    const matrix = correlationMatrix(itemMatrixFromColumns([vector(first.x), vector(first.y)]), { method: 'polychoric', missing: 'pairwise' });
    expect(matrix.standardErrors?.data[1]).toBeCloseTo(polychoricCorrelation(vector(first.x), vector(first.y)).standardError as number, 12);
    // The Fisher-z interval assumes a Pearson r of bivariate normal data: 1/sqrt(n − 3) on the z scale.
    const fisher = fisherZInterval(first.rho, first.n);
    const wald = waldCorrelationInterval(first.rho, first.se);
    // polycor's SE for lsat6 Q1–Q2 is 0.0741 against Fisher's 0.0317 × (1 − r²): more than twice as wide.
    expect(wald.upper - wald.lower).toBeGreaterThan(2 * (fisher.upper - fisher.lower));
    expect(wald.lower).toBeLessThan(first.rho);
    expect(wald.upper).toBeGreaterThan(first.rho);
  });
});

describe('the engine puts the estimator interval beside a polychoric pair', () => {
  it('lsat6 Q1–Q2: se from the likelihood (polycor 0.0741), not Fisher z', async () => {
    const { computeEvidence } = await import('../../src/lib/engine/compute-evidence');
    const { pairEvidence } = await import('../../src/lib/engine/overlap-clusters');
    const screening = JSON.parse(readFileSync(join(import.meta.dirname, '..', '..', 'fixtures', 'reference', 'real-screening.json'), 'utf8')) as { lsat6: { items: string[]; rows: number[][] } };
    const { itemMatrixFromRows } = await import('../../src/lib/stats');
    const matrix = itemMatrixFromRows(screening.lsat6.rows);
    const items = screening.lsat6.items.map((id) => ({ id, scale: 'T', text: null, locked: false, min: 0, max: 1 }));
    const evidence = computeEvidence(matrix, items, { method: 'polychoric', missing: 'pairwise' });
    const pair = pairEvidence(evidence, items.map(() => items.map(() => null)), 0, 1, 0.95);
    const reference = fixture.pairs.find((entry) => entry.data === 'lsat6' && entry.a === 'Q1' && entry.b === 'Q2') as Pair;
    expect(pair.interval).toBe('estimator-se');
    // polycor::polychor(lsat6$Q1, lsat6$Q2, std.err = TRUE, ML = FALSE); sqrt(fit$var)
    expect(Math.abs((pair.se as number) / reference.se - 1)).toBeLessThan(2e-4);
    const expected = waldCorrelationInterval(pair.r, reference.se);
    expect(pair.lower).toBeCloseTo(expected.lower, 4);
    expect(pair.upper).toBeCloseTo(expected.upper, 4);
  });
});
