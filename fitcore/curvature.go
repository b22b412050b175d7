package fitcore

import (
	"fmt"
	"math"
)

// CurvatureTest tests whether a straight line misses a bend in the readings.
// It fits
//
//	y = b0 + b1·x + b2·(x − x̄)²
//
// by least squares (weighted with w when w is not nil, unweighted when w is
// nil) and returns the t statistic of b2,
//
//	t = b2 / SE(b2),  df = n − 3,
//
// with its two-sided p from Student's t. This is the added-quadratic-term test
// for curvature (Draper & Smith, Applied Regression Analysis, 3rd ed. 1998,
// §5.1 and §6.1; NIST/SEMATECH e-Handbook of Statistical Methods §4.4.4).
// Centring the square at x̄ leaves t unchanged but keeps the fit well
// conditioned; internally x is also scaled by its spread and the fit uses
// Gram–Schmidt orthogonalisation, so t equals the coefficient t-value a
// QR-based least-squares program reports for the same model.
//
// Verdict (common practice): with α = 1 − level (level 0 means 0.95), a p
// below α/5 fails (1 % at the default level) and a p below α warns (5 %).
// The check is NA with a reason when there are fewer than 4 readings, fewer
// than 3 distinct x values, non-finite inputs, non-positive weights, or when
// the readings lie exactly (to rounding) on a straight line.
func CurvatureTest(x, y, w []float64, level float64) Check {
	const name = "Curvature"
	if s := ckValidate(x, y, w, "y value"); s != "" {
		return ckNA(name, s)
	}
	n := len(x)
	if n < 4 {
		return ckNA(name, fmt.Sprintf("The curvature check needs at least 4 readings; there are %d.", n))
	}
	if !(level > 0 && level < 1) {
		level = 0.95
	}
	alpha := 1 - level
	xs, ok := ckStandardize(x)
	if !ok {
		return ckNA(name, "All x values are the same, so no line (or curve) can be fitted.")
	}
	if ckDistinct(x) < 3 {
		return ckNA(name, "The curvature check needs at least 3 different x values.")
	}
	sw := make([]float64, n)
	c0 := make([]float64, n)
	c1 := make([]float64, n)
	c2 := make([]float64, n)
	yw := make([]float64, n)
	for i := range x {
		sw[i] = math.Sqrt(ckW(w, i))
		c0[i] = sw[i]
		c1[i] = sw[i] * xs[i]
		c2[i] = sw[i] * xs[i] * xs[i]
		yw[i] = sw[i] * y[i]
	}
	f, ok := ckFit([][]float64{c0, c1, c2}, yw)
	if !ok {
		return ckNA(name, "The x values do not spread enough to tell a curve from a line.")
	}
	df := float64(n - 3)
	sse := ckDot(f.resid, f.resid)
	s := math.Sqrt(sse / df)
	scale := ckNorm(yw)
	if !ckFinite(s) || !ckFinite(scale) {
		return ckNA(name, "The readings are too large to check for curvature.")
	}
	if s <= 1e-13*scale {
		if math.Abs(f.proj[2]) <= 1e-13*scale {
			return ckNA(name, "The readings lie exactly on a straight line, so there is nothing to test.")
		}
		return Check{Name: name, Statistic: 0, DF: df, P: 0, Verdict: Fail,
			Message: "The readings lie exactly on a curve, not a straight line (the t statistic is unbounded)."}
	}
	t := f.proj[2] / s
	p := ckT2(t, df)
	c := Check{Name: name, Statistic: t, DF: df, P: p, Verdict: ckVerdict(p, alpha, alpha/5)}
	switch c.Verdict {
	case Fail:
		c.Message = fmt.Sprintf("The readings bend away from a straight line (quadratic term t = %.2f, %s).", t, ckFmtP(p))
	case Warn:
		c.Message = fmt.Sprintf("The readings may bend slightly away from a straight line (quadratic term t = %.2f, %s).", t, ckFmtP(p))
	default:
		c.Message = fmt.Sprintf("No sign of a bend: a straight line fits (quadratic term t = %.2f, %s).", t, ckFmtP(p))
	}
	return c
}

// ckDistinct returns the number of distinct values in v (O(n log n)).
func ckDistinct(v []float64) int {
	s := ckSorted(v)
	k := 0
	for i := range s {
		if i == 0 || s[i] != s[i-1] {
			k++
		}
	}
	return k
}
