# Reference values for the EM estimate of the mean vector and covariance matrix under missing at
# random (Dempster, Laird & Rubin 1977; Little & Rubin 2002, §11.2), and for the
# Belsley-Kuh-Welsch diagnostics computed from those moments instead of complete rows.
# The EM is written below in base R (per row: conditional mean and covariance of the missing
# answers given the observed ones through solve(Sigma_OO)); lavaan's saturated model with
# missing = "ml" (full-information ML, the same estimate) is recorded as a second opinion.
# Writes fixtures/reference/em-covariance.json, read by tests/unit/em-covariance.test.ts.
#
# Run from the repository root:  Rscript scripts/reference/em-covariance.R
# Needs R >= 4.2 with psych, lavaan and jsonlite (Debian: r-cran-psych r-cran-lavaan
# r-cran-jsonlite). Numbers are written with 15 significant digits (jsonlite digits = NA).

suppressPackageStartupMessages({
  library(jsonlite)
  library(psych)
  library(lavaan)
})

versions <- list(
  r = R.version.string,
  psych = as.character(packageVersion("psych")),
  lavaan = as.character(packageVersion("lavaan")),
  jsonlite = as.character(packageVersion("jsonlite"))
)

# EM for the multivariate normal with missing values; covariance with divisor n (the ML estimate).
emNormal <- function(x, tol = 1e-13, maxit = 10000) {
  x <- as.matrix(x)
  x <- x[rowSums(!is.na(x)) > 0, , drop = FALSE]
  n <- nrow(x)
  p <- ncol(x)
  mu <- colMeans(x, na.rm = TRUE)
  sigma <- diag(apply(x, 2, function(v) mean((v - mean(v, na.rm = TRUE))^2, na.rm = TRUE)), p)
  for (it in seq_len(maxit)) {
    t1 <- numeric(p)
    t2 <- matrix(0, p, p)
    for (i in seq_len(n)) {
      o <- !is.na(x[i, ])
      xi <- x[i, ]
      ci <- matrix(0, p, p)
      if (any(!o)) {
        m <- !o
        b <- sigma[m, o, drop = FALSE] %*% solve(sigma[o, o, drop = FALSE])
        xi[m] <- mu[m] + b %*% (x[i, o] - mu[o])
        ci[m, m] <- sigma[m, m, drop = FALSE] - b %*% sigma[o, m, drop = FALSE]
      }
      t1 <- t1 + xi
      t2 <- t2 + tcrossprod(xi) + ci
    }
    muNew <- t1 / n
    sigmaNew <- t2 / n - tcrossprod(muNew)
    change <- max(abs(muNew - mu), abs(sigmaNew - sigma))
    mu <- muNew
    sigma <- sigmaNew
    if (change < tol) break
  }
  list(means = mu, covariance = sigma, iterations = it, rows = n)
}

# Belsley-Kuh-Welsch from moments: X'X of [1, X] over n rows is n * [[1, mu'], [mu, Sigma + mu mu']];
# scale to a unit diagonal (columns of unit length), eigen-decompose (d^2 and V).
bkwFromMoments <- function(mu, sigma, n) {
  p <- length(mu)
  g <- n * rbind(c(1, mu), cbind(mu, sigma + tcrossprod(mu)))
  s <- 1 / sqrt(diag(g))
  g <- g * outer(s, s)
  e <- eigen(g, symmetric = TRUE)
  d <- sqrt(pmax(e$values, 0))
  phi <- sweep(e$vectors^2, 2, d^2, "/")
  list(
    call = "bkwFromMoments(em$means, em$covariance, em$rows) in this script",
    singularValues = d,
    conditionIndices = max(d) / d,
    proportions = t(phi / rowSums(phi))
  )
}

describeCase <- function(name, source, x) {
  em <- emNormal(x)
  fit <- lavCor(as.data.frame(x), missing = "ml", output = "fit")
  implied <- lavInspect(fit, "implied")
  list(
    name = name,
    source = source,
    rows = nrow(x),
    columns = ncol(x),
    missingShare = mean(is.na(x)),
    completeRows = sum(complete.cases(x)),
    data = unname(as.matrix(x)),
    em = list(
      call = "emNormal(x, tol = 1e-13) in this script (covariance divisor n)",
      means = unname(em$means),
      covariance = unname(em$covariance),
      iterations = em$iterations,
      rows = em$rows
    ),
    lavaan = list(
      call = "lavInspect(lavCor(as.data.frame(x), missing = 'ml', output = 'fit'), 'implied')",
      means = unname(implied$mean),
      covariance = unname(unclass(implied$cov))
    ),
    bkw = bkwFromMoments(em$means, em$covariance, em$rows)
  )
}

# 1. psych::bfi, the first 400 rows of its 25 items (scattered missing answers as published).
bfiX <- as.matrix(psych::bfi[1:400, 1:25])

# 2. A simulated wave missing at random: 8 items, 300 rows; items 2-8 go missing with a
#    probability that rises with item 1 (always observed), 5% to 25%.
set.seed(20261202)
n <- 300
f <- rnorm(n)
l <- c(0.8, 0.7, 0.7, 0.6, 0.6, 0.5, 0.5, 0.4)
z <- sapply(l, function(a) a * f + sqrt(1 - a^2) * rnorm(n))
simX <- round(3 + 1.1 * z, 0)
prob <- 0.05 + 0.2 * (rank(simX[, 1]) / n)
for (j in 2:8) simX[runif(n) < prob, j] <- NA

fixture <- list(
  generatedBy = "scripts/reference/em-covariance.R",
  versions = versions,
  cases = list(
    describeCase("bfi-400-rows-25-items", "psych::bfi[1:400, 1:25]", bfiX),
    describeCase("simulated-mar-8-items", "simulated in this script (seed 20261202), missing depends on item 1", simX)
  )
)

writeLines(
  toJSON(fixture, digits = NA, auto_unbox = TRUE, na = "null", matrix = "rowmajor", null = "null"),
  "fixtures/reference/em-covariance.json"
)
cat("wrote fixtures/reference/em-covariance.json\n")
