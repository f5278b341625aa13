# Reference values for the reliability, model and distribution part of the numerical core
# (src/lib/stats: log-gamma, incomplete beta/gamma, t/F/chi-square distributions, Bartlett's test,
# Cronbach's alpha, item-rest correlation, alpha if deleted, minres one-factor loadings, omega
# total, OLS, relative weights).
#
# Run from the repository root:  Rscript scripts/reference/reliability.R
# Writes, under fixtures/reference/:
#   distributions.json      lgamma, pt, qt, pf, pchisq over a grid
#   reliability.json        psych::alpha, psych::cortest.bartlett, psych::fa(minres), omega, on
#                           psych::bfi scales (published keys, complete cases) and datasets::attitude
#   longley-nist.json       NIST StRD Longley data rebuilt from datasets::longley in NIST units
#   ols-lm.json             lm() on datasets::swiss and datasets::mtcars (plus an aliased design)
#   relative-weights.json   Johnson (2000) relative weights written independently in base R
#
# Numbers are written with sprintf("%.17g") by the small writer below (jsonlite rounds to 15
# significant digits), so every double round-trips exactly.
suppressPackageStartupMessages({
  library(psych)
  library(car)
  library(jsonlite)
})

versions <- list(
  r = R.version.string,
  psych = as.character(packageVersion("psych")),
  car = as.character(packageVersion("car")),
  GPArotation = tryCatch(as.character(packageVersion("GPArotation")), error = function(e) NULL)
)
script <- "scripts/reference/reliability.R"

# ── A JSON writer that keeps all 17 significant digits ─────────────────────────────────────
# Length-1 atomic vectors become scalars unless wrapped in I(); matrices become arrays of rows;
# NA/NaN/Inf become null.
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
  writeLines(prettify(json(value), indent = 1), path)
  check <- fromJSON(path, simplifyVector = FALSE)
  stopifnot(length(check) == length(value))
  cat("wrote", path, "\n")
}

# ── Distributions ───────────────────────────────────────────────────────────────────────────
lgamma_x <- c(1e-8, 0.01, 0.3, 0.5, 0.9, 1, 1.5, 2, 2.5, 3.7, 7.25, 9.99, 10, 10.01, 33.3, 100.5, 1e4, 1e8)
t_df <- c(1, 2, 3, 4.5, 7, 10, 25, 60, 150, 1000, 1e5)
t_x <- c(-40, -4, -1.5, -0.3, 0, 0.1, 0.5, 1, 1.96, 2.5, 4, 8, 15, 40, 200)
q_p <- c(1e-12, 1e-6, 0.001, 0.025, 0.1, 0.4, 0.6, 0.9, 0.975, 0.999, 0.999999)
f_df1 <- c(1, 2, 3, 5, 10, 30, 200)
f_df2 <- c(1, 2, 5, 10, 30, 100, 1000)
f_x <- c(0.05, 0.5, 1, 2, 4, 10, 50)
c_df <- c(0.5, 1, 2, 3, 5, 10, 21, 50, 100, 300, 1000, 1e4)
c_mult <- c(0.01, 0.1, 0.5, 0.9, 1, 1.1, 1.5, 2, 4)
b_shape <- c(0.5, 1, 2.5, 10, 50, 300, 5000)
b_x <- c(0.001, 0.01, 0.1, 0.3, 0.5, 0.7, 0.9, 0.99, 0.999)
g_shape <- c(0.5, 1, 3, 9.5, 10, 50, 300, 5000, 1e5)

t_grid <- expand.grid(t = t_x, df = t_df)
qt_grid <- expand.grid(p = q_p, df = t_df)
f_grid <- expand.grid(x = f_x, df1 = f_df1, df2 = f_df2)
c_grid <- do.call(rbind, lapply(c_df, function(d) data.frame(x = c(c_mult * d, 0.001, 1, 3.84, 30), df = d)))

b_grid <- expand.grid(x = b_x, a = b_shape, b = b_shape)
g_grid <- do.call(rbind, lapply(g_shape, function(a) data.frame(x = c(c_mult * a, 0.01, 1, 5, 40), a = a)))

rows_of <- function(df) lapply(seq_len(nrow(df)), function(i) as.list(df[i, , drop = FALSE]))
distributions <- list(
  source = script,
  versions = versions,
  logGamma = list(call = "lgamma(x)", rows = rows_of(data.frame(x = lgamma_x, value = lgamma(lgamma_x)))),
  logBeta = list(call = "lbeta(a, b)", rows = rows_of(unique(data.frame(a = b_grid$a, b = b_grid$b, value = lbeta(b_grid$a, b_grid$b))))),
  beta = list(
    call = "pbeta(x, a, b) and pbeta(x, a, b, lower.tail = FALSE)",
    rows = rows_of(data.frame(x = b_grid$x, a = b_grid$a, b = b_grid$b,
                              lower = pbeta(b_grid$x, b_grid$a, b_grid$b),
                              upper = pbeta(b_grid$x, b_grid$a, b_grid$b, lower.tail = FALSE)))
  ),
  gamma = list(
    call = "pgamma(x, a) and pgamma(x, a, lower.tail = FALSE)",
    rows = rows_of(data.frame(x = g_grid$x, a = g_grid$a, lower = pgamma(g_grid$x, g_grid$a),
                              upper = pgamma(g_grid$x, g_grid$a, lower.tail = FALSE)))
  ),
  t = list(
    call = "pt(t, df) and 2 * pt(-abs(t), df)",
    rows = rows_of(data.frame(t = t_grid$t, df = t_grid$df, lower = pt(t_grid$t, t_grid$df),
                              twoSided = 2 * pt(-abs(t_grid$t), t_grid$df)))
  ),
  tQuantile = list(call = "qt(p, df)", rows = rows_of(data.frame(p = qt_grid$p, df = qt_grid$df, value = qt(qt_grid$p, qt_grid$df)))),
  f = list(
    call = "pf(x, df1, df2) and pf(x, df1, df2, lower.tail = FALSE)",
    rows = rows_of(data.frame(x = f_grid$x, df1 = f_grid$df1, df2 = f_grid$df2,
                              lower = pf(f_grid$x, f_grid$df1, f_grid$df2),
                              upper = pf(f_grid$x, f_grid$df1, f_grid$df2, lower.tail = FALSE)))
  ),
  chiSquare = list(
    call = "pchisq(x, df) and pchisq(x, df, lower.tail = FALSE)",
    rows = rows_of(data.frame(x = c_grid$x, df = c_grid$df, lower = pchisq(c_grid$x, c_grid$df),
                              upper = pchisq(c_grid$x, c_grid$df, lower.tail = FALSE)))
  )
)
write_fixture(distributions, "distributions.json")

# ── Reliability, Bartlett, minres, omega ────────────────────────────────────────────────────
# psych::alpha uses cov(x, use = "pairwise") by default; on complete cases that is cov(x), so the
# reference is unambiguous. Reverse-keying uses the published keys (psych::bfi.keys) and the bfi
# response range 1..6: x' = (1 + 6) - x.
data(bfi, package = "psych")
data(attitude, package = "datasets")

reliability_case <- function(name, description, x, reversed) {
  x <- as.data.frame(x)
  n <- nrow(x)
  C <- cov(x)
  R <- cor(x)
  k <- ncol(x)
  a <- suppressWarnings(psych::alpha(x))
  bart <- psych::cortest.bartlett(R, n = n)
  f <- psych::fa(R, nfactors = 1, fm = "minres", n.obs = n)
  loadings <- as.numeric(f$loadings[, 1])
  if (sum(loadings) < 0) loadings <- -loadings
  omega_formula <- sum(loadings)^2 / (sum(loadings)^2 + sum(1 - loadings^2))
  omega_psych <- tryCatch(
    suppressWarnings(suppressMessages(psych::omega(x, nfactors = 1, plot = FALSE)$omega.tot)),
    error = function(e) NULL
  )
  list(
    name = name,
    description = description,
    items = I(colnames(x)),
    reversed = I(reversed),
    n = n,
    covariance = C,
    correlation = R,
    alpha = list(
      call = "psych::alpha(x) on complete cases (its default cov(x, use = \"pairwise\") equals cov(x) there)",
      rawAlpha = a$total$raw_alpha,
      stdAlpha = a$total$std.alpha,
      rDrop = I(a$item.stats$r.drop),
      alphaDropRaw = I(a$alpha.drop$raw_alpha),
      alphaDropStd = I(a$alpha.drop$std.alpha)
    ),
    bartlett = list(
      call = "psych::cortest.bartlett(cor(x), n = nrow(x))",
      chisq = unname(bart$chisq), df = unname(bart$df), p = unname(bart$p.value)
    ),
    minres = list(
      call = "psych::fa(cor(x), nfactors = 1, fm = 'minres', n.obs = nrow(x))$loadings, sign set so the sum is positive",
      loadings = I(loadings),
      communalities = I(loadings^2)
    ),
    omega = list(
      call = "(sum(l))^2 / ((sum(l))^2 + sum(1 - l^2)) on the minres loadings above",
      omegaTotal = omega_formula,
      psychOmegaCall = "psych::omega(x, nfactors = 1, plot = FALSE)$omega.tot (for information: total variance from sum(R), not the model)",
      psychOmegaTotal = omega_psych
    )
  )
}

reverse_bfi <- function(items, reversed) {
  x <- bfi[, items]
  for (item in reversed) x[[item]] <- 7 - x[[item]]
  na.omit(x)
}

cases <- list()
for (scale in names(bfi.keys)) {
  keys <- bfi.keys[[scale]]
  items <- sub("^-", "", keys)
  reversed <- items[startsWith(keys, "-")]
  x <- reverse_bfi(items, reversed)
  cases[[length(cases) + 1]] <- reliability_case(
    paste0("bfi-", scale),
    sprintf("psych::bfi %s items, reverse-keyed by psych::bfi.keys as 7 - x, complete cases (na.omit)", scale),
    x, reversed
  )
}
all_keys <- unlist(bfi.keys, use.names = FALSE)
all_items <- sub("^-", "", all_keys)
all_reversed <- all_items[startsWith(all_keys, "-")]
cases[[length(cases) + 1]] <- reliability_case(
  "bfi-all25",
  "psych::bfi all 25 personality items, reverse-keyed by psych::bfi.keys as 7 - x, complete cases",
  reverse_bfi(all_items, all_reversed), all_reversed
)
cases[[length(cases) + 1]] <- reliability_case(
  "attitude", "datasets::attitude, all 7 columns (no reverse-keying, no missing values)", attitude, character(0)
)
two <- reverse_bfi(c("A2", "A3"), character(0))
two_alpha <- psych::alpha(two)
reliability <- list(
  source = script,
  versions = versions,
  cases = cases,
  twoItems = list(
    description = "psych::bfi A2 and A3, complete cases",
    call = "psych::alpha(x) (alpha.drop is not used: psych reports C12/C22 there, not an alpha)",
    items = I(colnames(two)),
    n = nrow(two),
    covariance = cov(two),
    rawAlpha = two_alpha$total$raw_alpha,
    stdAlpha = two_alpha$total$std.alpha,
    rDrop = I(two_alpha$item.stats$r.drop)
  )
)
write_fixture(reliability, "reliability.json")

# ── Longley in NIST units ───────────────────────────────────────────────────────────────────
# NIST StRD Longley.dat: y = Employed (persons), x1 = GNP deflator, x2 = GNP, x3 = Unemployed,
# x4 = Armed forces, x5 = Population (14 and over), x6 = Year. datasets::longley holds the same
# numbers on other scales: GNP, Population and Employed x 1000 and Unemployed, Armed.Forces x 10
# give NIST's units; rounding removes the binary noise of the products (checked below).
nist <- data.frame(
  y = round(longley$Employed * 1000),
  x1 = longley$GNP.deflator,
  x2 = round(longley$GNP * 1000),
  x3 = round(longley$Unemployed * 10),
  x4 = round(longley$Armed.Forces * 10),
  x5 = round(longley$Population * 1000),
  x6 = longley$Year
)
stopifnot(all(abs(nist$x2 - longley$GNP * 1000) < 1e-6), all(abs(nist$y - longley$Employed * 1000) < 1e-6))
fit <- lm(y ~ x1 + x2 + x3 + x4 + x5 + x6, data = nist)
sfit <- summary(fit)
longley_fixture <- list(
  source = script,
  versions = versions,
  description = paste(
    "Longley (1967) data, public domain, as in NIST StRD Longley.dat, rebuilt from datasets::longley:",
    "y = round(Employed*1000), x1 = GNP.deflator, x2 = round(GNP*1000), x3 = round(Unemployed*10),",
    "x4 = round(Armed.Forces*10), x5 = round(Population*1000), x6 = Year"
  ),
  columns = I(names(nist)),
  rows = as.matrix(nist),
  rLm = list(
    call = "summary(lm(y ~ x1 + x2 + x3 + x4 + x5 + x6, data = nist)) (for information; tests use the NIST certified values)",
    estimates = I(unname(coef(sfit)[, 1])),
    standardErrors = I(unname(coef(sfit)[, 2])),
    sigma = sfit$sigma,
    rSquared = sfit$r.squared
  )
)
write_fixture(longley_fixture, "longley-nist.json")

# ── OLS against lm() ────────────────────────────────────────────────────────────────────────
lm_case <- function(name, description, data, outcome, call) {
  predictors <- setdiff(names(data), outcome)
  fit <- lm(reformulate(predictors, outcome), data = data)
  s <- summary(fit)
  coefs <- coef(fit) # includes NA for aliased terms
  table <- coef(s)    # aliased terms are dropped from this table
  full <- function(column) {
    out <- rep(NA_real_, length(coefs))
    names(out) <- names(coefs)
    out[rownames(table)] <- table[, column]
    I(unname(out))
  }
  aliased <- names(coefs)[is.na(coefs)]
  kept <- setdiff(predictors, aliased)
  aux <- vapply(predictors, function(p) {
    if (p %in% aliased) return(NA_real_)
    others <- setdiff(kept, p)
    if (length(others) == 0) return(0)
    summary(lm(reformulate(others, p), data = data))$r.squared
  }, 0)
  vif <- if (length(aliased) == 0 && length(predictors) > 1) I(unname(car::vif(fit))) else NULL
  list(
    name = name,
    description = description,
    call = call,
    outcome = outcome,
    predictors = I(predictors),
    rows = as.matrix(data[, c(predictors, outcome)]),
    terms = I(c("(Intercept)", predictors)),
    estimates = full("Estimate"),
    standardErrors = full("Std. Error"),
    tValues = full("t value"),
    pValues = full("Pr(>|t|)"),
    aliased = I(aliased),
    rSquared = s$r.squared,
    adjRSquared = s$adj.r.squared,
    sigma = s$sigma,
    residualDf = fit$df.residual,
    sumOfSquaredResiduals = sum(residuals(fit)^2),
    fStatistic = I(unname(s$fstatistic)),
    fPValue = pf(s$fstatistic[1], s$fstatistic[2], s$fstatistic[3], lower.tail = FALSE)[[1]],
    fCall = "summary(fit)$fstatistic (value, numdf, dendf); pf(value, numdf, dendf, lower.tail = FALSE)",
    auxiliaryRSquared = I(unname(aux)),
    auxiliaryCall = "summary(lm(x_j ~ other kept predictors))$r.squared",
    carVif = vif,
    carVifCall = if (is.null(vif)) NULL else "car::vif(fit)"
  )
}
data(swiss, package = "datasets")
data(mtcars, package = "datasets")
swiss_aliased <- swiss[, c("Agriculture", "Examination", "Education", "Catholic", "Infant.Mortality", "Fertility")]
swiss_aliased$AgriPlusEdu <- swiss$Agriculture + swiss$Education
swiss_aliased <- swiss_aliased[, c("Agriculture", "AgriPlusEdu", "Examination", "Education", "Catholic", "Infant.Mortality", "Fertility")]
ols <- list(
  source = script,
  versions = versions,
  cases = list(
    lm_case("swiss", "datasets::swiss, Fertility on the other five columns", swiss, "Fertility",
            "summary(lm(Fertility ~ ., data = swiss))"),
    lm_case("mtcars", "datasets::mtcars, mpg on the other ten columns", mtcars, "mpg",
            "summary(lm(mpg ~ ., data = mtcars))"),
    lm_case("swiss-aliased",
            "datasets::swiss with AgriPlusEdu = Agriculture + Education inserted as the second predictor: Education (later) is aliased",
            swiss_aliased, "Fertility",
            "summary(lm(Fertility ~ Agriculture + AgriPlusEdu + Examination + Education + Catholic + Infant.Mortality))")
  )
)
write_fixture(ols, "ols-lm.json")

# ── Relative weights, written independently in base R ───────────────────────────────────────
# Johnson (2000): R_xx = V diag(l) V'; Lambda = V diag(sqrt(l)) V' (correlations of the predictors
# with their closest orthonormal counterparts Z); beta = solve(Lambda, r_xy) (outcome on Z);
# raw weight_j = sum_k Lambda[j,k]^2 beta[k]^2. Here solve() is LAPACK's LU, not an eigen inverse.
relative_weights_r <- function(data, outcome) {
  predictors <- setdiff(names(data), outcome)
  R <- cor(data[, predictors])
  rxy <- cor(data[, predictors], data[[outcome]])[, 1]
  e <- eigen(R, symmetric = TRUE)
  Lambda <- e$vectors %*% diag(sqrt(e$values)) %*% t(e$vectors)
  beta <- solve(Lambda, rxy)
  raw <- as.numeric((Lambda^2) %*% (beta^2))
  list(predictors = predictors, R = R, rxy = rxy, raw = raw,
       r2 = summary(lm(reformulate(predictors, outcome), data = data))$r.squared)
}
rw_case <- function(name, data, outcome) {
  w <- relative_weights_r(data, outcome)
  list(
    name = name,
    call = sprintf("base R: eigen(cor(X), symmetric = TRUE), Lambda = V sqrt(D) V', beta = solve(Lambda, r_xy), weights = (Lambda^2) %%*%% beta^2; R^2 from summary(lm(%s ~ .))$r.squared", outcome),
    predictors = I(w$predictors),
    predictorCorrelation = w$R,
    outcomeCorrelation = I(unname(w$rxy)),
    rawWeights = I(w$raw),
    rescaledWeights = I(w$raw / sum(w$raw)),
    rSquared = w$r2
  )
}
relative <- list(
  source = script,
  versions = versions,
  note = "Johnson 2000's own worked example is not reproduced: its published values could not be checked here.",
  cases = list(
    rw_case("swiss", swiss, "Fertility"),
    rw_case("attitude", attitude, "rating"),
    rw_case("mtcars", mtcars, "mpg")
  )
)
write_fixture(relative, "relative-weights.json")
