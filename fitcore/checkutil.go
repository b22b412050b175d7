package fitcore

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// Small helpers shared by the assumption checks (curvature.go, lackoffit.go,
// breuschpagan.go, white.go, durbinwatson.go, runs.go, shapirowilk.go,
// influence.go, xexactness.go). They are deliberately self-contained so that
// the checks compile with report.go alone.

// Common-practice significance thresholds for the assumption checks: a p below
// ckWarnP earns a warning, a p below ckFailP a failure. These are the
// usual 5 % and 1 % levels (common practice).
const (
	ckWarnP = 0.05
	ckFailP = 0.01
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

// ckStandardize returns (v−mean)/rms, the centred and scaled copy of v used to
// keep the small least-squares problems well conditioned, and whether v has
// any spread at all.
func ckStandardize(v []float64) ([]float64, bool) {
	m, s := ckMeanSD(v)
	out := make([]float64, len(v))
	if s == 0 || !ckFinite(s) {
		return out, false
	}
	for i, a := range v {
		out[i] = (a - m) / s
	}
	return out, true
}

// ckLSQ is a least-squares fit by modified Gram–Schmidt with one full
// re-orthogonalisation pass ("twice is enough", Giraud, Langou & Rozložník,
// Computers & Mathematics with Applications 50, 2005). cols are the columns of
// the design, y the response. On return q holds the orthonormal basis, proj[j]
// = q_jᵀy, and resid the residual vector y − Σ proj[j]·q_j. ok is false when a
// column is, to rounding, a combination of the earlier ones. Cost O(n·k²).
type ckLSQ struct {
	q     [][]float64
	proj  []float64
	resid []float64
}

func ckFit(cols [][]float64, y []float64) (ckLSQ, bool) {
	n := len(y)
	var f ckLSQ
	for _, c := range cols {
		v := append([]float64(nil), c...)
		orig := ckNorm(v)
		if orig == 0 {
			return f, false
		}
		for pass := 0; pass < 2; pass++ {
			for _, qj := range f.q {
				d := ckDot(qj, v)
				for i := range v {
					v[i] -= d * qj[i]
				}
			}
		}
		nv := ckNorm(v)
		if nv <= 1e-10*orig {
			return f, false
		}
		for i := range v {
			v[i] /= nv
		}
		f.q = append(f.q, v)
	}
	r := append([]float64(nil), y...)
	f.proj = make([]float64, len(f.q))
	for pass := 0; pass < 2; pass++ {
		for j, qj := range f.q {
			d := ckDot(qj, r)
			f.proj[j] += d
			for i := 0; i < n; i++ {
				r[i] -= d * qj[i]
			}
		}
	}
	f.resid = r
	return f, true
}

func ckDot(a, b []float64) float64 {
	var s float64
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

// ckNorm is the Euclidean norm, scaled to avoid overflow and underflow.
func ckNorm(v []float64) float64 {
	var scale, ssq float64 = 0, 1
	for _, a := range v {
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

// ckAuxR2 is the centred R² of the auxiliary regression of v on an
// intercept and the given columns, as used by the Breusch–Pagan and White
// tests. ok is false when v has no spread or the columns are degenerate.
func ckAuxR2(v []float64, cols [][]float64) (r2 float64, ok bool) {
	vc, spread := ckStandardize(v)
	if !spread {
		return 0, false
	}
	ones := make([]float64, len(v))
	for i := range ones {
		ones[i] = 1
	}
	f, ok := ckFit(append([][]float64{ones}, cols...), vc)
	if !ok {
		return 0, false
	}
	// vc has mean 0 and Σvc² = n, so SST = n.
	sse := ckDot(f.resid, f.resid)
	r2 = 1 - sse/float64(len(v))
	if r2 < 0 {
		r2 = 0
	}
	if r2 > 1 {
		r2 = 1
	}
	return r2, ckFinite(r2)
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

// ckSorted returns v sorted ascending (O(n log n)).
func ckSorted(v []float64) []float64 {
	s := append([]float64(nil), v...)
	sort.Float64s(s)
	return s
}

// ckFmtP formats a p-value for a sentence.
func ckFmtP(p float64) string {
	switch {
	case p < 0.0001:
		return "p < 0.0001"
	case p < 0.001:
		return fmt.Sprintf("p = %.4f", p)
	default:
		return fmt.Sprintf("p = %.3f", p)
	}
}

// ckLine fits y = b0 + b1·x (or y = b1·x when origin) by weighted least
// squares with weights w (nil = 1) using centred sums, and returns the
// coefficients and raw residuals. ok is false when x has no spread (or is all
// zero through the origin).
func ckLine(x, y, w []float64, origin bool) (b0, b1 float64, resid []float64, ok bool) {
	n := len(x)
	resid = make([]float64, n)
	if origin {
		var sxx, sxy float64
		for i := range x {
			wi := ckW(w, i)
			sxx += wi * x[i] * x[i]
			sxy += wi * x[i] * y[i]
		}
		if sxx == 0 || !ckFinite(sxx) || !ckFinite(sxy) {
			return 0, 0, resid, false
		}
		b1 = sxy / sxx
	} else {
		var sw, mx, my float64
		for i := range x {
			wi := ckW(w, i)
			sw += wi
			mx += wi * x[i]
			my += wi * y[i]
		}
		mx /= sw
		my /= sw
		var sxx, sxy float64
		for i := range x {
			wi := ckW(w, i)
			dx := x[i] - mx
			sxx += wi * dx * dx
			sxy += wi * dx * (y[i] - my)
		}
		if sxx == 0 || !ckFinite(sxx) || !ckFinite(sxy) {
			return 0, 0, resid, false
		}
		b1 = sxy / sxx
		b0 = my - b1*mx
	}
	for i := range x {
		resid[i] = y[i] - b0 - b1*x[i]
	}
	return b0, b1, resid, true
}
