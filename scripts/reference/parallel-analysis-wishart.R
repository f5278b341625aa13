# Reference values for parallel analysis drawn from the Wishart law (src/lib/stats/
# wishart-correlation.ts, parallel-analysis.ts): psych::fa.parallel's simulated eigenvalues of
# random normal data, for three shapes, one of them with fewer respondents than items (a singular
# Wishart). Writes fixtures/reference/parallel-analysis-wishart.json, read by
# tests/unit/wishart-correlation.test.ts.
#
# Run from the repository root:  Rscript scripts/reference/parallel-analysis-wishart.R
# Needs R >= 4.2 with psych and jsonlite (Debian: r-cran-psych r-cran-jsonlite).
#
# The R call per shape (rows n, items p, N simulated data sets):
#   fp <- psych::fa.parallel(diag(p), n.obs = n, fa = "pc", n.iter = N, plot = FALSE)
#   fp$values: N x p, each row the eigenvalues of cor(matrix(rnorm(n * p), n, p))
# and from it per position: quantile(type = 7, 0.95), the mean, and the simulation error of each:
#   the mean's standard error sd / sqrt(N);
#   the 95th percentile's standard error from its distribution-free 95% confidence interval
#   [x(l), x(u)], l, u = N q -/+ 1.96 sqrt(N q (1 - q)) (Conover 1999, Practical Nonparametric
#   Statistics, 3rd ed., section 3.2), as (x(u) - x(l)) / (2 * 1.96).
# The test computes the same two errors from its own draws and allows 4 combined standard errors.

suppressPackageStartupMessages({
  library(jsonlite)
  library(psych)
})

set.seed(20261202)
shapes <- list(c(n = 15, p = 20, N = 2000), c(n = 200, p = 10, N = 4000), c(n = 1000, p = 40, N = 2000))
q <- 0.95
z <- 1.96

percentile_se <- function(x) {
  s <- sort(x)
  N <- length(s)
  half <- z * sqrt(N * q * (1 - q))
  l <- max(1, floor(N * q - half))
  u <- min(N, ceiling(N * q + half))
  (s[u] - s[l]) / (2 * z)
}

cases <- lapply(shapes, function(shape) {
  n <- shape[["n"]]; p <- shape[["p"]]; N <- shape[["N"]]
  fp <- fa.parallel(diag(p), n.obs = n, fa = "pc", n.iter = N, plot = FALSE)
  values <- fp$values
  list(
    rows = n, items = p, draws = N,
    call = sprintf("psych::fa.parallel(diag(%d), n.obs = %d, fa = \"pc\", n.iter = %d, plot = FALSE)$values", p, n, N),
    random95 = unname(apply(values, 2, quantile, probs = q, type = 7)),
    randomMean = unname(colMeans(values)),
    se95 = unname(apply(values, 2, percentile_se)),
    seMean = unname(apply(values, 2, sd) / sqrt(N))
  )
})

out <- list(
  generated = "Rscript scripts/reference/parallel-analysis-wishart.R",
  versions = list(r = R.version.string, psych = as.character(packageVersion("psych")), jsonlite = as.character(packageVersion("jsonlite"))),
  seed = 20261202,
  cases = cases
)
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, pretty = TRUE), "fixtures/reference/parallel-analysis-wishart.json")
