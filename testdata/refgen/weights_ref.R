# Reference weighted fits for the advice's weightings (fitcore/advice.go,
# fitcore/ols.go schemeWeights; TestWeightedRemediesR).
#
# Run from the repository root with Debian's R (r-base-core, r-cran-lmtest):
#   Rscript testdata/refgen/weights_ref.R > testdata/golden/weights.json
#
# For every dataset (invented, drawn below with set.seed) and weighting:
#   x2        lm(y ~ x, weights = 1/x^2)
#   fitted2   lm(y ~ x, weights = 1/fitted(lm(y ~ x))^2)
#   repeats   lm(y ~ x, weights = 1/ave(y, x, FUN = var))   (sample variance, n - 1)
#   none      lm(y ~ x)
# it writes the coefficients, their standard errors, sigma (the residual
# SE), and the studentized Breusch-Pagan statistic (Koenker 1981) of the
# weighted residuals sqrt(w)*e on x, computed here by hand as n * R^2 of
# lm(pe^2 ~ x); for "none" it is checked against lmtest::bptest.
suppressMessages(library(lmtest))

num <- function(v) paste(sprintf("%.17g", v), collapse = ", ")

fits <- function(x, y) {
  u <- lm(y ~ x)
  ws <- list(none = rep(1, length(x)), x2 = 1 / x^2, fitted2 = 1 / fitted(u)^2,
             repeats = 1 / ave(y, x, FUN = var))
  out <- c()
  for (k in names(ws)) {
    w <- ws[[k]]
    m <- lm(y ~ x, weights = w)
    cf <- summary(m)$coefficients
    pe <- sqrt(w) * resid(m)
    aux <- summary(lm(pe^2 ~ x))
    lm_stat <- length(x) * aux$r.squared
    if (k == "none") {
      bp <- bptest(u, studentize = TRUE)
      stopifnot(abs(bp$statistic - lm_stat) < 1e-9 * max(1, lm_stat))
    }
    out <- c(out, sprintf(
      '      "%s": {"intercept": %.17g, "slope": %.17g, "se_intercept": %.17g, "se_slope": %.17g, "sigma": %.17g, "bp": %.17g, "bp_p": %.17g}',
      k, cf[1, 1], cf[2, 1], cf[1, 2], cf[2, 2], summary(m)$sigma, lm_stat,
      pchisq(lm_stat, 1, lower.tail = FALSE)))
  }
  paste(out, collapse = ",\n")
}

sets <- list()
add <- function(name, x, y) {
  sets[[length(sets) + 1]] <<- sprintf('  {"name": "%s", "source": "invented (set.seed in testdata/refgen/weights_ref.R)",\n    "x": [%s],\n    "y": [%s],\n    "fits": {\n%s\n    }}',
    name, num(x), num(y), fits(x, y))
}

set.seed(11)
x <- rep(c(1, 2, 5, 10, 20, 50), 3)
add("six standards x3, scatter 5 % of the reading", x, 0.5 * x * (1 + 0.05 * rnorm(length(x))))

set.seed(12)
x <- rep(1:12, 2)
add("twelve standards x2, scatter growing with x", x, 3 + 2 * x + 0.2 * x * rnorm(length(x)))

set.seed(13)
x <- rep(c(0.5, 1, 2, 4, 8), each = 4)
add("five standards x4, scatter 2 % plus a floor", x, 10 * x + sqrt(0.01 + (0.02 * 10 * x)^2) * rnorm(length(x)))

cat('{"generator": "testdata/refgen/weights_ref.R", "r": "', R.version.string, '", "lmtest": "',
    as.character(packageVersion("lmtest")), '",\n "sets": [\n', paste(sets, collapse = ",\n"), '\n]}\n', sep = "")
