# Real open instruments for the engine's local-dependence check (issue 9).
# Writes fixtures/reference/engine-real-instruments.json: the raw answers of psych::bfi (25 items,
# reverse keys from psych's bfi.keys) and lavaan::HolzingerSwineford1939 (x1-x9), and, per scale,
# the residual covariance with the largest modification index of a confirmatory model:
#   bfi: each five-item scale's one-factor CFA, lavaan::cfa(model, data, missing = "ml"),
#        modindices(fit)[op == "~~" between two items], the largest mi;
#   HolzingerSwineford1939: the classic three-factor CFA (visual x1-x3, textual x4-x6, speed x7-x9),
#        lavaan::cfa(model, data), modindices, the largest "~~" mi between two items (a one-factor
#        model of three items is just identified, so its residual covariances have no mi).
# The bfi item texts below are the IPIP wordings listed in help(bfi), typed from memory; they only
# feed the wording similarity.
#   psychTools::epi: the 24 extraversion items (0/1; psychTools epi.keys$E, nine negatively keyed),
#        one-factor CFA, lavaan::cfa(model, data, missing = "ml"), the largest "~~" mi;
#   psychTools::sai: the 20 state-anxiety items (1-4) at each study's first occasion (time 1), the ten
#        anxiety-absent items reverse-keyed, one-factor CFA as for bfi, the largest "~~" mi, and the
#        worrying / worried pair's mi and its rank; item texts from psychTools::epi.dictionary and the
#        sai item names.
# Run: Rscript scripts/reference/engine-real-instruments.R
suppressPackageStartupMessages({ library(psych); library(lavaan); library(jsonlite) })

largest_residual_mi <- function(fit, items) {
  mi <- modindices(fit)
  mi <- mi[mi$op == "~~" & mi$lhs != mi$rhs & mi$lhs %in% items & mi$rhs %in% items, ]
  mi <- mi[order(-mi$mi), ]
  list(pair = c(mi$lhs[1], mi$rhs[1]), mi = mi$mi[1], epc = mi$sepc.all[1],
       second = list(pair = c(mi$lhs[2], mi$rhs[2]), mi = mi$mi[2]))
}

data(bfi, package = "psych")
items <- colnames(bfi)[1:25]
reverse <- c("A1", "C4", "C5", "E1", "E2", "O2", "O5")  # psych::bfi.keys, items with a minus sign
scales <- list(A = paste0("A", 1:5), C = paste0("C", 1:5), E = paste0("E", 1:5), N = paste0("N", 1:5), O = paste0("O", 1:5))
bfi_mi <- lapply(names(scales), function(s) {
  model <- paste0("f =~ ", paste(scales[[s]], collapse = " + "))
  fit <- cfa(model, data = bfi[, scales[[s]]], missing = "ml")
  c(list(scale = s, call = paste0('cfa("', model, '", data = bfi, missing = "ml"); modindices(fit)')), largest_residual_mi(fit, scales[[s]]))
})

data(HolzingerSwineford1939, package = "lavaan")
hs <- HolzingerSwineford1939[, paste0("x", 1:9)]
hs_model <- "visual =~ x1 + x2 + x3\n textual =~ x4 + x5 + x6\n speed =~ x7 + x8 + x9"
hs_fit <- cfa(hs_model, data = hs)
hs_mi <- largest_residual_mi(hs_fit, paste0("x", 1:9))

data(epi, package = "psychTools")
data(epi.dictionary, package = "psychTools")
epi_items <- c("V1", "V3", "V8", "V10", "V13", "V17", "V22", "V25", "V27", "V39", "V44", "V46", "V49", "V53", "V56",
               "V5", "V15", "V20", "V29", "V32", "V34", "V37", "V41", "V51")
epi_reverse <- c("V5", "V15", "V20", "V29", "V32", "V34", "V37", "V41", "V51")
epi_e <- epi[, epi_items]
for (v in epi_reverse) epi_e[[v]] <- 1 - epi_e[[v]]
epi_model <- paste0("f =~ ", paste(epi_items, collapse = " + "))
epi_fit <- cfa(epi_model, data = epi_e, missing = "ml")
epi_mi <- c(list(scale = "E", call = paste0('cfa("', epi_model, '", data = epi (reversed items 1 - x), missing = "ml"); modindices(fit)')), largest_residual_mi(epi_fit, epi_items))

data(sai, package = "psychTools")
sai_items <- c("calm", "secure", "tense", "regretful", "at.ease", "upset", "worrying", "rested", "anxious", "comfortable",
               "confident", "nervous", "jittery", "high.strung", "relaxed", "content", "worried", "rattled", "joyful", "pleasant")
sai_reverse <- c("calm", "secure", "at.ease", "rested", "comfortable", "confident", "relaxed", "content", "joyful", "pleasant")
sai1 <- sai[sai$time == 1, sai_items]
sai_scored <- sai1
for (v in sai_reverse) sai_scored[[v]] <- 5 - sai_scored[[v]]
sai_model <- paste0("f =~ ", paste(sai_items, collapse = " + "))
sai_fit <- cfa(sai_model, data = sai_scored, missing = "ml")
sai_all <- modindices(sai_fit)
sai_all <- sai_all[sai_all$op == "~~" & sai_all$lhs != sai_all$rhs, ]
sai_all <- sai_all[order(-sai_all$mi), ]
sai_ww <- which((sai_all$lhs == "worrying" & sai_all$rhs == "worried") | (sai_all$lhs == "worried" & sai_all$rhs == "worrying"))
sai_mi <- c(list(scale = "anxiety", call = paste0('cfa("', sai_model, '", data = sai[sai$time == 1, ] (ten items 5 - x), missing = "ml"); modindices(fit)')),
            largest_residual_mi(sai_fit, sai_items),
            list(worrying = list(mi = sai_all$mi[sai_ww], epc = sai_all$sepc.all[sai_ww], rank = sai_ww)))

to_columns <- function(frame) lapply(frame, function(column) ifelse(is.na(column), NA, column))
out <- list(
  generated = list(R = R.version.string, psych = as.character(packageVersion("psych")), lavaan = as.character(packageVersion("lavaan"))),
  bfi = list(
    items = items, reverse = reverse, min = 1, max = 6,
    scale = sapply(items, function(i) substr(i, 1, 1), USE.NAMES = FALSE),
    text = c("Am indifferent to the feelings of others", "Inquire about others' well-being", "Know how to comfort others", "Love children", "Make people feel at ease",
             "Am exacting in my work", "Continue until everything is perfect", "Do things according to a plan", "Do things in a half-way manner", "Waste my time",
             "Don't talk a lot", "Find it difficult to approach others", "Know how to captivate people", "Make friends easily", "Take charge",
             "Get angry easily", "Get irritated easily", "Have frequent mood swings", "Often feel blue", "Panic easily",
             "Am full of ideas", "Avoid difficult reading material", "Carry the conversation to a higher level", "Spend time reflecting on things", "Will not probe deeply into a subject"),
    columns = to_columns(bfi[, items]),
    largestResidualMi = bfi_mi
  ),
  holzinger = list(
    items = paste0("x", 1:9), scale = rep(c("visual", "textual", "speed"), each = 3),
    columns = to_columns(hs),
    call = 'cfa("visual =~ x1 + x2 + x3; textual =~ x4 + x5 + x6; speed =~ x7 + x8 + x9", data = HolzingerSwineford1939); modindices(fit)',
    largestResidualMi = hs_mi
  ),
  epi = list(
    items = epi_items, reverse = epi_reverse, min = 0, max = 1, scale = rep("E", length(epi_items)),
    text = unname(as.character(epi.dictionary[epi_items, 1])),
    columns = to_columns(epi[, epi_items]),
    largestResidualMi = epi_mi
  ),
  sai = list(
    items = sai_items, reverse = sai_reverse, min = 1, max = 4, scale = rep("anxiety", length(sai_items)),
    text = gsub(".", " ", sai_items, fixed = TRUE),
    columns = to_columns(sai1),
    largestResidualMi = sai_mi
  )
)
dir.create("fixtures/reference", showWarnings = FALSE, recursive = TRUE)
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, na = "null"), "fixtures/reference/engine-real-instruments.json")
for (entry in bfi_mi) cat(entry$scale, entry$pair, round(entry$mi, 1), "\n")
cat("HS", hs_mi$pair, round(hs_mi$mi, 1), "\n")
cat("EPI E", epi_mi$pair, round(epi_mi$mi, 1), "second", epi_mi$second$pair, round(epi_mi$second$mi, 1), "\n")
cat("SAI", sai_mi$pair, round(sai_mi$mi, 1), "worrying/worried", round(sai_mi$worrying$mi, 1), "rank", sai_mi$worrying$rank, "\n")
