/**
 * Writes the generated local-dependence waves (issue 9) to CSV for the R reference detectors
 * (scripts/reference/local-dependence-recall.R): the same specs and seeds as the engine's evaluation
 * (src/lib/evaluation/evaluate-local-dependence.ts: `localDependenceWaveSpec(seed, kind)`,
 * `generateWave(spec, seed + 500000)`), and the same recoded values the engine sees
 * (`engineInputFromSyntheticWave`: missing codes and blanks as NA, reverse-keyed items recoded).
 *
 * Per wave, DIR/<kind>-<seed>.csv (one column per item, NA for missing) and one manifest
 * DIR/manifest.json: kind, seed, file, respondents, each item's scale, and the planted doublets
 * with their latent residual correlation.
 *
 * Run: npx tsx scripts/reference/local-dependence-waves.ts DIR [WAVES_PER_KIND=60] [FIRST_SEED=1]
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { engineInputFromSyntheticWave } from '../../src/lib/evaluation/synthetic-wave-input';
import { generateWave } from '../../src/lib/synth/generate-wave';
import { LOCAL_DEPENDENCE_WAVE_KINDS, localDependenceWaveSpec } from '../../src/lib/synth/local-dependence-spec';

/** Offset between a wave's structure seed and its respondents' seed (as in the evaluation). */
const RESPONDENT_SEED_OFFSET = 500_000;

const [directory, perKindText = '60', firstSeedText = '1'] = process.argv.slice(2);
if (directory === undefined) throw new Error('usage: local-dependence-waves.ts DIR [WAVES_PER_KIND] [FIRST_SEED]');
const wavesPerKind = Number(perKindText);
const firstSeed = Number(firstSeedText);
mkdirSync(directory, { recursive: true });

const manifest: unknown[] = [];
for (const kind of LOCAL_DEPENDENCE_WAVE_KINDS) {
  for (let seed = firstSeed; seed < firstSeed + wavesPerKind; seed++) {
    const spec = localDependenceWaveSpec(seed, kind);
    const wave = generateWave(spec, seed + RESPONDENT_SEED_OFFSET);
    const { matrix, items } = engineInputFromSyntheticWave(wave);
    const lines = [items.map((item) => item.id).join(',')];
    for (let i = 0; i < matrix.rows; i++) {
      const row: string[] = [];
      for (let j = 0; j < matrix.columns; j++) {
        const value = matrix.data[j * matrix.rows + i];
        row.push(Number.isNaN(value) ? 'NA' : String(value));
      }
      lines.push(row.join(','));
    }
    const file = `${kind}-${seed}.csv`;
    writeFileSync(join(directory, file), `${lines.join('\n')}\n`);
    const doublets = spec.scales.flatMap((scale) =>
      scale.items.filter((item) => item.doubletOf !== undefined).map((item) => ({ a: item.doubletOf as string, b: item.name, residual: item.doubletResidual as number })),
    );
    manifest.push({ kind, seed, file, respondents: matrix.rows, items: items.map((item) => ({ id: item.id, scale: item.scale, points: item.max === null || item.min === null ? null : item.max - item.min + 1 })), doublets });
  }
}
writeFileSync(join(directory, 'manifest.json'), JSON.stringify(manifest));
console.log(`${manifest.length} waves written to ${directory}`);
