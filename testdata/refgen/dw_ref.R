# Reference p-values of the Durbin–Watson test for fitcore's exact
# Durbin–Watson p (fitcore/durbinwatson.go, TestDurbinWatsonExactR).
#
# Run from the repository root with Debian's R (r-base-core, r-cran-lmtest):
#   Rscript testdata/refgen/dw_ref.R > testdata/golden/dw_exact.json
#
# For every dataset it writes x, y (and w), d and
#   greater    lmtest::dwtest(..., exact = TRUE, alternative = "greater"):
#              P(D <= d), Pan's algorithm (Farebrother's AS 153) on the
#              eigenvalues of MA; fitcore's F(d)
#   two_sided  the same with alternative = "two.sided": 2 min(F, 1 - F),
#              the p fitcore's check reports
#   lmtest_exact  false when dwtest could not use Pan's algorithm (it then
#              warns and gives its normal approximation; the test uses imhof)
#   imhof      P(D <= d) computed here by hand, independently of lmtest:
#              eigenvalues of W'AW (W an orthonormal basis of the residual
#              space, from qr.Q) and Imhof's integral (Biometrika 48, 1961)
#              by R's integrate()
# Weighted fits: dwtest does not take lm weights, so the whitened model is
# given instead: sqrt(w)*y on sqrt(w) and sqrt(w)*x without intercept (its
# residuals are the Pearson residuals sqrt(w)*e of the weighted fit, and its
# design is the whitened design sqrt(W) X that fitcore uses).
#
# Data: NIST StRD Norris (testdata/strd/Norris.txt, public domain) and
# invented sets generated below with set.seed (marked "invented").
suppressMessages(library(lmtest))

num <- function(v) paste(sprintf("%.17g", v), collapse = ", ")

imhof_cdf <- function(X, d) {
  n <- nrow(X); k <- ncol(X)
  A <- diag(c(1, rep(2, n - 2), 1)); A[abs(row(A) - col(A)) == 1] <- -1
  Q <- qr.Q(qr(X), complete = TRUE)
  W <- Q[, (k + 1):n, drop = FALSE]
  ev <- eigen(crossprod(W, A %*% W), symmetric = TRUE, only.values = TRUE)$values
  mu <- ev - d
  f <- function(u) sapply(u, function(uu) {
    if (uu == 0) return(0.5 * sum(mu))
    sin(0.5 * sum(atan(mu * uu))) / (uu * exp(0.25 * sum(log1p(mu^2 * uu^2))))
  })
  0.5 - integrate(f, 0, Inf, rel.tol = 1e-12, abs.tol = 1e-14, subdivisions = 10000L)$value / pi
}

cases <- list()
add <- function(name, x, y, w = NULL, origin = FALSE, source = "invented") {
  if (is.null(w)) {
    X <- if (origin) cbind(x) else cbind(1, x)
    yy <- y
  } else {
    sw <- sqrt(w)
    X <- if (origin) cbind(sw * x) else cbind(sw, sw * x)
    yy <- sw * y
  }
  # dwtest falls back to its normal approximation, with a warning, when
  # Pan's algorithm leaves [0, 1]; such a p is recorded as not exact.
  exact <- TRUE
  dw <- function(alt) withCallingHandlers(dwtest(yy ~ 0 + X, exact = TRUE, alternative = alt),
    warning = function(w) { exact <<- FALSE; invokeRestart("muffleWarning") })
  g <- dw("greater")
  t2 <- dw("two.sided")
  s <- sprintf('    {"name": "%s", "source": "%s", "origin": %s, "n": %d,\n     "x": [%s],\n     "y": [%s],\n',
               name, source, tolower(as.character(origin)), length(x), num(x), num(y))
  if (!is.null(w)) s <- paste0(s, sprintf('     "w": [%s],\n', num(w)))
  s <- paste0(s, sprintf('     "d": %.17g, "lmtest_exact": %s, "greater": %.17g, "two_sided": %.17g, "imhof": %.17g}',
                         unname(g$statistic), tolower(as.character(exact)), g$p.value, t2$p.value,
                         imhof_cdf(X, unname(g$statistic))))
  cases[[length(cases) + 1]] <<- s
}

nor <- read.table("testdata/strd/Norris.txt", comment.char = "#", header = FALSE, col.names = c("y", "x"))
add("norris", nor$x, nor$y, source = "NIST StRD Norris")

set.seed(20261202)
x <- 1:25; e <- as.numeric(arima.sim(list(ar = 0.6), 25))
add("drift25", x, 2 + 0.5 * x + e)
x <- seq(0.5, 12, length.out = 40); e <- as.numeric(arima.sim(list(ar = 0.85), 40))
add("strong_drift40", x, 1 + 2 * x + 0.3 * e)            # p far below 1e-6
x <- 1:8; add("alternate8", x, 3 + x + 0.2 * c(1, -1, 1, -1, 1, -1, 1, -1) + rnorm(8, sd = 0.05))
x <- sort(runif(12, 1, 20)); add("plain12", x, 0.4 + 1.1 * x + rnorm(12))
x <- sort(runif(18, 2, 30)); add("origin18", x, 0.9 * x + rnorm(18, sd = 0.5), origin = TRUE)
x <- seq(1, 30, length.out = 60); e <- as.numeric(arima.sim(list(ar = 0.3), 60)) * 0.05 * x
w <- 1 / x^2
add("weighted60", x, 2 + 1.5 * x + e, w = w)
x <- sort(runif(15, 1, 10)); w <- 1 / x
add("weighted_origin15", x, 1.2 * x + rnorm(15, sd = 0.3) * sqrt(x), w = w, origin = TRUE)
x <- 1:300; e <- as.numeric(arima.sim(list(ar = 0.15), 300))
add("long300", x, 5 + 0.01 * x + e)

cat("{\n")
cat(sprintf('  "generator": "testdata/refgen/dw_ref.R",\n  "r": "%s",\n  "lmtest": "%s",\n',
            R.version.string, as.character(packageVersion("lmtest"))))
cat('  "note": "greater = P(D <= d) by lmtest::dwtest(exact = TRUE); two_sided = 2 min(F, 1 - F); imhof = P(D <= d) from eigen() and integrate() in R. Invented data except Norris.",\n')
cat('  "cases": [\n')
cat(paste(unlist(cases), collapse = ",\n"))
cat("\n  ]\n}\n")
