# Reference values for the exploratory view of multi-scale waves (issue 14): minres factors,
# oblimin rotation (GPArotation), factor correlations and omega hierarchical (psych::omega,
# Schmid-Leiman).
#
# Run from the repository root:  Rscript scripts/reference/exploratory-structure.R
# Writes fixtures/reference/exploratory-structure.json with, per data set:
#   correlation      cor(x) on complete cases (reverse-keyed items negated first, as an audit's
#                    recoded matrix has them)
#   unrotated        psych::fa(R, nfactors = k, fm = "minres", rotate = "none", n.obs = n)$loadings
#   oblimin          GPArotation::oblimin(unrotated, eps = 1e-8, maxit = 20000): loadings, Phi
#                    (the rotation started from the same unrotated loadings, converged tightly)
#   faOblimin        psych::fa(R, k, fm = "minres", rotate = "oblimin", n.obs = n): loadings, Phi
#                    (psych sorts and signs the factors; GPArotation's default eps = 1e-5)
#   omega            psych::omega(R, nfactors = k, fm = "minres", n.obs = n, plot = FALSE):
#                    omega_h, omega.tot, the Schmid-Leiman g loadings (schmid$sl[, "g"])
#   slTight          the same Schmid-Leiman steps (psych::schmid's) on the tight oblimin
#                    solution: g loadings (items with negative g reversed, psych's flip = TRUE),
#                    omega_h = sum(g)^2 / sum(R with those items reversed), omega_tot
# Numbers are written with sprintf("%.17g").
suppressPackageStartupMessages({
  library(psych)
  library(psychTools)
  library(GPArotation)
  library(lavaan)
  library(jsonlite)
})

versions <- list(
  r = R.version.string,
  psych = as.character(packageVersion("psych")),
  GPArotation = as.character(packageVersion("GPArotation")),
  psychTools = as.character(packageVersion("psychTools")),
  lavaan = as.character(packageVersion("lavaan"))
)
script <- "scripts/reference/exploratory-structure.R"

num <- function(x) ifelse(is.finite(x), sprintf("%.17g", as.numeric(x)), "null")
json <- function(x) {
  if (is.null(x)) return("null")
  if (is.matrix(x)) return(paste0("[", paste(vapply(seq_len(nrow(x)), function(i) json(I(unname(as.numeric(x[i, ])))), ""), collapse = ","), "]"))
  if (is.list(x)) {
    parts <- vapply(x, json, "")
    if (!is.null(names(x))) return(paste0("{", paste0('"', names(x), '":', parts, collapse = ","), "}"))
    return(paste0("[", paste(parts, collapse = ","), "]"))
  }
  scalar <- length(x) == 1 && !inherits(x, "AsIs")
  x <- unclass(x)
  items <- if (is.character(x)) vapply(x, function(s) as.character(toJSON(s, auto_unbox = TRUE)), "") else num(x)
  if (scalar) return(unname(items))
  paste0("[", paste(unname(items), collapse = ","), "]")
}

# Schmid-Leiman as psych::schmid computes it, from given oblique loadings and Phi.
schmid_leiman <- function(fload, phi, orth, R) {
  k <- ncol(fload)
  gload <- if (k > 2) as.numeric(loadings(fa(phi, fm = "minres"))) else c(sqrt(abs(phi[1, 2])), sign(phi[1, 2]) * sqrt(abs(phi[1, 2])))
  g <- as.numeric(fload %*% gload)
  h2 <- rowSums(orth^2)
  # psych::omega's flip = TRUE: items with a negative g loading are reversed before summing.
  key <- ifelse(g < 0, -1, 1)
  Vt <- sum(diag(key) %*% R %*% diag(key))
  list(gFactorLoadings = I(gload), g = I(g * key), flipped = I(which(key < 0) - 1), omegaH = sum(g * key)^2 / Vt, omegaTotal = (Vt - sum(1 - h2)) / Vt)
}

one_set <- function(name, x, k, call) {
  x <- x[complete.cases(x), ]
  R <- cor(x)
  n <- nrow(x)
  unrot <- unclass(loadings(fa(R, nfactors = k, fm = "minres", rotate = "none", n.obs = n)))
  rot <- GPArotation::oblimin(unrot, eps = 1e-8, maxit = 20000)
  fao <- fa(R, nfactors = k, fm = "minres", rotate = "oblimin", n.obs = n)
  om <- suppressMessages(suppressWarnings(omega(R, nfactors = k, fm = "minres", n.obs = n, plot = FALSE)))
  list(
    name = name, call = call, items = I(colnames(x)), n = n, factors = k,
    correlation = R,
    unrotated = unrot,
    oblimin = list(loadings = unclass(rot$loadings), phi = rot$Phi, call = "GPArotation::oblimin(unrotated, eps = 1e-8, maxit = 20000)"),
    faOblimin = list(loadings = unclass(fao$loadings), phi = fao$Phi, call = sprintf("psych::fa(R, %d, fm = 'minres', rotate = 'oblimin', n.obs = %d)", k, n)),
    omega = list(omegaH = om$omega_h, omegaTotal = om$omega.tot, g = I(as.numeric(om$schmid$sl[, "g"])), call = sprintf("psych::omega(R, nfactors = %d, fm = 'minres', n.obs = %d, plot = FALSE)", k, n)),
    slTight = schmid_leiman(unclass(rot$loadings), rot$Phi, unrot, R)
  )
}

bfi <- psychTools::bfi[, 1:25]
reversed <- c("A1", "C4", "C5", "E1", "E2", "O2", "O5")
bfi[reversed] <- 7 - bfi[reversed]
hs <- lavaan::HolzingerSwineford1939[, paste0("x", 1:9)]
sets <- list(
  one_set("bfi", bfi, 5, "psychTools::bfi[, 1:25], A1 C4 C5 E1 E2 O2 O5 reversed (7 - x), complete cases"),
  one_set("holzinger", hs, 3, "lavaan::HolzingerSwineford1939[, x1:x9]"),
  one_set("bfi-AC", bfi[, 1:10], 2, "psychTools::bfi A1-C5 (reversed as above), complete cases: two factors (Schmid-Leiman's equal option)")
)
path <- "fixtures/reference/exploratory-structure.json"
writeLines(json(list(script = script, versions = versions, sets = sets)), path)
stopifnot(length(fromJSON(path, simplifyVector = FALSE)$sets) == 3)
cat("wrote", path, "\n")
