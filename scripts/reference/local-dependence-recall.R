# Published local-dependence detectors on the engine's generated waves (issue 9): how many planted
# doublets can a confirmatory model find on the same files, and with how many false alarms?
#
# Input: the directory written by
#   npx tsx scripts/reference/local-dependence-waves.ts DIR 60 1
# (localDependenceWaveSpec seeds 1-60 of each kind, generateWave(spec, seed + 500000), the values the
# engine sees: reverse keys recoded, missing codes and blanks as NA).
# Per wave and per scale of four or more items (a one-factor model of three items has no free residual
# covariance), every detector below; a pair is a true positive when it is a planted doublet.
#   mi_ml:      lavaan::cfa("f =~ items", data, missing = "ml", std.lv = TRUE) (ML, FIML for the
#               missing answers, items treated as continuous), modindices(fit) for the residual
#               covariances ("~~" between two items); a pair is flagged when its mi exceeds the
#               chi-square(1) quantile at alpha / (pairs of the scale) (Bonferroni per scale), alpha
#               .05 (mi_ml_05) or .001 (mi_ml_001); with sepc.all >= .20 as well (…_sepc20).
#   mi_ml_seq:  the same model, Sörbom's sequential use (free the largest index when it passes the
#               Bonferroni .05 quantile, refit, repeat): flags at .05 and, as the prefix of the
#               sequence that passes it, at .001.
#   mi_wlsmv:   lavaan::cfa(..., ordered = items, estimator = "WLSMV") (polychoric, missing pairwise),
#               modindices (score test), Bonferroni per scale at .05.
#   q3_rel:     the Q3 idea carried to the one-factor model: psych::fa(R, 1, fm = "minres") on the
#               scale's pairwise Pearson matrix, Q3_ij = residual_ij / sqrt(u_i u_j), flagged when Q3_ij - mean(Q3) > .20
#               (Christensen, Makransky & Horton 2017's relative rule).
# Output: fixtures/reference/local-dependence-recall.json: per detector the flags per wave kind,
# precision, recall and the per-cell table (respondents band x planted residual band, as
# src/lib/evaluation/evaluate-local-dependence.ts bands them), false pairs per respondents band,
# waves with nothing redundant that get any flag; and every wave's flagged pairs (jsonlite's auto_unbox
# writes a list of one pair as a bare string: readers take a string as a list of one).
# Run: Rscript scripts/reference/local-dependence-recall.R DIR [OUT]
suppressPackageStartupMessages({ library(lavaan); library(psych); library(jsonlite); library(parallel) })

args <- commandArgs(trailingOnly = TRUE)
dir <- args[1]
out <- if (length(args) >= 2) args[2] else "fixtures/reference/local-dependence-recall.json"
manifest <- fromJSON(file.path(dir, "manifest.json"), simplifyVector = FALSE)

pair_key <- function(a, b) ifelse(a < b, paste(a, b, sep = "|"), paste(b, a, sep = "|"))
bonferroni_critical <- function(k, alpha) qchisq(1 - alpha / (k * (k - 1) / 2), 1)

residual_mi <- function(fit, items) {
  mi <- modindices(fit, sort. = FALSE)
  mi[mi$op == "~~" & mi$lhs != mi$rhs & mi$lhs %in% items & mi$rhs %in% items, c("lhs", "rhs", "mi", "sepc.all")]
}

scale_detectors <- function(x, items) {
  k <- length(items)
  model <- paste0("f =~ ", paste(items, collapse = " + "))
  result <- list()
  # ML with FIML, all residual covariances.
  fit <- tryCatch(suppressWarnings(cfa(model, data = x, missing = "ml", std.lv = TRUE)), error = function(e) NULL)
  if (!is.null(fit) && lavInspect(fit, "converged")) {
    mi <- residual_mi(fit, items)
    result$ml <- data.frame(pair = pair_key(mi$lhs, mi$rhs), mi = mi$mi, sepc = mi$sepc.all)
    # Sequential: free the largest index while it passes the Bonferroni .05 quantile.
    critical <- bonferroni_critical(k, 0.05)
    freed <- character(0)
    sequence <- data.frame(pair = character(0), mi = numeric(0))
    current <- mi
    repeat {
      if (nrow(current) == 0) break
      top <- which.max(current$mi)
      if (!(current$mi[top] > critical)) break
      sequence <- rbind(sequence, data.frame(pair = pair_key(current$lhs[top], current$rhs[top]), mi = current$mi[top]))
      freed <- c(freed, paste(current$lhs[top], "~~", current$rhs[top]))
      refit <- tryCatch(suppressWarnings(cfa(paste(c(model, freed), collapse = "\n"), data = x, missing = "ml", std.lv = TRUE)), error = function(e) NULL)
      if (is.null(refit) || !lavInspect(refit, "converged")) break
      current <- residual_mi(refit, items)
    }
    result$ml_seq <- sequence
  }
  # WLSMV on polychoric correlations.
  wfit <- tryCatch(suppressWarnings(cfa(model, data = x, ordered = items, estimator = "WLSMV", std.lv = TRUE)), error = function(e) NULL)
  if (!is.null(wfit) && lavInspect(wfit, "converged")) {
    mi <- residual_mi(wfit, items)
    result$wlsmv <- data.frame(pair = pair_key(mi$lhs, mi$rhs), mi = mi$mi, sepc = mi$sepc.all)
  }
  # Q3 from the one-factor minres model, relative rule.
  q3 <- function(r) {
    f <- suppressWarnings(suppressMessages(fa(r, 1, fm = "minres")))
    u <- pmax(1 - as.vector(f$loadings)^2, 1e-3)
    q <- (r - tcrossprod(as.vector(f$loadings))) / sqrt(outer(u, u))
    low <- lower.tri(q)
    rows <- row(q)[low]; cols <- col(q)[low]
    data.frame(pair = pair_key(items[rows], items[cols]), relative = q[low] - mean(q[low]))
  }
  result$q3 <- tryCatch(q3(cor(x, use = "pairwise.complete.obs")), error = function(e) NULL)
  result
}

wave_flags <- function(entry) {
  x <- read.csv(file.path(dir, entry$file))
  ids <- vapply(entry$items, function(i) i$id, "")
  scales <- vapply(entry$items, function(i) i$scale, "")
  flags <- list(mi_ml_05 = character(0), mi_ml_001 = character(0), mi_ml_05_sepc20 = character(0), mi_ml_001_sepc20 = character(0),
                mi_ml_seq_05 = character(0), mi_ml_seq_001 = character(0), mi_wlsmv_05 = character(0), mi_wlsmv_001 = character(0),
                q3_rel = character(0))
  for (s in unique(scales)) {
    items <- ids[scales == s]
    k <- length(items)
    if (k < 4) next
    d <- scale_detectors(x[, items], items)
    c05 <- bonferroni_critical(k, 0.05); c001 <- bonferroni_critical(k, 0.001)
    if (!is.null(d$ml)) {
      flags$mi_ml_05 <- c(flags$mi_ml_05, d$ml$pair[d$ml$mi > c05])
      flags$mi_ml_001 <- c(flags$mi_ml_001, d$ml$pair[d$ml$mi > c001])
      flags$mi_ml_05_sepc20 <- c(flags$mi_ml_05_sepc20, d$ml$pair[d$ml$mi > c05 & d$ml$sepc >= 0.2])
      flags$mi_ml_001_sepc20 <- c(flags$mi_ml_001_sepc20, d$ml$pair[d$ml$mi > c001 & d$ml$sepc >= 0.2])
    }
    if (!is.null(d$ml_seq) && nrow(d$ml_seq) > 0) {
      flags$mi_ml_seq_05 <- c(flags$mi_ml_seq_05, d$ml_seq$pair)
      strict <- cumprod(d$ml_seq$mi > c001) == 1
      flags$mi_ml_seq_001 <- c(flags$mi_ml_seq_001, d$ml_seq$pair[strict])
    }
    if (!is.null(d$wlsmv)) {
      flags$mi_wlsmv_05 <- c(flags$mi_wlsmv_05, d$wlsmv$pair[d$wlsmv$mi > c05])
      flags$mi_wlsmv_001 <- c(flags$mi_wlsmv_001, d$wlsmv$pair[d$wlsmv$mi > c001])
    }
    if (!is.null(d$q3)) flags$q3_rel <- c(flags$q3_rel, d$q3$pair[d$q3$relative > 0.2])
  }
  list(kind = entry$kind, seed = entry$seed, respondents = entry$respondents, flags = lapply(flags, unique))
}

cores <- as.integer(Sys.getenv("CORES", "2"))
started <- Sys.time()
waves <- mclapply(manifest, wave_flags, mc.cores = cores)
seconds <- as.numeric(difftime(Sys.time(), started, units = "secs"))

n_bands <- list(c(150, 299), c(300, 449), c(450, 600))
residual_bands <- list(c(0.15, 0.2), c(0.2, 0.25), c(0.25, 0.35))
band_of <- function(bands, value) {
  for (b in seq_along(bands)) if (value < bands[[b]][2] || (b == length(bands) && value <= bands[[b]][2])) return(b)
  length(bands)
}
kinds <- c("doublets", "homogeneous", "cross-loading", "clean")
detector_names <- names(waves[[1]]$flags)
summary <- lapply(setNames(detector_names, detector_names), function(name) {
  tp <- 0; fp <- 0; planted <- 0
  by_kind <- setNames(rep(0, 4), kinds)
  clean_waves_flagged <- 0
  cells <- array(0, c(3, 3, 2))
  false_by_n <- rep(0, 3)
  for (w in seq_along(waves)) {
    entry <- manifest[[w]]; wave <- waves[[w]]
    truth <- vapply(entry$doublets, function(d) pair_key(d$a, d$b), "")
    flagged <- wave$flags[[name]]
    nb <- band_of(n_bands, entry$respondents)
    by_kind[entry$kind] <- by_kind[entry$kind] + length(flagged)
    tp <- tp + sum(flagged %in% truth); fp <- fp + sum(!(flagged %in% truth))
    false_by_n[nb] <- false_by_n[nb] + sum(!(flagged %in% truth))
    planted <- planted + length(truth)
    if (entry$kind != "doublets" && length(flagged) > 0) clean_waves_flagged <- clean_waves_flagged + 1
    for (d in entry$doublets) {
      rb <- band_of(residual_bands, d$residual)
      cells[nb, rb, 1] <- cells[nb, rb, 1] + 1
      if (pair_key(d$a, d$b) %in% flagged) cells[nb, rb, 2] <- cells[nb, rb, 2] + 1
    }
  }
  cell_rows <- list()
  for (nb in 1:3) {
    for (rb in 1:3) cell_rows[[length(cell_rows) + 1]] <- list(n = paste(n_bands[[nb]], collapse = "-"), residual = sprintf("%s-%s", sub("^0", "", sprintf("%.2f", residual_bands[[rb]][1])), sub("^0", "", sprintf("%.2f", residual_bands[[rb]][2]))), planted = cells[nb, rb, 1], found = cells[nb, rb, 2])
    cell_rows[[length(cell_rows) + 1]] <- list(n = paste(n_bands[[nb]], collapse = "-"), residual = "all", planted = sum(cells[nb, , 1]), found = sum(cells[nb, , 2]), falsePairs = false_by_n[nb])
  }
  list(truePositives = tp, falsePositives = fp, precision = if (tp + fp == 0) 1 else tp / (tp + fp), recall = tp / planted,
       flagsByKind = as.list(by_kind), cleanFlagsPerTenWaves = 10 * sum(by_kind[kinds[-1]]) / (3 * length(waves) / 4),
       cleanWavesFlaggedPerTen = 10 * clean_waves_flagged / (3 * length(waves) / 4), cells = cell_rows)
})

result <- list(
  generated = format(Sys.time(), "%Y-%m-%dT%H:%M:%SZ", tz = "UTC"),
  r = R.version.string, lavaan = as.character(packageVersion("lavaan")), psych = as.character(packageVersion("psych")),
  input = "npx tsx scripts/reference/local-dependence-waves.ts DIR 60 1 (localDependenceWaveSpec seeds 1-60 per kind, generateWave(spec, seed + 500000), engine-recoded values)",
  calls = list(
    mi_ml = 'cfa("f =~ items", data, missing = "ml", std.lv = TRUE); modindices(fit) "~~" between items; mi > qchisq(1 - alpha / pairs, 1)',
    mi_ml_seq = "the same, freeing the largest index while it passes the .05 Bonferroni quantile and refitting",
    mi_wlsmv = 'cfa("f =~ items", data, ordered = items, estimator = "WLSMV", std.lv = TRUE); modindices(fit)',
    q3_rel = 'fa(R, 1, fm = "minres") on cor(x, use = "pairwise.complete.obs"); Q3 = residual / sqrt(u_i u_j); flagged when Q3 - mean(Q3) > .20'
  ),
  wavesPerKind = length(waves) / 4, seconds = seconds,
  detectors = summary,
  waves = lapply(waves, function(w) list(kind = w$kind, seed = w$seed, respondents = w$respondents, flags = w$flags))
)
writeLines(toJSON(result, auto_unbox = TRUE, digits = 6, pretty = FALSE), out)
for (name in detector_names) {
  s <- summary[[name]]
  cat(sprintf("%-18s precision %.3f recall %.3f  clean flags/10 waves %.2f  by kind %s\n", name, s$precision, s$recall, s$cleanFlagsPerTenWaves, paste(unlist(s$flagsByKind), collapse = "/")))
  cat("   ", paste(vapply(s$cells, function(c) sprintf("%s %s %d/%d", c$n, c$residual, c$found, c$planted), ""), collapse = "; "), "\n")
}
cat(sprintf("seconds %.0f\n", seconds))
