/**
 * Content facets as a constraint: a cut that leaves a facet without items is blocked (`facet` in
 * blockedBy), and the what-if names the facets a set of removals empties. The data are the
 * engine's reference wave (scripts/reference/engine-evidence.R): without constraints the engine
 * keeps A1 and drops its twin A5 (r = 0.934), see engine-recommend-cuts.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { computeEvidence, scaleAlphaOracle } from '../../src/lib/engine/compute-evidence';
import { resolveEngineSettings } from '../../src/lib/engine/engine-settings';
import { emptiedFacets, emptiesFacet, facetWarnings } from '../../src/lib/engine/facet-coverage';
import { findOverlapClusters } from '../../src/lib/engine/overlap-clusters';
import { recommendCuts } from '../../src/lib/engine/recommend-cuts';
import { simulateCut } from '../../src/lib/engine/simulate-cut';
import type { EngineItem } from '../../src/lib/engine/types';
import { constraintWords } from '../../src/lib/words/labels';
import { reasonSentence } from '../../src/lib/words';
import { referenceInput } from './engine-fixture';

function recommendWithFacets(facets: Record<string, string>) {
  const { matrix, items: plain } = referenceInput();
  const items: EngineItem[] = plain.map((item) => ({ ...item, facet: facets[item.id] ?? null }));
  const settings = resolveEngineSettings({});
  const evidence = computeEvidence(matrix, items, settings);
  const { clusters } = findOverlapClusters(evidence, items.map(() => items.map(() => null)), settings);
  const cuts = recommendCuts(evidence, clusters, settings, scaleAlphaOracle(evidence, matrix));
  return { cuts, items, evidence, matrix };
}

describe('facet coverage', () => {
  it('blocks dropping the last item of a facet, like any constraint', () => {
    // Without facets A5 is dropped (engine-recommend-cuts.test.ts).
    const free = recommendWithFacets({});
    expect(free.cuts.recommendations[0].actions.find((action) => action.item === 'A5')).toMatchObject({ action: 'drop', blockedBy: [] });

    // A5 alone covers "sleep": the drop is blocked and the reason says why.
    const { cuts, items } = recommendWithFacets({ A1: 'rest', A5: 'sleep' });
    const action = cuts.recommendations[0].actions.find((entry) => entry.item === 'A5')!;
    expect(action.action).toBe('keep');
    expect(action.proposed).toBe('drop');
    expect(action.blockedBy).toEqual(['facet']);
    expect(cuts.removed.map((index) => items[index].id)).not.toContain('A5');
    expect(reasonSentence(cuts.recommendations[0].because)).toMatch(/last item of its content facet/);
    expect(constraintWords.facet).toMatch(/facet/);
  });

  it('lets the cut through when another item still covers the facet', () => {
    const { cuts, items } = recommendWithFacets({ A5: 'sleep', A2: 'sleep' });
    expect(cuts.recommendations[0].actions.find((entry) => entry.item === 'A5')).toMatchObject({ action: 'drop', blockedBy: [] });
    expect(cuts.removed.map((index) => items[index].id)).toContain('A5');
  });

  it('the what-if names the facets a set of removals empties', () => {
    const { items, evidence, matrix } = recommendWithFacets({ A1: 'rest', A5: 'sleep', A2: 'sleep' });
    const settings = resolveEngineSettings({});
    const one = simulateCut(evidence, matrix, ['A5'], settings);
    expect(one.warnings.filter((warning) => warning.code === 'facet-emptied')).toEqual([]);
    const both = simulateCut(evidence, matrix, ['A5', 'A2'], settings);
    const emptied = both.warnings.filter((warning) => warning.code === 'facet-emptied');
    expect(emptied).toHaveLength(1);
    expect(emptied[0].items).toEqual(['A2', 'A5']);
    expect(emptied[0].message).toMatch(/facet "sleep"/);
    const index = (id: string) => items.findIndex((item) => item.id === id);
    expect(emptiedFacets(items, new Set([index('A1')])).map((entry) => entry.facet)).toEqual(['rest']);
    expect(emptiesFacet(items, index('A2'), new Set([index('A5')]))).toBe(true);
    expect(emptiesFacet(items, index('A3'), new Set())).toBe(false); // no facet
    expect(facetWarnings(items, new Set())).toEqual([]);
  });
});
