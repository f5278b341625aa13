# Reference values for outcome mode (src/lib/audit/outcome-model.ts): a driver model fitted with
# lm() before and after a fixed cut, on the same respondents, with Johnson's (2000) relative
# weights written independently in base R, and each remaining item's standard-error ratio.
#
# Data: psych::bfi, an open personality questionnaire (2,800 respondents, 6-point ratings), with
# age as the outcome and the neuroticism and extraversion items as predictors, as answered (a
# reverse key would flip a coefficient's sign, never its standard error). The fixed cut removes
# N2 and E2, the partners of the locally dependent
# pairs N1/N2 and E1/E2.
#
# Run from the repository root:  Rscript scripts/reference/outcome-after-cut.R
# Writes fixtures/reference/outcome-after-cut.json (jsonlite, digits = NA: 15 significant digits).
suppressPackageStartupMessages({
  library(psych)
  library(jsonlite)
})

predictors <- c(paste0("N", 1:5), paste0("E", 1:5))
removed <- c("N2", "E2")
data <- psych::bfi[, c(predictors, "age")]
rows <- which(complete.cases(data))
used <- data[rows, ]

relative_weights <- function(frame, outcome) {
  x <- setdiff(names(frame), outcome)
  R <- cor(frame[, x])
  rxy <- cor(frame[, x], frame[[outcome]])[, 1]
  e <- eigen(R, symmetric = TRUE)
  Lambda <- e$vectors %*% diag(sqrt(e$values)) %*% t(e$vectors)
  beta <- solve(Lambda, rxy)
  as.numeric((Lambda^2) %*% (beta^2))
}

fit <- function(frame) {
  model <- lm(age ~ ., data = frame)
  s <- summary(model)
  co <- coef(s)
  list(
    terms = c("(intercept)", rownames(co)[-1]),
    estimate = unname(co[, 1]),
    se = unname(co[, 2]),
    t = unname(co[, 3]),
    p = unname(co[, 4]),
    r2 = s$r.squared,
    adjR2 = s$adj.r.squared,
    ssr = sum(residuals(model)^2),
    sigma = s$sigma,
    relativeWeights = relative_weights(frame, "age")
  )
}

before <- fit(used)
after <- fit(used[, setdiff(names(used), removed)])
ratio <- after$se / before$se[match(after$terms, before$terms)]

out <- list(
  source = "scripts/reference/outcome-after-cut.R",
  versions = list(r = R.version.string, psych = as.character(packageVersion("psych"))),
  call = "lm(age ~ ., data = psych::bfi[complete.cases(...), c(N1..N5, E1..E5, age)]); after: the same rows without N2 and E2; relative weights by Johnson (2000) in base R (eigen, solve)",
  predictors = predictors,
  removed = removed,
  outcome = "age",
  rows = rows - 1L,
  matrix = unname(as.matrix(data[, predictors])),
  outcomeValues = data$age,
  before = before,
  after = c(after, list(seRatio = ratio))
)
writeLines(toJSON(out, digits = NA, auto_unbox = TRUE, na = "null", matrix = "rowmajor"), "fixtures/reference/outcome-after-cut.json")
cat("wrote fixtures/reference/outcome-after-cut.json\n")
