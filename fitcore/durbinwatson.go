package fitcore

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// DurbinWatson is the Durbin–Watson test for serial correlation of the
// residuals e_1 … e_n in the order the readings were entered:
//
//	d = Σ_{t=2..n} (e_t − e_{t−1})² / Σ_{t=1..n} e_t²
//
// (Durbin & Watson, "Testing for serial correlation in least squares
// regression I/II", Biometrika 37, 1950 and 38, 1951). d near 2 means no
// correlation; d well below 2 means neighbouring readings drift together,
// well above 2 that they alternate.
//
// The p-value uses the exact mean and variance of d under independent normal
// errors for this design X ([1, x], or [x] when origin is true), with
// M = I − X(XᵀX)⁻¹Xᵀ, A the first-difference matrix (d = eᵀAe/eᵀe) and k the
// number of columns of X:
//
//	P = tr(MA),  Q = tr((MA)²)
//	E[d] = P/(n−k),  Var[d] = 2(Q − P·E[d]) / ((n−k)(n−k+2))
//
// (Durbin & Watson 1950, §3; Durbin & Watson, "Testing for serial correlation
// in least squares regression III", Biometrika 58, 1971). d/4 is then taken as
// Beta(a, b) with the same mean and variance (the beta approximation of
// Durbin & Watson 1950, §4), and the p is two-sided:
// p = 2·min(F(d/4), 1 − F(d/4)), capped at 1, so drift and alternation both
// count. The traces are computed from an orthonormal basis of X in O(n).
//
// resid must be the residuals of that fit, in entry order. The check is NA
// with a reason for fewer than k+2 readings, non-finite input or all-zero
// residuals. Verdict (common practice): p < 0.01 fails, p < 0.05 warns.
func DurbinWatson(x, resid []float64, origin bool) Check {
	const name = "Durbin–Watson"
	if s := ckValidate(x, resid, nil, "residual"); s != "" {
		return ckNA(name, s)
	}
	n := len(x)
	k := 2
	if origin {
		k = 1
	}
	if n < k+2 {
		return ckNA(name, fmt.Sprintf("The Durbin–Watson check needs at least %d readings for this fit; there are %d.", k+2, n))
	}
	d, ok := ckDWStat(resid)
	if !ok {
		return ckNA(name, "The residuals are all zero, so there is no pattern in their order to test.")
	}
	mean, variance, ok := ckDWMoments(x, origin)
	if !ok {
		return ckNA(name, "The x values do not spread enough to judge the order of the residuals.")
	}
	c := Check{Name: name, Statistic: d, DF: float64(n - k)}
	mu, v := mean/4, variance/16
	ab := mu*(1-mu)/v - 1
	if !(v > 0) || !(ab > 0) || !ckFinite(ab) {
		c.Verdict, c.P = NA, 1
		c.Message = fmt.Sprintf("Durbin–Watson d = %.3f, but too few readings to judge it.", d)
		return c
	}
	beta := distuv.Beta{Alpha: mu * ab, Beta: (1 - mu) * ab}
	u := d / 4
	lo := beta.CDF(u)
	hi := beta.Survival(u)
	p := ckClampP(2 * math.Min(lo, hi))
	c.P = p
	c.Verdict = ckVerdict(p, ckWarnP, ckFailP)
	what := "neighbouring readings tend to sit on the same side of the line (drift)"
	if d > mean {
		what = "neighbouring readings tend to alternate about the line"
	}
	switch c.Verdict {
	case Fail:
		c.Message = fmt.Sprintf("In the order entered, %s (Durbin–Watson d = %.3f, %s).", what, d, ckFmtP(p))
	case Warn:
		c.Message = fmt.Sprintf("In the order entered, there are signs that %s (Durbin–Watson d = %.3f, %s).", what, d, ckFmtP(p))
	default:
		c.Message = fmt.Sprintf("In the order entered, the residuals look independent (Durbin–Watson d = %.3f, %s).", d, ckFmtP(p))
	}
	return c
}

// ckDWStat is Σ(e_t − e_{t−1})² / Σe_t², computed on e scaled by its
// largest magnitude to avoid overflow. ok is false when all e are zero.
func ckDWStat(e []float64) (float64, bool) {
	var big float64
	for _, v := range e {
		big = math.Max(big, math.Abs(v))
	}
	if big == 0 {
		return 0, false
	}
	var num, den float64
	for t, v := range e {
		v /= big
		den += v * v
		if t > 0 {
			dv := v - e[t-1]/big
			num += dv * dv
		}
	}
	return num / den, den > 0
}

// ckDWMoments returns E[d] and Var[d] under H0 for the design [1, x] (or [x]
// when origin) from P = tr(MA) and Q = tr(MAMA) with H = UUᵀ (U orthonormal):
//
//	tr(A) = 2(n−1), tr(A²) = 6n − 8,
//	P = tr(A) − Σ_j u_jᵀAu_j,
//	Q = tr(A²) − 2Σ_j |Au_j|² + Σ_jl (u_jᵀAu_l)².
func ckDWMoments(x []float64, origin bool) (mean, variance float64, ok bool) {
	n := len(x)
	var cols [][]float64
	if origin {
		// Scale x by its largest magnitude; no centring through the origin.
		var big float64
		for _, v := range x {
			big = math.Max(big, math.Abs(v))
		}
		if big == 0 {
			return 0, 0, false
		}
		c := make([]float64, n)
		for i, v := range x {
			c[i] = v / big
		}
		cols = [][]float64{c}
	} else {
		xs, spread := ckStandardize(x)
		if !spread {
			return 0, 0, false
		}
		ones := make([]float64, n)
		for i := range ones {
			ones[i] = 1
		}
		cols = [][]float64{ones, xs}
	}
	f, ok := ckFit(cols, make([]float64, n))
	if !ok {
		return 0, 0, false
	}
	k := len(f.q)
	au := make([][]float64, k)
	for j, u := range f.q {
		au[j] = ckDiffApply(u)
	}
	nf := float64(n)
	p := 2 * (nf - 1)
	q := 6*nf - 8
	for j := 0; j < k; j++ {
		p -= ckDot(f.q[j], au[j])
		q -= 2 * ckDot(au[j], au[j])
		for l := 0; l < k; l++ {
			v := ckDot(f.q[j], au[l])
			q += v * v
		}
	}
	dfr := nf - float64(k)
	mean = p / dfr
	variance = 2 * (q - p*mean) / (dfr * (dfr + 2))
	return mean, variance, ckFinite(mean) && ckFinite(variance)
}

// ckDiffApply returns A·u for the first-difference matrix A = DᵀD (diagonal
// 1, 2, …, 2, 1 and −1 beside it).
func ckDiffApply(u []float64) []float64 {
	n := len(u)
	out := make([]float64, n)
	for i := range u {
		v := 0.0
		if i > 0 {
			v += u[i] - u[i-1]
		}
		if i < n-1 {
			v += u[i] - u[i+1]
		}
		out[i] = v
	}
	return out
}
