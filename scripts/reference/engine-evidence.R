# Reference values for the redundancy engine (src/lib/engine): compute-evidence.ts,
# overlap-clusters.ts (Fisher-z interval of a pair) and simulate-cut.ts (the what-if of a cut).
# An invented data set of already recoded answers (10 items: scale S1 = A1..A5 with A5 a planted
# near-twin of A1, scale S2 = B1..B4 plus the constant item K1, and the unscaled item U1), with
# about 4% missing answers, analysed under pairwise and listwise deletion.
# Run: Rscript scripts/reference/engine-evidence.R  (writes fixtures/reference/engine-evidence.json)
suppressPackageStartupMessages({ library(jsonlite); library(psych) })

set.seed(20261202)
n <- 240
cut5 <- function(latent) as.numeric(cut(latent, c(-Inf, -1.5, -0.5, 0.5, 1.5, Inf), labels = FALSE))
general <- rnorm(n)
f1 <- sqrt(0.3) * general + sqrt(0.7) * rnorm(n)
f2 <- sqrt(0.3) * general + sqrt(0.7) * rnorm(n)
latent_item <- function(f, l) l * f + sqrt(1 - l^2) * rnorm(n)
a1 <- latent_item(f1, 0.72)
X <- data.frame(
  A1 = cut5(a1),
  A2 = cut5(latent_item(f1, 0.65)),
  A3 = cut5(latent_item(f1, 0.60)),
  A4 = cut5(latent_item(f1, 0.70)),
  A5 = cut5((a1 + 0.2 * rnorm(n)) / sqrt(1.04)),
  B1 = cut5(latent_item(f2, 0.70)),
  B2 = cut5(latent_item(f2, 0.66)),
  B3 = cut5(latent_item(f2, 0.62)),
  B4 = cut5(latent_item(f2, 0.58)),
  K1 = rep(4, n),
  U1 = cut5(0.45 * f1 + 0.45 * f2 + sqrt(1 - 0.45^2 * 2 - 2 * 0.45^2 * 0.3) * rnorm(n))
)
for (j in setdiff(names(X), "K1")) X[[j]][runif(n) < 0.04] <- NA
X <- as.matrix(X)
items <- data.frame(
  id = colnames(X),
  scale = c(rep("S1", 5), rep("S2", 4), "S2", NA),
  stringsAsFactors = FALSE
)
usable <- setdiff(colnames(X), "K1")

summarise <- function(data, use_policy, removed = character(0)) {
  keep <- setdiff(usable, removed)
  Z <- data[, keep, drop = FALSE]
  if (use_policy == "listwise") Z <- Z[complete.cases(Z), , drop = FALSE]
  use <- if (use_policy == "pairwise") "pairwise.complete.obs" else "complete.obs"
  R <- cor(Z, use = use)
  C <- cov(Z, use = use)
  present <- !is.na(Z)
  pairN <- crossprod(present)
  vif <- diag(solve(R))
  ev <- eigen(R, symmetric = TRUE)$values
  scales <- lapply(c("S1", "S2"), function(s) {
    members <- intersect(items$id[!is.na(items$scale) & items$scale == s], keep)
    Cs <- C[members, members]
    k <- length(members)
    alpha <- k / (k - 1) * (1 - sum(diag(Cs)) / sum(Cs))
    ps <- suppressMessages(suppressWarnings(psych::alpha(Cs, n.obs = nrow(Z), warnings = FALSE)))
    total <- sum(Cs)
    rowSumsC <- rowSums(Cs)
    itemRest <- (rowSumsC - diag(Cs)) / sqrt(diag(Cs) * (total - 2 * rowSumsC + diag(Cs)))
    alphaIfDeleted <- sapply(seq_len(k), function(i) {
      Ci <- Cs[-i, -i]
      (k - 1) / (k - 2) * (1 - sum(diag(Ci)) / sum(Ci))
    })
    loadings <- as.numeric(suppressMessages(suppressWarnings(psych::fa(R[members, members], nfactors = 1, fm = "minres", n.obs = nrow(Z))))$loadings)
    if (sum(loadings) < 0) loadings <- -loadings
    omega <- sum(loadings)^2 / (sum(loadings)^2 + sum(1 - loadings^2))
    list(id = s, items = members, alpha = alpha, psychRawAlpha = ps$total$raw_alpha,
         itemRest = unname(itemRest), alphaIfDeleted = alphaIfDeleted,
         omegaTotal = omega)
  })
  list(items = keep, correlation = unname(R), pairN = unname(pairN), vif = unname(vif),
       eigenvalues = ev, conditionNumber = sqrt(max(ev) / min(ev)), scales = scales)
}

bkw <- function(data) {
  Z <- data[, usable]
  Z <- Z[complete.cases(Z), ]
  X1 <- cbind(1, Z)
  X1 <- sweep(X1, 2, sqrt(colSums(X1^2)), "/")
  s <- svd(X1)
  phi <- sweep(s$v^2, 2, s$d^2, "/")          # [column, dimension]
  pi <- t(sweep(phi, 1, rowSums(phi), "/"))   # [dimension, column]
  order_d <- order(s$d, decreasing = TRUE)
  list(rowsUsed = nrow(Z), conditionIndices = max(s$d) / s$d[order_d], varianceProportions = unname(pi[order_d, ]))
}

descriptives <- lapply(colnames(X), function(j) {
  x <- X[, j]
  o <- x[!is.na(x)]
  list(id = j, n = length(o), missingRate = mean(is.na(x)), floor = mean(o == 1), ceiling = mean(o == 5))
})

pairwise <- summarise(X, "pairwise")
r15 <- cor(X[, "A1"], X[, "A5"], use = "pairwise.complete.obs")
n15 <- sum(!is.na(X[, "A1"]) & !is.na(X[, "A5"]))
half <- qnorm(0.975) / sqrt(n15 - 3)

Rp <- cor(X[, usable], use = "pairwise.complete.obs")
keeperVif <- list(
  A1 = unname(diag(solve(Rp[setdiff(usable, "A5"), setdiff(usable, "A5")]))[1]),
  A5 = unname(diag(solve(Rp[setdiff(usable, "A1"), setdiff(usable, "A1")]))[4])
)

removed <- c("A5", "B4")
whatif <- function(policy) {
  before <- summarise(X, policy)
  after <- summarise(X, policy, removed)
  list(
    removed = removed,
    maxVif = max(after$vif),
    conditionNumber = after$conditionNumber,
    scales = lapply(1:2, function(s) {
      a <- before$scales[[s]]$alpha
      m <- length(after$scales[[s]]$items) / length(before$scales[[s]]$items)
      list(id = after$scales[[s]]$id, alpha = after$scales[[s]]$alpha, omegaTotal = after$scales[[s]]$omegaTotal,
           items = length(after$scales[[s]]$items), spearmanBrown = m * a / (1 + (m - 1) * a))
    })
  )
}

out <- list(
  source = "scripts/reference/engine-evidence.R",
  calls = c("cor(x, use = 'pairwise.complete.obs' | 'complete.obs')", "diag(solve(R))", "eigen(R)$values",
            "svd(cbind(1, x) scaled to unit length) for Belsley-Kuh-Welsch",
            "k/(k-1) (1 - tr(C)/sum(C)) and psych::alpha(C)$total$raw_alpha (must agree)",
            "item-rest (sum_j C_ij - C_ii) / sqrt(C_ii (sum C - 2 sum_j C_ij + C_ii)); alpha of C without item i",
            "psych::fa(R, nfactors = 1, fm = 'minres')$loadings -> omega total",
            "tanh(atanh(r) -/+ qnorm(0.975) / sqrt(n - 3))", "m * a / (1 + (m - 1) * a)", "keeperVif: diag(solve(R without the partner))"),
  r_version = R.version.string,
  psych_version = as.character(packageVersion("psych")),
  items = lapply(seq_len(nrow(items)), function(i) list(id = items$id[i], scale = if (is.na(items$scale[i])) NULL else items$scale[i])),
  rows = n,
  data = lapply(seq_len(ncol(X)), function(j) lapply(X[, j], function(v) if (is.na(v)) NULL else v)),
  descriptives = descriptives,
  pairwise = pairwise,
  listwise = summarise(X, "listwise"),
  collinearity = bkw(X),
  keeperVif = keeperVif,
  fisherZ = list(a = "A1", b = "A5", r = r15, n = n15, lower = tanh(atanh(r15) - half), upper = tanh(atanh(r15) + half)),
  whatIf = list(pairwise = whatif("pairwise"), listwise = whatif("listwise"))
)
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, null = "null", pretty = FALSE), "fixtures/reference/engine-evidence.json")
