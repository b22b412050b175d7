package fitcore

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/stat/distuv"
)

// DWExactMax is the largest number of readings for which the p of the
// Durbin–Watson check is exact (Imhof's integral); above it the beta
// approximation is used. The exact p costs O(n) per point of the
// integral (a few hundred points), about 10–40 ms at n = 2000 on the build
// machine; the beta approximation is O(n) in all. Below p = 1e-6 the beta
// approximation can be off by a factor of 100, at p ≈ 0.05 by a few per
// cent (compared with lmtest::dwtest, exact).
const DWExactMax = 2000

// dwTailCut: where the beta approximation puts min(F(d), 1 − F(d)) below
// it, the exact integral (absolute error about 1e-10) cannot improve on it
// and is not taken.
const dwTailCut = 1e-12

// DurbinWatson is the Durbin–Watson test for serial correlation of the
// residuals e_1 … e_n in the order the readings were entered:
//
//	d = Σ_{t=2..n} (e_t − e_{t−1})² / Σ_{t=1..n} e_t²
//
// (Durbin & Watson, "Testing for serial correlation in least squares
// regression I/II", Biometrika 37, 1950 and 38, 1951). d near 2 means no
// correlation; d well below 2 means neighbouring readings drift together,
// well above 2 that they alternate. It is DurbinWatsonWeighted with every
// weight 1.
func DurbinWatson(x, resid []float64, origin bool) Check {
	return durbinWatsonW(x, resid, nil, origin, nil)
}

// DurbinWatsonWeighted is the Durbin–Watson test of a weighted fit:
// pearson are the residuals √w_t·e_t of the weighted line (those of the
// ordinary least-squares fit of √w·y on the whitened design Z = √W·X), w
// the weights (nil: unweighted) and X = [1, x] (or [x] when origin).
//
// Under independent normal errors d = εᵀMAMε/εᵀMε with M = I − Z(ZᵀZ)⁻¹Zᵀ
// and A the first-difference matrix (tridiagonal: 1, 2, …, 2, 1 on the
// diagonal, −1 beside it), so the null distribution is that of
// Σν_i·χ²_1,i / Σχ²_1,i with ν_i the n − k non-zero eigenvalues of MAM
// (Durbin & Watson 1950, §3), k the number of columns of X. The
// p-value is two-sided, p = 2·min(F(d), 1 − F(d)) capped at 1 (drift and
// alternation both count), with F(d) = P(D ≤ d) (R's lmtest::dwtest gives
// F(d) as alternative "greater" and this p as "two.sided"):
//
//   - n ≤ DWExactMax: F(d) exactly, by Imhof's integral (Imhof, "Computing
//     the distribution of quadratic forms in normal variables",
//     Biometrika 48, 1961, eq. 3.2) for Q = Σ(ν_i − d)χ²_1,i:
//     F(d) = P(Q ≤ 0) = ½ − (1/π)∫₀^∞ sin θ(u)/(u·ρ(u)) du with
//     θ(u) = ½Σ arctan((ν_i − d)u) and ρ(u) = Π(1 + (ν_i − d)²u²)^¼.
//     No eigenvalue is computed: θ and ρ come from log det(I − iu·Wᵀ(A −
//     dI)W) (W an orthonormal basis of the residual space), which by
//     Jacobi's identity for complementary minors is log det(G) + log
//     det(UᵀG⁻¹U) with G = I − iu(A − dI) tridiagonal and U an orthonormal
//     basis of Z: an O(n) factorisation per point. The branch of the
//     logarithm follows from the interlacing of eigenvalues (every pivot's
//     argument lies in (−π/2, π/2), that of det(UᵀG⁻¹U) in (−kπ/2, kπ/2)).
//     The integral is taken by adaptive Gauss–Kronrod (7/15 points) to an
//     absolute error of about 1e-11; the integration is cut off where ρ
//     exceeds about 1e15.
//   - n > DWExactMax: d/4 is taken as Beta(a, b) with the exact null mean
//     and variance of d (Durbin & Watson 1950, §4),
//     E[d] = P/(n−k), Var[d] = 2(Q − P·E[d])/((n−k)(n−k+2)),
//     P = tr(MA), Q = tr((MA)²) (Durbin & Watson 1971, Biometrika 58).
//
// Both use the whitened design, so a weighted fit's p takes its null
// distribution from √W·X, not from X. The check's message says which
// was used. The check is NA with a reason for fewer than k+2 readings,
// non-finite input, non-positive weights or all-zero residuals (Analyze
// also makes it NA below MinResidualDF residual degrees of freedom).
// Verdict (common practice): p < 0.01 fails, p < 0.05 warns.
func DurbinWatsonWeighted(x, pearson, w []float64, origin bool) Check {
	return durbinWatsonW(x, pearson, w, origin, nil)
}

// dwNearThreshold says whether a Durbin–Watson p from the beta
// approximation lies near enough to CheckFailP or CheckWarnP (from a third of
// the one to five times the other) that a refit of the advice takes the
// exact p; outside, the approximation gives the same verdict
// (TestDWQuickWindow).
func dwNearThreshold(pBeta float64) bool { return pBeta >= CheckFailP/3 && pBeta <= 5*CheckWarnP }

// durbinWatsonW is DurbinWatsonWeighted with what is known about x in pre
// (nil: validate the inputs here). The stages: check the inputs and work
// out d (dwInputs), choose between the exact p and the beta approximation
// (dwMethod), then word the verdict (dwWord).
func durbinWatsonW(x, resid, w []float64, origin bool, pre *ckPre) Check {
	const name = "Durbin–Watson"
	d, k, why := dwInputs(x, resid, w, origin, pre)
	if why != "" {
		return ckNA(name, why)
	}
	var shared *dwShared
	if pre != nil {
		shared = pre.dw
	}
	dz, mean, variance, ok := shared.design(x, w, origin)
	if !ok {
		return ckNA(name, "The x values do not spread enough to judge the order of the residuals.")
	}
	c := Check{Name: name, Statistic: d, DF: float64(len(x) - k)}
	cdf, how, ok := dwMethod(dz, d, mean, variance, len(x), pre)
	if !ok {
		c.Verdict, c.P = NA, 1
		c.Message = fmt.Sprintf("Durbin–Watson d = %.3f, but too few readings to judge it.", d)
		return c
	}
	p := ckClampP(2 * math.Min(cdf, 1-cdf))
	c.P = p
	c.Verdict = ckVerdict(p, ckWarnP, ckFailP)
	c.Message = dwWord(c.Verdict, d, mean, p, how)
	return c
}

// dwInputs checks the inputs of durbinWatsonW (validated here unless pre
// says they were) and returns d, the number of line parameters k, or why
// the check does not apply.
func dwInputs(x, resid, w []float64, origin bool, pre *ckPre) (d float64, k int, why string) {
	if pre == nil || !pre.residValid {
		if s := ckValidate(x, resid, w, "residual"); s != "" {
			return 0, 0, s
		}
	} else if s := ckWeights(w, len(x)); s != "" {
		return 0, 0, s
	}
	n := len(x)
	k = 2
	if origin {
		k = 1
	}
	if n < k+2 {
		return 0, 0, fmt.Sprintf("The Durbin–Watson check needs at least %d readings for this fit; there are %d.", k+2, n)
	}
	d, ok := ckDWStat(resid)
	if !ok {
		return 0, 0, "The residuals are all zero, so there is no pattern in their order to test."
	}
	return d, k, ""
}

// dwMethod is the null cdf of d for n readings and how it was found: the
// exact distribution (Imhof) up to DWExactMax readings, else the beta
// approximation; the beta value also far in the tail, where Imhof cannot
// resolve the p, and for the advice's refits (pre.quick) away from the
// thresholds. ok is false when neither gives a value.
func dwMethod(dz *dwDesign, d, mean, variance float64, n int, pre *ckPre) (cdf float64, how string, ok bool) {
	bcdf, bok := ckDWBetaCDF(d, mean, variance)
	exact := n <= DWExactMax
	how = "exact"
	if bok && math.Min(bcdf, 1-bcdf) < dwTailCut {
		// Imhof's integral cannot resolve a p this small (its absolute
		// error is about 1e-10), so the beta value is kept and said so.
		exact, how = false, "beta approximation, far in the tail"
	} else if exact && pre != nil && pre.quick && bok {
		// A refit of the advice needs only the verdict: exact only near
		// the thresholds CheckFailP and CheckWarnP (0.001 and 0.01), from
		// a third of the one to five times the other, where the
		// approximation could change it.
		if !dwNearThreshold(2 * math.Min(bcdf, 1-bcdf)) {
			exact, how = false, "beta approximation"
		}
	}
	cdf = bcdf
	ok = bok
	if exact {
		if f, fok := dz.cdf(d); fok {
			cdf, ok = f, true
		} else {
			how = "beta approximation"
		}
	} else if how == "exact" {
		how = "beta approximation"
	}
	return cdf, how, ok
}

// dwWord is the message of the verdict v for d (below its null mean:
// drift; above: alternation), with p and the method.
func dwWord(v Verdict, d, mean, p float64, how string) string {
	what := "neighbouring readings tend to sit on the same side of the line (drift)"
	if d > mean {
		what = "neighbouring readings tend to alternate about the line"
	}
	switch v {
	case Fail:
		return fmt.Sprintf("In the order entered, %s (Durbin–Watson d = %.3f, %s, %s).", what, d, ckFmtP(p), how)
	case Warn:
		return fmt.Sprintf("In the order entered, there are signs that %s (Durbin–Watson d = %.3f, %s, %s).", what, d, ckFmtP(p), how)
	default:
		return fmt.Sprintf("In the order entered, the residuals look independent (Durbin–Watson d = %.3f, %s, %s).", d, ckFmtP(p), how)
	}
}

// dwShared keeps the design of the last x the Durbin–Watson check saw
// without weights, with its null mean and variance: they depend on x alone
// (not on the residuals), and the original fit and the advice's refits of
// y on a new scale all have the same x.
type dwShared struct {
	x              []float64
	origin         bool
	dz             *dwDesign
	ok             bool
	mean, variance float64

	// buf is the space of the columns of a weighted design (worked out
	// anew for every weighting, used only while its check runs).
	buf [2][]float64
}

// design returns newDWDesign(x, w, origin) and its moments, from s when s
// saw the same x (the same slice) unweighted last time. A nil s keeps
// nothing.
func (s *dwShared) design(x, w []float64, origin bool) (dz *dwDesign, mean, variance float64, ok bool) {
	if s == nil || w != nil || len(x) == 0 {
		var buf *[2][]float64
		if s != nil {
			buf = &s.buf
		}
		if dz, ok = newDWDesignIn(x, w, origin, buf); ok {
			mean, variance = dz.moments()
		}
		return dz, mean, variance, ok
	}
	if len(s.x) != len(x) || &s.x[0] != &x[0] || s.origin != origin {
		s.x, s.origin = x, origin
		s.mean, s.variance = 0, 0
		if s.dz, s.ok = newDWDesign(x, nil, origin); s.ok {
			s.mean, s.variance = s.dz.moments()
		}
	}
	return s.dz, s.mean, s.variance, s.ok
}

// ckDWBetaCDF is F(d) = P(D ≤ d) with d/4 taken as the beta variable of
// the given mean and variance of d; ok is false when no beta has them.
func ckDWBetaCDF(d, mean, variance float64) (float64, bool) {
	mu, v := mean/4, variance/16
	ab := mu*(1-mu)/v - 1
	if !(v > 0) || !(ab > 0) || !ckFinite(ab) {
		return 0, false
	}
	beta := distuv.Beta{Alpha: mu * ab, Beta: (1 - mu) * ab}
	return ckClampP(beta.CDF(d / 4)), true
}

// ckDWStat is Σ(e_t − e_{t−1})² / Σe_t², computed on e scaled by the power
// of two nearest above its largest magnitude (exact) to avoid overflow. ok
// is false when all e are zero.
func ckDWStat(e []float64) (float64, bool) {
	var big float64
	for _, v := range e {
		big = absMax(big, v)
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

// dwDesign is an orthonormal basis U (k = 1 or 2 columns of length n) of
// the whitened design Z = √W·X, with the work space of the exact
// distribution.
type dwDesign struct {
	n int
	u [2][]float64
	k int
	// evals counts the points of the last integral (for tests).
	evals int
}

// newDWDesign builds U by Gram–Schmidt, each step repeated once ("twice
// is enough"), on the columns √w (with an intercept) and √w·z, z = x
// standardized by its plain mean and root mean square (which spans the
// same space and is well scaled), or √w·x/max|x| through the origin. ok is
// false when the x column is, to 1e-10 of its norm, a multiple of the
// first (no spread).
func newDWDesign(x, w []float64, origin bool) (*dwDesign, bool) {
	return newDWDesignIn(x, w, origin, nil)
}

// newDWDesignIn is newDWDesign with the columns in the space buf (nil:
// new slices); the design then lives in buf until buf is used again.
func newDWDesignIn(x, w []float64, origin bool, buf *[2][]float64) (*dwDesign, bool) {
	sw := dwRootWeights(w)
	var u1, u2 []float64
	if buf != nil {
		buf[0], buf[1] = ckGrowF64(buf[0], len(x)), ckGrowF64(buf[1], len(x))
		u1, u2 = buf[0][:len(x)], buf[1][:len(x)]
	}
	if origin {
		u, ok := dwOriginColumn(x, sw, u1)
		if !ok {
			return nil, false
		}
		return &dwDesign{n: len(x), u: [2][]float64{u}, k: 1}, true
	}
	u1, u2, ok := dwLineColumns(x, sw, u1, u2)
	if !ok {
		return nil, false
	}
	return &dwDesign{n: len(x), u: [2][]float64{u1, u2}, k: 2}, true
}

// dwRootWeights is t ↦ √w_t, the weights scaled by ckWeightScale (1
// without weights).
func dwRootWeights(w []float64) func(int) float64 {
	if w == nil {
		return func(int) float64 { return 1 }
	}
	wk := ckWeightScale(w)
	return func(t int) float64 { return math.Sqrt(w[t] * wk) }
}

// dwNormalize scales v to unit length (its norm found through v/max|v| so
// that it cannot overflow) and returns the norm, or 0, leaving v as it
// is, when v is zero or not finite.
func dwNormalize(v []float64) float64 {
	var big float64
	for _, a := range v {
		big = absMax(big, a)
	}
	if big == 0 || !ckFinite(big) {
		return 0
	}
	var ss float64
	for _, a := range v {
		a /= big
		ss += a * a
	}
	nrm := big * math.Sqrt(ss)
	for i := range v {
		v[i] /= nrm
	}
	return nrm
}

// dwOriginColumn is the one column of a line through the origin,
// √w·x/max|x| normalized; ok is false when x is zero or not finite.
func dwOriginColumn(x []float64, sw func(int) float64, u []float64) ([]float64, bool) {
	var big float64
	for _, v := range x {
		big = absMax(big, v)
	}
	if big == 0 || !ckFinite(big) {
		return nil, false
	}
	if len(u) != len(x) {
		u = make([]float64, len(x))
	}
	for t, v := range x {
		u[t] = sw(t) * (v / big)
	}
	if dwNormalize(u) == 0 {
		return nil, false
	}
	return u, true
}

// dwLineColumns are the two orthonormal columns of a line with an
// intercept: √w normalized, and √w·z, z = (x − mean)/sd, made orthogonal
// to it by Gram–Schmidt twice, then normalized; ok is false when x has no
// spread (what is left of the second column is below 1e-10 of it). The
// columns are written into u1 and u2 when they have the length of x (new
// slices otherwise).
//
// Each sweep over the readings does what the next step can do in the same
// order: the largest |u1| and Σu2² with the columns; the division of u1
// by its norm with the first dot product; each subtraction with the dot
// product or the sums that follow it (dwNormalize's steps, written out).
// Every value is the one the steps taken one after another give
// (dwLineColumnsByStep in the tests, the code before).
func dwLineColumns(x []float64, sw func(int) float64, u1, u2 []float64) ([]float64, []float64, bool) {
	m, s := ckMeanSD(x)
	if s == 0 || !ckFinite(s) {
		return nil, nil, false
	}
	n := len(x)
	if len(u1) != n || len(u2) != n {
		u1, u2 = make([]float64, n), make([]float64, n)
	}
	u2 = u2[:len(u1)]
	var big1, before float64
	for t, v := range x {
		st := sw(t)
		u1[t] = st
		a := st * ((v - m) / s)
		u2[t] = a
		big1 = absMax(big1, st)
		before += a * a
	}
	nrm1, ok := dwNorm(u1, big1)
	if !ok {
		return nil, nil, false
	}
	var dot float64
	for t := range u1 {
		u1[t] /= nrm1
		dot += u1[t] * u2[t]
	}
	var dot2 float64
	for t, a := range u1 {
		u2[t] -= dot * a
		dot2 += a * u2[t]
	}
	var after, big2 float64
	for t, a := range u1 {
		u2[t] -= dot2 * a
		after += u2[t] * u2[t]
		big2 = absMax(big2, u2[t])
	}
	if !(math.Sqrt(after) > 1e-10*math.Sqrt(before)) {
		return nil, nil, false
	}
	nrm2, ok := dwNorm(u2, big2)
	if !ok {
		return nil, nil, false
	}
	for t := range u2 {
		u2[t] /= nrm2
	}
	return u1, u2, true
}

// dwNorm is the norm dwNormalize finds for v, given big = max|v|; ok is
// false when v is zero or not finite.
func dwNorm(v []float64, big float64) (float64, bool) {
	if big == 0 || !ckFinite(big) {
		return 0, false
	}
	var ss float64
	for _, a := range v {
		a /= big
		ss += a * a
	}
	return big * math.Sqrt(ss), true
}

// dwA applies the first-difference matrix A to v at t.
func dwA(v []float64, t int) float64 {
	n := len(v)
	var r float64
	if t > 0 {
		r += v[t] - v[t-1]
	}
	if t < n-1 {
		r += v[t] - v[t+1]
	}
	return r
}

// moments returns E[d] and Var[d] under H0 from P = tr(MA) and Q =
// tr((MA)²) with M = I − UUᵀ:
//
//	tr(A) = 2(n−1), tr(A²) = 6n − 8,
//	P = tr(A) − Σ_j u_jᵀAu_j,
//	Q = tr(A²) − 2Σ_j |Au_j|² + Σ_jl (u_jᵀAu_l)².
func (dz *dwDesign) moments() (mean, variance float64) {
	n, k := dz.n, dz.k
	var uau [2][2]float64
	var au2 float64
	for t := range n {
		var a [2]float64
		for j := range k {
			a[j] = dwA(dz.u[j], t)
			au2 += a[j] * a[j]
		}
		for j := range k {
			for l := range k {
				uau[j][l] += dz.u[j][t] * a[l]
			}
		}
	}
	nf, kf := float64(n), float64(k)
	p := 2 * (nf - 1)
	q := 6*nf - 8 - 2*au2
	for j := range k {
		p -= uau[j][j]
		for l := range k {
			q += uau[j][l] * uau[j][l]
		}
	}
	dfr := nf - kf
	mean = p / dfr
	variance = 2 * (q - p*mean) / (dfr * (dfr + 2))
	return mean, variance
}

// ckDWMoments returns E[d] and Var[d] under H0 for the unweighted design
// [1, x] (or [x] when origin); ok is false when x has no spread.
func ckDWMoments(x []float64, origin bool) (mean, variance float64, ok bool) {
	dz, ok := newDWDesign(x, nil, origin)
	if !ok {
		return 0, 0, false
	}
	mean, variance = dz.moments()
	return mean, variance, ckFinite(mean) && ckFinite(variance)
}

// logDet returns log det(I − iu·Wᵀ(A − dI)W) (principal branches summed as
// described on DurbinWatsonWeighted); ok is false if a pivot vanished. One
// pass: G = L·D·Lᵀ is factored as it goes, Y = L⁻¹U is carried along by
// forward substitution, and UᵀG⁻¹U = Yᵀ·D⁻¹·Y is summed term by term, so
// nothing of size n is stored.
func (dz *dwDesign) logDet(u, d float64) (complex128, bool) {
	n, k := dz.n, dz.k
	u0, u1 := dz.u[0], dz.u[1]
	// The product of the pivots is kept with its winding: each pivot's
	// argument lies in (−π/2, π/2), so the running product's argument
	// passes ±π only from the second quadrant to the third (or back), seen
	// as a change of sign of its imaginary part while its real part is
	// negative. Its size is rescaled by powers of two as it goes.
	// Complex arithmetic is written out in real and imaginary parts (no
	// library division: every pivot has real part ≥ 1, the Hermitian part
	// of G being I, so 1/g = conj(g)/|g|² cannot overflow).
	pr, pi := 1.0, 0.0 // running product of the pivots
	wind, exp2 := 0, 0
	var ipr, ipi float64           // 1/pivot of the previous row
	var y0r, y0i, y1r, y1i float64 // the previous row of Y = L⁻¹U
	var s00, s01, s11 complex128   // UᵀG⁻¹U
	var a00r, a00i, a01r, a01i, a11r, a11i float64
	for t := range n {
		a := 2.0
		if t == 0 || t == n-1 {
			a = 1
		}
		gr, gi := 1.0, -u*(a-d)
		r0r, r0i := u0[t], 0.0
		var r1r, r1i float64
		if k == 2 {
			r1r = u1[t]
		}
		if t > 0 {
			lr, li := -u*ipi, u*ipr // l = iu/p
			gr += u * u * ipr       // g − (iu)²/p
			gi += u * u * ipi
			r0r -= lr*y0r - li*y0i
			r0i -= lr*y0i + li*y0r
			if k == 2 {
				r1r -= lr*y1r - li*y1i
				r1i -= lr*y1i + li*y1r
			}
		}
		m2 := gr*gr + gi*gi
		if !(m2 > 0) || !ckFinite(m2) {
			return 0, false
		}
		ipr, ipi = gr/m2, -gi/m2
		y0r, y0i, y1r, y1i = r0r, r0i, r1r, r1i
		// a += r·r'·ip
		qr, qi := r0r*r0r-r0i*r0i, 2*r0r*r0i
		a00r += qr*ipr - qi*ipi
		a00i += qr*ipi + qi*ipr
		if k == 2 {
			qr, qi = r0r*r1r-r0i*r1i, r0r*r1i+r0i*r1r
			a01r += qr*ipr - qi*ipi
			a01i += qr*ipi + qi*ipr
			qr, qi = r1r*r1r-r1i*r1i, 2*r1r*r1i
			a11r += qr*ipr - qi*ipi
			a11i += qr*ipi + qi*ipr
		}
		nr, ni := pr*gr-pi*gi, pr*gi+pi*gr
		if nr < 0 || pr < 0 {
			switch {
			case pi >= 0 && ni < 0 && nr < 0:
				wind++
			case pi < 0 && ni >= 0 && nr < 0:
				wind--
			}
		}
		pr, pi = nr, ni
		if t%32 == 31 {
			_, e := math.Frexp(math.Abs(pr) + math.Abs(pi))
			pr, pi = math.Ldexp(pr, -e), math.Ldexp(pi, -e)
			exp2 += e
		}
	}
	s00, s01, s11 = complex(a00r, a00i), complex(a01r, a01i), complex(a11r, a11i)
	prod := complex(pr, pi)
	logdet := cmplx.Log(prod) + complex(float64(exp2)*math.Ln2, 2*math.Pi*float64(wind))
	det := s00
	if k == 2 {
		det = s00*s11 - s01*s01
	}
	if det == 0 || cmplx.IsNaN(det) || cmplx.IsInf(det) {
		return 0, false
	}
	return logdet + cmplx.Log(det), true
}

// cdf returns F(d) = P(D ≤ d) by Imhof's integral (see
// DurbinWatsonWeighted); ok is false when the integral could not be
// evaluated (the caller then uses the beta approximation).
func (dz *dwDesign) cdf(d float64) (float64, bool) {
	m := float64(dz.n - dz.k)
	// The integrand at u → 0 is θ'(0) = ½·tr(Wᵀ(A − dI)W) = ½(P − m·d).
	mean, _ := dz.moments()
	f0 := 0.5 * (mean*m - m*d)
	bad := false
	dz.evals = 0
	f := func(u float64) float64 {
		dz.evals++
		if u == 0 {
			return f0
		}
		ld, ok := dz.logDet(u, d)
		if !ok {
			bad = true
			return 0
		}
		theta := -0.5 * imag(ld)
		logRho := 0.5 * real(ld)
		return math.Sin(theta) / (u * math.Exp(logRho))
	}
	// Upper limit: the smallest power of two where 1/(u·ρ(u)) has fallen
	// below e^-35 ≈ 6e-16 (ρ grows with u, so a doubling search finds it).
	past := func(u float64) (bool, bool) {
		ld, ok := dz.logDet(u, d)
		return 0.5*real(ld)+math.Log(u) > 35, ok
	}
	hi := 1.0
	done, ok := past(hi)
	if !ok {
		return 0, false
	}
	for i := 0; i < 200 && done; i++ {
		if d2, ok2 := past(hi / 2); !ok2 || !d2 {
			break
		}
		hi /= 2
	}
	for i := 0; i < 200 && !done; i++ {
		hi *= 2
		if done, ok = past(hi); !ok {
			return 0, false
		}
	}
	const tol = 1e-10
	// A few panels to start with, finer near 0 where the integrand varies
	// fastest for large n.
	var integral float64
	lo := 0.0
	edges := [...]float64{hi / 64, hi / 16, hi / 4, hi}
	for _, e := range edges {
		v, ok := ckGK15Adaptive(f, lo, e, tol/float64(len(edges)), 40)
		if !ok || bad {
			return 0, false
		}
		integral += v
		lo = e
	}
	p := 0.5 - integral/math.Pi
	if !ckFinite(p) || p < -1e-9 || p > 1+1e-9 {
		return 0, false
	}
	return ckClampP(p), true
}

// Gauss–Kronrod 7/15 nodes and weights on [−1, 1] (the Kronrod extension
// of the 7-point Gauss rule; Piessens et al., QUADPACK, 1983, qk15).
var (
	gkNodes = [8]float64{
		0.991455371120812639206854697526329,
		0.949107912342758524526189684047851,
		0.864864423359769072789712788640926,
		0.741531185599394439863864773280788,
		0.586087235467691130294144845693013,
		0.405845151377397166906606412076961,
		0.207784955007898467600689403773245,
		0.000000000000000000000000000000000,
	}
	gkWK = [8]float64{
		0.022935322010529224963732008058970,
		0.063092092629978553290700663189204,
		0.104790010322250183839876322541518,
		0.140653259715525918745189590510238,
		0.169004726639267902826583426598550,
		0.190350578064785409913256402421014,
		0.204432940075298892414161999234649,
		0.209482141084727828012999174891714,
	}
	gkWG = [4]float64{ // weights of the Gauss nodes 1, 3, 5, 7 (odd indices)
		0.129484966168869693270611432679082,
		0.279705391489276667901467771423780,
		0.381830050505118944950369775488975,
		0.417959183673469387755102040816327,
	}
)

// ckGK15 integrates f over [a, b] by the 15-point Kronrod rule and returns
// the estimate and QUADPACK's error estimate (qk15: the difference from
// the 7-point Gauss rule, scaled as resasc·min(1, (200·|K − G|/resasc)^1.5),
// which for smooth integrands is close to the true error rather than to
// the much larger |K − G|).
func ckGK15(f func(float64) float64, a, b float64) (float64, float64) {
	c, h := 0.5*(a+b), 0.5*(b-a)
	var fv [15]float64
	fv[7] = f(c)
	for i := range 7 {
		x := h * gkNodes[i]
		fv[i], fv[14-i] = f(c-x), f(c+x)
	}
	k := fv[7] * gkWK[7]
	g := fv[7] * gkWG[3]
	for i := range 7 {
		s := fv[i] + fv[14-i]
		k += gkWK[i] * s
		if i%2 == 1 {
			g += gkWG[i/2] * s
		}
	}
	mean := 0.5 * k
	asc := gkWK[7] * math.Abs(fv[7]-mean)
	for i := range 7 {
		asc += gkWK[i] * (math.Abs(fv[i]-mean) + math.Abs(fv[14-i]-mean))
	}
	asc *= math.Abs(h)
	err := math.Abs((k - g) * h)
	if asc != 0 && err != 0 {
		err = asc * math.Min(1, math.Pow(200*err/asc, 1.5))
	}
	return k * h, err
}

// ckGK15Adaptive integrates f over [a, b] by bisecting where the
// Gauss–Kronrod difference exceeds the share of tol, at most depth levels.
func ckGK15Adaptive(f func(float64) float64, a, b, tol float64, depth int) (float64, bool) {
	v, e := ckGK15(f, a, b)
	if !ckFinite(v) {
		return 0, false
	}
	if e <= tol || depth == 0 {
		return v, e <= tol || e <= 1e-9
	}
	m := 0.5 * (a + b)
	l, ok1 := ckGK15Adaptive(f, a, m, tol/2, depth-1)
	r, ok2 := ckGK15Adaptive(f, m, b, tol/2, depth-1)
	return l + r, ok1 && ok2
}
