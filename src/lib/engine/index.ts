/**
 * The redundancy engine: from a wave's evidence to overlap clusters, a constrained cut list, the
 * what-if of a cut and bootstrap stability. Pure code (no database, framework or DOM); see
 * docs/decisions/003-redundancy-engine.md.
 */
export * from './bootstrap-stability';
export * from './compute-evidence';
export * from './engine-settings';
export * from './inflation-evidence';
export * from './notice-warnings';
export * from './local-dependence';
export * from './core-detectors';
export * from './overlap-clusters';
export * from './principal-submatrix';
export * from './recommend-cuts';
export * from './run-engine';
export * from './simulate-cut';
export * from './types';
export * from './wording-similarity';
