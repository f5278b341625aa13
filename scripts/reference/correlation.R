#!/usr/bin/env Rscript
# Reference values for the correlation part of the numerical core (issue 3): normal and
# bivariate normal distribution functions, Pearson / Spearman / covariance matrices under
# pairwise and listwise deletion, item descriptives, polychoric correlations and thresholds,
# and Fisher-z intervals.
#
# Run from the repository root:   Rscript scripts/reference/correlation.R
# Writes:                          fixtures/reference/correlation-*.json
#
# Numbers are written with sprintf("%.17g") (round-trip exact); NA becomes null and ±Inf the
# strings "Infinity" / "-Infinity". Every fixture records the R calls and package versions.
# The synthetic ordinal data are generated here with a fixed seed and saved into the fixture,
# so the tests never need R.

suppressPackageStartupMessages({
  library(psych)
  library(mvtnorm)
})

out_dir <- file.path("fixtures", "reference")
dir.create(out_dir, recursive = TRUE, showWarnings = FALSE)

# ── A small JSON writer (17 significant digits) ──────────────────────────────────────────
arr <- function(x) structure(x, json_array = TRUE) # force an array even for length 1
json_number <- function(v) {
  ifelse(is.na(v), "null",
    ifelse(is.infinite(v), ifelse(v > 0, "\"Infinity\"", "\"-Infinity\""), sprintf("%.17g", v))
  )
}
json_string <- function(s) {
  s <- gsub("\\\\", "\\\\\\\\", s)
  s <- gsub("\"", "\\\\\"", s)
  s <- gsub("\n", "\\\\n", s)
  paste0("\"", s, "\"")
}
to_json <- function(x) {
  if (is.null(x)) return("null")
  if (is.matrix(x)) {
    rows <- vapply(seq_len(nrow(x)), function(i) to_json(arr(unname(x[i, ]))), "")
    return(paste0("[", paste(rows, collapse = ","), "]"))
  }
  if (is.list(x)) {
    parts <- vapply(x, to_json, "")
    if (!is.null(names(x))) {
      return(paste0("{", paste(paste0(json_string(names(x)), ":", parts), collapse = ","), "}"))
    }
    return(paste0("[", paste(parts, collapse = ","), "]"))
  }
  is_array <- isTRUE(attr(x, "json_array")) || length(x) != 1
  if (is.logical(x)) {
    values <- ifelse(is.na(x), "null", ifelse(x, "true", "false"))
  } else if (is.numeric(x)) {
    values <- json_number(as.numeric(x))
  } else {
    values <- json_string(as.character(x))
  }
  if (is_array) paste0("[", paste(values, collapse = ","), "]") else values
}
write_fixture <- function(name, content) {
  path <- file.path(out_dir, name)
  writeLines(to_json(content), path)
  cat("wrote", path, "\n")
}
provenance <- function(calls) {
  list(
    script = "scripts/reference/correlation.R",
    r = R.version.string,
    packages = list(
      psych = as.character(packageVersion("psych")),
      mvtnorm = as.character(packageVersion("mvtnorm")),
      stats = as.character(packageVersion("stats"))
    ),
    calls = arr(calls)
  )
}
columns_of <- function(x) lapply(seq_len(ncol(x)), function(j) arr(unname(as.numeric(x[, j]))))

# ── 1. Normal distribution ───────────────────────────────────────────────────────────────
xs <- c(-38, -37.5, -37, -30, -20, -10, -8, -6, -5.6568542494923806, -5, -3, -2, -1.5, -1,
        -0.66291, -0.5, -0.1, -1e-10, 0, 1e-10, 0.1, 0.5, 0.66291, 1, 1.5, 2, 3, 5, 6, 8, 8.3, 10)
ps <- c(1e-300, 1e-100, 1e-20, 1e-12, 1e-10, 1e-5, 0.001, 0.01, 0.025, 0.05, 0.075, 0.1, 0.3,
        0.5, 0.7, 0.9, 0.925, 0.95, 0.975, 0.99, 0.999, 1 - 1e-10)
write_fixture("correlation-normal-distribution.json", list(
  provenance = provenance(c("pnorm(x)", "pnorm(x, lower.tail = FALSE)", "dnorm(x)", "qnorm(p)")),
  cdf = lapply(xs, function(x) list(x = x, lower = pnorm(x), upper = pnorm(x, lower.tail = FALSE), density = dnorm(x))),
  quantile = lapply(ps, function(p) list(p = p, q = qnorm(p)))
))

# ── 2. Bivariate normal ──────────────────────────────────────────────────────────────────
# Plackett's identity: Φ2(h, k; ρ) = Φ(h)Φ(k) + ∫_0^ρ φ2(h, k; r) dr, integrated numerically
# (independent of Genz's method), and mvtnorm's TVPACK (Genz's own code) for comparison.
phi2 <- function(r, h, k) exp(-(h^2 - 2 * r * h * k + k^2) / (2 * (1 - r^2))) / (2 * pi * sqrt(1 - r^2))
plackett <- function(h, k, rho) {
  if (h == -Inf || k == -Inf) return(0)
  if (h == Inf) return(pnorm(k))
  if (k == Inf) return(pnorm(h))
  if (rho == 0) return(pnorm(h) * pnorm(k))
  pnorm(h) * pnorm(k) + integrate(phi2, 0, rho, h = h, k = k, rel.tol = 1e-13, abs.tol = 0, subdivisions = 2000L)$value
}
tvpack <- function(h, k, rho) {
  as.numeric(pmvnorm(upper = c(h, k), corr = matrix(c(1, rho, rho, 1), 2), algorithm = TVPACK(abseps = 1e-15)))
}
grid_h <- c(-3, -1.2, -0.3, 0, 0.4, 1.7, 2.5)
grid_rho <- c(-0.999, -0.95, -0.925, -0.8, -0.5, -0.29, -0.1, 0, 0.05, 0.3, 0.6, 0.74, 0.76, 0.9, 0.93, 0.99, 0.999)
cases <- list()
for (rho in grid_rho) for (h in grid_h) for (k in c(-2.2, -0.5, 0.3, 1.1, 2.8)) {
  cases[[length(cases) + 1]] <- list(h = h, k = k, rho = rho, plackett = plackett(h, k, rho), tvpack = tvpack(h, k, rho))
}
for (extra in list(c(-Inf, 0.5, 0.3), c(0.5, -Inf, 0.3), c(Inf, 0.7, 0.5), c(-0.4, Inf, -0.6),
                   c(Inf, Inf, 0.2), c(-5, -5, 0.8), c(6, -6, -0.5), c(0, 0, 0.5), c(-8, 3, 0.2))) {
  h <- extra[1]; k <- extra[2]; rho <- extra[3]
  cases[[length(cases) + 1]] <- list(h = h, k = k, rho = rho, plackett = plackett(h, k, rho),
    tvpack = if (is.finite(h) && is.finite(k)) tvpack(h, k, rho) else plackett(h, k, rho))
}
densities <- list()
for (rho in c(-0.9, -0.3, 0, 0.5, 0.95)) for (h in c(-1.5, 0, 0.8)) for (k in c(-0.7, 0.2, 2)) {
  densities[[length(densities) + 1]] <- list(h = h, k = k, rho = rho,
    density = dmvnorm(c(h, k), sigma = matrix(c(1, rho, rho, 1), 2)))
}
write_fixture("correlation-bivariate-normal.json", list(
  provenance = provenance(c(
    "pnorm(h) * pnorm(k) + integrate(function(r) bivariate density at (h, k; r), 0, rho, rel.tol = 1e-13)$value  # Plackett 1954",
    "mvtnorm::pmvnorm(upper = c(h, k), corr = matrix(c(1, rho, rho, 1), 2), algorithm = TVPACK(abseps = 1e-15))",
    "mvtnorm::dmvnorm(c(h, k), sigma = matrix(c(1, rho, rho, 1), 2))"
  )),
  cdf = cases,
  density = densities
))

# ── 3. Data sets ─────────────────────────────────────────────────────────────────────────
set.seed(20261202)
ordinal_data <- function(n, p, categories, missing_rate) {
  factor_score <- rnorm(n)
  loadings <- runif(p, 0.35, 0.8)
  cuts <- qnorm(seq_len(categories - 1) / categories) + runif(categories - 1, -0.25, 0.25)
  x <- sapply(seq_len(p), function(j) {
    latent <- loadings[j] * factor_score + sqrt(1 - loadings[j]^2) * rnorm(n)
    if (j %% 3 == 0) latent <- -latent # some negatively related items
    findInterval(latent, sort(cuts)) + 1
  })
  x[matrix(runif(n * p) < missing_rate, n, p)] <- NA
  colnames(x) <- paste0("q", seq_len(p))
  x
}
ordinal5 <- ordinal_data(500, 8, 5, 0.06)
ordinal7 <- ordinal_data(400, 6, 7, 0.05)

data(bfi, package = "psych")
bfi_items <- as.matrix(bfi[, 1:25])
attitude_m <- as.matrix(datasets::attitude)
mtcars_m <- as.matrix(datasets::mtcars[, c("mpg", "disp", "hp", "drat", "wt", "qsec")])
mtcars_holes <- mtcars_m
holes <- cbind(row = c(1, 4, 4, 9, 15, 22, 30, 31, 2), col = c(1, 2, 5, 3, 6, 1, 4, 2, 6))
mtcars_holes[holes] <- NA

descriptives <- function(x) {
  lapply(seq_len(ncol(x)), function(j) {
    v <- x[!is.na(x[, j]), j]
    list(n = length(v), mean = mean(v), sd = sd(v), min = min(v), max = max(v),
         floorShare = mean(v == min(v)), ceilingShare = mean(v == max(v)))
  })
}

# psych's two-step estimate with thresholds from every observed answer of each item.
poly_global <- function(x) {
  # A warning here would mean psych switched to global = FALSE (unequal category counts).
  result <- withCallingHandlers(
    psych::polychoric(x, smooth = FALSE, global = TRUE, correct = 0),
    warning = function(w) stop("psych::polychoric warned: ", conditionMessage(w))
  )
  list(rho = unname(result$rho), tau = unname(result$tau))
}

# An independent, tighter two-step estimate (R code, mvtnorm's TVPACK for the cell
# probabilities, optimize() to 1e-10): thresholds from all observed answers of each item.
thresholds_of <- function(v) {
  v <- v[!is.na(v)]
  shares <- cumsum(table(v)) / length(v)
  qnorm(shares[-length(shares)])
}
cell_probabilities <- function(rho, tx, ty) {
  rx <- c(-Inf, tx, Inf); ry <- c(-Inf, ty, Inf)
  cdf <- matrix(0, length(rx), length(ry))
  for (i in seq_along(rx)) for (j in seq_along(ry)) {
    cdf[i, j] <- if (rx[i] == -Inf || ry[j] == -Inf) 0
      else if (rx[i] == Inf && ry[j] == Inf) 1
      else if (rx[i] == Inf) pnorm(ry[j])
      else if (ry[j] == Inf) pnorm(rx[i])
      else tvpack(rx[i], ry[j], rho)
  }
  a <- nrow(cdf); b <- ncol(cdf)
  cdf[-1, -1] - cdf[-a, -1] - cdf[-1, -b] + cdf[-a, -b]
}
two_step_rho <- function(table, tx, ty) {
  negative_log_likelihood <- function(rho) {
    p <- cell_probabilities(rho, tx, ty)
    -sum(table[table > 0] * log(p[table > 0]))
  }
  optimize(negative_log_likelihood, c(-0.999999, 0.999999), tol = 1e-10)$minimum
}
poly_precise <- function(x) {
  p <- ncol(x)
  rho <- diag(p)
  for (i in 1:(p - 1)) for (j in (i + 1):p) {
    ok <- !is.na(x[, i]) & !is.na(x[, j])
    levels_i <- sort(unique(x[!is.na(x[, i]), i]))
    levels_j <- sort(unique(x[!is.na(x[, j]), j]))
    tab <- table(factor(x[ok, i], levels = levels_i), factor(x[ok, j], levels = levels_j))
    rho[i, j] <- rho[j, i] <- two_step_rho(unclass(tab), thresholds_of(x[, i]), thresholds_of(x[, j]))
  }
  rho
}

dataset_entry <- function(name, source, x, ordinal, precise = FALSE) {
  complete <- x[complete.cases(x), , drop = FALSE]
  observed <- !is.na(x)
  entry <- list(
    name = name,
    source = source,
    rows = nrow(x),
    columns = ncol(x),
    names = arr(colnames(x)),
    data = columns_of(x),
    completeRows = nrow(complete),
    pairCounts = unname(crossprod(observed * 1)),
    pearsonPairwise = unname(cor(x, use = "pairwise.complete.obs")),
    pearsonListwise = unname(cor(x, use = "complete.obs")),
    spearmanPairwise = unname(cor(x, use = "pairwise.complete.obs", method = "spearman")),
    spearmanListwise = unname(cor(x, use = "complete.obs", method = "spearman")),
    covariancePairwise = unname(cov(x, use = "pairwise.complete.obs")),
    covarianceListwise = unname(cov(x, use = "complete.obs")),
    descriptives = descriptives(x)
  )
  if (ordinal) {
    entry$polychoricPairwise <- poly_global(x)
    entry$polychoricListwise <- poly_global(complete)
  }
  if (precise) entry$polychoricPrecise <- unname(poly_precise(x))
  entry
}

datasets <- list(
  dataset_entry("attitude", "datasets::attitude (Chatterjee & Price 1977), 30 x 7, complete", attitude_m, FALSE),
  dataset_entry("mtcars", "datasets::mtcars[, c('mpg','disp','hp','drat','wt','qsec')], complete", mtcars_m, FALSE),
  dataset_entry("mtcars-holes", "the mtcars columns above with 9 cells set to NA (see holesAt)", mtcars_holes, FALSE),
  dataset_entry("bfi", "psych::bfi[, 1:25] (2800 x 25, 6-point items, with their missing values)", bfi_items, TRUE),
  dataset_entry("ordinal5", "synthetic: 500 x 8 five-point items, one factor, ~6% missing (seed 20261202)", ordinal5, TRUE, TRUE),
  dataset_entry("ordinal7", "synthetic: 400 x 6 seven-point items, one factor, ~5% missing (seed 20261202)", ordinal7, TRUE, TRUE)
)
datasets[[3]]$holesAt <- unname(holes)
write_fixture("correlation-datasets.json", list(
  provenance = provenance(c(
    "cor(x, use = 'pairwise.complete.obs'); cor(x, use = 'complete.obs')",
    "cor(x, use = 'pairwise.complete.obs', method = 'spearman'); cor(x, use = 'complete.obs', method = 'spearman')",
    "cov(x, use = 'pairwise.complete.obs'); cov(x, use = 'complete.obs')",
    "crossprod(!is.na(x))  # pair counts",
    "mean(v), sd(v), min(v), max(v), mean(v == min(v)), mean(v == max(v)) over the observed values v of each item",
    "psych::polychoric(x, smooth = FALSE, global = TRUE, correct = 0)  # pairwise; on x[complete.cases(x), ] for listwise",
    "two_step_rho(): thresholds qnorm(cumsum(table(v))/n) from all observed answers, cell probabilities by mvtnorm::pmvnorm(TVPACK(abseps = 1e-15)), optimize(tol = 1e-10)"
  )),
  datasets = datasets
))

# ── 4. Polychoric edge cases ─────────────────────────────────────────────────────────────
expand_table <- function(counts) {
  x <- integer(0); y <- integer(0)
  for (i in seq_len(nrow(counts))) for (j in seq_len(ncol(counts))) {
    x <- c(x, rep(i, counts[i, j])); y <- c(y, rep(j, counts[i, j]))
  }
  list(x = x, y = y)
}
# (a) A staircase table whose likelihood peaks at rho = 1 without a perfect association: the
#     empty cells of the observed rows and columns get 0.5 and rho is estimated again.
staircase <- matrix(c(20, 5, 0, 0, 30, 6, 0, 0, 25), 3, byrow = TRUE)
pair <- expand_table(staircase)
corrected <- staircase
corrected[corrected == 0] <- 0.5
staircase_rho <- two_step_rho(corrected, thresholds_of(pair$x), thresholds_of(pair$y))
staircase_psych <- psych::polychoric(cbind(pair$x, pair$y), smooth = FALSE, global = TRUE, correct = 0)$rho[1, 2]
# (b) A category of x observed only where y is missing: an empty row in the pair's table, with
#     x's thresholds still taken from all of its answers.
set.seed(7)
latent <- MASS::mvrnorm(300, c(0, 0), matrix(c(1, 0.6, 0.6, 1), 2))
ex <- findInterval(latent[, 1], c(-0.8, 0.2, 1.2)) + 1
ey <- findInterval(latent[, 2], c(-0.5, 0.5)) + 1
ey[ex == 4] <- NA
levels_x <- sort(unique(ex)); levels_y <- sort(unique(ey[!is.na(ey)]))
ok <- !is.na(ex) & !is.na(ey)
empty_row_tab <- unclass(table(factor(ex[ok], levels = levels_x), factor(ey[ok], levels = levels_y)))
empty_row_rho <- two_step_rho(empty_row_tab, thresholds_of(ex), thresholds_of(ey))
write_fixture("correlation-polychoric-edge.json", list(
  provenance = provenance(c(
    "staircase: two_step_rho(table with its 0 cells set to 0.5, thresholds from x and y)",
    "staircase: psych::polychoric(cbind(x, y), smooth = FALSE, global = TRUE, correct = 0)$rho[1, 2]  # uncorrected, at the boundary",
    "emptyRow: set.seed(7); MASS::mvrnorm(300, c(0, 0), matrix(c(1, .6, .6, 1), 2)); x cut at (-0.8, 0.2, 1.2), y at (-0.5, 0.5); y set NA where x == 4",
    "emptyRow: two_step_rho(pair table, thresholds of x from all its answers, thresholds of y)"
  )),
  staircase = list(table = staircase, x = arr(pair$x), y = arr(pair$y), correctedRho = staircase_rho, psychUncorrectedRho = staircase_psych,
                   thresholdsX = arr(unname(thresholds_of(pair$x))), thresholdsY = arr(unname(thresholds_of(pair$y)))),
  emptyRow = list(x = arr(ex), y = arr(ey), table = empty_row_tab, rho = empty_row_rho,
                  thresholdsX = arr(unname(thresholds_of(ex))), thresholdsY = arr(unname(thresholds_of(ey))))
))

# ── 5. Fisher-z intervals ────────────────────────────────────────────────────────────────
fisher <- list()
for (r in c(-0.95, -0.3, 0, 0.42, 0.8, 0.999)) for (n in c(4, 10, 57, 500)) for (level in c(0.9, 0.95, 0.99)) {
  half <- qnorm(0.5 + level / 2) / sqrt(n - 3)
  fisher[[length(fisher) + 1]] <- list(r = r, n = n, confidence = level,
    lower = tanh(atanh(r) - half), upper = tanh(atanh(r) + half),
    psych = arr(unname(psych::r.con(r, n, p = level))))
}
write_fixture("correlation-fisher-z.json", list(
  provenance = provenance(c(
    "tanh(atanh(r) + c(-1, 1) * qnorm(0.5 + level / 2) / sqrt(n - 3))",
    "psych::r.con(r, n, p = level)"
  )),
  cases = fisher
))
