# Reference values for the residual-correlation part of the local-dependence core: residual
# correlations after each scale's one-factor minres model (psych::fa), their Q3 form (divided by
# sqrt((1 - l_i^2)(1 - l_j^2)): the correlation of the residuals given the factor), the relative residual
# (residual minus the scale's mean off-diagonal residual; Christensen, Makransky & Horton 2017),
# and the null distribution of the largest relative residual under the fitted one-factor model,
# drawn by a parametric bootstrap written here in base R + psych (R's own RNG).
# Writes fixtures/reference/local-dependence-residuals.json, read by
# tests/unit/residual-correlations.test.ts.
#
# Run from the repository root:  Rscript scripts/reference/local-dependence-residuals.R
# Needs R >= 4.2 with psych and jsonlite (Debian: r-cran-psych r-cran-jsonlite). About a minute.
# Numbers are written with 15 significant digits (jsonlite digits = NA).
#
# The bootstrap here and the one in the core use different random generators, so their draws are
# two independent samples of the same distribution; the test compares them with a two-sample
# Kolmogorov-Smirnov bound and compares the 95th / 99th percentiles within Monte Carlo error.

suppressPackageStartupMessages({
  library(jsonlite)
  library(psych)
})

versions <- list(
  r = R.version.string,
  psych = as.character(packageVersion("psych")),
  jsonlite = as.character(packageVersion("jsonlite"))
)

bfi <- psych::bfi
# Reverse-keyed items of psych::bfi (its documentation's keys list), recoded 7 - x.
reversed <- c("A1", "C4", "C5", "E1", "E2", "O2", "O5")
for (item in reversed) bfi[[item]] <- 7 - bfi[[item]]

scales <- list(
  agreeableness = paste0("A", 1:5),
  conscientiousness = paste0("C", 1:5),
  extraversion = paste0("E", 1:5),
  neuroticism = paste0("N", 1:5),
  openness = paste0("O", 1:5)
)

offDiagonalMean <- function(m) mean(m[upper.tri(m)])

oneFactor <- function(r) {
  f <- suppressWarnings(fa(r, nfactors = 1, fm = "minres", warnings = FALSE))
  l <- as.vector(f$loadings)
  if (sum(l) < 0) l <- -l
  res <- f$residual
  diag(res) <- 0
  # Q3 carried to the factor model: the correlation of the two items' residuals given the factor.
  q3 <- res / sqrt(outer(1 - l^2, 1 - l^2))
  diag(q3) <- 0
  list(loadings = l, residual = res, q3 = q3)
}

residualCases <- lapply(names(scales), function(name) {
  items <- scales[[name]]
  r <- cor(bfi[, items], use = "pairwise")
  fit <- oneFactor(r)
  res <- fit$residual
  rel <- res - offDiagonalMean(res)
  diag(rel) <- 0
  q3rel <- fit$q3 - offDiagonalMean(fit$q3)
  diag(q3rel) <- 0
  list(
    name = paste0("bfi-", name),
    items = items,
    correlation = unname(r),
    call = "f <- psych::fa(cor(bfi[, items], use = 'pairwise'), nfactors = 1, fm = 'minres'); f$residual with its diagonal set to 0",
    loadings = fit$loadings,
    residual = unname(res),
    meanResidual = offDiagonalMean(res),
    relative = unname(rel),
    q3 = unname(fit$q3),
    q3Relative = unname(q3rel)
  )
})

# Parametric bootstrap of the largest relative residual under a one-factor model with loadings l:
# x_j = l_j f + sqrt(1 - l_j^2) e_j (normal), n rows; optionally cut at thresholds tau_j (the
# ordinal case), then Pearson r, minres refit, largest (residual - mean residual) over pairs.
bootstrapMaxRelative <- function(l, n, draws, thresholds = NULL) {
  k <- length(l)
  out <- numeric(draws)
  outQ3 <- numeric(draws)
  for (b in seq_len(draws)) {
    f <- rnorm(n)
    x <- sapply(seq_len(k), function(j) l[j] * f + sqrt(1 - l[j]^2) * rnorm(n))
    if (!is.null(thresholds)) {
      x <- sapply(seq_len(k), function(j) findInterval(x[, j], thresholds[[j]]))
    }
    fit <- oneFactor(cor(x))
    res <- fit$residual
    out[b] <- max((res - offDiagonalMean(res))[upper.tri(res)])
    outQ3[b] <- max((fit$q3 - offDiagonalMean(fit$q3))[upper.tri(fit$q3)])
  }
  list(residual = out, q3 = outQ3)
}

set.seed(20261202)
draws <- 1000
bootstrapCases <- list()

# 1. Normal data from a five-item model with moderate loadings, n = 300.
l1 <- c(0.75, 0.7, 0.65, 0.6, 0.55)
d1 <- bootstrapMaxRelative(l1, 300, draws)
bootstrapCases[[1]] <- list(name = "five-items-n300-normal", loadings = l1, n = 300, thresholds = NULL, maxRelative = d1$residual, maxRelativeQ3 = d1$q3)

# 2. Normal data, ten items, n = 150 (more pairs, fewer rows: a larger critical value).
l2 <- c(0.8, 0.75, 0.7, 0.7, 0.65, 0.6, 0.6, 0.55, 0.5, 0.45)
d2 <- bootstrapMaxRelative(l2, 150, draws)
bootstrapCases[[2]] <- list(name = "ten-items-n150-normal", loadings = l2, n = 150, thresholds = NULL, maxRelative = d2$residual, maxRelativeQ3 = d2$q3)

# 3. Ordinal: the neuroticism loadings above, cut into six categories at the thresholds of
#    psych::bfi's N1-N5 marginal proportions (qnorm of the cumulative shares), n = 250.
l3 <- residualCases[[4]]$loadings
tau3 <- lapply(scales$neuroticism, function(item) {
  p <- cumsum(table(bfi[[item]])) / sum(!is.na(bfi[[item]]))
  unname(qnorm(p[-length(p)]))
})
d3 <- bootstrapMaxRelative(l3, 250, draws, tau3)
bootstrapCases[[3]] <- list(name = "bfi-neuroticism-n250-ordinal", loadings = l3, n = 250, thresholds = tau3, maxRelative = d3$residual, maxRelativeQ3 = d3$q3)

bootstrapCases <- lapply(bootstrapCases, function(case) {
  case$call <- "bootstrapMaxRelative(loadings, n, 1000, thresholds) in this script; quantile(draws, c(.95, .99)) (type 7)"
  case$quantiles <- unname(quantile(case$maxRelative, c(0.95, 0.99), type = 7))
  case$quantilesQ3 <- unname(quantile(case$maxRelativeQ3, c(0.95, 0.99), type = 7))
  case
})

fixture <- list(
  generatedBy = "scripts/reference/local-dependence-residuals.R",
  versions = versions,
  residuals = residualCases,
  bootstrap = bootstrapCases
)

writeLines(
  toJSON(fixture, digits = NA, auto_unbox = TRUE, na = "null", matrix = "rowmajor", null = "null"),
  "fixtures/reference/local-dependence-residuals.json"
)
cat("wrote fixtures/reference/local-dependence-residuals.json\n")
