# Reference values for src/lib/engine/wording-similarity.ts: cosine similarity of character
# 3-gram TF-IDF vectors (sublinear tf 1 + ln count, smoothed idf ln((1+N)/(1+df)) + 1, over the
# texts that are present), written independently in base R.
# Salton & Buckley 1988, "Term-weighting approaches in automatic text retrieval".
# Run: Rscript scripts/reference/engine-wording-similarity.R  (writes fixtures/reference/engine-wording-similarity.json)
library(jsonlite)

texts <- c(
  "The library website is easy to use.",
  "The library's website is simple to use.",
  "Staff help me find what I am looking for.",
  "Staff do not help me find what I am looking for.",
  NA,
  "There are enough quiet places to study.",
  "There are enough QUIET spaces for studying!",
  "",
  "Caf\u00e9 opening hours suit me.",
  "Cafe opening hours suit me"
)

normalise <- function(x) {
  x <- iconv(x, "UTF-8", "ASCII//TRANSLIT")
  x <- tolower(x)
  x <- gsub("[^a-z0-9]+", " ", x)
  x <- trimws(x)
  ifelse(nchar(x) == 0, "", paste0(" ", x, " "))
}
grams <- function(x) {
  if (is.na(x) || nchar(x) < 3) return(character(0))
  substring(x, 1:(nchar(x) - 2), 3:nchar(x))
}

norm <- vapply(texts, function(t) if (is.na(t)) NA_character_ else normalise(t), "", USE.NAMES = FALSE)
gram_lists <- lapply(norm, grams)
present <- which(vapply(gram_lists, length, 0L) > 0)
N <- length(present)
vocab <- sort(unique(unlist(gram_lists[present])))
tf <- matrix(0, nrow = length(texts), ncol = length(vocab))
for (i in present) {
  counts <- table(factor(gram_lists[[i]], levels = vocab))
  tf[i, ] <- ifelse(counts > 0, 1 + log(as.numeric(counts)), 0)
}
df <- colSums(tf[present, , drop = FALSE] > 0)
idf <- log((1 + N) / (1 + df)) + 1
w <- sweep(tf, 2, idf, `*`)
sim <- matrix(NA_real_, length(texts), length(texts))
for (i in present) for (j in present) {
  sim[i, j] <- sum(w[i, ] * w[j, ]) / sqrt(sum(w[i, ]^2) * sum(w[j, ]^2))
}

out <- list(
  source = "scripts/reference/engine-wording-similarity.R",
  call = "base R: char 3-gram tf (1 + log count) x idf (log((1+N)/(1+df)) + 1), cosine",
  r_version = R.version.string,
  texts = lapply(texts, function(t) if (is.na(t)) NULL else t),
  similarity = lapply(seq_along(texts), function(i) lapply(seq_along(texts), function(j) if (is.na(sim[i, j])) NULL else sim[i, j]))
)
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, null = "null", pretty = TRUE), "fixtures/reference/engine-wording-similarity.json")
