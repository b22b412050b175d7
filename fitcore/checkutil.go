package fitcore

import (
	"pairline/app/numfmt"

	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// Small helpers shared by the assumption checks (curvature.go, lackoffit.go,
// breuschpagan.go, white.go, durbinwatson.go, runs.go, shapirowilk.go,
// influence.go, xexact.go), with checkbasis.go (the orthogonal basis in x
// the auxiliary regressions use) and sortutil.go (sorting).

// Significance thresholds of the assumption checks: a p below ckWarnP earns
// a warning, a p below ckFailP a failure. They are stricter than the usual
// 5 % and 1 % because a record is judged by about seven tests at once
// (curvature, lack of fit, Breusch–Pagan, White, Durbin–Watson, runs,
// Shapiro–Wilk) plus the outlier test: at 1 % and 0.1 % each, good data get
// any flag in at most about a quarter of records and any Fail in well under
// 5 % (measured: TestOperatingCharacteristic, table in DEVELOPERS.md "How
// the checks decide").
const (
	ckWarnP = CheckWarnP
	ckFailP = CheckFailP
)

// CheckWarnP and CheckFailP are the p values below which an assumption
// check warns and fails (see ckWarnP). Chosen by simulation so that the
// whole set of checks has the false-alarm rates stated in DEVELOPERS.md.
const (
	CheckWarnP = 0.01
	CheckFailP = 0.001
)

// ckNA returns a check that could not be run, with the reason.
func ckNA(name, why string) Check {
	return Check{Name: name, Verdict: NA, Message: why}
}

// ckVerdict maps a p-value to a verdict with the thresholds warnP > failP.
func ckVerdict(p, warnP, failP float64) Verdict {
	switch {
	case !ckFinite(p):
		return NA
	case p < failP:
		return Fail
	case p < warnP:
		return Warn
	default:
		return Pass
	}
}

func ckFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// ckClampP keeps a probability inside [0, 1] and finite.
func ckClampP(p float64) float64 {
	switch {
	case math.IsNaN(p):
		return 1
	case p < 0:
		return 0
	case p > 1:
		return 1
	}
	return p
}

// ckFirstNonFinite returns a sentence naming the first non-finite value of v, or "".
// what names the column for the technician ("x", "residual", …).
func ckFirstNonFinite(what string, v []float64) string {
	for i, a := range v {
		if !ckFinite(a) {
			return fmt.Sprintf("Reading %d has a %s that is not a number (%v).", i+1, what, a)
		}
	}
	return ""
}

// ckAllFinite says whether every value of v is finite (ckFirstNonFinite
// would return ""), without a branch per value: a·0 is ±0 for a finite a
// and NaN for ±Inf or NaN, so the sums stay zero exactly when all are
// finite.
func ckAllFinite(v []float64) bool {
	var s0, s1 float64
	i := 0
	for ; i+2 <= len(v); i += 2 {
		s0 += v[i] * 0
		s1 += v[i+1] * 0
	}
	for ; i < len(v); i++ {
		s0 += v[i] * 0
	}
	return s0+s1 == 0
}

// ckWeights returns a sentence naming the first weight that is not a
// positive finite number, or "". A nil w is fine (unweighted).
func ckWeights(w []float64, n int) string {
	if w == nil {
		return ""
	}
	if len(w) != n {
		return fmt.Sprintf("There are %d weights for %d readings; they must match one to one.", len(w), n)
	}
	for i, a := range w {
		if !ckFinite(a) || a <= 0 {
			return fmt.Sprintf("Reading %d has weight %v; weights must be positive numbers.", i+1, a)
		}
	}
	return ""
}

// ckValidate checks lengths, finiteness and weights of the inputs shared by the
// checks and returns a sentence for the technician, or "" when all is well.
func ckValidate(x, y, w []float64, yName string) string {
	if len(x) != len(y) {
		return fmt.Sprintf("There are %d x values but %d %s values; they must pair up.", len(x), len(y), yName)
	}
	if s := ckFirstNonFinite("x value", x); s != "" {
		return s
	}
	if s := ckFirstNonFinite(yName, y); s != "" {
		return s
	}
	return ckWeights(w, len(x))
}

// ckW returns w[i], or 1 when w is nil.
func ckW(w []float64, i int) float64 {
	if w == nil {
		return 1
	}
	return w[i]
}

// ckMeanSD returns the mean and the root mean square deviation of v (two-pass,
// with the compensated second pass of Chan, Golub & LeVeque, "Algorithms for
// computing the sample variance", The American Statistician 37, 1983).
func ckMeanSD(v []float64) (mean, rms float64) {
	n := float64(len(v))
	if n == 0 {
		return 0, 0
	}
	for _, a := range v {
		mean += a
	}
	mean /= n
	var ss, corr float64
	for _, a := range v {
		d := a - mean
		ss += d * d
		corr += d
	}
	ss -= corr * corr / n
	if ss < 0 {
		ss = 0
	}
	return mean + corr/n, math.Sqrt(ss / n)
}

// ckChi2SF is P(χ²(df) > x).
func ckChi2SF(x, df float64) float64 {
	return ckClampP(distuv.ChiSquared{K: df}.Survival(x))
}

// ckT2 is the two-sided p of a t statistic with df degrees of freedom.
func ckT2(t, df float64) float64 {
	return ckClampP(2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Survival(math.Abs(t)))
}

// ckFSF is P(F(d1, d2) > x) = I_{d2/(d2+d1·x)}(d2/2, d1/2), the regularized
// incomplete beta function (Abramowitz & Stegun 26.6.2). It is evaluated
// directly rather than as 1 − CDF so that tiny p-values keep their digits.
func ckFSF(x, d1, d2 float64) float64 {
	if !(x > 0) {
		return 1
	}
	return ckClampP(mathext.RegIncBeta(d2/2, d1/2, d2/(d2+d1*x)))
}

// ckZ2 is the two-sided standard-normal p of z.
func ckZ2(z float64) float64 {
	return ckClampP(2 * distuv.UnitNormal.Survival(math.Abs(z)))
}

// ckFmtP formats a p-value for a sentence, in the one form the screen
// uses too (numfmt.PEq).
func ckFmtP(p float64) string { return numfmt.PEq(p) }

// ckLine fits y = b0 + b1·x (or y = b1·x when origin) by weighted least
// squares with weights w (nil = 1) using centred sums, and returns the
// coefficients and raw residuals. ok is false when x has no spread (or is all
// zero through the origin).
func ckLine(x, y, w []float64, origin bool) (b0, b1 float64, resid []float64, ok bool) {
	resid = make([]float64, len(x))
	b0, b1, ok = ckLineCoef(x, y, w, origin)
	if !ok {
		return 0, 0, resid, false
	}
	for i := range x {
		resid[i] = y[i] - b0 - b1*x[i]
	}
	return b0, b1, resid, true
}

// ckLineCoef is ckLine without the residuals.
func ckLineCoef(x, y, w []float64, origin bool) (b0, b1 float64, ok bool) {
	n := len(x)
	if origin {
		var sxx, sxy float64
		for i := range x {
			wi := ckW(w, i)
			sxx += wi * x[i] * x[i]
			sxy += wi * x[i] * y[i]
		}
		if sxx == 0 || !ckFinite(sxx) || !ckFinite(sxy) {
			return 0, 0, false
		}
		return 0, sxy / sxx, true
	}
	var sw, mx, my float64
	for i := range n {
		wi := ckW(w, i)
		sw += wi
		mx += wi * x[i]
		my += wi * y[i]
	}
	mx /= sw
	my /= sw
	var sxx, sxy float64
	for i := range n {
		wi := ckW(w, i)
		dx := x[i] - mx
		sxx += wi * dx * dx
		sxy += wi * dx * (y[i] - my)
	}
	if sxx == 0 || !ckFinite(sxx) || !ckFinite(sxy) {
		return 0, 0, false
	}
	b1 = sxy / sxx
	return my - b1*mx, b1, true
}

// absMax is max(m, |v|) for a running maximum m that starts at +0: the
// value of the builtin max, a NaN in v carrying through and staying, but
// as a comparison the compiler keeps in the loop (on WebAssembly the
// builtin max of two floats is a call into the runtime, which a loop over
// every reading pays once per value).
func absMax(m, v float64) float64 {
	return posMax(m, math.Abs(v))
}

// posMax is max(m, v) for a running maximum m that starts at +0 and only
// grows (so it is never −0): v when v > m or v is a NaN, else m. A NaN m
// stays, as with max.
func posMax(m, v float64) float64 {
	if v > m || v != v {
		return v
	}
	return m
}

// ckMin and ckMax are the builtin min and max of two floats (a NaN wins,
// min(−0, +0) = −0, max(−0, +0) = +0) as comparisons, for loops over
// every reading (on WebAssembly the builtins are a call into the runtime).
func ckMin(a, b float64) float64 {
	if b < a || b != b || (b == a && math.Signbit(b)) {
		return b
	}
	return a
}

// ckMax: see ckMin.
func ckMax(a, b float64) float64 {
	if b > a || b != b || (b == a && !math.Signbit(b)) {
		return b
	}
	return a
}
