/**
 * The engine's evaluation on local-dependence waves (issue 9): generated waves of four kinds
 * (`doublets`, `homogeneous`, `cross-loading`, `clean`; see src/lib/synth/local-dependence-spec.ts),
 * precision and recall of each detector on its own and of the engine, and the recommendations
 * made on waves where nothing is redundant. Used by the unit test (floors) and the benchmark
 * (figures for the README).
 *
 * Truth: the planted doublets of `doublets` waves. Every other pair of every wave is not
 * redundant, so a pair flagged anywhere else is a false positive. Figures are pooled over all
 * waves of all kinds (micro-averaged). A detector "flags" a pair on its own raw rule:
 * - `strong-pair`: |r| ≥ strongPairThreshold;
 * - `mi`: the scale's sequential modification-index test at the strict level;
 * - `residual`: relative residual above the scale's critical value (the fixed rule without one);
 * - `wto`: wTO ≥ wtoThreshold;
 * and `engine` counts the pairs inside the clusters of its recommendations (after every veto
 * and the complete linkage).
 */
import { generateWave } from '../synth/generate-wave';
import { LOCAL_DEPENDENCE_WAVE_KINDS, localDependenceWaveSpec, type LocalDependenceWaveKind } from '../synth/local-dependence-spec';
import { computeEvidence } from '../engine/compute-evidence';
import { resolveEngineSettings, type EngineSettings } from '../engine/engine-settings';
import { pairLocalFigures } from '../engine/overlap-clusters';
import { runEngine } from '../engine/run-engine';
import { engineInputFromSyntheticWave } from './synthetic-wave-input';

/** Detectors scored separately, and the engine. */
export const LOCAL_DEPENDENCE_DETECTORS = Object.freeze(['strong-pair', 'mi', 'residual', 'wto', 'engine'] as const);
export type LocalDependenceDetectorName = (typeof LOCAL_DEPENDENCE_DETECTORS)[number];

/** Precision and recall of one detector. */
export interface DetectorScore {
  readonly truePositives: number;
  readonly falsePositives: number;
  /** TP / (TP + FP); 1 when it flagged nothing. */
  readonly precision: number;
  /** TP / planted doublets. */
  readonly recall: number;
  /** Flags on waves of each kind (false alarms except for true doublets). */
  readonly flagsByKind: Readonly<Record<LocalDependenceWaveKind, number>>;
}

/** The evaluation's figures. */
export interface LocalDependenceEvaluation {
  readonly wavesPerKind: number;
  readonly plantedDoublets: number;
  readonly detectors: Readonly<Record<LocalDependenceDetectorName, DetectorScore>>;
  /** Recommendations on waves of each kind other than `doublets`. */
  readonly recommendationsByKind: Readonly<Record<LocalDependenceWaveKind, number>>;
  /** Recommendations per ten waves with nothing redundant (homogeneous, cross-loading and clean together). */
  readonly cleanRecommendationsPerTenWaves: number;
  /** One line per missed doublet and per false engine pair. */
  readonly misses: readonly string[];
  /** The engine per cell: respondents band × planted residual band (recall), and per respondents band (precision). */
  readonly cells: readonly EvaluationCell[];
}

/** The engine's figures in one cell of respondents × planted residual size. */
export interface EvaluationCell {
  /** Respondents band, e.g. "150-299". */
  readonly n: string;
  /** Planted residual band, e.g. ".15-.20"; "all" for the precision row of a respondents band. */
  readonly residual: string;
  readonly planted: number;
  readonly found: number;
  /** Engine pairs on waves of this respondents band that are not planted doublets (only in "all" rows). */
  readonly falsePairs: number;
}

/** Bands of the per-cell table. */
const N_BANDS: readonly [number, number][] = [[150, 299], [300, 449], [450, 600]];
const RESIDUAL_BANDS: readonly [number, number][] = [[0.15, 0.2], [0.2, 0.25], [0.25, 0.35]];
const bandOf = (bands: readonly [number, number][], value: number): number => Math.max(0, bands.findIndex(([, high], k) => value < high || (k === bands.length - 1 && value <= high)));
const residualLabel = ([low, high]: readonly [number, number]): string => `${low.toFixed(2).slice(1)}-${high.toFixed(2).slice(1)}`;

/** Options of `evaluateLocalDependence`. */
export interface LocalDependenceEvaluationOptions {
  /** Waves of each kind (spec seeds firstSeed ..). */
  readonly wavesPerKind: number;
  readonly firstSeed?: number;
  /** Engine settings; the stability bootstrap is off unless set here. */
  readonly settings?: Partial<EngineSettings>;
  /** Respondents of every wave in place of the spec's own 150-600 (one cell of the per-cell table). */
  readonly respondents?: number;
}

/** Offset between a wave's structure seed and its respondents' seed. */
const RESPONDENT_SEED_OFFSET = 500_000;

function pairKey(a: string, b: string): string {
  return a < b ? `${a}|${b}` : `${b}|${a}`;
}

/**
 * Runs the evaluation.
 * @param options Waves per kind, first seed, engine settings.
 * @throws {RangeError} when wavesPerKind is not a positive integer.
 * @returns Per-detector and engine precision and recall, recommendations per kind, misses.
 * References: van Rijsbergen 1979, "Information Retrieval", ch. 7 (precision and recall).
 */
export async function evaluateLocalDependence(options: LocalDependenceEvaluationOptions): Promise<LocalDependenceEvaluation> {
  const { wavesPerKind } = options;
  if (!(Number.isInteger(wavesPerKind) && wavesPerKind >= 1)) throw new RangeError(`evaluateLocalDependence: wavesPerKind must be a positive integer, got ${wavesPerKind}`);
  const firstSeed = options.firstSeed ?? 1;
  const settings = resolveEngineSettings({ bootstrap: 0, ...options.settings });
  const zero = (): Record<LocalDependenceWaveKind, number> => ({ doublets: 0, homogeneous: 0, 'cross-loading': 0, clean: 0 });
  const tallies = Object.fromEntries(LOCAL_DEPENDENCE_DETECTORS.map((name) => [name, { tp: 0, fp: 0, byKind: zero() }])) as Record<
    LocalDependenceDetectorName,
    { tp: number; fp: number; byKind: Record<LocalDependenceWaveKind, number> }
  >;
  const recommendationsByKind = zero();
  const cellCounts = N_BANDS.map(() => RESIDUAL_BANDS.map(() => ({ planted: 0, found: 0 })));
  const falseByN = N_BANDS.map(() => 0);
  const misses: string[] = [];
  let planted = 0;

  for (const kind of LOCAL_DEPENDENCE_WAVE_KINDS) {
    for (let seed = firstSeed; seed < firstSeed + wavesPerKind; seed++) {
      const drawn = localDependenceWaveSpec(seed, kind);
      const spec = options.respondents === undefined ? drawn : { ...drawn, respondents: options.respondents };
      const wave = generateWave(spec, seed + RESPONDENT_SEED_OFFSET);
      const { matrix, items } = engineInputFromSyntheticWave(wave);
      const evidence = computeEvidence(matrix, items, settings);
      const result = await runEngine(evidence, matrix, items, settings);
      const truth = new Set(wave.truth.doublets.map(([a, b]) => pairKey(a, b)));
      planted += truth.size;
      const flagged: Record<LocalDependenceDetectorName, Set<string>> = { 'strong-pair': new Set(), mi: new Set(), residual: new Set(), wto: new Set(), engine: new Set() };
      const figuresOf = pairLocalFigures(evidence);
      const order = evidence.correlation.order;
      for (let i = 0; i < order; i++) {
        for (let j = i + 1; j < order; j++) {
          const a = evidence.usable[i];
          const b = evidence.usable[j];
          const k = pairKey(items[a].id, items[b].id);
          const figures = figuresOf(a, b);
          if (Math.abs(evidence.correlation.data[i * order + j]) >= settings.strongPairThreshold) flagged['strong-pair'].add(k);
          if (figures.miFlagged === 'strict') flagged.mi.add(k);
          if (figures.relativeResidual !== null && figures.relativeResidual > (figures.residualCritical ?? settings.residualRelativeThreshold)) flagged.residual.add(k);
          if (figures.wto !== null && figures.wto >= settings.wtoThreshold) flagged.wto.add(k);
        }
      }
      for (const recommendation of result.recommendations) {
        const cluster = recommendation.cluster;
        for (let x = 0; x < cluster.length; x++) for (let y = x + 1; y < cluster.length; y++) flagged.engine.add(pairKey(cluster[x], cluster[y]));
      }
      if (kind !== 'doublets') recommendationsByKind[kind] += result.recommendations.length;
      for (const name of LOCAL_DEPENDENCE_DETECTORS) {
        for (const pair of flagged[name]) {
          tallies[name].byKind[kind]++;
          if (truth.has(pair)) tallies[name].tp++;
          else {
            tallies[name].fp++;
            if (name === 'engine') misses.push(`${kind} wave ${seed}: false pair ${pair}`);
          }
        }
      }
      for (const pair of truth) if (!flagged.engine.has(pair)) misses.push(`${kind} wave ${seed} (n ${matrix.rows}): missed doublet ${pair}`);
      const nBand = bandOf(N_BANDS, matrix.rows);
      falseByN[nBand] += [...flagged.engine].filter((pair) => !truth.has(pair)).length;
      for (const scale of spec.scales) {
        for (const item of scale.items) {
          if (item.doubletOf === undefined || item.doubletResidual === undefined) continue;
          const cell = cellCounts[nBand][bandOf(RESIDUAL_BANDS, item.doubletResidual)];
          cell.planted++;
          if (flagged.engine.has(pairKey(item.name, item.doubletOf))) cell.found++;
        }
      }
    }
  }

  const detectors = Object.fromEntries(
    LOCAL_DEPENDENCE_DETECTORS.map((name) => {
      const { tp, fp, byKind } = tallies[name];
      return [name, { truePositives: tp, falsePositives: fp, precision: tp + fp === 0 ? 1 : tp / (tp + fp), recall: planted === 0 ? 1 : tp / planted, flagsByKind: byKind }];
    }),
  ) as Record<LocalDependenceDetectorName, DetectorScore>;
  const cleanWaves = 3 * wavesPerKind;
  const cleanRecommendations = recommendationsByKind.homogeneous + recommendationsByKind['cross-loading'] + recommendationsByKind.clean;
  return {
    wavesPerKind,
    plantedDoublets: planted,
    detectors,
    recommendationsByKind,
    cleanRecommendationsPerTenWaves: (10 * cleanRecommendations) / cleanWaves,
    misses,
    cells: N_BANDS.flatMap(([low, high], x) => {
      const n = `${low}-${high}`;
      const rows = RESIDUAL_BANDS.map((band, y) => ({ n, residual: residualLabel(band), ...cellCounts[x][y], falsePairs: 0 }));
      const planted = rows.reduce((sum, row) => sum + row.planted, 0);
      const found = rows.reduce((sum, row) => sum + row.found, 0);
      return [...rows, { n, residual: 'all', planted, found, falsePairs: falseByN[x] }];
    }),
  };
}
