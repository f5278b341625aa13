/**
 * What the benchmarks that compare with R share: the machine's load when they start, and running
 * an R script on data written to a temporary folder (skipped with --no-r or when Rscript is not
 * on PATH, reported as a figure rather than thrown when R fails). Figures only: nothing asserts.
 */
import { spawnSync } from 'node:child_process';
import { closeSync, mkdtempSync, openSync, rmSync, writeSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { createSeededRandom } from '../src/lib/stats/seeded-random';
import type { ItemMatrix } from '../src/lib/stats/types';
import type { WaveSpec } from '../src/lib/synth/types';

/**
 * The load averages over 1, 5 and 15 minutes and the number of cores, for the heading of a run.
 * @returns e.g. "0.52 0.40 0.31 on 2 cores".
 */
export function loadAverageAndCores(): string {
  return `${loadavg().map((value) => value.toFixed(2)).join(' ')} on ${availableParallelism()} cores`;
}

/**
 * Runs an R script with `Rscript -e` on files written to a temporary folder, removed afterwards.
 * Prints why R was skipped or failed (the last line of its error output) and then returns null.
 * @param folderPrefix prefix of the temporary folder's name.
 * @param prepare writes the data files into the folder and returns the script's text.
 * @param parse reads the figures from what the script printed.
 * @returns what `parse` returned, or null when --no-r was given, Rscript is missing or the script failed.
 */
export function withRScript<T>(folderPrefix: string, prepare: (directory: string) => string, parse: (stdout: string) => T): T | null {
  if (process.argv.includes('--no-r')) {
    console.log('  R: skipped (--no-r)');
    return null;
  }
  const probe = spawnSync('Rscript', ['--version'], { encoding: 'utf8' });
  if (probe.error !== undefined || probe.status !== 0) {
    console.log('  R: Rscript not on PATH, skipped');
    return null;
  }
  const directory = mkdtempSync(join(tmpdir(), folderPrefix));
  try {
    const script = prepare(directory);
    const run = spawnSync('Rscript', ['-e', script], { encoding: 'utf8', maxBuffer: 1 << 20 });
    if (run.status !== 0) {
      console.log(`  R: failed (${run.stderr.trim().split('\n').at(-1)})`);
      return null;
    }
    return parse(run.stdout);
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
}

/**
 * Seeded ordinal answers from a two-factor model: item j loads 0.45-0.85 on factor j mod 2, and
 * its latent score is cut at thresholds spread over ±1.8 with a seeded jitter (every category
 * used); each answer is missing with probability `missingShare` (NaN).
 * @param rows respondents.
 * @param items items.
 * @param categories answer categories (coded 1..categories).
 * @param seed seed of the generator.
 * @param missingShare share of answers left out at random (0 for complete data).
 * @returns respondents × items, column-major.
 */
export function ordinalFactorData(rows: number, items: number, categories: number, seed: number, missingShare = 0): ItemMatrix {
  const random = createSeededRandom(seed);
  const factors = [0, 1].map(() => Float64Array.from({ length: rows }, () => random.nextNormal()));
  const data = new Float64Array(rows * items);
  for (let j = 0; j < items; j++) {
    const loading = 0.45 + 0.4 * random.next();
    const cuts = Array.from({ length: categories - 1 }, (_, c) => -1.8 + (3.6 * (c + 0.5)) / (categories - 1) + 0.2 * (random.next() - 0.5));
    const factor = factors[j % 2];
    for (let i = 0; i < rows; i++) {
      const latent = loading * factor[i] + Math.sqrt(1 - loading * loading) * random.nextNormal();
      let category = 1;
      for (const cut of cuts) if (latent > cut) category++;
      data[j * rows + i] = missingShare > 0 && random.next() < missingShare ? Number.NaN : category;
    }
  }
  return { rows, columns: items, data };
}

/**
 * Writes a matrix as CSV with a header `q1,q2,...` (an empty cell for NaN), a block of rows at a
 * time so that a large matrix never becomes one string.
 * @param path the file to write.
 * @param matrix respondents × items, column-major.
 * @returns nothing; the file is written.
 */
export function writeItemsCsv(path: string, matrix: ItemMatrix): void {
  const { rows, columns, data } = matrix;
  const descriptor = openSync(path, 'w');
  try {
    writeSync(descriptor, `${Array.from({ length: columns }, (_, j) => `q${j + 1}`).join(',')}\n`);
    const block = 2_000;
    for (let first = 0; first < rows; first += block) {
      const lines: string[] = [];
      for (let i = first; i < Math.min(rows, first + block); i++) {
        const cells: string[] = [];
        for (let j = 0; j < columns; j++) {
          const value = data[j * rows + i];
          cells.push(value === value ? String(value) : '');
        }
        lines.push(cells.join(','));
      }
      writeSync(descriptor, `${lines.join('\n')}\n`);
    }
  } finally {
    closeSync(descriptor);
  }
}

/** How {@link questionnaireSpec} names and plants its items. */
export interface QuestionnaireShape {
  /** Items per scale (10). */
  itemsPerScale: number;
  /** Scales whose last item is a planted near-copy of their first (the first 4). */
  twinnedScales: number;
  /** Item names are `${prefix}${scale}_${item}` ('b'). */
  prefix: string;
  /** Item texts are `${label} scale ${scale}, statement ${item}` ('Bench'). */
  label: string;
}

/**
 * A questionnaire for the benchmarks: `scales` scales of five-point items (ten by default), the
 * last item of the first scales (four by default) a planted near-copy of the scale's first, a
 * missing-answer code (9) and a few blanks; the wave's id and duration columns come with it.
 * @param rows respondents.
 * @param scales scales.
 * @param shape items per scale, planted scales and names, when not the defaults.
 * @returns the generator's spec.
 */
export function questionnaireSpec(rows: number, scales: number, shape: Partial<QuestionnaireShape> = {}): WaveSpec {
  const { itemsPerScale = 10, twinnedScales = 4, prefix = 'b', label = 'Bench' } = shape;
  return {
    respondents: rows,
    scales: Array.from({ length: scales }, (_, s) => ({
      name: `scale_${s + 1}`,
      points: 5 as const,
      items: Array.from({ length: itemsPerScale }, (_, q) => ({
        name: `${prefix}${s + 1}_${q + 1}`,
        text: `${label} scale ${s + 1}, statement ${q + 1}`,
        ...(q === itemsPerScale - 1 && s < twinnedScales ? { twinOf: `${prefix}${s + 1}_1` } : {}),
      })),
    })),
    factorCorrelation: 0.3,
    loadingRange: [0.5, 0.78],
    twinNoise: 0.18,
    skew: 0.3,
    missingCodes: [{ code: 9, label: 'prefer not to say', rate: 0.01 }],
    blankRate: 0.005,
    constantItems: [],
    duplicateColumns: [],
    straightliners: 0,
    speeders: 0,
    medianDurationSeconds: 300,
    idColumn: 'respondent_id',
    durationColumn: 'duration_sec',
    firstRespondentId: 1,
    outcome: null,
  };
}
