/**
 * The audit's exploratory view (structure.exploratory): its loadings are the core's minres +
 * oblimin on the audit's own correlation matrix (checked against GPArotation and psych in
 * exploratory-structure.test.ts), and weak or cross-loading items become candidates behind the
 * designer's constraints. The data are made here: two scales of four items driven by two
 * correlated factors, plus W (noise: loads nothing) and X (half of each factor: cross-loads).
 */
import { describe, expect, it } from 'vitest';
import { runAudit, type AuditInput } from '../../src/lib/audit/run-audit';
import { minresFactors } from '../../src/lib/stats/minres-factors';
import { obliminRotation } from '../../src/lib/stats/oblimin-rotation';
import { createSeededRandom } from '../../src/lib/stats/seeded-random';
import { itemMatrixFromColumns, squareMatrixFromRows } from '../../src/lib/stats/types';

function input(locked: string[] = []): AuditInput {
  const random = createSeededRandom(14);
  const normal = () => {
    const u = Math.max(random.next(), 1e-12);
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * random.next());
  };
  const n = 400;
  const ids = ['A1', 'A2', 'A3', 'A4', 'B1', 'B2', 'B3', 'B4', 'W', 'X'];
  const columns = ids.map(() => new Float64Array(n));
  const cut = (value: number) => Math.min(5, Math.max(1, Math.round(3 + value)));
  for (let i = 0; i < n; i++) {
    const f = normal();
    const g = 0.3 * f + Math.sqrt(1 - 0.09) * normal();
    for (let j = 0; j < 4; j++) columns[j][i] = cut(0.8 * f + 0.6 * normal());
    for (let j = 4; j < 8; j++) columns[j][i] = cut(0.8 * g + 0.6 * normal());
    columns[8][i] = cut(normal());
    columns[9][i] = cut(0.55 * f + 0.55 * g + 0.6 * normal());
  }
  return {
    matrix: itemMatrixFromColumns(columns),
    items: ids.map((id) => ({ id, scale: id.startsWith('A') || id === 'W' ? 'A' : 'B', text: null, locked: locked.includes(id), min: 1, max: 5, reverse: false })),
    rowsInWave: n,
    excluded: 0,
    outcome: null,
  };
}

describe('structure.exploratory of the audit JSON', () => {
  it('holds the core oblimin solution of the audit correlation matrix, its omegas and the candidates', async () => {
    const audit = await runAudit(input(), { bootstrap: 0, seed: 1 });
    const view = (audit.structure as any).exploratory;
    expect(view.factors).toBe(2);
    expect([...view.factorNames].sort()).toEqual(['A', 'B']); // factor order is arbitrary (rotation)
    // Same numbers as the core's chain on the JSON's own matrix (identity of composition).
    const fit = minresFactors(squareMatrixFromRows(audit.correlation.matrix), 2);
    const rotated = obliminRotation(fit.loadings, 10, 2);
    const ours = view.loadings.flat().map(Math.abs).sort();
    const core = Array.from(rotated.loadings).map(Math.abs).sort();
    ours.forEach((value: number, i: number) => expect(value).toBeCloseTo(core[i], 10));
    expect(view.factorCorrelations[0][1]).toBeGreaterThan(0.1);
    expect(view.omega.hierarchical).toBeGreaterThan(0);
    expect(view.omega.hierarchical).toBeLessThan(view.omega.total);
    expect(view.weak.map((entry: { item: string }) => entry.item)).toEqual(['W']);
    expect(view.crossLoadings.map((entry: { item: string }) => entry.item)).toEqual(['X']);
    const byItem = Object.fromEntries(view.candidates.map((c: any) => [c.item, c]));
    expect(byItem.W).toMatchObject({ reason: 'weak', proposed: 'drop', blockedBy: [] });
    expect(byItem.X).toMatchObject({ reason: 'cross-loading', proposed: 'drop' });
    expect(byItem.W.evidence.maxLoading).toBeLessThan(0.3);
  });

  it('keeps a locked candidate, naming the lock', async () => {
    const audit = await runAudit(input(['W']), { bootstrap: 0, seed: 1 });
    const view = (audit.structure as any).exploratory;
    expect(view.candidates.find((c: any) => c.item === 'W').blockedBy).toEqual(['locked']);
  });

  it('is null for a one-scale wave', async () => {
    const one = input();
    const audit = await runAudit({ ...one, items: one.items.map((item) => ({ ...item, scale: 'S' })) }, { bootstrap: 0, seed: 1 });
    expect((audit.structure as any).exploratory).toBeNull();
  });
});
