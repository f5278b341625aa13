/**
 * The methods appendix of the memo: every statistic the audit reports, what it is for in one
 * sentence, and its published source (as listed in the project's methods notes). Journal details
 * were taken from those notes, which mark them as recalled; the memo cites author, year and title.
 */

/** One statistic of the appendix. */
export interface MemoMethod {
  readonly statistic: string;
  readonly use: string;
  readonly source: string;
}

/** The appendix rows, in the order the memo's sections use them. */
export const MEMO_METHODS: readonly MemoMethod[] = Object.freeze([
  { statistic: 'Reverse-keying', use: 'Recodes reverse-worded items as (min + max) − x before every statistic.', source: 'Common practice.' },
  { statistic: 'Long-string index', use: 'Flags respondents who give the same answer down a grid.', source: 'Johnson (2005), Ascertaining the validity of individual protocols from Web-based personality inventories.' },
  { statistic: 'Within-person SD', use: 'Flags respondents whose answers barely vary.', source: 'Dunn et al. (2018), Intra-individual response variability as an indicator of insufficient effort responding.' },
  { statistic: 'Speeders', use: 'Flags completion times below a share of the median.', source: 'Common practice (one third to one half of the median).' },
  { statistic: 'Floor and ceiling effects', use: 'Share of answers at the lowest or highest category; above 15% is flagged.', source: 'Terwee et al. (2007), Quality criteria were proposed for measurement properties of health status questionnaires.' },
  { statistic: 'Pearson and Spearman correlation', use: 'Pair correlations of the recoded items; Spearman on mid-ranks.', source: 'Pearson (1896); Spearman (1904).' },
  { statistic: 'Polychoric correlation', use: 'Correlation of the continuous traits behind two ordinal items (two-step estimator).', source: 'Olsson (1979), Maximum likelihood estimation of the polychoric correlation coefficient.' },
  { statistic: 'Bivariate normal probabilities', use: 'Cell probabilities of the polychoric likelihood.', source: 'Genz (2004), Numerical computation of rectangular bivariate and trivariate normal and t probabilities.' },
  { statistic: "Fisher's z interval", use: 'Confidence interval of a Pearson correlation.', source: 'Fisher (1921), On the probable error of a coefficient of correlation deduced from a small sample.' },
  { statistic: 'Nearest correlation matrix', use: 'Repairs an indefinite pairwise or polychoric matrix, reported when used.', source: 'Higham (2002), Computing the nearest correlation matrix.' },
  { statistic: 'VIF and tolerance', use: 'How much the other items explain an item: VIF = 1/(1 − R²).', source: 'Marquardt (1970), Generalized inverses, ridge regression, biased linear estimation, and nonlinear estimation.' },
  { statistic: 'Condition indices and variance-decomposition proportions', use: 'Near-dependencies among items in the scaled, uncentred data matrix.', source: 'Belsley, Kuh & Welsch (1980), Regression Diagnostics; Belsley (1991), Conditioning Diagnostics.' },
  { statistic: 'Residual correlations after a one-factor model', use: 'Local dependence: what two items share beyond their scale.', source: 'Yen (1984); Christensen, Makransky & Horton (2017), Critical values for Yen’s Q3.' },
  { statistic: 'Weighted topological overlap', use: 'Local dependence in a regularised partial-correlation network.', source: 'Nowick et al. (2009); Christensen, Garrido & Golino (2023), Unique Variable Analysis.' },
  { statistic: 'Graphical lasso with extended BIC', use: 'The regularised partial-correlation network.', source: 'Friedman, Hastie & Tibshirani (2008), Sparse inverse covariance estimation with the graphical lasso; Foygel & Drton (2010), Extended Bayesian information criteria for Gaussian graphical models.' },
  { statistic: 'Eigenvalues and parallel analysis', use: 'How many dimensions the items carry; components above the 95th percentile of random eigenvalues.', source: 'Horn (1965), A rationale and test for the number of factors in factor analysis; Glorfeld (1995).' },
  { statistic: 'Kaiser-Meyer-Olkin measure', use: 'Sampling adequacy of the whole matrix and of each item.', source: 'Kaiser (1970), A second generation little jiffy; Kaiser & Rice (1974), Little jiffy, mark IV.' },
  { statistic: "Bartlett's test of sphericity", use: 'Whether the items correlate at all.', source: 'Bartlett (1950), Tests of significance in factor analysis.' },
  { statistic: "Cronbach's alpha", use: 'Reliability of each scale from the raw covariances; standardized alpha beside it.', source: 'Cronbach (1951), Coefficient alpha and the internal structure of tests.' },
  { statistic: 'Item-rest correlation and alpha if deleted', use: 'Each item against the sum of the other items of its scale.', source: 'Common practice; see Cronbach (1951).' },
  { statistic: 'McDonald’s omega total', use: 'Reliability from one-factor (minimum residual) loadings.', source: 'McDonald (1999), Test Theory: A Unified Treatment.' },
  { statistic: 'Spearman-Brown prophecy', use: 'Projected reliability of a shortened scale.', source: 'Spearman (1910); Brown (1910).' },
  { statistic: 'Reliability thresholds', use: '.70 as the usual floor; above about .95 often signals redundant items.', source: 'Nunnally (1978), Psychometric Theory; Streiner (2003), Starting at the beginning.' },
  { statistic: 'OLS by Householder QR and standard-error decomposition', use: 'The driver model and how overlap inflates each standard error.', source: 'Textbook result (e.g. Wooldridge, Introductory Econometrics, ch. 3); accuracy checked against NIST StRD Longley.' },
  { statistic: 'Relative weights', use: 'Shares of R² that stay sensible when predictors overlap.', source: 'Johnson (2000), A heuristic method for estimating the relative weight of predictor variables in multiple regression.' },
  { statistic: 'Bootstrap stability', use: 'Share of resamples of respondents in which the same recommendation recurs.', source: 'Efron (1979), Bootstrap methods: another look at the jackknife.' },
]);
