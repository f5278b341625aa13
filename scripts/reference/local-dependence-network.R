# Reference values for the regularised partial-correlation network of the local-dependence core:
# the graphical lasso (glasso::glasso), the EBIC-selected network (qgraph::EBICglasso) and the
# weighted topological overlap computed from it with the formula of Nowick et al. (2009), written
# out in base R below (EGAnet, which ships a wTO function, is not installed here).
# Writes fixtures/reference/local-dependence-network.json, read by
# tests/unit/{graphical-lasso,ebic-glasso,weighted-topological-overlap}.test.ts.
#
# Run from the repository root:  Rscript scripts/reference/local-dependence-network.R
# Needs R >= 4.2 with psych, qgraph, glasso and jsonlite (Debian: r-cran-psych r-cran-qgraph
# r-cran-jsonlite; r-cran-glasso comes with qgraph). Numbers are written with 15 significant
# digits (jsonlite digits = NA).
#
# Two convergence thresholds are recorded. glasso's default thr = 1e-4 stops when the mean
# absolute change of the covariance estimate falls below 1e-4 times the mean absolute
# off-diagonal input, so its answer is that far from the optimum; the "tight" calls pass
# thr = 1e-12 (and EBICglasso forwards it to glassopath) to pin the optimum itself. EBICglasso
# must be given `threshold = FALSE` explicitly beside `thr`: otherwise R's partial matching binds
# `thr` to EBICglasso's own `threshold` argument (which then hard-thresholds the network) and
# glassopath never sees it.

suppressPackageStartupMessages({
  library(jsonlite)
  library(psych)
  library(qgraph)
  library(glasso)
})

versions <- list(
  r = R.version.string,
  psych = as.character(packageVersion("psych")),
  qgraph = as.character(packageVersion("qgraph")),
  glasso = as.character(packageVersion("glasso")),
  jsonlite = as.character(packageVersion("jsonlite"))
)

# ── Input matrices ───────────────────────────────────────────────────────────────────────────
# 1. psych::bfi, the 25 personality items, pairwise Pearson (n = 2800 respondents).
bfiItems <- psych::bfi[, 1:25]
bfiR <- cor(bfiItems, use = "pairwise")
bfiN <- nrow(bfiItems)

# 2. A simulated wave: 12 items, two correlated factors, one planted doublet (items 2 and 3
#    share a residual correlation of .30), 400 rows.
set.seed(20261202)
simN <- 400
lambda <- c(0.7, 0.6, 0.6, 0.5, 0.65, 0.55, 0.7, 0.6, 0.5, 0.6, 0.45, 0.55)
factorOf <- c(1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 2)
f <- matrix(rnorm(simN * 2), simN, 2)
f[, 2] <- 0.4 * f[, 1] + sqrt(1 - 0.4^2) * f[, 2]
e <- matrix(rnorm(simN * 12), simN, 12)
shared <- rnorm(simN)
simX <- sapply(1:12, function(j) lambda[j] * f[, factorOf[j]] + sqrt(1 - lambda[j]^2) * e[, j])
simX[, 2] <- lambda[2] * f[, 1] + sqrt(1 - lambda[2]^2) * (sqrt(0.7) * e[, 2] + sqrt(0.3) * shared)
simX[, 3] <- lambda[3] * f[, 1] + sqrt(1 - lambda[3]^2) * (sqrt(0.7) * e[, 3] + sqrt(0.3) * shared)
colnames(simX) <- paste0("s", 1:12)
simR <- cor(simX)
simCov <- cov(simX)

# 3. A polychoric matrix: the ten agreeableness and conscientiousness items of psych::bfi,
#    first 600 complete rows (psych::polychoric, its default correction of .5 for empty cells).
polyItems <- na.omit(psych::bfi[, 1:10])[1:600, ]
polyR <- unclass(psych::polychoric(polyItems)$rho)
polyN <- nrow(polyItems)

# ── glasso::glasso at fixed penalties ────────────────────────────────────────────────────────
glassoCase <- function(name, s, rho, penalizeDiagonal) {
  tight <- glasso(s, rho = rho, penalize.diagonal = penalizeDiagonal, thr = 1e-12, maxit = 1e5)
  loose <- glasso(s, rho = rho, penalize.diagonal = penalizeDiagonal)
  list(
    name = name,
    rho = rho,
    penalizeDiagonal = penalizeDiagonal,
    input = unname(s),
    tight = list(
      call = sprintf("glasso::glasso(s, rho = %s, penalize.diagonal = %s, thr = 1e-12, maxit = 1e5)", rho, penalizeDiagonal),
      w = unname(tight$w), wi = unname(tight$wi), niter = tight$niter
    ),
    default = list(
      call = sprintf("glasso::glasso(s, rho = %s, penalize.diagonal = %s)", rho, penalizeDiagonal),
      w = unname(loose$w), wi = unname(loose$wi), niter = loose$niter
    )
  )
}
glassoCases <- list(
  glassoCase("simulated-correlation-rho-0.05", simR, 0.05, FALSE),
  glassoCase("simulated-correlation-rho-0.2", simR, 0.2, FALSE),
  glassoCase("simulated-covariance-rho-0.1-penalized-diagonal", simCov, 0.1, TRUE),
  glassoCase("bfi-correlation-rho-0.1", bfiR, 0.1, FALSE)
)

# ── qgraph::EBICglasso ───────────────────────────────────────────────────────────────────────
# wTO of Nowick et al. (2009) on a = |network| (zero diagonal):
#   wTO_ij = (sum_u a_iu a_uj + a_ij) / (min(k_i, k_j) + 1 - a_ij),  k_i = sum_u a_iu.
wto <- function(net) {
  a <- abs(net)
  diag(a) <- 0
  k <- rowSums(a)
  num <- a %*% a + a
  den <- outer(k, k, pmin) + 1 - a
  out <- num / den
  diag(out) <- 0
  out
}

ebicCase <- function(name, s, n) {
  tight <- suppressWarnings(suppressMessages(
    EBICglasso(s, n, gamma = 0.5, returnAllResults = TRUE, threshold = FALSE, thr = 1e-12, maxit = 1e5)
  ))
  default <- suppressWarnings(suppressMessages(EBICglasso(s, n, gamma = 0.5)))
  defaultAll <- suppressWarnings(suppressMessages(EBICglasso(s, n, gamma = 0.5, returnAllResults = TRUE)))
  net <- as.matrix(tight$optnet)
  list(
    name = name,
    n = n,
    input = unname(s),
    tight = list(
      call = "qgraph::EBICglasso(S, n, gamma = 0.5, returnAllResults = TRUE, threshold = FALSE, thr = 1e-12, maxit = 1e5)",
      lambda = tight$lambda,
      ebic = tight$ebic,
      selectedIndex = which.min(tight$ebic),
      network = unname(net),
      wto = list(
        call = "wto(tight$optnet), the base-R formula of Nowick et al. 2009 written in this script",
        value = unname(wto(net))
      )
    ),
    default = list(
      call = "qgraph::EBICglasso(S, n, gamma = 0.5)",
      lambda = defaultAll$lambda[which.min(defaultAll$ebic)],
      selectedIndex = which.min(defaultAll$ebic),
      network = unname(as.matrix(default))
    )
  )
}
ebicCases <- list(
  ebicCase("bfi-25-pairwise-pearson", bfiR, bfiN),
  ebicCase("simulated-12-doublet", simR, simN),
  ebicCase("bfi-10-polychoric", polyR, polyN)
)

fixture <- list(
  generatedBy = "scripts/reference/local-dependence-network.R",
  versions = versions,
  glasso = glassoCases,
  ebic = ebicCases
)

writeLines(
  toJSON(fixture, digits = NA, auto_unbox = TRUE, na = "null", matrix = "rowmajor"),
  "fixtures/reference/local-dependence-network.json"
)
cat("wrote fixtures/reference/local-dependence-network.json\n")
