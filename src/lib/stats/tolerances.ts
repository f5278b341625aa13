/**
 * Every numerical tolerance and threshold of the core, named, in one place. Each helper domain
 * keeps its own section; a literal tolerance anywhere else in src/lib/stats is a defect.
 */

// ── Linear algebra, overlap and structure ──────────────────────────────────────────────

/**
 * An eigenvalue at or below this share of the largest one counts as zero: the matrix is
 * singular, and the items loading on those eigenvectors are exactly dependent. It corresponds
 * to a condition number of 1e6 for a correlation matrix, far beyond any meaningful VIF.
 */
export const EXACT_DEPENDENCY_RELATIVE_EIGENVALUE = 1e-12;
/**
 * An item takes part in an exact dependency when the length of its row in the null-space
 * eigenvectors reaches this (an exact duplicate pair gives about 0.71; rounding gives ~1e-12).
 */
export const NULL_SPACE_MEMBERSHIP = 1e-6;
/**
 * An item whose standard deviation is at or below this share of its absolute mean (or exactly
 * zero) is constant: what remains after centring is rounding, not variation.
 */
export const CONSTANT_ITEM_RELATIVE_SD = 1e-10;
/**
 * Pairwise-complete sums from masked cross-products (masked-cross-products.ts): when a pair's
 * centred sum of squares is below this share of its shifted sum of squares, subtracting the
 * pair's mean would cancel more than 3 digits (or the item is constant over the pair), so that
 * pair is recomputed by the two-pass pair loop instead. Accuracy, not a statistic: with at most
 * 3 digits lost the result stays within about 1e-12 of the pair loop.
 */
export const MASKED_PRODUCTS_CANCELLATION_LIMIT = 1e-3;
/**
 * Pairwise Pearson from masked cross-products: a pair whose |r| reaches this is recomputed by the
 * two-pass pair loop, whose arithmetic keeps an exact copy at exactly 1 (the masked sums reach it
 * only to rounding, and exact dependencies are read from such pairs).
 */
export const NEAR_PERFECT_CORRELATION = 1 - 1e-9;
/** Ceiling on implicit QL iterations spent on one eigenvalue before non-convergence is declared. */
export const EIGEN_MAX_ITERATIONS_PER_VALUE = 60;
/**
 * Belsley-Kuh-Welsch: the accurate path (Householder QR of the data, then the SVD of R) runs
 * while rows × columns² stays at or below this; larger problems take the Gram-matrix path.
 */
export const BELSLEY_QR_WORK_LIMIT = 3e8;
/**
 * A singular value at or below this share of the largest counts as zero in Belsley-Kuh-Welsch
 * (a condition index above 1e6). It is the square root of EXACT_DEPENDENCY_RELATIVE_EIGENVALUE,
 * so both paths (the Gram path sees d², with noise near 1e-16 of the largest) agree.
 */
export const BELSLEY_SINGULAR_VALUE_RELATIVE = 1e-6;
/** Condition index from which a near-dependency is strong (Belsley, Kuh & Welsch 1980). */
export const CONDITION_INDEX_STRONG = 30;
/** Condition index from which a near-dependency is moderate (Belsley, Kuh & Welsch 1980). */
export const CONDITION_INDEX_MODERATE = 10;
/** A variance-decomposition proportion at or above this puts a column in a near-dependency. */
export const VARIANCE_PROPORTION_INVOLVED = 0.5;
/** Lower bounds of Kaiser's (1974) KMO labels, highest first; below the last is unacceptable. */
export const KMO_LABEL_BOUNDS = Object.freeze([
  Object.freeze({ bound: 0.9, label: 'marvelous' }),
  Object.freeze({ bound: 0.8, label: 'meritorious' }),
  Object.freeze({ bound: 0.7, label: 'middling' }),
  Object.freeze({ bound: 0.6, label: 'mediocre' }),
  Object.freeze({ bound: 0.5, label: 'miserable' }),
] as const);
/** Parallel analysis: random data sets drawn by default (Horn 1965 used far fewer). */
export const PARALLEL_ANALYSIS_DEFAULT_ITERATIONS = 100;
/** Parallel analysis: percentile of the random eigenvalues an observed one must exceed (Glorfeld 1995). */
export const PARALLEL_ANALYSIS_PERCENTILE = 95;
/**
 * Parallel analysis on polychoric correlations: random data sets drawn by default. Each needs a
 * polychoric matrix (p(p−1)/2 likelihood fits), so fewer than for Pearson (common practice:
 * psych::fa.parallel's own default n.iter is 20).
 */
export const POLYCHORIC_PARALLEL_DEFAULT_ITERATIONS = 20;
/**
 * Fewest respondents for a polychoric matrix before the audit warns that it rests on too few
 * (common practice, from memory: simulation studies of polychoric-based factor analysis, e.g.
 * Flora & Curran 2004, Psychological Methods 9:466-491, found estimates usable from about 200;
 * tetrachoric correlations need more). The empirical check beside it is the matrix itself:
 * negative eigenvalues before repair.
 */
export const POLYCHORIC_MINIMUM_N = 200;
/** Fewest respondents for a tetrachoric (0/1 polychoric) matrix before the audit warns (common practice, from memory; see POLYCHORIC_MINIMUM_N). */
export const TETRACHORIC_MINIMUM_N = 400;
/** A repaired correlation matrix keeps its eigenvalues at or above this (so it is invertible). */
export const REPAIR_EIGENVALUE_FLOOR = 1e-8;
/** Higham's alternating projections stop when the relative change in one sweep is below this. */
export const NEAREST_CORRELATION_TOLERANCE = 1e-10;
/** Ceiling on Higham's alternating-projection sweeps before non-convergence is reported. */
export const NEAREST_CORRELATION_MAX_ITERATIONS = 1_000;

// ── Correlation ────────────────────────────────────────────────────────────────────────

/**
 * Fewest pair-complete respondents for which a correlation is reported. With fewer, the pair
 * is undefined: it enters the matrix as 0, is listed in `undefinedPairs` and reported.
 */
export const MIN_ROWS_FOR_CORRELATION = 3;
/** Fewest pair-complete respondents for a covariance (its denominator is n − 1). */
export const MIN_ROWS_FOR_COVARIANCE = 2;
/** Polychoric ρ: the Newton search stops when a step is smaller than this. */
export const POLYCHORIC_RHO_TOLERANCE = 1e-10;
/** Ceiling on Newton / bisection steps for one polychoric ρ before non-convergence is reported. */
export const POLYCHORIC_MAX_ITERATIONS = 200;
/**
 * Polychoric ρ: the likelihood is taken to peak on the boundary ±1 when it still rises at
 * |ρ| = 1 − this (the search probes that point before declaring a boundary maximum).
 */
export const POLYCHORIC_BOUNDARY_GAP = 1e-9;
/**
 * Polychoric ρ: after convergence ℓ is evaluated at ±(1 − POLYCHORIC_BOUNDARY_GAP); if it is at
 * least ℓ(ρ̂) less this share of |ℓ(ρ̂)| (rounding), the maximum is taken to lie on the boundary.
 */
export const POLYCHORIC_LIKELIHOOD_RELATIVE_SLACK = 1e-12;
/**
 * Count added to each empty cell (inside the observed rows and columns) of a contingency table
 * whose likelihood peaks on the boundary without a perfect association: the usual continuity
 * correction of one half (Brown & Benedetti 1977; the default of psych::polychoric).
 */
export const POLYCHORIC_ZERO_CELL_CORRECTION = 0.5;
/** Most distinct values an item may take to enter a polychoric correlation. */
export const POLYCHORIC_MAX_CATEGORIES = 15;
/** Share of answers at the lowest (highest) category above which a floor (ceiling) effect is flagged (Terwee et al. 2007). */
export const FLOOR_CEILING_SHARE = 0.15;

// ── Reliability, models and distributions ──────────────────────────────────────────────

/** Relative size of the last term at which a power series or continued fraction is stopped. */
export const SERIES_RELATIVE_TOLERANCE = 1e-15;
/** Ceiling on terms of a series or continued fraction before it is declared non-convergent. */
export const SERIES_MAX_TERMS = 100_000;
/** Largest |x + (1 − x) − 1| accepted when a caller passes 1 − x alongside x (rounding only). */
export const COMPLEMENT_TOLERANCE = 4 * Number.EPSILON;
/** Stand-in for zero in the modified Lentz algorithm, so no denominator is exactly 0. */
export const LENTZ_TINY = 1e-300;
/** Arguments at or above this use Stirling's series (with its remainder) in log-gamma work. */
export const STIRLING_THRESHOLD = 10;
/** Relative step in t at which the t-quantile root search stops. */
export const QUANTILE_RELATIVE_TOLERANCE = 1e-14;
/** Ceiling on root-search steps for a quantile. */
export const QUANTILE_MAX_STEPS = 500;
/** Relative asymmetry |a_ij − a_ji| / max(|a_ij|, |a_ji|, 1) tolerated in a symmetric input. */
export const SYMMETRY_TOLERANCE = 1e-10;
/** Largest |r_ii − 1| tolerated on the diagonal of an input correlation matrix. */
export const UNIT_DIAGONAL_TOLERANCE = 1e-8;
/**
 * A Cholesky pivot at or below this share of its diagonal element marks the matrix as
 * singular (numerically not positive definite) for Bartlett's test.
 */
export const CHOLESKY_PIVOT_RELATIVE_TOLERANCE = 1e-12;
/** A variance at or below this share of the largest variance counts as zero (a constant item). */
export const ZERO_VARIANCE_RELATIVE_TOLERANCE = 1e-12;
/**
 * Householder QR: a column whose remaining norm is below this share of its own original norm
 * is aliased (linearly dependent on earlier columns). 1e-7 is the value R's lm() uses.
 */
export const QR_ALIASING_RELATIVE_TOLERANCE = 1e-7;
/**
 * OLS: the fit is exact when the root mean squared residual is at or below this share of the
 * root mean square of the outcome (what is left is rounding); t and p are then undefined.
 */
export const EXACT_FIT_RELATIVE_RESIDUAL = 1e-10;
/** Minres factoring stops when no loading moves by more than this in one sweep. */
export const MINRES_CONVERGENCE_TOLERANCE = 1e-10;
/** Ceiling on minres sweeps before non-convergence is reported. */
export const MINRES_MAX_SWEEPS = 20_000;
/** Power-iteration steps spent on the minres starting values. */
export const MINRES_START_POWER_STEPS = 100;
/** A communality at or above this is a Heywood case (Heywood 1931). */
export const HEYWOOD_COMMUNALITY = 1;
/** Eigenvalues of R_xx at or below this share of the largest make relative weights undefined. */
export const RELATIVE_WEIGHTS_EIGENVALUE_TOLERANCE = 1e-12;

// ── Local dependence: graphical lasso, EBIC, wTO, residual correlations, smoothing ────────

/**
 * Graphical lasso: sweeps stop when the mean absolute change of the off-diagonal covariance
 * estimate in one sweep is below this share of the mean absolute off-diagonal input (glasso's
 * own criterion; its default there is 1e-4, far looser, and leaves answers that far from the
 * optimum). The inner lasso of each column stops at the same relative size of step.
 */
export const GRAPHICAL_LASSO_TOLERANCE = 1e-10;
/** Ceiling on graphical-lasso sweeps over all columns before non-convergence is reported. */
export const GRAPHICAL_LASSO_MAX_SWEEPS = 10_000;
/**
 * Graphical lasso: when two sweeps in a row shrink the change of W by ratios within `agreement`
 * of each other and between `lowest` and `highest`, the remaining geometric tail r / (1 − r) of
 * the last step is added at once (Aitken's extrapolation); slow linear convergence (ratios near
 * 0.85 where two blocks of items have just joined) then takes a few sweeps instead of dozens.
 */
export const GRAPHICAL_LASSO_EXTRAPOLATION_RATIOS = Object.freeze({ lowest: 0.5, highest: 0.95, agreement: 0.02 } as const);
/** Ceiling on coordinate-descent passes of one column's inner lasso within one sweep. */
export const GRAPHICAL_LASSO_MAX_INNER_PASSES = 1_000;
/**
 * EBIC graphical lasso: tolerance of the fits along the path (the selected one is refitted to
 * GRAPHICAL_LASSO_TOLERANCE). At 1e-7 the log-likelihoods are exact far beyond the EBIC's
 * differences, and the path costs about a third of a path at 1e-10.
 */
export const EBIC_PATH_TOLERANCE = 1e-7;
/** EBIC graphical lasso: number of penalties on the path (qgraph::EBICglasso's nlambda). */
export const EBIC_PENALTY_COUNT = 100;
/** EBIC graphical lasso: smallest penalty as a share of the largest (qgraph's lambda.min.ratio). */
export const EBIC_MINIMUM_PENALTY_RATIO = 0.01;
/** Extended BIC tuning parameter gamma (Foygel & Drton 2010; qgraph's default 0.5). */
export const EBIC_GAMMA = 0.5;
/**
 * A selected penalty below this share of the largest makes a dense network; qgraph warns that
 * its smallest edges may be false positives (Williams & Rast 2020).
 */
export const EBIC_DENSE_PENALTY_RATIO = 0.1;
/** Unique Variable Analysis flags a pair from this weighted topological overlap (Christensen, Garrido & Golino 2023). */
export const WTO_FLAG = 0.25;
/** wTO bands of Unique Variable Analysis: small-to-moderate from .20, moderate-to-large from .25, large above .30. */
export const WTO_BANDS = Object.freeze({ smallToModerate: 0.2, moderateToLarge: 0.25, large: 0.3 } as const);
/** Residual-correlation bootstrap: simulated data sets drawn by default. */
export const RESIDUAL_BOOTSTRAP_DRAWS = 200;
/** Residual-correlation bootstrap: the lower and upper percentiles reported of the largest relative residual. */
export const RESIDUAL_BOOTSTRAP_PERCENTILES = Object.freeze({ flag: 0.95, strict: 0.99 } as const);
/** Residual-correlation bootstrap: fewer usable draws than this share is an error, not a result. */
export const RESIDUAL_BOOTSTRAP_MIN_USABLE_SHARE = 0.8;
/**
 * Fixed rule of thumb for the relative residual correlation (residual minus the scale's mean):
 * .20 (Christensen, Makransky & Horton 2017, after Chen & Thissen 1997). Shown beside the
 * bootstrap critical value, which is the one that adapts to items, respondents and categories.
 */
export const RELATIVE_RESIDUAL_RULE_OF_THUMB = 0.2;
/**
 * Bentler & Yuan (2011) smoothing: the constant k by which the squared scaling of an item with
 * MTFA communality h ≥ 1 is k / h; it leaves the smoothed matrix an eigenvalue floor of 1 − k.
 * .98 is the value of Bentler & Yuan's example and of Debelak & Tran (2013, 2016).
 */
export const BENTLER_YUAN_SCALING_CONSTANT = 0.98;
/** Minimum trace factor analysis: upper bound on each communality (Debelak & Tran 2013 used 2.5). */
export const MTFA_COMMUNALITY_UPPER_BOUND = 2.5;
/** Minimum trace factor analysis: the barrier method stops when its duality-gap bound is below this. */
export const MTFA_GAP_TOLERANCE = 1e-10;
/** Minimum trace factor analysis: a barrier stage is centred when half the squared Newton decrement is below this. */
export const MTFA_NEWTON_DECREMENT_TOLERANCE = 1e-13;
/** Minimum trace factor analysis: ceiling on Newton steps over all barrier stages. */
export const MTFA_MAX_NEWTON_STEPS = 500;
/**
 * EM covariance: iterations stop when no mean moves by more than this many standard deviations
 * and no covariance by more than this share of the product of the two standard deviations.
 */
export const EM_TOLERANCE = 1e-10;
/** EM covariance: iteration limit before non-convergence is reported. */
export const EM_MAX_ITERATIONS = 10_000;
/**
 * Q3 residual correlations divide by sqrt(1 − λ²); a uniqueness below this (a Heywood case) is
 * raised to it so that the ratio stays finite (the Heywood case itself is reported by minres).
 */
export const RESIDUAL_MIN_UNIQUENESS = 0.01;
/** One-factor ML: the fit stops when every gradient component (in ln ψ) is below this. */
export const ONE_FACTOR_ML_GRADIENT_TOLERANCE = 1e-8;
/** One-factor ML: a step that lowers F by less than this (relative) ends the search (F's rounding error). */
export const ONE_FACTOR_ML_STAGNATION = 1e-14;
/** One-factor ML: most BFGS iterations. */
export const ONE_FACTOR_ML_MAX_ITERATIONS = 500;
/** One-factor ML: smallest uniqueness allowed (a Heywood case stops here; common practice, as factanal's lower = 0.005). */
export const ONE_FACTOR_ML_UNIQUENESS_FLOOR = 0.005;

/** Iterated principal axes for k factors: stop when no communality moves by more than this. */
export const MINRES_FACTORS_TOLERANCE = 1e-12;
/** Iterated principal axes for k factors: at most this many eigen-decompositions. */
export const MINRES_FACTORS_MAX_ITERATIONS = 20_000;
/** Oblimin (gradient projection): stop when the projected gradient's norm falls below this (GPArotation's default is 1e-5). */
export const OBLIMIN_GRADIENT_TOLERANCE = 1e-8;
/** Oblimin: when no step lowers the criterion (rounding floor), the rotation counts as settled if the projected gradient is below this. */
export const OBLIMIN_STALL_TOLERANCE = 1e-6;
/** Oblimin (gradient projection): at most this many outer steps. */
export const OBLIMIN_MAX_ITERATIONS = 20_000;
