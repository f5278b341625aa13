/** The synthetic pilot-wave generator: evaluation waves and the demo study's data. */
export { generateWave } from './generate-wave';
export { randomWaveSpec, randomUnplantedWaveSpec } from './random-wave-spec';
export { toCsv, codebookToCsv, codebookCells } from './wave-csv';
export { demoWave, DEMO_SPEC, DEMO_SEED, DEMO_STUDY_NAME } from './demo';
export { ordinalThresholds, discretiseLatent } from './ordinal-thresholds';
export type * from './types';
export { localDependenceWaveSpec, LOCAL_DEPENDENCE_WAVE_KINDS, DOUBLET_RESIDUAL_RANGE, HOMOGENEOUS_LOADING_RANGE, type LocalDependenceWaveKind } from './local-dependence-spec';
