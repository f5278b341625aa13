import { describe, expect, it } from 'vitest';
import { evaluateLocalDependence } from '../../src/lib/evaluation/evaluate-local-dependence';

// Issue 9 asks for precision and recall of at least .95 on generated doublet waves. The engine does
// NOT reach it (60 waves per kind: see README "Engine figures" and docs/decisions/010); this test
// runs a few waves per kind (cheap settings, stated) and checks what the combination is for: it
// keeps the false alarms of wTO alone (every pair of a homogeneous scale) and of a blunt |r| rule
// out, without losing what the residual rule finds. Figures printed by bench/engine-local-dependence.bench.ts.
const CHEAP = { ebicPenaltyCount: 20, residualBootstrapDraws: 50 };

describe('evaluateLocalDependence', () => {
  it('combines the detectors so that wTO false alarms in homogeneous scales are vetoed and planted doublets are still found', async () => {
    const result = await evaluateLocalDependence({ wavesPerKind: 4, settings: CHEAP });
    expect(result.plantedDoublets).toBeGreaterThan(4);
    const { engine, wto, residual } = result.detectors;
    // wTO alone flags pairs of homogeneous scales; the engine's veto removes most of them.
    expect(wto.flagsByKind.homogeneous).toBeGreaterThan(engine.flagsByKind.homogeneous);
    expect(engine.precision).toBeGreaterThan(wto.precision);
    expect(engine.recall).toBeGreaterThanOrEqual(0.5);
    expect(residual.truePositives).toBeGreaterThan(0);
    // The ceiling of one recommendation per ten clean waves is measured on 60 waves per kind with
    // 100 residual-bootstrap draws (README); on 4 waves with 50 draws (a noisier 99th percentile)
    // it is not asserted.
  });

  it('refuses a non-positive wave count', async () => {
    await expect(evaluateLocalDependence({ wavesPerKind: 0 })).rejects.toThrow(/wavesPerKind must be a positive integer/);
  });
});
