# Reference values for the overlap and structure part of the numerical core: VIF, eigenvalues,
# KMO/MSA, condition number, Belsley-Kuh-Welsch diagnostics, the nearest correlation matrix and
# parallel-analysis percentiles. Writes fixtures/reference/overlap.json, read by
# tests/unit/{variance-inflation,symmetric-eigen,kmo,condition-number,belsley-collinearity,
# nearest-correlation,parallel-analysis}.test.ts.
#
# Run from the repository root:  Rscript scripts/reference/overlap.R
# Needs R >= 4.2 with psych, car and jsonlite (Debian: r-cran-psych r-cran-car r-cran-jsonlite)
# and the recommended package Matrix. The data sets ship with R (datasets) and psych.
# Numbers are written with 15 significant digits (jsonlite digits = NA).

suppressPackageStartupMessages({
  library(jsonlite)
  library(psych)
  library(car)
  library(Matrix)
})

versions <- list(
  r = R.version.string,
  psych = as.character(packageVersion("psych")),
  car = as.character(packageVersion("car")),
  Matrix = as.character(packageVersion("Matrix")),
  jsonlite = as.character(packageVersion("jsonlite"))
)

# Belsley-Kuh-Welsch from base R's svd(): intercept first, every column scaled to unit length.
bkw <- function(X) {
  X <- cbind("(intercept)" = 1, as.matrix(X))
  Xs <- sweep(X, 2, sqrt(colSums(X^2)), "/")
  s <- svd(Xs)
  phi <- sweep(s$v^2, 2, s$d^2, "/")
  list(
    call = "Xs <- sweep(cbind(1, X), 2, sqrt(colSums(cbind(1, X)^2)), '/'); s <- svd(Xs); max(s$d)/s$d; t(phi / rowSums(phi)) with phi = sweep(s$v^2, 2, s$d^2, '/')",
    singularValues = s$d,
    conditionIndices = max(s$d) / s$d,
    proportions = t(phi / rowSums(phi))
  )
}

describe <- function(name, source, X, raw = X, outcome = NULL, outcomeName = NULL) {
  X <- as.data.frame(X)
  R <- cor(X)
  e <- eigen(R, symmetric = TRUE)
  k <- KMO(R)
  out <- list(
    name = name,
    source = source,
    columns = colnames(X),
    rows = nrow(X),
    # Raw data, row-major, NA written as null (only psych::bfi has missing values).
    data = unname(as.matrix(raw)),
    correlation = list(call = "cor(X)", value = unname(R)),
    vifFromInverse = list(call = "diag(solve(cor(X)))", value = unname(diag(solve(R)))),
    eigen = list(
      call = "eigen(cor(X), symmetric = TRUE)",
      values = e$values,
      vectors = unname(e$vectors)
    ),
    conditionNumber = list(
      call = "sqrt(max(ev) / min(ev)), ev = eigen(cor(X), symmetric = TRUE)$values",
      value = sqrt(max(e$values) / min(e$values))
    ),
    kmo = list(call = "psych::KMO(cor(X))", overall = k$MSA, items = unname(k$MSAi)),
    bkw = bkw(X)
  )
  if (!is.null(outcome)) {
    fit <- lm(outcome ~ ., data = X)
    out$vifCar <- list(
      call = sprintf("car::vif(lm(%s ~ ., data = X))", outcomeName),
      value = unname(car::vif(fit))
    )
    out$outcome <- unname(outcome)
  }
  out
}

datasets <- list()

# datasets::longley (1967): six predictors of Employed.
longley_x <- longley[, c("GNP.deflator", "GNP", "Unemployed", "Armed.Forces", "Population", "Year")]
datasets[[length(datasets) + 1]] <- describe(
  "longley", "datasets::longley", longley_x,
  outcome = longley$Employed, outcomeName = "Employed"
)

# datasets::mtcars: ten predictors of mpg.
datasets[[length(datasets) + 1]] <- describe(
  "mtcars", "datasets::mtcars", mtcars[, -1],
  outcome = mtcars$mpg, outcomeName = "mpg"
)

# datasets::swiss: five predictors of Fertility.
datasets[[length(datasets) + 1]] <- describe(
  "swiss", "datasets::swiss", swiss[, -1],
  outcome = swiss$Fertility, outcomeName = "Fertility"
)

# datasets::attitude: six predictors of rating.
datasets[[length(datasets) + 1]] <- describe(
  "attitude", "datasets::attitude", attitude[, -1],
  outcome = attitude$rating, outcomeName = "rating"
)

# psych::bfi, the 25 personality items. The statistics use complete cases; the data written are
# the raw 2800 rows WITH missing values, so the tests also exercise listwise deletion.
bfi_items <- psych::bfi[, 1:25]
bfi_complete <- na.omit(bfi_items)
bfi_entry <- describe(
  "bfi", "psych::bfi[, 1:25], statistics on na.omit() (complete cases)", bfi_complete,
  raw = bfi_items,
  outcome = psych::bfi[rownames(bfi_complete), "age"], outcomeName = "age"
)
# The reverse-keyed items recoded x' = (1 + 6) - x, as the product does before any statistic.
bfi_reversed <- bfi_complete
reverse_keyed <- c("A1", "C4", "C5", "E1", "E2", "O2", "O5")
bfi_reversed[, reverse_keyed] <- 7 - bfi_reversed[, reverse_keyed]
bfi_entry$reversedKeys <- list(
  items = match(reverse_keyed, colnames(bfi_items)) - 1,
  call = "X[, c('A1','C4','C5','E1','E2','O2','O5')] <- 7 - X[, ...] on na.omit(bfi[, 1:25])",
  bkw = bkw(bfi_reversed),
  vifFromInverse = unname(diag(solve(cor(bfi_reversed)))),
  eigenValues = eigen(cor(bfi_reversed), symmetric = TRUE)$values,
  kmoOverall = KMO(cor(bfi_reversed))$MSA
)
datasets[[length(datasets) + 1]] <- bfi_entry

# psych::sat.act, complete cases (SATQ has missing values).
sat <- na.omit(psych::sat.act)
datasets[[length(datasets) + 1]] <- describe("sat.act", "na.omit(psych::sat.act)", sat)

# Nearest correlation matrices (Higham 2002) from Matrix::nearPD with corr = TRUE and no final
# eigenvalue step, at a tight convergence tolerance.
near <- function(name, A) {
  fit <- Matrix::nearPD(A, corr = TRUE, do2eigen = FALSE, conv.tol = 1e-13, maxit = 10000)
  list(
    name = name,
    input = unname(A),
    inputEigenvalues = eigen(A, symmetric = TRUE)$values,
    call = "Matrix::nearPD(A, corr = TRUE, do2eigen = FALSE, conv.tol = 1e-13, maxit = 10000)",
    nearest = unname(as.matrix(fit$mat)),
    iterations = fit$iterations,
    converged = fit$converged
  )
}
nearest <- list(
  # Higham 2002, section 4: the 3 x 3 example.
  near("higham2002", matrix(c(1, 1, 0, 1, 1, 1, 0, 1, 1), 3)),
  # An inconsistent set of pairwise correlations (invented).
  near("inconsistent3", matrix(c(1, 0.9, 0.9, 0.9, 1, -0.5, 0.9, -0.5, 1), 3)),
  near("inconsistent5", matrix(c(
    1.00, 0.85, 0.80, -0.30, 0.10,
    0.85, 1.00, 0.20, 0.75, 0.05,
    0.80, 0.20, 1.00, -0.60, 0.40,
    -0.30, 0.75, -0.60, 1.00, 0.30,
    0.10, 0.05, 0.40, 0.30, 1.00
  ), 5))
)

# Parallel analysis: 95th percentiles of eigenvalues of correlation matrices of independent
# normal data, by brute force with many replications (R's own generator; only the distribution,
# not the draws, is comparable).
random_percentiles <- function(n, p, reps, seed) {
  set.seed(seed)
  values <- replicate(reps, eigen(cor(matrix(rnorm(n * p), n, p)), symmetric = TRUE, only.values = TRUE)$values)
  list(
    rows = n,
    items = p,
    replications = reps,
    call = sprintf("set.seed(%d); apply(replicate(%d, eigen(cor(matrix(rnorm(%d * %d), %d, %d)), symmetric = TRUE, only.values = TRUE)$values), 1, quantile, 0.95, type = 7)", seed, reps, n, p, n, p),
    random95 = unname(apply(values, 1, quantile, probs = 0.95, type = 7)),
    randomMean = unname(rowMeans(values))
  )
}
parallel <- list(
  small = random_percentiles(400, 40, 4000, 20260101),
  bfi = c(
    random_percentiles(nrow(bfi_complete), 25, 2000, 20260102),
    list(observed = eigen(cor(bfi_complete), symmetric = TRUE)$values)
  )
)
bfi_pa <- parallel$bfi
parallel$bfi$suggested <- {
  k <- 0
  while (k < length(bfi_pa$observed) && bfi_pa$observed[k + 1] > bfi_pa$random95[k + 1]) k <- k + 1
  k
}
parallel$bfi$margins <- bfi_pa$observed - bfi_pa$random95

fixture <- list(
  generatedBy = "scripts/reference/overlap.R",
  versions = versions,
  datasets = datasets,
  nearestCorrelation = nearest,
  parallelAnalysis = parallel
)
dir.create("fixtures/reference", recursive = TRUE, showWarnings = FALSE)
writeLines(
  toJSON(fixture, digits = NA, auto_unbox = TRUE, na = "null", matrix = "rowmajor"),
  "fixtures/reference/overlap.json"
)
cat("wrote fixtures/reference/overlap.json\n")
