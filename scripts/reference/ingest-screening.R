# Reference values for src/lib/ingest/screening/: long-string index (Johnson 2005, longest run of
# identical consecutive answers, missing answers left out), within-person SD (Dunn et al. 2018,
# sample SD across a respondent's answered items), share of items missing, and the median
# completion time with the speeder cut (1/3 of the median), all in base R.
# Run: Rscript scripts/reference/ingest-screening.R  (writes fixtures/reference/ingest-screening.json)
library(jsonlite)

# 8 respondents x 7 items, answers as given (1..5), NA missing.
answers <- rbind(
  c(3, 3, 3, 3, 3, 3, 3),      # straightliner
  c(1, 2, 3, 4, 5, 4, 3),
  c(4, 4, NA, 4, 4, 2, 2),     # run of 4 across a skipped item
  c(5, 1, 5, 1, 5, 1, 5),
  c(NA, NA, NA, NA, NA, 2, 2), # mostly missing
  c(2, 2, 3, 3, 3, 3, 1),
  c(NA, NA, NA, NA, NA, NA, 4),# one answer: SD undefined
  c(1, 1, 1, 2, 2, 2, 2)
)
durations <- c(610, 95, 420, 388, NA, 512, 140, 455)

longest_run <- function(row) {
  y <- row[!is.na(row)]
  if (length(y) == 0) return(0L)
  max(rle(y)$lengths)
}
long_string <- apply(answers, 1, longest_run)
within_sd <- apply(answers, 1, sd, na.rm = TRUE)
missing_share <- rowMeans(is.na(answers))
median_duration <- median(durations, na.rm = TRUE)
speeders <- which(!is.na(durations) & durations < median_duration / 3) - 1L

out <- list(
  source = "scripts/reference/ingest-screening.R",
  call = paste(
    "apply(answers, 1, function(r) max(rle(r[!is.na(r)])$lengths));",
    "apply(answers, 1, sd, na.rm = TRUE); rowMeans(is.na(answers));",
    "median(durations, na.rm = TRUE); which(durations < median / 3) - 1"
  ),
  r_version = R.version.string,
  answers = unname(lapply(seq_len(nrow(answers)), function(i) answers[i, ])),
  durations = durations,
  long_string = long_string,
  within_sd = unname(within_sd),
  missing_share = unname(missing_share),
  median_duration = median_duration,
  speeders_third = I(speeders)
)
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, na = "null", pretty = TRUE), "fixtures/reference/ingest-screening.json")
