# Modification indices (score tests) of the residual covariances of one-factor ML models, for
# src/lib/stats/residual-modification-indices.ts (issue 9).
#
# For each case: the Pearson correlation matrix R of a scale's items (complete cases) and its n,
# then
#   fit <- lavaan::cfa("f =~ i1 + ... + ik", sample.cov = R, sample.nobs = n, std.lv = TRUE,
#                      sample.cov.rescale = FALSE)
#   modindices(fit)[op == "~~" & lhs != rhs]   # mi, epc, sepc.all of every residual covariance
# (ML, expected information, the likelihood with N as lavaan computes it; sample.cov.rescale =
# FALSE so the model is fitted to R itself, not R·(n − 1)/n.)
# Cases: psych::bfi N, A, C (five items each); lavaan::HolzingerSwineford1939 x1-x9 as one factor;
# psychTools::sai (state anxiety, 20 items, each study's first occasion, complete cases) with
# its worrying / worried pair; psychTools::epi extraversion items (24, 0/1) Pearson.
#
# Run from the repository root: Rscript scripts/reference/residual-modification-indices.R
# Writes fixtures/reference/residual-modification-indices.json (numbers with sprintf("%.17g")).
suppressPackageStartupMessages({ library(psych); library(psychTools); library(lavaan); library(jsonlite) })

case_of <- function(name, frame) {
  frame <- frame[complete.cases(frame), , drop = FALSE]
  items <- colnames(frame)
  R <- cor(frame)
  n <- nrow(frame)
  model <- paste0("f =~ ", paste(items, collapse = " + "))
  fit <- cfa(model, sample.cov = R, sample.nobs = n, std.lv = TRUE, sample.cov.rescale = FALSE)
  mi <- modindices(fit)
  mi <- mi[mi$op == "~~" & mi$lhs != mi$rhs, ]
  list(
    name = name, n = n, items = items,
    call = paste0('cfa("', model, '", sample.cov = R, sample.nobs = ', n, ', std.lv = TRUE, sample.cov.rescale = FALSE); modindices(fit)'),
    correlation = sprintf("%.17g", as.vector(t(R))),
    loadings = sprintf("%.17g", lavInspect(fit, "std")$lambda[, 1]),
    pairs = lapply(seq_len(nrow(mi)), function(r) list(
      a = mi$lhs[r], b = mi$rhs[r],
      mi = sprintf("%.17g", mi$mi[r]), epc = sprintf("%.17g", mi$epc[r]), sepcAll = sprintf("%.17g", mi$sepc.all[r])))
  )
}

data(bfi, package = "psych")
data(HolzingerSwineford1939, package = "lavaan")
data(sai, package = "psychTools")
data(epi, package = "psychTools")
sai_first <- sai[sai$time == 1, ]
sai_items <- c("calm", "secure", "tense", "regretful", "at.ease", "upset", "worrying", "rested", "anxious", "comfortable",
               "confident", "nervous", "jittery", "high.strung", "relaxed", "content", "worried", "rattled", "joyful", "pleasant")
epi_e <- c("V1", "V3", "V8", "V10", "V13", "V17", "V22", "V25", "V27", "V39", "V44", "V46", "V49", "V53", "V56",
           "V5", "V15", "V20", "V29", "V32", "V34", "V37", "V41", "V51")  # psychTools epi.keys$E (the last nine negatively keyed)
epi_e_data <- epi[, epi_e]
for (v in epi_e[16:24]) epi_e_data[[v]] <- 1 - epi_e_data[[v]]

cases <- list(
  case_of("bfi-N", bfi[, paste0("N", 1:5)]),
  case_of("bfi-A", transform(bfi[, paste0("A", 1:5)], A1 = 7 - A1)),
  case_of("bfi-C", transform(bfi[, paste0("C", 1:5)], C4 = 7 - C4, C5 = 7 - C5)),
  case_of("holzinger-all", HolzingerSwineford1939[, paste0("x", 1:9)]),
  case_of("sai", sai_first[, sai_items]),
  case_of("epi-E", epi_e_data)
)
out <- list(
  generated = list(R = R.version.string, lavaan = as.character(packageVersion("lavaan")), psych = as.character(packageVersion("psych")),
                   psychTools = as.character(packageVersion("psychTools"))),
  cases = cases
)
writeLines(toJSON(out, auto_unbox = TRUE, pretty = FALSE), "fixtures/reference/residual-modification-indices.json")
