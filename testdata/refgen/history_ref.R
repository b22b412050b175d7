# Reference values for fitcore's comparison of two calibration lines
# (fitcore/compare.go) and the drift of a calibration parameter
# (fitcore/drift.go); read by fitcore/history_ref_test.go.
#
# Run from the repository root with Debian's R (r-base-core):
#   Rscript testdata/refgen/history_ref.R > testdata/golden/history.json
#
# compare: for each data set, g = 0 (previous line) / 1 (today's line),
#   seq   <- anova(lm(y ~ x), lm(y ~ x + g), lm(y ~ x * g))
#            row 2: F, p of equal intercepts given a common slope
#            row 3: F, p of equal slopes (separate lines vs common slope)
#   coinc <- anova(lm(y ~ x), lm(y ~ x * g))   row 2: F, p of coincidence
#   plus the coefficients of lm(y ~ x) fitted to each group.
# drift: lm(s ~ t, weights = 1/se^2): coefficients, standard errors,
#   p of the t column (summary), confint at 0.95.
#
# All data are invented (generated below with set.seed) and marked so.
num <- function(v) paste(sprintf("%.17g", v), collapse = ", ")
arr <- function(v) paste0("[", num(v), "]")

compare_case <- function(name, x1, y1, x2, y2) {
  x <- c(x1, x2); y <- c(y1, y2); g <- c(rep(0, length(x1)), rep(1, length(x2)))
  seq <- anova(lm(y ~ x), lm(y ~ x + g), lm(y ~ x * g))
  coinc <- anova(lm(y ~ x), lm(y ~ x * g))
  c1 <- coef(lm(y1 ~ x1)); c2 <- coef(lm(y2 ~ x2))
  sprintf(paste0('    {"name": "%s", "invented": true, "x1": %s, "y1": %s, "x2": %s, "y2": %s,\n',
                 '     "f_intercepts": %s, "p_intercepts": %s, "f_slopes": %s, "p_slopes": %s,\n',
                 '     "f_coincident": %s, "p_coincident": %s, "df2": %d,\n',
                 '     "intercept1": %s, "slope1": %s, "intercept2": %s, "slope2": %s}'),
          name, arr(x1), arr(y1), arr(x2), arr(y2),
          num(seq$F[2]), num(seq$`Pr(>F)`[2]), num(seq$F[3]), num(seq$`Pr(>F)`[3]),
          num(coinc$F[2]), num(coinc$`Pr(>F)`[2]), as.integer(seq$Res.Df[3]),
          num(c1[1]), num(c1[2]), num(c2[1]), num(c2[2]))
}

drift_case <- function(name, t, s, se) {
  m <- lm(s ~ t, weights = 1 / se^2)
  co <- summary(m)$coefficients
  ci <- confint(m, level = 0.95)
  sprintf(paste0('    {"name": "%s", "invented": true, "t": %s, "s": %s, "se": %s,\n',
                 '     "intercept": %s, "intercept_se": %s, "rate": %s, "rate_se": %s, "p": %s,\n',
                 '     "rate_low": %s, "rate_high": %s}'),
          name, arr(t), arr(s), arr(se), num(co[1, 1]), num(co[1, 2]), num(co[2, 1]), num(co[2, 2]),
          num(co[2, 4]), num(ci[2, 1]), num(ci[2, 2]))
}

set.seed(20261202)
x <- c(0, 5, 10, 20, 40, 60, 80, 100)
cmp <- c(
  compare_case("same line", x, 0.2 + 1.5 * x + rnorm(8, 0, 0.3), x, 0.2 + 1.5 * x + rnorm(8, 0, 0.3)),
  compare_case("slope changed", x, 0.2 + 1.5 * x + rnorm(8, 0, 0.3), x, 0.2 + 1.53 * x + rnorm(8, 0, 0.3)),
  compare_case("line moved", x, 0.2 + 1.5 * x + rnorm(8, 0, 0.3), x, 1.0 + 1.5 * x + rnorm(8, 0, 0.3)),
  compare_case("unequal sizes", c(1, 2, 3, 4, 5), c(2.1, 3.9, 6.2, 7.8, 10.1),
               c(1, 1.5, 2, 3, 4, 5, 6), c(2.3, 3.2, 4.1, 6.4, 8.2, 10.3, 12.1))
)
tm <- seq(0, 1, length.out = 12)
se1 <- runif(12, 0.002, 0.006)
se2 <- runif(12, 0.002, 0.006)
dr <- c(
  drift_case("stable slope", tm, 1.5 + rnorm(12, 0, se1), se1),
  drift_case("drifting slope", tm, 1.5 - 0.02 * tm + rnorm(12, 0, se2), se2),
  drift_case("three calibrations", c(0, 0.5, 1.1), c(0.21, 0.25, 0.31), c(0.02, 0.01, 0.03))
)
cat('{\n  "generator": "', R.version.string, '",\n', sep = "")
cat('  "compare": [\n', paste(cmp, collapse = ",\n"), '\n  ],\n', sep = "")
cat('  "drift": [\n', paste(dr, collapse = ",\n"), '\n  ]\n}\n', sep = "")
