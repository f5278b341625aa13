import { describe, expect, it } from 'vitest';
import { computeEvidence } from '../../src/lib/engine/compute-evidence';
import { runEngine, type EngineResult } from '../../src/lib/engine/run-engine';
import { instrumentInput, msqInstrument, realInstruments } from './engine-real-instruments';

// The confirmatory models' verdicts come from scripts/reference/engine-real-instruments.R
// (lavaan 0.6.14, psych 2.2.9, psychTools 2.2.9): per scale, the residual covariance with the
// largest modification index of its one-factor CFA (missing = "ml"). Pearson audits; the residual
// bootstrap at 50 draws to keep the file affordable (an audit: 200).
const cheap = { bootstrap: 0, residualBootstrapDraws: 50 };

async function audit(name: 'bfi' | 'holzinger' | 'epi' | 'sai' | 'msq'): Promise<EngineResult> {
  const { matrix, items } = instrumentInput(name === 'msq' ? msqInstrument : realInstruments[name]);
  const evidence = computeEvidence(matrix, items, { method: 'pearson', missing: 'pairwise', ...cheap });
  return runEngine(evidence, matrix, items, cheap);
}

const flagged = (result: EngineResult, [a, b]: readonly [string, string]): string[] =>
  result.pairs.find((pair) => pair.items.includes(a) && pair.items.includes(b))?.rules?.slice() ?? [];
const clusters = (result: EngineResult): string[] => result.recommendations.map((entry) => [...entry.cluster].sort().join('/')).sort();

describe('the engine on real open instruments, against the largest modification index of a confirmatory model', () => {
  it('psych::bfi: flags the largest-index pair of A, C, N and O (N1/N2 "Get angry easily" / "Get irritated easily" first) and proposes dropping one of N1/N2', async () => {
    const result = await audit('bfi');
    const mi = Object.fromEntries(realInstruments.bfi.largestResidualMi.map((entry) => [entry.scale, entry]));
    expect(mi.N.pair).toEqual(['N1', 'N2']); // R: modindices(cfa("f =~ N1 + ... + N5", bfi, missing = "ml")), largest "~~": mi 399.7
    expect(flagged(result, ['N1', 'N2'])).toEqual(expect.arrayContaining(['local-dependence-mi', 'local-dependence-wto']));
    const recommendation = result.recommendations.find((entry) => entry.cluster.includes('N1'))!;
    expect([...recommendation.cluster].sort()).toEqual(['N1', 'N2']);
    expect(recommendation.actions[0].action).toBe('drop'); // synonyms are dropped, not sent for rewording
    expect(recommendation.because.code).toBe('local-dependence');
    // A1/A2 (74.9), C4/C5 (132.5), O2/O5 (74.8): the largest index of each scale (R as above).
    for (const scale of ['A', 'C', 'O']) expect(flagged(result, mi[scale].pair)).toContain('local-dependence-mi');
    // E3/E5 (57.2) passes the index but its expected residual correlation (.17 here) is below .20: stated so a change shows.
    expect(mi.E.pair).toEqual(['E3', 'E5']);
    expect(flagged(result, ['E3', 'E5'])).toEqual([]);
    expect(clusters(result)).toEqual(['A1/A2', 'C4/C5', 'N1/N2', 'O2/O5']);
  });

  it('lavaan::HolzingerSwineford1939: the largest residual mi (x7/x8, speed) is not flagged: a three-item scale has no identified residual covariance and wTO does not count alone', async () => {
    const result = await audit('holzinger');
    expect(realInstruments.holzinger.largestResidualMi.pair).toEqual(['x7', 'x8']); // R: modindices of the three-factor CFA: mi 34.1
    expect(flagged(result, ['x7', 'x8'])).toEqual([]);
    expect(result.recommendations).toEqual([]);
  });

  it('psychTools::epi extraversion: flags V25/V51 (the lively-party pair, largest index) and V56/V37 (pranks / jokes, the next)', async () => {
    const result = await audit('epi');
    const reference = realInstruments.epi.largestResidualMi;
    expect(reference.pair).toEqual(['V25', 'V51']); // R: modindices(cfa("f =~ V1 + ... + V51", epi, missing = "ml")): mi 1044.2
    expect(reference.second.pair).toEqual(['V56', 'V37']); // mi 584.9
    expect(flagged(result, ['V25', 'V51'])).toContain('local-dependence-mi');
    expect(flagged(result, ['V56', 'V37'])).toContain('local-dependence-mi');
    expect(clusters(result)).toEqual(expect.arrayContaining(['V25/V51', 'V37/V56']));
  });

  it('psychTools::sai state anxiety: flags worrying/worried (the largest index) and proposes dropping one of them', async () => {
    const result = await audit('sai');
    const reference = realInstruments.sai.largestResidualMi;
    expect(reference.pair).toEqual(['worrying', 'worried']); // R: modindices(cfa("f =~ calm + ... + pleasant", sai[time == 1], missing = "ml")): mi 1035.8
    expect(flagged(result, ['worrying', 'worried'])).toEqual(expect.arrayContaining(['local-dependence-mi', 'local-dependence-wto']));
    const recommendation = result.recommendations.find((entry) => entry.cluster.includes('worried'))!;
    expect([...recommendation.cluster].sort()).toEqual(['worried', 'worrying']);
    expect(recommendation.actions.map((action) => action.action)).toEqual(['drop']); // the keeper is not listed among the actions
  });

  it('psychTools::msq energetic and tense arousal: flags the synonym pairs lavaan\'s sequential modification indices point to, as pairs, not chains', async () => {
    const result = await audit('msq');
    const { EA, TA } = msqInstrument.scales;
    // R (scripts/reference/engine-msq.R): modindices(cfa("f =~ active + ... + drowsy", msq, missing = "ml")): largest "~~" sleepy/drowsy, mi 2410.4
    expect(EA.largest[0].pair).toEqual(['sleepy', 'drowsy']);
    // ...and of the tense-arousal model quiet/still, mi 810.4; then calm/at.rest, 592.3
    expect(TA.largest[0].pair).toEqual(['quiet', 'still']);
    expect(TA.largest[1].pair).toEqual(['calm', 'at.rest']);
    // Sequential use with the engine's levels (Bonferroni .001, SEPC .20): EA frees sleepy/drowsy, then wakeful/wide.awake (401.2)
    expect(EA.sequential.slice(0, 2).map((step) => step.pair)).toEqual([['sleepy', 'drowsy'], ['wakeful', 'wide.awake']]);
    // sleepy/drowsy correlate .85 and stand out of their scale: a strong pair (set aside from the index model).
    expect(flagged(result, ['sleepy', 'drowsy'])).toContain('strong-pair');
    for (const pair of [['quiet', 'still'], ['calm', 'at.rest'], ['wakeful', 'wide.awake']] as const) expect(flagged(result, pair)).toContain('local-dependence-mi');
    // full.of.pep/lively: R's fifth largest EA index (314.8); r .81 here, a strong pair standing out of its scale.
    expect(EA.largest.map((entry) => entry.pair.join('/'))).toContain('full.of.pep/lively');
    // Complete linkage keeps each recommendation to its pair: no seven-adjective chain of energetic-arousal markers.
    expect(clusters(result)).toEqual(['at.rest/calm', 'drowsy/sleepy', 'full.of.pep/lively', 'quiet/still', 'wakeful/wide.awake']);
    // Synonyms of one scale are proposed for dropping, never for rewording.
    expect(result.recommendations.flatMap((entry) => entry.actions.map((action) => action.action))).toEqual(['drop', 'drop', 'drop', 'drop', 'drop']);
  });
});
