#!/usr/bin/env Rscript
# Reference values for average-linkage hierarchical clustering (src/lib/stats/hierarchical-clustering.ts):
# R's stats::hclust(as.dist(D), method = "average") on four dissimilarity matrices, with its
# merge table, merge heights and leaf order.
#
# Run from the repository root:   Rscript scripts/reference/hierarchical-clustering.R
# Writes:                          fixtures/reference/hierarchical-clustering.json
#
# Cases:
#   bfi         1 - |r| of psych::bfi's 25 personality items (pairwise Pearson), the overlap map's use
#   usarrests   Euclidean distances of the scaled USArrests data (50 states, R's own example data)
#   ties        integer distances with many ties (checks which pair R merges first on a tie)
#   factor60    1 - |r| of 60 items simulated from a 6-factor model (set.seed(20261202), n = 300)

suppressPackageStartupMessages({
  library(psych)
  library(jsonlite)
})

cases <- list()
add_case <- function(name, D, call) {
  h <- hclust(as.dist(D), method = "average")
  cases[[name]] <<- list(
    call = call,
    dissimilarities = unname(D),
    merge = unname(h$merge),
    height = h$height,
    order = h$order
  )
}

R_bfi <- cor(psych::bfi[, 1:25], use = "pairwise.complete.obs")
add_case("bfi", 1 - abs(R_bfi), 'hclust(as.dist(1 - abs(cor(psych::bfi[, 1:25], use = "pairwise.complete.obs"))), method = "average")')

add_case("usarrests", as.matrix(dist(scale(USArrests))), 'hclust(dist(scale(USArrests)), method = "average")')

set.seed(7)
P <- matrix(sample(1:4, 12 * 12, replace = TRUE), 12, 12)
D_ties <- P + t(P)
diag(D_ties) <- 0
add_case("ties", D_ties, 'set.seed(7); P <- matrix(sample(1:4, 144, TRUE), 12); D <- P + t(P); diag(D) <- 0; hclust(as.dist(D), method = "average")')

set.seed(20261202)
loadings <- matrix(0, 60, 6)
for (f in 1:6) loadings[((f - 1) * 10 + 1):(f * 10), f] <- runif(10, 0.4, 0.9)
scores <- matrix(rnorm(300 * 6), 300, 6)
X <- scores %*% t(loadings) + matrix(rnorm(300 * 60), 300, 60) * 0.7
add_case("factor60", 1 - abs(cor(X)), 'set.seed(20261202); six-factor model, 60 items, n = 300; hclust(as.dist(1 - abs(cor(X))), method = "average")')

out <- list(
  generated_by = "scripts/reference/hierarchical-clustering.R",
  r_version = R.version.string,
  packages = list(psych = as.character(packageVersion("psych")), jsonlite = as.character(packageVersion("jsonlite"))),
  cases = cases
)
dir.create(file.path("fixtures", "reference"), recursive = TRUE, showWarnings = FALSE)
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, pretty = FALSE, matrix = "rowmajor"), file.path("fixtures", "reference", "hierarchical-clustering.json"))
cat("Wrote fixtures/reference/hierarchical-clustering.json\n")
