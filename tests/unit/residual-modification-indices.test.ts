import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { residualModificationIndices } from '../../src/lib/stats/residual-modification-indices';

// Fixture: scripts/reference/residual-modification-indices.R (lavaan 0.6.14; psych, psychTools 2.2.9).
// Per case: fit <- cfa("f =~ ...", sample.cov = R, sample.nobs = n, std.lv = TRUE,
// sample.cov.rescale = FALSE); modindices(fit) rows with op "~~" between two items (mi, epc, sepc.all).
interface Case {
  name: string;
  n: number;
  items: string[];
  correlation: string[];
  loadings: string[];
  pairs: { a: string; b: string; mi: string; epc: string; sepcAll: string }[];
}
const fixture = JSON.parse(readFileSync(new URL('../../fixtures/reference/residual-modification-indices.json', import.meta.url), 'utf8')) as { cases: Case[] };

describe('residualModificationIndices', () => {
  for (const entry of fixture.cases) {
    it(`matches lavaan::modindices on ${entry.name} (${entry.items.length} items, n ${entry.n})`, () => {
      const p = entry.items.length;
      const result = residualModificationIndices({ order: p, data: Float64Array.from(entry.correlation.map(Number)) }, entry.n);
      expect(result.fit.converged).toBe(true);
      entry.loadings.forEach((value, k) => expect(Math.abs(result.fit.loadings[k])).toBeCloseTo(Math.abs(Number(value)), 5)); // lavInspect(fit, "std")$lambda
      for (const pair of entry.pairs) {
        const i = entry.items.indexOf(pair.a);
        const j = entry.items.indexOf(pair.b);
        const mi = Number(pair.mi);
        // modindices(fit)$mi, $epc, $sepc.all (the optimiser's tolerances differ: relative 1e-4 on mi)
        expect(Math.abs(result.mi.data[i * p + j] - mi)).toBeLessThanOrEqual(1e-4 * Math.max(1, mi));
        expect(result.epc.data[i * p + j]).toBeCloseTo(Number(pair.epc), 4);
        expect(result.sepc.data[i * p + j]).toBeCloseTo(Number(pair.sepcAll), 4);
      }
    });
  }

  it('gives the largest index of psychTools::epi extraversion to V25/V51 (lively party, both wordings) and the next to V56/V37 (pranks / jokes)', () => {
    const entry = fixture.cases.find((c) => c.name === 'epi-E')!;
    const p = entry.items.length;
    const result = residualModificationIndices({ order: p, data: Float64Array.from(entry.correlation.map(Number)) }, entry.n);
    const ranked: [string, number][] = [];
    for (let i = 0; i < p; i++) for (let j = i + 1; j < p; j++) ranked.push([`${entry.items[i]}/${entry.items[j]}`, result.mi.data[i * p + j]]);
    ranked.sort((x, y) => y[1] - x[1]);
    expect(ranked.slice(0, 2).map(([pair]) => pair)).toEqual(['V25/V51', 'V56/V37']); // modindices as above: 1030.4, 551.2
  });

  it('refuses a three-item scale, whose residual covariances are not identified', () => {
    expect(() => residualModificationIndices({ order: 3, data: Float64Array.from([1, 0.5, 0.5, 0.5, 1, 0.5, 0.5, 0.5, 1]) }, 100)).toThrow(/at least 4 items/);
  });
});
