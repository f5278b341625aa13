# Reference values for the smoothing of indefinite correlation matrices (Bentler & Yuan 2011):
# minimum trace factor analysis (MTFA) communalities from a general semidefinite-programming
# solver (CSDP through Rcsdp, the solver Debelak & Tran used), the off-diagonal scaling with
# k = .98, and for comparison psych::cor.smooth and the figures that invert the matrix (largest
# VIF, KMO, condition number) before and after, beside the pairwise Pearson matrix of the same data.
# Writes fixtures/reference/smooth-correlation.json, read by
# tests/unit/smooth-correlation-matrix.test.ts.
#
# Run from the repository root:  Rscript scripts/reference/smooth-correlation.R
# Needs R >= 4.2 with psych, Rcsdp and jsonlite (Debian: r-cran-psych r-cran-rcsdp
# r-cran-jsonlite). Numbers are written with 15 significant digits (jsonlite digits = NA).

suppressPackageStartupMessages({
  library(jsonlite)
  library(psych)
  library(Rcsdp)
})

versions <- list(
  r = R.version.string,
  psych = as.character(packageVersion("psych")),
  Rcsdp = as.character(packageVersion("Rcsdp")),
  jsonlite = as.character(packageVersion("jsonlite"))
)

# MTFA with bounds 0 <= h <= upper as a semidefinite program in CSDP's standard form:
#   dual: minimise sum(y) subject to  diag(y) - (I - R) >= 0 (psd),  upper - y >= 0,  y >= 0,
# so y are the communalities h with R - I + diag(h) psd.
mtfa <- function(R, upper = 2.5) {
  p <- ncol(R)
  C <- list(diag(p) - R, -rep(upper, p), rep(0, p))
  A <- lapply(seq_len(p), function(i) {
    e <- rep(0, p)
    e[i] <- 1
    list(diag(e), -e, e)
  })
  K <- list(type = c("s", "l", "l"), size = rep(p, 3))
  out <- csdp(C, A, rep(1, p), K, control = csdp.control(printlevel = 0))
  stopifnot(out$status == 0)
  out$y
}

bentlerYuan <- function(R, h, k = 0.98) {
  d <- ifelse(h >= 1, sqrt(k / h), 1)
  S <- R * outer(d, d)
  diag(S) <- 1
  S
}

figures <- function(R) {
  e <- eigen(R, symmetric = TRUE)$values
  list(
    smallestEigenvalue = min(e),
    largestVif = if (min(e) > 0) max(diag(solve(R))) else NULL,
    kmo = if (min(e) > 0) KMO(R)$MSA else NULL,
    conditionNumber = if (min(e) > 0) sqrt(max(e) / min(e)) else NULL
  )
}

describeCase <- function(name, source, R, pearson = NULL) {
  h <- mtfa(R)
  by <- bentlerYuan(R, h)
  cs <- suppressWarnings(cor.smooth(R))
  list(
    name = name,
    source = source,
    correlation = unname(R),
    mtfa = list(call = "mtfa(R): Rcsdp::csdp on the MTFA semidefinite program, bounds 0 <= h <= 2.5 (this script)", communalities = h),
    bentlerYuan = list(
      call = "bentlerYuan(R, mtfa(R), k = 0.98): r_ij * d_i * d_j with d_i = sqrt(k / h_i) where h_i >= 1 (this script)",
      matrix = unname(by),
      figures = figures(by)
    ),
    corSmooth = list(call = "psych::cor.smooth(R)", matrix = unname(cs), figures = figures(cs)),
    before = figures(R),
    pearson = if (is.null(pearson)) NULL else list(call = "cor(x, use = 'pairwise') of the same data", figures = figures(pearson))
  )
}

# 1. A simulated pilot wave with a near-duplicate pair: 12 five-point items on one factor, items
#    1 and 2 near-copies (latent r about .97), 220 rows, 12% of answers missing completely at
#    random; pairwise polychoric correlations without psych's own smoothing. The seed is the first
#    from 1 upward whose matrix is indefinite (found by the loop, recorded below).
simulate <- function(seed) {
  set.seed(seed)
  n <- 220
  p <- 12
  l <- c(0.8, 0.8, seq(0.7, 0.5, length.out = p - 2))
  f <- rnorm(n)
  z <- sapply(seq_len(p), function(j) l[j] * f + sqrt(1 - l[j]^2) * rnorm(n))
  z[, 2] <- 0.985 * z[, 1] + sqrt(1 - 0.985^2) * rnorm(n)
  x <- apply(z, 2, function(v) findInterval(v, c(-1.3, -0.4, 0.4, 1.3)) + 1)
  x[matrix(runif(n * p) < 0.12, n, p)] <- NA
  colnames(x) <- paste0("q", seq_len(p))
  x
}
seed <- 1
repeat {
  x <- simulate(seed)
  poly <- suppressWarnings(suppressMessages(polychoric(x, smooth = FALSE)$rho))
  if (min(eigen(poly, symmetric = TRUE)$values) < 0) break
  seed <- seed + 1
}
case1 <- describeCase(
  "simulated-near-duplicate-pairwise-polychoric",
  sprintf("simulate(%d) in this script; psych::polychoric(x, smooth = FALSE)$rho", seed),
  unclass(poly),
  cor(x, use = "pairwise")
)
case1$data <- unname(x)

# 2. The ten agreeableness and conscientiousness items of psych::bfi (polychoric, 600 complete
#    rows) with two cells made inconsistent: A2-A3 pushed to .95 and A1-A2 turned from -.42 to
#    +.50 (A1 stays negative with A3), which makes the matrix clearly indefinite (about -.21).
polyItems <- na.omit(psych::bfi[, 1:10])[1:600, ]
R2 <- unclass(psych::polychoric(polyItems)$rho)
R2[2, 3] <- R2[3, 2] <- 0.95
R2[1, 2] <- R2[2, 1] <- 0.5
stopifnot(min(eigen(R2, symmetric = TRUE)$values) < 0)
case2 <- describeCase("bfi-10-polychoric-two-cells-altered", "psych::polychoric(na.omit(bfi[, 1:10])[1:600, ])$rho with r[A2, A3] = .95 and r[A1, A2] = .50", unname(R2))

fixture <- list(
  generatedBy = "scripts/reference/smooth-correlation.R",
  versions = versions,
  cases = list(case1, case2)
)

writeLines(
  toJSON(fixture, digits = NA, auto_unbox = TRUE, na = "null", matrix = "rowmajor", null = "null"),
  "fixtures/reference/smooth-correlation.json"
)
cat("wrote fixtures/reference/smooth-correlation.json (simulated seed", seed, ")\n")
