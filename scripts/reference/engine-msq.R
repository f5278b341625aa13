# psychTools::msq (Motivational State Questionnaire, 3,896 respondents, items 0-3) for the engine's
# local-dependence check (issue 9). The factor model: Thayer's two activation scales as psychTools'
# help(msq) keys them (ADACL), one-factor CFA per scale, negatively keyed items 3 - x:
#   EA: active, energetic, vigorous, wakeful, wide.awake, full.of.pep, lively, -sleepy, -tired, -drowsy
#   TA: intense, jittery, fearful, tense, clutched.up, -quiet, -still, -placid, -calm, -at.rest
# Per scale: lavaan::cfa("f =~ items", data, missing = "ml"), modindices(fit) for the residual
# covariances between items (the five largest, with sepc.all), and Sörbom's sequential use with the
# engine's levels: among the pairs with sepc.all >= .20 free the largest index while it exceeds
# qchisq(1 - .001 / pairs, 1) (Bonferroni .001 per scale), refit, repeat.
# Writes fixtures/reference/engine-msq.json. Run: Rscript scripts/reference/engine-msq.R
suppressPackageStartupMessages({ library(lavaan); library(jsonlite) })
data(msq, package = "psychTools")
scales <- list(
  EA = c("active", "energetic", "vigorous", "wakeful", "wide.awake", "full.of.pep", "lively", "sleepy", "tired", "drowsy"),
  TA = c("intense", "jittery", "fearful", "tense", "clutched.up", "quiet", "still", "placid", "calm", "at.rest"))
reverse <- c("sleepy", "tired", "drowsy", "quiet", "still", "placid", "calm", "at.rest")
items <- unlist(scales, use.names = FALSE)
scored <- msq[, items]
for (v in reverse) scored[[v]] <- 3 - scored[[v]]

residual_mi <- function(fit, its) {
  mi <- modindices(fit, sort. = FALSE)
  mi <- mi[mi$op == "~~" & mi$lhs != mi$rhs & mi$lhs %in% its & mi$rhs %in% its, c("lhs", "rhs", "mi", "sepc.all")]
  mi[order(-mi$mi), ]
}
per_scale <- lapply(names(scales), function(s) {
  its <- scales[[s]]
  k <- length(its)
  model <- paste0("f =~ ", paste(its, collapse = " + "))
  fit <- cfa(model, data = scored[, its], missing = "ml")
  mi <- residual_mi(fit, its)
  critical <- qchisq(1 - 0.001 / (k * (k - 1) / 2), 1)
  freed <- character(0); sequence <- list(); current <- mi
  repeat {
    eligible <- current[current$sepc.all >= 0.2, ]
    if (nrow(eligible) == 0 || !(eligible$mi[1] > critical)) break
    sequence[[length(sequence) + 1]] <- list(pair = c(eligible$lhs[1], eligible$rhs[1]), mi = eligible$mi[1], sepc = eligible$sepc.all[1])
    freed <- c(freed, paste(eligible$lhs[1], "~~", eligible$rhs[1]))
    current <- residual_mi(cfa(paste(c(model, freed), collapse = "\n"), data = scored[, its], missing = "ml"), its)
  }
  top <- head(mi, 5)
  list(scale = s, call = paste0('cfa("', model, '", data = msq (', paste(intersect(reverse, its), collapse = ", "), ' as 3 - x), missing = "ml"); modindices(fit)'),
       critical001 = critical,
       largest = lapply(seq_len(nrow(top)), function(r) list(pair = c(top$lhs[r], top$rhs[r]), mi = top$mi[r], sepc = top$sepc.all[r])),
       sequential = sequence)
})
names(per_scale) <- names(scales)
to_columns <- function(frame) lapply(frame, function(column) ifelse(is.na(column), NA, column))
out <- list(
  generated = list(R = R.version.string, lavaan = as.character(packageVersion("lavaan")), psychTools = as.character(packageVersion("psychTools"))),
  items = items, reverse = reverse, min = 0, max = 3,
  scale = rep(names(scales), lengths(scales)),
  text = gsub(".", " ", items, fixed = TRUE),
  columns = to_columns(msq[, items]),
  scales = per_scale)
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, na = "null"), "fixtures/reference/engine-msq.json")
for (s in per_scale) {
  cat(s$scale, "critical", round(s$critical001, 1), "\n")
  for (e in s$largest) cat("  largest", e$pair, round(e$mi, 1), round(e$sepc, 2), "\n")
  for (e in s$sequential) cat("  sequential", e$pair, round(e$mi, 1), round(e$sepc, 2), "\n")
}
