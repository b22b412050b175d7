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
	return durbinWatson(x, resid, origin, nil)
}

// durbinWatson is DurbinWatson with what is known about x in pre (nil:
// work it out).
func durbinWatson(x, resid []float64, origin bool, pre *ckPre) Check {
	const name = "Durbin–Watson"
	if pre == nil || !pre.residValid {
		if s := ckValidate(x, resid, nil, "residual"); s != "" {
			return ckNA(name, s)
		}
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
	var mean, variance float64
	if origin || pre == nil {
		mean, variance, ok = ckDWMoments(x, origin)
	} else if pre.ok {
		mean, variance, ok = ckDWMomentsBasis(x, false, &pre.basis)
	} else {
		ok = false
	}
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

// ckDWStat is Σ(e_t − e_{t−1})² / Σe_t², computed on e scaled by the power
// of two nearest above its largest magnitude (exact) to avoid overflow. ok
// is false when all e are zero.
func ckDWStat(e []float64) (float64, bool) {
	var big float64
	for _, v := range e {
		big = max(big, math.Abs(v))
	}
	if big == 0 {
		return 0, false
	}
	_, ex := math.Frexp(big)
	k := math.Ldexp(1, -max(ex, -1000)) // 2^1073 for a subnormal would overflow
	var num, den, prev float64
	for t, v := range e {
		v *= k
		den += v * v
		if t > 0 {
			dv := v - prev
			num += dv * dv
		}
		prev = v
	}
	return num / den, den > 0
}

// ckDWMoments returns E[d] and Var[d] under H0 for the design [1, x] (or [x]
// when origin) from P = tr(MA) and Q = tr(MAMA) with H = UUᵀ (U orthonormal):
//
//	tr(A) = 2(n−1), tr(A²) = 6n − 8,
//	P = tr(A) − Σ_j u_jᵀAu_j,
//	Q = tr(A²) − 2Σ_j |Au_j|² + Σ_jl (u_jᵀAu_l)².
//
// With an intercept, u_1 = 1/√n and A·1 = 0 (the rows of A sum to zero),
// so only u_2 = (x − x̄)/|x − x̄| contributes; through the origin u_1 =
// x/|x|. Either way one pass gives u_jᵀAu_j = Σ_t (u_t − u_{t−1})² and
// |Au_j|², with u evaluated as it goes (no n-sized column is stored).
func ckDWMoments(x []float64, origin bool) (mean, variance float64, ok bool) {
	var bs ckBasis
	if !origin {
		var spread bool
		if bs, spread = ckNewBasis(x, nil, false); !spread {
			return 0, 0, false
		}
	}
	return ckDWMomentsBasis(x, origin, &bs)
}

// ckDWMomentsBasis is ckDWMoments with the linear basis of x already built
// (ignored through the origin).
func ckDWMomentsBasis(x []float64, origin bool, bs *ckBasis) (mean, variance float64, ok bool) {
	n := len(x)
	// u_i = c·(x_i − m)·a − c·mz: the standardized, centred x, or x scaled
	// by its largest magnitude (m = mz = 0).
	var m, a, mz, c float64
	if origin {
		var big float64
		for _, v := range x {
			big = max(big, math.Abs(v))
		}
		if big == 0 {
			return 0, 0, false
		}
		a = 1 / big
		var ss float64
		for _, v := range x {
			v *= a
			ss += v * v
		}
		c = 1 / math.Sqrt(ss)
	} else {
		if !bs.okD {
			return 0, 0, false
		}
		m, a, mz = bs.m, bs.is, bs.mz
		c = 1 / math.Sqrt(bs.sdd)
	}
	if !ckFinite(c) || c == 0 {
		return 0, 0, false
	}
	u := func(i int) float64 { return c * ((x[i]-m)*a - mz) }
	var uau, au2 float64
	prev, cur := 0.0, u(0)
	for i := range n {
		next := 0.0
		if i < n-1 {
			next = u(i + 1)
		}
		v := 0.0
		if i > 0 {
			dv := cur - prev
			uau += dv * dv
			v += dv
		}
		if i < n-1 {
			v += cur - next
		}
		au2 += v * v
		prev, cur = cur, next
	}
	nf := float64(n)
	k := 1.0
	if !origin {
		k = 2
	}
	p := 2*(nf-1) - uau
	q := 6*nf - 8 - 2*au2 + uau*uau
	dfr := nf - k
	mean = p / dfr
	variance = 2 * (q - p*mean) / (dfr * (dfr + 2))
	return mean, variance, ckFinite(mean) && ckFinite(variance)
}
