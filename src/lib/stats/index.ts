/**
 * The numerical core's one entry point: every published method, one file each (see DEVELOPERS.md).
 * Pure: typed arrays and plain objects in and out, no file, network, database or framework.
 * The worker-thread variants live under ./parallel/ and are imported from there on purpose, so
 * that importing the core never loads node:worker_threads.
 */
export * from './alpha-if-item-deleted';
export * from './bartlett-sphericity';
export * from './belsley-collinearity';
export * from './bivariate-normal-cdf';
export * from './chi-square-distribution';
export * from './complete-rows';
export * from './condition-number';
export * from './correlation-input';
export * from './correlation-matrix';
export * from './covariance-input';
export * from './covariance-matrix';
export * from './cronbach-alpha';
export * from './cross-products';
export * from './ebic-glasso';
export * from './em-covariance';
export * from './f-distribution';
export * from './fisher-z-interval';
export * from './gamma-variate';
export * from './graphical-lasso';
export * from './hierarchical-clustering';
export * from './incomplete-beta';
export * from './incomplete-gamma';
export * from './item-descriptives';
export * from './item-rest-correlation';
export * from './kmo';
export * from './log-gamma';
export * from './masked-cross-products';
export * from './mid-ranks';
export * from './minres-factor';
export * from './minres-factors';
export * from './nearest-correlation';
export * from './normal-distribution';
export * from './oblimin-rotation';
export * from './ols-regression';
export * from './omega-hierarchical';
export * from './omega-total';
export * from './one-factor-ml';
export * from './parallel-analysis';
export * from './parallel-analysis-polychoric';
export * from './pearson-correlation';
export * from './polychoric-coding';
export * from './polychoric-correlation';
export * from './polychoric-likelihood';
export * from './polychoric-pairs';
export * from './relative-weights';
export * from './residual-correlations';
export * from './residual-modification-indices';
export * from './seeded-random';
export * from './smooth-correlation-matrix';
export * from './spearman-brown';
export * from './spearman-correlation';
export * from './spectral-inverse';
export * from './symmetric-eigen';
export * from './symmetric-input';
export * from './t-distribution';
export * from './tolerances';
export * from './types';
export * from './undefined-pair-cover';
export * from './variance-inflation';
export * from './weighted-topological-overlap';
export * from './wald-correlation-interval';
export * from './wishart-correlation';
