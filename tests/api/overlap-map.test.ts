/**
 * The overlap map's routes against the built server with the seeded demo: the map slice of a done
 * audit (its shape, that it agrees with the audit JSON, that it is much smaller), the crosstab of
 * a pair checked against the stored wave, small cells withheld for a reviewer, and the refusals
 * (not done, unknown items, another team).
 *
 * Facts of the demo wave come from fixtures/demo/README.md ("What is planted"): 41 items, one of
 * them constant (hours_7, left out of the matrix), five planted overlap structures, and 14
 * respondents set aside by screening (386 used of 400).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { crosstabSchema, mapCorrelation, mapPairN, overlapMapSchema, SMALL_CELL_LIMIT, upperIndex } from '../../src/lib/api/overlap-map';
import { demoIds } from '../../src/lib/server/demo-seed';
import { hierarchicalClustering } from '../../src/lib/stats/hierarchical-clustering';
import { body, Client, demoEmails, signedIn } from '../setup/http';
import { auditDone } from '../setup/workspace-waves';
import { readOnlyDatabase, storedMatrix, waveRecord } from './waves-http';

const clients = {} as Record<'owner' | 'designer' | 'field' | 'reviewer' | 'outsider', Client>;
let auditId = '';
let full: any;

beforeAll(async () => {
  for (const caller of ['owner', 'designer', 'field', 'reviewer', 'outsider'] as const) clients[caller] = await signedIn(demoEmails[caller]);
  const started = await clients.designer.post(`/api/waves/${demoIds.demoWave}/audits`, { settings: { method: 'pearson', bootstrap: 0, seed: 31_337 } });
  expect([200, 202]).toContain(started.status);
  auditId = (await body(started)).audit.id;
  await auditDone(clients.designer, auditId);
  full = (await body(await clients.designer.get(`/api/audits/${auditId}`))).result;
});

describe('GET /api/audits/{id}/overlap-map', () => {
  it('gives the slice the map draws, in the contract shape, agreeing with the audit JSON', async () => {
    const response = await clients.designer.get(`/api/audits/${auditId}/overlap-map`);
    expect(response.status).toBe(200);
    const text = await response.text();
    const map = overlapMapSchema.parse(JSON.parse(text));
    // fixtures/demo/README.md: 41 items, hours_7 constant and left out → 40 in the matrix.
    expect(map.items).toHaveLength(40);
    expect(map.items.map((item) => item.id)).toEqual(full.correlation.items);
    expect(map.items.some((item) => item.id === 'hours_7')).toBe(false);
    expect(map.upper).toHaveLength((40 * 39) / 2);
    expect(map.respondentsUsed).toBe(386); // fixtures/demo/README.md: 400 rows, 14 set aside
    // The packed triangle is the audit's matrix rounded to three decimals.
    for (let i = 0; i < 40; i++) {
      for (let j = 0; j < 40; j++) {
        if (i === j) continue;
        expect(mapCorrelation(map, i, j)).toBeCloseTo(full.correlation.matrix[i][j], 3);
        expect(mapPairN(map, i, j)).toBe(full.correlation.n[i][j]);
      }
    }
    expect(upperIndex(40, 38, 39)).toBe(map.upper.length - 1);
    // Three orderings, each a permutation of the items.
    for (const order of Object.values(map.orders)) expect([...order].sort((a, b) => a - b)).toEqual(map.items.map((_, i) => i));
    // The cluster order is the core's average-linkage tree (checked against R's hclust in
    // tests/unit/hierarchical-clustering.test.ts) on 1 − |r| of the unrounded matrix.
    const m = 40;
    const distances = new Float64Array(m * m);
    for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) distances[i * m + j] = i === j ? 0 : 1 - Math.abs(full.correlation.matrix[i][j]);
    expect(map.orders.cluster).toEqual(hierarchicalClustering({ order: m, data: distances }).order);
    // Questionnaire order is the wave's column order; scale order keeps each scale together.
    expect(map.orders.questionnaire.map((i) => map.items[i].position)).toEqual([...map.items.map((item) => item.position)].sort((a, b) => a - b));
    const scaleRuns = map.orders.scale.map((i) => map.items[i].scale).filter((scale, k, all) => k === 0 || scale !== all[k - 1]);
    expect(new Set(scaleRuns).size).toBe(scaleRuns.length);
    // fixtures/demo/README.md: five planted overlap structures, each a cluster with its proposal.
    expect(map.clusters).toHaveLength(5);
    expect(map.clusters.every((cluster) => cluster.recommendation !== null)).toBe(true);
    // Planted near-copies merge first in the tree, so each cluster sits together in its order.
    for (const cluster of map.clusters) {
      const places = cluster.items.map((i) => map.orders.cluster.indexOf(i)).sort((a, b) => a - b);
      expect(places[places.length - 1] - places[0], cluster.items.map((i) => map.items[i].id).join('+')).toBe(places.length - 1);
    }
    // Each flagged pair carries the audit's own interval and n.
    const coll = map.pairs.find((pair) => [map.items[pair.a].id, map.items[pair.b].id].sort().join('+') === 'coll_2+coll_7');
    expect(coll).toBeDefined();
    expect(coll!.lower).toBeLessThan(coll!.r);
    expect(coll!.upper).toBeGreaterThan(coll!.r);
    expect(map.recommendations).toHaveLength(full.recommendations.length);
    // The slice is a small part of the audit JSON.
    expect(text.length).toBeLessThan(JSON.stringify(full).length / 2);
  });

  it('answers every member of the team, and 404 to another team and for an unknown audit', async () => {
    for (const caller of ['owner', 'field', 'reviewer'] as const) expect((await clients[caller].get(`/api/audits/${auditId}/overlap-map`)).status).toBe(200);
    const outsider = await clients.outsider.get(`/api/audits/${auditId}/overlap-map`);
    expect(outsider.status).toBe(404);
    expect((await body(outsider)).error.code).toBe('audit-not-found');
    expect((await clients.designer.get('/api/audits/no-such-audit/overlap-map')).status).toBe(404);
    expect((await new Client().get(`/api/audits/${auditId}/overlap-map`)).status).toBe(401);
  });

  it('answers 409 for an audit that is not done', async () => {
    const started = await clients.designer.post(`/api/waves/${demoIds.demoWave}/audits`, { settings: { bootstrap: 0, seed: 31_338 + (Date.now() % 10_000), testFault: 'throw' } });
    const failedId = (await body(started)).audit.id;
    for (let attempt = 0; attempt < 600; attempt++) {
      if ((await body(await clients.designer.get(`/api/audits/${failedId}`))).audit.status === 'failed') break;
      await new Promise((r) => setTimeout(r, 100));
    }
    const response = await clients.designer.get(`/api/audits/${failedId}/overlap-map`);
    expect(response.status).toBe(409);
    expect((await body(response)).error.code).toBe('audit-not-done');
  });
});

describe('GET /api/audits/{id}/crosstab', () => {
  it('counts the two items over the respondents the audit used, as the stored wave says', async () => {
    const response = await clients.designer.get(`/api/audits/${auditId}/crosstab?a=coll_2&b=coll_7`);
    expect(response.status).toBe(200);
    const crosstab = crosstabSchema.parse(await body(response));
    expect(crosstab.respondents).toBe(386); // fixtures/demo/README.md
    expect(crosstab.suppressedBelow).toBeNull();
    // Recount from the stored matrix (read straight from SQLite), leaving out the wave's exclusions.
    const db = readOnlyDatabase();
    const wave = waveRecord(db, demoIds.demoWave)!;
    const matrix = storedMatrix(db, demoIds.demoWave);
    const columns = db.prepare('select item_id, position from wave_items where wave_id = ?').all(demoIds.demoWave) as { item_id: string; position: number }[];
    db.close();
    const col = (id: string) => columns.find((c) => c.item_id === id)!.position;
    const excluded = new Set(JSON.parse(wave.exclusions) as number[]);
    const expected = new Map<string, number>();
    let both = 0;
    for (let row = 0; row < matrix.rows; row++) {
      if (excluded.has(row)) continue;
      const a = matrix.data[col('coll_2') * matrix.rows + row];
      const b = matrix.data[col('coll_7') * matrix.rows + row];
      if (Number.isNaN(a) || Number.isNaN(b)) continue;
      both += 1;
      expected.set(`${a}:${b}`, (expected.get(`${a}:${b}`) ?? 0) + 1);
    }
    expect(crosstab.answeredBoth).toBe(both);
    expect(crosstab.answeredBoth + crosstab.missingEither).toBe(386);
    // The pair's n in the audit is the number who answered both (pairwise deletion).
    const i = full.correlation.items.indexOf('coll_2');
    const j = full.correlation.items.indexOf('coll_7');
    expect(crosstab.answeredBoth).toBe(full.correlation.n[i][j]);
    crosstab.counts.forEach((row, r) => row.forEach((count, c) => expect(count).toBe(expected.get(`${crosstab.items[0].values[r]}:${crosstab.items[1].values[c]}`) ?? 0)));
    expect(crosstab.rowTotals!.reduce((s, v) => s + v, 0)).toBe(both);
    expect(crosstab.columnTotals!.reduce((s, v) => s + v, 0)).toBe(both);
  });

  it('withholds small cells and the totals from a reviewer, and never hides one cell alone', async () => {
    const designer = crosstabSchema.parse(await body(await clients.designer.get(`/api/audits/${auditId}/crosstab?a=coll_2&b=staff_4`)));
    const small = designer.counts.flat().filter((count) => count !== null && count > 0 && count < SMALL_CELL_LIMIT).length;
    expect(small).toBeGreaterThan(0); // two unrelated five-point items over 386 respondents leave some rare answer pairs
    const reviewer = crosstabSchema.parse(await body(await clients.reviewer.get(`/api/audits/${auditId}/crosstab?a=coll_2&b=staff_4`)));
    expect(reviewer.suppressedBelow).toBe(SMALL_CELL_LIMIT);
    expect(reviewer.suppressedCells).toBeGreaterThanOrEqual(Math.max(2, small));
    expect(reviewer.counts.flat().every((count) => count === null || count === 0 || count >= SMALL_CELL_LIMIT)).toBe(true);
    expect(reviewer.rowTotals).toBeNull();
    expect(reviewer.columnTotals).toBeNull();
    // The cells both see agree.
    reviewer.counts.forEach((row, r) => row.forEach((count, c) => count !== null && expect(count).toBe(designer.counts[r][c])));
    // A field manager may not read respondent rows either.
    expect(crosstabSchema.parse(await body(await clients.field.get(`/api/audits/${auditId}/crosstab?a=coll_2&b=staff_4`))).suppressedBelow).toBe(SMALL_CELL_LIMIT);
  });

  it('refuses a missing, repeated or unknown item with the reason, and another team with 404', async () => {
    const missing = await clients.designer.get(`/api/audits/${auditId}/crosstab?a=coll_2`);
    expect(missing.status).toBe(400);
    expect((await body(missing)).error.code).toBe('items-required');
    expect((await body(await clients.designer.get(`/api/audits/${auditId}/crosstab?a=coll_2&b=coll_2`))).error.code).toBe('same-item');
    const unknown = await clients.designer.get(`/api/audits/${auditId}/crosstab?a=coll_2&b=nope_9`);
    expect(unknown.status).toBe(404);
    expect((await body(unknown)).error.message).toContain('nope_9');
    expect((await clients.outsider.get(`/api/audits/${auditId}/crosstab?a=coll_2&b=coll_7`)).status).toBe(404);
  });
});
