# Reference values from open item sets that ship with R packages, for issue 14 ("real
# questionnaires"): screening of a scored test, the polychoric / tetrachoric standard error,
# parallel analysis on polychoric correlations, and one-factor models per scale.
#
# Run from the repository root:  Rscript scripts/reference/real-questionnaires.R
# Writes, under fixtures/reference/:
#   real-screening.json     psych::lsat6 and psych::lsat7 (LSAT sections 6 and 7, Bock & Lieberman
#                           1970: five scored right/wrong items, 1000 examinees each), expanded to
#                           rows, with rowSums counts and psych::alpha
#   real-polychoric-se.json polycor::polychor(x, y, std.err = TRUE, ML = FALSE) on pairs of
#                           psych::bfi items (six categories, missing answers) and of lsat6 (0/1)
#   real-parallel-poly.json psych::fa.parallel(x, cor = "poly", fa = "pc") on bfi agreeableness +
#                           conscientiousness (10 items) and on lsat7
#   real-one-factor.json    lavaan::cfa('f =~ ...', std.lv = TRUE) per scale: HolzingerSwineford1939
#                           visual / textual / speed and all nine, psych::bfi A, C, E, N, O (complete
#                           cases), each before and after dropping one item; standardized loadings,
#                           fitMeasures(chisq, df, rmsea, cfi, srmr), the correlation matrix and n
#
# Numbers are written with sprintf("%.17g") (jsonlite rounds to 15 significant digits).
suppressPackageStartupMessages({
  library(psych)
  library(polycor)
  library(lavaan)
  library(jsonlite)
})

versions <- list(
  r = R.version.string,
  psych = as.character(packageVersion("psych")),
  polycor = as.character(packageVersion("polycor")),
  lavaan = as.character(packageVersion("lavaan"))
)
script <- "scripts/reference/real-questionnaires.R"

json <- function(x) {
  if (is.null(x)) return("null")
  if (is.matrix(x)) {
    return(paste0("[", paste(vapply(seq_len(nrow(x)), function(i) json(I(unname(x[i, ]))), ""), collapse = ","), "]"))
  }
  if (is.list(x)) {
    parts <- vapply(x, json, "")
    if (!is.null(names(x))) {
      keys <- vapply(names(x), function(k) as.character(toJSON(k, auto_unbox = TRUE)), "")
      return(paste0("{", paste0(keys, ":", parts, collapse = ","), "}"))
    }
    return(paste0("[", paste(parts, collapse = ","), "]"))
  }
  scalar <- length(x) == 1 && !inherits(x, "AsIs")
  x <- unclass(x)
  if (is.character(x)) {
    items <- vapply(x, function(s) if (is.na(s)) "null" else as.character(toJSON(s, auto_unbox = TRUE)), "")
  } else if (is.logical(x)) {
    items <- ifelse(is.na(x), "null", ifelse(x, "true", "false"))
  } else {
    items <- ifelse(is.finite(x), sprintf("%.17g", as.numeric(x)), "null")
  }
  if (scalar) return(unname(items))
  paste0("[", paste(unname(items), collapse = ","), "]")
}
write_fixture <- function(value, name) {
  path <- file.path("fixtures/reference", name)
  writeLines(json(value), path)
  check <- fromJSON(path, simplifyVector = FALSE)
  stopifnot(length(check) == length(value))
  cat("wrote", path, "\n")
}
rows_of <- function(d) lapply(seq_len(nrow(d)), function(i) I(unname(as.numeric(d[i, ]))))

# ── Screening a scored test ───────────────────────────────────────────────────────────────
lsat <- function(d, name) {
  d <- as.matrix(d)
  list(
    name = name,
    items = I(colnames(d)),
    rows = rows_of(d),
    score_counts = I(as.numeric(table(factor(rowSums(d), levels = 0:ncol(d))))),
    alpha = psych::alpha(as.data.frame(d), warnings = FALSE)$total$raw_alpha,
    call = sprintf("psych::%s; table(rowSums(%s)); psych::alpha(%s)$total$raw_alpha", name, name, name)
  )
}
write_fixture(list(script = script, versions = versions, lsat6 = lsat(psych::lsat6, "lsat6"), lsat7 = lsat(psych::lsat7, "lsat7")), "real-screening.json")

# ── Polychoric / tetrachoric standard errors (two-step) ───────────────────────────────────
se_pair <- function(d, a, b, label) {
  # Pair-complete rows, so that the thresholds of both programs come from the same answers.
  keep <- !is.na(d[[a]]) & !is.na(d[[b]])
  x <- d[[a]][keep]
  y <- d[[b]][keep]
  rho <- polycor::polychor(x, y, ML = FALSE)
  # std.err = TRUE runs optim (BFGS) from `start`; starting at the optimise() estimate keeps the
  # Hessian at the two-step estimate itself.
  fit <- polycor::polychor(x, y, std.err = TRUE, ML = FALSE, start = rho)
  list(
    data = label, a = a, b = b,
    x = I(as.numeric(x)), y = I(as.numeric(y)),
    n = length(x),
    rho = rho, rhoStdErrRun = fit$rho, se = sqrt(fit$var[1, 1]),
    call = sprintf("keep <- complete.cases(%s$%s, %s$%s); rho <- polycor::polychor(x, y, ML = FALSE); fit <- polycor::polychor(x, y, std.err = TRUE, ML = FALSE, start = rho); sqrt(fit$var)", label, a, label, b)
  )
}
bfi_items <- psych::bfi[, 1:25]
lsat6 <- as.data.frame(psych::lsat6)
pairs <- list(
  se_pair(bfi_items, "A1", "A2", "bfi"),
  se_pair(bfi_items, "A2", "A3", "bfi"),
  se_pair(bfi_items, "C1", "C2", "bfi"),
  se_pair(bfi_items, "N1", "N2", "bfi"),
  se_pair(bfi_items, "O2", "O5", "bfi"),
  se_pair(lsat6, "Q1", "Q2", "lsat6"),
  se_pair(lsat6, "Q3", "Q4", "lsat6"),
  se_pair(lsat6, "Q2", "Q5", "lsat6")
)
write_fixture(list(script = script, versions = versions, pairs = pairs), "real-polychoric-se.json")

# ── Parallel analysis on polychoric correlations ──────────────────────────────────────────
pa <- function(d, label, iterations) {
  set.seed(2026)
  res <- psych::fa.parallel(d, cor = "poly", fa = "pc", n.iter = iterations, plot = FALSE, quant = 0.95)
  list(
    data = label, items = I(colnames(d)), rows = rows_of(d),
    # fa.parallel's $pc.sim and $pc.simr are the MEANS of the random eigenvalues (values.sim.mean
    # in its source); the quantiles are not returned for components.
    observed = I(res$pc.values), simulatedMean = I(res$pc.sim), resampledMean = I(res$pc.simr),
    ncomp = res$ncomp, iterations = iterations,
    call = sprintf("set.seed(2026); psych::fa.parallel(%s, cor = 'poly', fa = 'pc', n.iter = %d, quant = 0.95); $pc.values, $pc.sim (mean), $pc.simr (mean), $ncomp (observed above the resampled mean)", label, iterations)
  )
}
ac <- psych::bfi[complete.cases(psych::bfi[, 1:10]), 1:10]
ac <- ac[seq(1, nrow(ac), by = 4), ]
sink("/dev/null")
pa_sets <- list(pa(ac, "bfi[complete.cases(bfi[,1:10]), 1:10][seq(1, n, by = 4), ]", 20), pa(as.data.frame(psych::lsat7), "lsat7", 20))
sink()
write_fixture(list(script = script, versions = versions, sets = pa_sets), "real-parallel-poly.json")

# ── One-factor models per scale (ML on Pearson data) ──────────────────────────────────────
one_factor <- function(d, label, scale, items) {
  d <- d[complete.cases(d[, items]), items]
  model <- paste("f =~", paste(items, collapse = " + "))
  fit <- lavaan::cfa(model, data = d, std.lv = TRUE)
  std <- lavaan::standardizedSolution(fit)
  loadings <- std$est.std[std$op == "=~"]
  fm <- lavaan::fitMeasures(fit, c("chisq", "df", "rmsea", "cfi", "srmr"))
  residuals <- lavaan::lavResiduals(fit, type = "cor.bentler")$cov
  list(
    data = label, scale = scale, items = I(items), n = nrow(d),
    correlation = unname(cor(d)),
    loadings = I(unname(loadings)),
    chisq = unname(fm["chisq"]), df = unname(fm["df"]), rmsea = unname(fm["rmsea"]), cfi = unname(fm["cfi"]), srmr = unname(fm["srmr"]),
    residualCorrelations = unname(residuals),
    call = sprintf("lavaan::cfa('%s', data = %s[complete.cases(...), ], std.lv = TRUE); standardizedSolution(fit); fitMeasures(fit, c('chisq','df','rmsea','cfi','srmr')); lavResiduals(fit, type = 'cor.bentler')$cov", model, label)
  )
}
hs <- lavaan::HolzingerSwineford1939
bfi <- psych::bfi
models <- list(
  one_factor(hs, "HolzingerSwineford1939", "visual", c("x1", "x2", "x3")),
  one_factor(hs, "HolzingerSwineford1939", "textual", c("x4", "x5", "x6")),
  one_factor(hs, "HolzingerSwineford1939", "speed", c("x7", "x8", "x9")),
  one_factor(hs, "HolzingerSwineford1939", "all nine", paste0("x", 1:9)),
  one_factor(hs, "HolzingerSwineford1939", "all nine without x9", paste0("x", 1:8)),
  one_factor(bfi, "bfi", "A", paste0("A", 1:5)),
  one_factor(bfi, "bfi", "A without A1", paste0("A", 2:5)),
  one_factor(bfi, "bfi", "C", paste0("C", 1:5)),
  one_factor(bfi, "bfi", "E", paste0("E", 1:5)),
  one_factor(bfi, "bfi", "N", paste0("N", 1:5)),
  one_factor(bfi, "bfi", "N without N2", c("N1", "N3", "N4", "N5")),
  one_factor(bfi, "bfi", "O", paste0("O", 1:5))
)
write_fixture(list(script = script, versions = versions, models = models), "real-one-factor.json")
