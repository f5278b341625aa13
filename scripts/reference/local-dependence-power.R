# How much power can any modification-index test have for a doublet of the generator's size
# (issue 9)? The expected index of a planted residual covariance is about its noncentrality: the
# index computed on the population matrix with the sample size n (Saris, Satorra & Sörbom 1987,
# "The detection and correction of specification errors in structural equation models").
# Population: one factor, k ordinary items with loading l, plus a doublet item whose latent part is
# l f + sqrt(theta) s (s shared with one ordinary item, theta the generator's "residual"), as
# src/lib/synth/generate-wave.ts draws it; continuous items, so the figure is an upper bound for 5- and
# 7-point answers (categorising loses information).
# lavaan::cfa("f =~ items", sample.cov = Sigma, sample.nobs = n, std.lv = TRUE), modindices(fit)
# for the doublet pair = noncentrality; power = P(chi-square(1, ncp) > qchisq(1 - alpha / pairs, 1)).
# Writes fixtures/reference/local-dependence-power.json. Run: Rscript scripts/reference/local-dependence-power.R
suppressPackageStartupMessages({ library(lavaan); library(jsonlite) })
population <- function(k, loading, theta) {
  p <- k + 1
  lambda <- rep(loading, p)
  sigma <- tcrossprod(lambda)
  diag(sigma) <- 1
  sigma[1, p] <- sigma[p, 1] <- sigma[1, p] + theta  # shared component: covariance theta beyond the factor
  dimnames(sigma) <- list(paste0("x", 1:p), paste0("x", 1:p))
  sigma
}
rows <- list()
for (k in c(4, 6, 8)) for (loading in c(0.55, 0.65, 0.75)) for (theta in c(0.15, 0.2, 0.25, 0.35)) for (n in c(150, 300, 450, 600)) {
  sigma <- population(k, loading, theta)
  p <- k + 1
  fit <- cfa(paste0("f =~ ", paste(colnames(sigma), collapse = " + ")), sample.cov = sigma, sample.nobs = n, std.lv = TRUE)
  mi <- modindices(fit, sort. = FALSE)
  ncp <- mi$mi[mi$op == "~~" & ((mi$lhs == "x1" & mi$rhs == paste0("x", p)) | (mi$rhs == "x1" & mi$lhs == paste0("x", p)))]
  pairs <- p * (p - 1) / 2
  power <- function(alpha) pchisq(qchisq(1 - alpha / pairs, 1), 1, ncp = ncp, lower.tail = FALSE)
  rows[[length(rows) + 1]] <- list(items = p, loading = loading, residual = theta, n = n, noncentrality = ncp,
                                   power001 = power(0.001), power05 = power(0.05))
}
out <- list(generated = list(R = R.version.string, lavaan = as.character(packageVersion("lavaan"))),
            call = 'cfa("f =~ x1 + ... + xp", sample.cov = Sigma, sample.nobs = n, std.lv = TRUE); modindices(fit) of x1 ~~ xp; pchisq(qchisq(1 - alpha / pairs, 1), 1, ncp, lower.tail = FALSE)',
            rows = rows)
writeLines(toJSON(out, auto_unbox = TRUE, digits = 6), "fixtures/reference/local-dependence-power.json")
for (r in rows) if (r$n %in% c(150, 300, 450) && r$loading == 0.65) cat(sprintf("items %d loading %.2f residual %.2f n %d ncp %.1f power .001 %.2f .05 %.2f\n", r$items, r$loading, r$residual, r$n, r$noncentrality, r$power001, r$power05))
