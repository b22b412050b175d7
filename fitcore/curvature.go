package fitcore

import (
	"fmt"
	"math"
	"slices"
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
// Gram–Schmidt orthogonalisation (on a basis held as a few sums, see
// ckBasis, so the cost is O(n) with no n-sized copies), so t equals the
// coefficient t-value a QR-based least-squares program reports for the
// same model.
//
// Verdict: with α = 1 − level (a level outside MinLevel…MaxLevel, 0 included, means 0.95), a p
// below α/50 fails (0.1 % at the default level) and a p below α/5 warns (1 %), the
// thresholds of every check (CheckWarnP, CheckFailP) at the default level.
// The check is NA with a reason when there are fewer than 4 readings, fewer
// than 3 distinct x values, non-finite inputs, non-positive weights, or when
// the readings lie exactly (to rounding) on a straight line.
func CurvatureTest(x, y, w []float64, level float64) Check {
	return curvatureTest(x, y, w, level, nil)
}

// curvatureTest is CurvatureTest with what is known about x in pre (nil:
// work it out).
func curvatureTest(x, y, w []float64, level float64, pre *ckPre) Check {
	const name = "Curvature"
	if pre == nil || !pre.xyValid {
		if s := ckValidate(x, y, w, "y value"); s != "" {
			return ckNA(name, s)
		}
	}
	n := len(x)
	if n < MinCurvatureN {
		return ckNA(name, fmt.Sprintf("The curvature check needs at least %d readings; there are %d.", MinCurvatureN, n))
	}
	level = levelOrDefault(level)
	alpha := 1 - level
	if pre == nil {
		pre = ckPrepare(x)
	}
	if !pre.ok {
		return ckNA(name, "All x values are the same, so no line (or curve) can be fitted.")
	}
	if pre.distinct < 3 {
		return ckNA(name, "The curvature check needs at least 3 different x values.")
	}
	bs := &pre.basis
	if w != nil {
		wb, ok := ckNewBasis(x, w, true)
		if !ok {
			return ckNA(name, "All x values are the same, so no line (or curve) can be fitted.")
		}
		bs = &wb
	}
	if !bs.okD || !bs.okG {
		return ckNA(name, "The x values do not spread enough to tell a curve from a line.")
	}
	f := bs.project(x, w, true, y, false, 0, 1)
	df := float64(n - 3)
	s := math.Sqrt(f.sse / df)
	scale := ckWNorm(y, w, bs.wk)
	if !ckFinite(s) || !ckFinite(scale) {
		return ckNA(name, "The readings are too large to check for curvature.")
	}
	// The same tolerance as every check (NoScatterTol, on root sums of
	// squares): no scatter about the quadratic, and none about the line.
	if math.Sqrt(f.sse) <= NoScatterTol*scale {
		if math.Hypot(math.Sqrt(f.sse), f.pg) <= NoScatterTol*scale {
			return ckNA(name, NoScatterSentence)
		}
		return Check{Name: name, Statistic: 0, DF: df, P: 0, Verdict: Fail,
			Message: "The readings lie exactly on a curve, not a straight line (the t statistic is unbounded)."}
	}
	t := f.pg / s
	p := ckT2(t, df)
	c := Check{Name: name, Statistic: t, DF: df, P: p, Verdict: ckVerdict(p, alpha/5, alpha/50)}
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

// ckDistinctAtLeast returns min(k, the number of distinct values in v) in
// O(n·k), without sorting.
func ckDistinctAtLeast(v []float64, k int) int {
	seen := make([]float64, 0, k)
	for _, a := range v {
		if len(seen) == k {
			break
		}
		if !slices.Contains(seen, a) {
			seen = append(seen, a)
		}
	}
	return len(seen)
}

// ckWNorm is √Σ(wk·w)·v², scaled to avoid overflow and underflow (the
// Euclidean norm of √(wk·w)·v); w nil means all weights 1.
func ckWNorm(v, w []float64, wk float64) float64 {
	var ss float64
	for i, a := range v {
		if w != nil {
			ss += w[i] * wk * a * a
		} else {
			ss += a * a
		}
	}
	if ss > 0x1p-900 && ss < 0x1p900 {
		return math.Sqrt(ss)
	}
	var scale, ssq float64 = 0, 1
	for i, a := range v {
		if w != nil {
			a *= math.Sqrt(w[i] * wk)
		}
		if a == 0 {
			continue
		}
		a = math.Abs(a)
		if scale < a {
			ssq = 1 + ssq*(scale/a)*(scale/a)
			scale = a
		} else {
			ssq += (a / scale) * (a / scale)
		}
	}
	return scale * math.Sqrt(ssq)
}
