package fitcore

// White is White's test for residual spread that changes with x: regress the
// squared residuals e² on an intercept, x and the centred square (x − x̄)²
// and take
//
//	LM = n·R²,  p = P(χ²(2) > LM).
//
// With one regressor this is White's full test (levels, squares and cross
// products of the regressors), since the centred square spans the same space
// as x². Source: White, "A heteroskedasticity-consistent covariance matrix
// estimator and a direct test for heteroskedasticity", Econometrica 48
// (1980). It equals statsmodels' het_white for the design [1, x].
//
// Unlike Breusch–Pagan it also picks up spread that is largest (or smallest)
// in the middle of the range. The check is NA with a reason for fewer than 4
// readings, fewer than 3 distinct x values, non-finite input, or residuals
// whose squares are all equal. Verdict (common practice): p < 0.01 fails,
// p < 0.05 warns.
func White(x, resid []float64) Check {
	return ckSpread("White", x, resid, true, nil)
}
