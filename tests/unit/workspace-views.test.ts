/**
 * What the workspace reads from an audit JSON: the item table's rows, the structure panels'
 * figures and the overlap map's slice, on the demo wave's audit (fixtures/demo/README.md: 41
 * items, hours_7 constant, events_3b an exact copy of events_3, five planted overlap clusters).
 * The statistics are checked against R in their own files; here the claim is that every view
 * carries the audit's own numbers, complete and in the right order.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { itemRows } from '../../src/components/workspace/item-rows';
import { PROPORTION_SHOWN, structureView } from '../../src/components/workspace/structure-view';
import { mapCorrelation, upperIndex } from '../../src/lib/api/overlap-map';
import { auditInputFromWave } from '../../src/lib/audit/audit-input';
import { runAudit } from '../../src/lib/audit/run-audit';
import { acceptProposal, readWave } from '../../src/lib/ingest';
import { buildOverlapMap } from '../../src/lib/server/workspace/overlap-map';
import { CONDITION_INDEX_MODERATE } from '../../src/lib/stats/tolerances';

async function demoAudit() {
  // The one reader and the one accept path, as the seed and the command line use them.
  const read = await readWave({
    fileName: 'library-pilot-1.csv', bytes: new Uint8Array(readFileSync('fixtures/demo/library-pilot-1.csv')),
    codebookName: 'library-codebook.csv', codebookBytes: new Uint8Array(readFileSync('fixtures/demo/library-codebook.csv')), sheet: null,
  });
  return runAudit(auditInputFromWave(acceptProposal(read).wave), { bootstrap: 0, seed: 3 });
}

describe('workspace views of the demo audit', async () => {
  const audit = await demoAudit();

  it('item table: one row per item with the audit’s statistics, keeper scores and wording similarity', () => {
    const rows = itemRows(audit);
    expect(rows.map((row) => row.id)).toEqual(audit.items.map((item) => item.id));
    for (const row of rows) {
      const item = audit.items.find((entry) => entry.id === row.id)!;
      expect([row.n, row.mean, row.sd, row.vif, row.msa, row.itemRest, row.alphaIfDeleted, row.partner]).toEqual([item.n, item.mean, item.sd, item.vif, item.msa, item.itemRest, item.alphaIfDeleted, item.topPartner?.id ?? null]);
    }
    expect(rows.find((row) => row.id === 'hours_7')?.inMatrix).toBe(false); // constant: left out
    for (const recommendation of audit.recommendations) {
      for (const score of recommendation.evidence.keeperScores as { item: string; score: number }[]) expect(rows.find((row) => row.id === score.item)?.keeperScore).toBe(score.score);
      for (const action of recommendation.actions) {
        const row = rows.find((entry) => entry.id === action.item)!;
        expect(row.proposal).toContain(action.action);
        if (row.partner === recommendation.keep && typeof action.wordingWithKeeper === 'number') expect(row.wording).toBe(action.wordingWithKeeper);
      }
      expect(rows.find((row) => row.id === recommendation.keep)?.proposal).toBe('keep');
    }
    expect(rows.filter((row) => row.keeperScore === null && row.proposal !== null)).toEqual([]);
  });

  it('structure: condition indices of 10 or more, largest first, bars above 20%, and the rows they rest on', () => {
    const view = structureView(audit);
    expect(view.collinearityRows).toBe(audit.collinearity?.rowsUsed);
    expect(view.collinearityRows).toBeLessThan(view.respondentsUsed); // complete rows only
    const indices = view.dependencies.map((d) => d.conditionIndex ?? Number.POSITIVE_INFINITY);
    expect(indices).toEqual([...indices].sort((a, b) => b - a));
    expect(indices.every((ci) => ci >= CONDITION_INDEX_MODERATE)).toBe(true);
    expect(view.dependencies[0].conditionIndex).toBeNull(); // events_3b copies events_3: infinite
    expect(view.dependencies[0].items.map((entry) => entry.id).sort()).toEqual(['events_3', 'events_3b']);
    for (const dependency of view.dependencies) {
      expect(dependency.items.every((entry) => entry.proportion >= PROPORTION_SHOWN)).toBe(true);
      const proportions = audit.collinearity!.varianceProportions[dependency.dimension];
      for (const entry of dependency.items) expect(entry.proportion).toBe(proportions[audit.collinearity!.columns.indexOf(entry.id)]);
    }
    expect(view.scales.map((scale) => scale.id)).toEqual(audit.scales.map((scale) => scale.id));
    expect(view.eigenvalues).toEqual(audit.eigenvalues);
  });

  it('map slice: the matrix packed by rows above the diagonal, each cluster together in tree order', () => {
    const map = buildOverlapMap('demo', audit);
    const m = audit.correlation.items.length;
    expect(map.upper).toHaveLength((m * (m - 1)) / 2);
    for (let i = 0; i < m; i++) for (let j = i + 1; j < m; j++) expect(map.upper[upperIndex(m, i, j)]).toBeCloseTo(audit.correlation.matrix[i][j], 3);
    expect(mapCorrelation(map, 5, 5)).toBe(1);
    expect(map.clusters).toHaveLength(5);
    for (const cluster of map.clusters) {
      const places = cluster.items.map((i) => map.orders.cluster.indexOf(i)).sort((a, b) => a - b);
      expect(places[places.length - 1] - places[0]).toBe(places.length - 1);
    }
    expect(map.localDependence).toBe(Array.isArray(audit.pairs) && (audit.pairs as { wto?: unknown }[]).some((pair) => typeof pair.wto === 'number'));
  });

  it('map pairs carry the audit pair’s modification index, its critical value and the standardized change', () => {
    const pairs = (audit.pairs as Record<string, unknown>[]).map((pair, k) => (k === 0 ? { ...pair, mi: 14.25, miCritical: 10.83, sepc: 0.31 } : pair));
    const map = buildOverlapMap('demo', { ...audit, pairs });
    const first = pairs[0].items as string[];
    const found = map.pairs.find((pair) => [map.items[pair.a].id, map.items[pair.b].id].sort().join('+') === [...first].sort().join('+'));
    expect(found).toMatchObject({ mi: 14.25, miCritical: 10.83, sepc: 0.31 });
    for (const pair of map.pairs) {
      const source = pairs.find((entry) => (entry.items as string[]).includes(map.items[pair.a].id) && (entry.items as string[]).includes(map.items[pair.b].id));
      expect(pair.mi).toBe(source?.mi ?? null);
    }
  });
});
