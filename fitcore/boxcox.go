package fitcore

import (
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/stat/distuv"
)

// The interval BoxCoxProfile searches for λ. Values of |λ| above 3 have no
// practical reading as a scale and are common practice to leave out.
const (
	bcLambdaMin = -3.0
	bcLambdaMax = 3.0
	// bcGridStep is the grid before the 1-D maximizer. ℓ(λ) is a smooth
	// function of λ (each RSS is), so a quarter step brackets its maximum
	// as a tenth did on every reference dataset (tests), with 25
	// evaluations of ℓ instead of 61.
	bcGridStep = 0.25
)

// BoxCoxProfile estimates the Box–Cox power λ for the straight-line model
//
//	y^(λ) = b0 + b1·x + e,  e ~ N(0, σ²),
//	y^(λ) = (y^λ − 1)/λ  (λ ≠ 0),   log y  (λ = 0),
//
// by maximizing the profile log-likelihood (Box & Cox 1964, "An analysis of
// transformations", JRSS B 26, 211–252, eq. 9)
//
//	ℓ(λ) = −n/2 · log(RSS(λ)/n) + (λ − 1) · Σ log y_i,
//
// where RSS(λ) is the residual sum of squares of the least-squares line of
// y^(λ) on x. The search is over [−3, 3]: a grid of step 0.25 and then
// Brent's parabolic/golden-section maximizer on the bracket around the
// best grid point. The interval is the likelihood-ratio set
//
//	{λ : 2·(ℓ(λ̂) − ℓ(λ)) ≤ χ²₁(level)}
//
// (Box & Cox 1964, section 4), with its ends found by the Illinois regula
// falsi on √χ²₁(level)/2 − √(ℓ(λ̂) − ℓ(λ)), bracketed by the grid points
// walking out from λ̂; an end that does not fall inside [−3, 3] is reported
// as the bound itself. About 46 evaluations of ℓ in all (65 with regula
// falsi on ℓ itself; TestBoxCoxAgainstExhaustive and
// FuzzBoxCoxAgainstExhaustive keep the earlier search as their oracle). level is the
// confidence level, from MinLevel to MaxLevel (0 means 0.95); any other
// level is an *OptionError, never a panic.
//
// Numerics: y is rescaled by its geometric mean ġ, which turns ℓ into
// −n/2·log(RSS_u/n) + constant with u_i = ((y_i/ġ)^λ − 1)/λ, computed as
// expm1(λ·log(y_i/ġ))/λ (so λ → 0 gives log(y_i/ġ) smoothly) or, when λ·log
// is large, as a scaled exponential whose logarithm carries the scale, so no
// power overflows. Each evaluation is O(n): two passes over the readings.
//
// It returns an error, in a sentence, when a y is zero or negative, a value
// is not finite, x does not vary, there are fewer than MinBoxCoxN pairs, or the
// transformed readings lie exactly on a line (λ is then not defined).
func BoxCoxProfile(x, y []float64, level float64) (*BoxCox, error) {
	p, err := bcNewProfile(x, y)
	if err != nil {
		return nil, err
	}
	if level == 0 {
		level = DefaultLevel
	}
	if !(level >= MinLevel && level <= MaxLevel) {
		// The χ² quantile below panics (gonum) for levels near 0 or 1.
		return nil, optErr("level", formatValue(level), "the confidence level must be from %g to %g (for example 0.95 for 95 %%)", MinLevel, MaxLevel)
	}
	cut := distuv.ChiSquared{K: 1}.Quantile(level) / 2

	// The whole grid of step bcGridStep, in two passes over the readings
	// (gridLoglik). (Evaluating every fourth point and then the quarters
	// near the best of those would save work too, but a profile can have
	// two maxima, and then that finds the other one:
	// FuzzBoxCoxAgainstExhaustive's seed, six readings.)
	lams, ells := p.gridLoglik()
	nGrid := len(lams)
	best := 0
	for i := range ells {
		if ells[i] > ells[best] {
			best = i
		}
	}
	// The best point exactly as loglik gives it (it may be the maximum),
	// with ℓ′ there.
	ia, ib := max(best-1, 0), min(best+1, nGrid-1)
	nf := float64(p.n)
	vm, dlm := p.logRSSD(lams[best], true)
	em := -0.5 * nf * vm
	if math.IsNaN(em) {
		em = math.Inf(-1)
	}
	ells[best] = em
	// RSS′/RSS(m) from ℓ: RSS = e^{−2ℓ/n} in the unscaled branches (the
	// only ones with a slope); RSS″/RSS(m) from the parabola through three
	// neighbouring grid points.
	slope := func(l float64) (float64, float64) {
		v, dl := p.logRSSD(l, true)
		e := -0.5 * nf * v
		if math.IsNaN(e) {
			e = math.Inf(-1)
		}
		return e, dl * math.Exp(v-vm)
	}
	ic := min(max(best, 1), nGrid-2)
	rel := func(i int) float64 { return math.Exp(-2 * (ells[i] - em) / nf) }
	c2 := (rel(ic-1) - 2*rel(ic) + rel(ic+1)) / (bcGridStep * bcGridStep)

	// Refine on the bracket around the best grid point: the root of ℓ′,
	// or Brent's method where that is not found.
	floored := p.floored
	p.minRel = math.Inf(1)
	lamHat, ellHat, ok := bcSlopeMax(slope, lams[ia], lams[best], lams[ib], dlm, em, c2)
	if p.floored && !floored || p.minRel < bcSpikeRel {
		// The slope led to a power where the readings lie on a line, or
		// nearly (a root of RSS′ can be a zero of the RSS, where ℓ has a
		// spike): judge that as Brent's method does.
		ok, p.floored = false, floored
	}
	if !ok {
		lamHat, ellHat = bcBrentMax(p.loglik, lams[ia], lams[ib], 1e-10)
	}
	if ells[best] > ellHat { // a bound is the maximum
		lamHat, ellHat = lams[best], ells[best]
	}
	if !isFiniteNum(ellHat) {
		return nil, fmt.Errorf("%w: the Box–Cox likelihood could not be computed for these readings (n = %d)", ErrDegenerate, p.n)
	}
	if p.floored {
		return nil, fmt.Errorf("%w: the readings lie on an exact straight line after a power transform, so the Box–Cox power is not defined (n = %d)", ErrDegenerate, p.n)
	}

	// Likelihood-ratio interval: the ends are the roots of
	// g(λ) = √cut − √(ℓ̂ − ℓ(λ)), which is ≥ 0 inside. Near λ̂ the profile
	// is close to a parabola, so g is close to a straight line and regula
	// falsi needs a few steps where it needed about twelve on ℓ itself.
	// The bracket is the first grid point outside and the last one inside
	// (or λ̂), walking out from λ̂.
	rc := math.Sqrt(cut)
	gOf := func(l float64) float64 { return rc - math.Sqrt(math.Max(ellHat-l, 0)) }
	g := func(l float64) float64 { return gOf(p.loglik(l)) }
	ciLow, ciHigh := bcLambdaMin, bcLambdaMax
	inside, gInside := lamHat, rc
	for i := nGrid - 1; i >= 0; i-- { // largest grid point below λ̂ that is outside
		if lams[i] >= lamHat {
			continue
		}
		if gi := gOf(ells[i]); gi < 0 {
			ciLow = bcRoot(g, lams[i], gi, inside, gInside)
			break
		} else {
			inside, gInside = lams[i], gi
		}
	}
	inside, gInside = lamHat, rc
	for i := 0; i < nGrid; i++ {
		if lams[i] <= lamHat {
			continue
		}
		if gi := gOf(ells[i]); gi < 0 {
			ciHigh = bcRoot(g, lams[i], gi, inside, gInside)
			break
		} else {
			inside, gInside = lams[i], gi
		}
	}
	bc := &BoxCox{Lambda: lamHat, CILow: ciLow, CIHigh: ciHigh}
	if !isFiniteNum(bc.Lambda) || !isFiniteNum(bc.CILow) || !isFiniteNum(bc.CIHigh) {
		return nil, fmt.Errorf("%w: the Box–Cox power could not be computed for these readings (n = %d)", ErrDegenerate, p.n)
	}
	return bc, nil
}

// bcProfile holds what every evaluation of ℓ(λ) needs.
type bcProfile struct {
	n       int
	xc      []float64 // x − x̄
	sxx     float64
	w       []float64 // log(y/ġ)
	wMin    float64
	wMax    float64
	sxc     float64   // Σ(x − x̄), the rounding left in xc
	u       []float64 // work space
	floored bool      // set when an RSS hit the exact-fit floor
	minRel  float64   // the smallest RSS/Σ(u − ū)² since it was last reset
}

// bcNewProfile validates the data and precomputes centred x and log(y/ġ).
func bcNewProfile(x, y []float64) (*bcProfile, error) {
	if len(x) != len(y) {
		return nil, fmt.Errorf("%w: x has %d readings, y has %d", ErrLengthMismatch, len(x), len(y))
	}
	n := len(y)
	if n < MinBoxCoxN {
		return nil, tooFewError(fmt.Sprintf("the Box–Cox power needs at least %d readings (got %d): with fewer, some power puts the readings on a line (almost) exactly and the power cannot be judged", MinBoxCoxN, n))
	}
	var mx, my float64
	for i := range y {
		if !isFiniteNum(x[i]) {
			return nil, &DataError{Index: i, Column: "x", Value: x[i], Err: ErrNotFinite}
		}
		if !isFiniteNum(y[i]) {
			return nil, &DataError{Index: i, Column: "y", Value: y[i], Err: ErrNotFinite}
		}
		if !(y[i] > 0) {
			return nil, &DataError{Index: i, Column: "y", Value: y[i], Err: ErrTransformDomain,
				Hint: "The Box–Cox power needs every y reading above zero"}
		}
		mx += x[i]
	}
	mx /= float64(n)
	p := &bcProfile{n: n, xc: make([]float64, n), w: make([]float64, n), u: make([]float64, n)}
	for i := range x {
		p.xc[i] = x[i] - mx
		p.sxx += p.xc[i] * p.xc[i]
		p.sxc += p.xc[i]
		p.w[i] = math.Log(y[i])
		my += p.w[i]
	}
	if !(p.sxx > 0) || !isFiniteNum(p.sxx) {
		return nil, fmt.Errorf("%w (all %d are %v), so the Box–Cox power cannot be estimated", ErrNoSpreadInX, n, x[0])
	}
	my /= float64(n)
	p.wMin, p.wMax = math.Inf(1), math.Inf(-1)
	for i := range p.w {
		p.w[i] -= my
		p.wMin = ckMin(p.wMin, p.w[i])
		p.wMax = ckMax(p.wMax, p.w[i])
	}
	if p.wMax-p.wMin == 0 {
		return nil, fmt.Errorf("%w (all %d are %v), so the Box–Cox power cannot be estimated", ErrNoSpreadInY, n, y[0])
	}
	return p, nil
}

// logRSS returns log RSS_u(λ) for u = ((y/ġ)^λ − 1)/λ regressed on x, in
// two passes over the readings: u with Σu and Σ(x − x̄)·u as it is made,
// then Σ(u − ū)² and the residual sum of squares about the line. On a large
// record each pass runs in two halves side by side, whose sums are added in
// a fixed order, so the result does not depend on the number of cores.
func (p *bcProfile) logRSS(lam float64) float64 {
	v, _ := p.logRSSD(lam, false)
	return v
}

// logRSSD is logRSS and, with deriv, also d log RSS_u/dλ = 2·Σ r_i·u′_i / RSS
// (r the residuals about the line; by the normal equations the line's own
// change adds nothing), u′ = du/dλ, made in the same second pass; NaN where
// it is not made (the scaled branch, an RSS at the floor).
func (p *bcProfile) logRSSD(lam float64, deriv bool) (float64, float64) {
	wAbs := math.Max(-p.wMin, p.wMax)
	logScale := 0.0
	mode, c := bcPlain, 0.0
	switch {
	case math.Abs(lam)*wAbs > 100:
		// u ≡ e^{λw}/λ up to a constant = e^{λc}/λ · e^{λ(w−c)}, with c chosen
		// so that every exponent is ≤ 0; RSS scales by e^{2λc}/λ².
		mode, c = bcScaled, p.wMax
		if lam < 0 {
			c = p.wMin
		}
		logScale = 2*lam*c - 2*math.Log(math.Abs(lam))
	case lam == 0:
		mode = bcLog
	}
	u, xc := p.u[:len(p.w)], p.xc[:len(p.w)]
	var su, sxu float64
	if len(u) >= anParallelMin {
		h := len(u) / 2
		var wg sync.WaitGroup
		var su2, sxu2 float64
		wg.Add(1)
		go func() {
			defer wg.Done()
			su2, sxu2 = bcFill(u[h:], p.w[h:], xc[h:], lam, c, mode)
		}()
		su, sxu = bcFill(u[:h], p.w[:h], xc[:h], lam, c, mode)
		wg.Wait()
		su, sxu = su+su2, sxu+sxu2
	} else {
		su, sxu = bcFill(u, p.w, xc, lam, c, mode)
	}
	mu := su / float64(p.n)
	// Σ(x − x̄)(u − ū) = Σ(x − x̄)·u − ū·Σ(x − x̄); the second sum is the
	// rounding left in the centred x.
	b := (sxu - mu*p.sxc) / p.sxx
	var syy, rss float64
	var ds bcDSums
	useD := deriv && mode != bcScaled
	sums := func(u, w, xc []float64) (syy, rss float64, d bcDSums) {
		if useD {
			return bcSumsD(u, w, xc, mu, b, lam)
		}
		syy, rss = bcSums(u, xc, mu, b)
		return syy, rss, d
	}
	if len(u) >= anParallelMin {
		h := len(u) / 2
		var wg sync.WaitGroup
		var syy2, rss2 float64
		var ds2 bcDSums
		wg.Add(1)
		go func() {
			defer wg.Done()
			syy2, rss2, ds2 = sums(u[h:], p.w[h:], xc[h:])
		}()
		syy, rss, ds = sums(u[:h], p.w[:h], xc[:h])
		wg.Wait()
		syy, rss, ds = syy+syy2, rss+rss2, ds.add(ds2)
	} else {
		syy, rss, ds = sums(u, p.w, xc)
	}
	sru := math.NaN()
	if useD {
		sru = bcDerivSum(ds, p.n, p.sxc, p.sxx)
	}
	// An exact fit would make ℓ infinite; floor the RSS at the rounding level
	// of the data (the one no-scatter tolerance, NoScatterTol, on the
	// transformed readings) and remember that it happened.
	if rel := rss / syy; rel < p.minRel {
		p.minRel = rel
	}
	if floor := syy * NoScatterTol * NoScatterTol; rss <= floor {
		rss = floor
		p.floored = true
		sru = math.NaN()
	}
	if !(rss > 0) || !isFiniteNum(rss) {
		return math.Inf(1), math.NaN() // treated as the worst possible λ
	}
	return math.Log(rss) + logScale, 2 * sru / rss
}

// bcSpikeRel: where an RSS falls below this fraction of Σ(u − ū)² the
// search for λ̂ by the slope is left to Brent's method (the readings are
// then on a line for some power, or nearly, and ℓ has a spike there whose
// depth only rounding decides; FuzzBoxCoxAgainstExhaustive's records of
// five readings on three x).
const bcSpikeRel = 1e-12

// How bcFill makes u from w = log(y/ġ).
const (
	bcPlain  = iota // expm1(λw)/λ
	bcLog           // w (λ = 0)
	bcScaled        // e^{λ(w − c)}
)

// bcFill sets u_i from w_i as mode says and returns Σu and Σxc·u.
func bcFill(u, w, xc []float64, lam, c float64, mode int) (su, sxu float64) {
	u, xc = u[:len(w)], xc[:len(w)]
	switch mode {
	case bcScaled:
		for i, v := range w {
			e := math.Exp(lam * (v - c))
			u[i] = e
			su += e
			sxu += xc[i] * e
		}
	case bcLog:
		for i, v := range w {
			u[i] = v
			su += v
			sxu += xc[i] * v
		}
	default:
		for i, v := range w {
			e := math.Expm1(lam*v) / lam
			u[i] = e
			su += e
			sxu += xc[i] * e
		}
	}
	return su, sxu
}

// bcSums returns Σ(u − ū)² and Σ(u − ū − b·xc)².
func bcSums(u, xc []float64, mu, b float64) (syy, rss float64) {
	xc = xc[:len(u)]
	for i, v := range u {
		d := v - mu
		syy += d * d
		r := d - b*xc[i]
		rss += r * r
	}
	return syy, rss
}

// bcSumsD is bcSums with the sums for Σ r·u′, r = u − ū − b·xc and u′ =
// du/dλ for u = expm1(λw)/λ (or w at λ = 0): u′ = (w·(λu + 1) − u)/λ, or
// where |λw| < 1e-3 (where that difference cancels) its series
// w²/2 + λw³/3 + λ²w⁴/8 + λ³w⁵/30 (the terms k·λ^(k−1)·w^(k+1)/(k+1)!).
// The rounding of ū and b shifts every r by a line in xc, which would
// enter Σ r·u′ at first order (it enters the RSS only at second), so the
// sums Σr, Σr·xc, Σu′ and Σxc·u′ come too: bcDerivSum takes the part of
// u′ on the line out.
func bcSumsD(u, w, xc []float64, mu, b, lam float64) (syy, rss float64, d bcDSums) {
	w, xc = w[:len(u)], xc[:len(u)]
	for i, v := range u {
		dv := v - mu
		syy += dv * dv
		x := xc[i]
		r := dv - b*x
		rss += r * r
		wi := w[i]
		var du float64
		if t := lam * wi; math.Abs(t) < 1e-3 {
			du = wi * wi * (0.5 + t*(1.0/3+t*(1.0/8+t*(1.0/30))))
		} else {
			du = (wi*(lam*v+1) - v) / lam
		}
		d.ru += r * du
		d.r += r
		d.rx += r * x
		d.u += du
		d.xu += x * du
	}
	return syy, rss, d
}

// bcDSums are bcSumsD's sums Σr·u′, Σr, Σr·xc, Σu′, Σxc·u′.
type bcDSums struct{ ru, r, rx, u, xu float64 }

func (a bcDSums) add(b bcDSums) bcDSums {
	return bcDSums{a.ru + b.ru, a.r + b.r, a.rx + b.rx, a.u + b.u, a.xu + b.xu}
}

// bcDerivSum returns Σ r·(u′ − α − β·xc) with α + β·xc the least-squares
// line of u′ on xc (n readings, Σxc = sxc, Σxc² = sxx), which equals Σ r·u′
// for the exact residuals.
func bcDerivSum(d bcDSums, n int, sxc, sxx float64) float64 {
	mu := d.u / float64(n)
	beta := (d.xu - mu*sxc) / sxx
	alpha := mu - beta*sxc/float64(n)
	return d.ru - alpha*d.r - beta*d.rx
}

// bcGridN is the number of points of the grid, λ = −3 + k/4, k = 0 … 24;
// λ = 0 is point bcGridZero.
const (
	bcGridN    = 25
	bcGridZero = 12
	// bcGridMinSpread: below this spread of log(y/ġ) the grid is not made
	// by products. A product e^{λw} − 1 is off by about k units in the last
	// place of 1 at the k-th point from 0, which is below 1e-11 of the
	// spread of the v from here up.
	bcGridMinSpread = 1e-3
)

// bcGridSums holds the sums of each grid point: with v = (y/ġ)^λ − 1
// (λ·u; v = log(y/ġ) at λ = 0), Σv and Σxc·v, then Σ(v − v̄)² and the
// residual sum of squares of v about its line.
type bcGridSums struct {
	sv, sxv, syy, rss [bcGridN]float64
}

// gridLoglik returns the grid λ = −3 + k/4 (k = 0 … 24) and ℓ at each
// point, as loglik gives them to rounding, in two passes over the readings
// instead of two per point: the powers e^{λw} of neighbouring points differ
// by the factor q = e^{w/4}, so each reading takes one exponential and
// then a product per point, outwards from λ = 0 (e^{0·w} = 1), where the
// products stay within a few units in the last place of e^{λw}. u = v/λ,
// so Σu, Σxc·u scale by 1/λ and the sums of squares by 1/λ². A point
// where |λ|·max|w| > 100 (the scaled branch of logRSS, whose powers could
// overflow here) and every point beyond it are evaluated by loglik.
func (p *bcProfile) gridLoglik() (lams, ells []float64) {
	lams = make([]float64, bcGridN)
	ells = make([]float64, bcGridN)
	for k := range lams {
		lams[k] = bcLambdaMin + float64(k)*bcGridStep
	}
	lams[bcGridN-1] = bcLambdaMax
	wAbs := math.Max(-p.wMin, p.wMax)
	lo, hi := bcGridZero, bcGridZero // the points done by products
	if p.wMax-p.wMin < bcGridMinSpread {
		// e^{λw} − 1 would lose too many of the digits that tell the
		// readings apart: every point by loglik (expm1).
		lo, hi = bcGridN, -1
	}
	for lo > 0 && lo <= bcGridZero && math.Abs(lams[lo-1])*wAbs <= 100 {
		lo--
	}
	for hi >= bcGridZero && hi < bcGridN-1 && math.Abs(lams[hi+1])*wAbs <= 100 {
		hi++
	}
	n := len(p.w)
	var a, b bcGridSums
	run := func(pass int, mu, slope *[bcGridN]float64) {
		if n >= anParallelMin {
			h := n / 2
			var wg sync.WaitGroup
			wg.Add(1)
			go func() {
				defer wg.Done()
				p.gridPass(&b, h, n, lo, hi, pass, mu, slope)
			}()
			p.gridPass(&a, 0, h, lo, hi, pass, mu, slope)
			wg.Wait()
		} else {
			p.gridPass(&a, 0, n, lo, hi, pass, mu, slope)
		}
	}
	var mu, slope [bcGridN]float64
	if lo > hi {
		for k := range lams {
			ells[k] = p.loglik(lams[k])
		}
		return lams, ells
	}
	run(1, nil, nil)
	for k := lo; k <= hi; k++ {
		sv := a.sv[k] + b.sv[k]
		sxv := a.sxv[k] + b.sxv[k]
		mu[k] = sv / float64(p.n)
		slope[k] = (sxv - mu[k]*p.sxc) / p.sxx
	}
	run(2, &mu, &slope)
	for k := range lams {
		if k < lo || k > hi {
			ells[k] = p.loglik(lams[k])
			continue
		}
		syy, rss := a.syy[k]+b.syy[k], a.rss[k]+b.rss[k]
		if floor := syy * NoScatterTol * NoScatterTol; rss <= floor {
			rss = floor
			p.floored = true
		}
		lr := math.Inf(1)
		if rss > 0 && isFiniteNum(rss) {
			lr = math.Log(rss)
			if k != bcGridZero {
				lr -= 2 * math.Log(math.Abs(lams[k]))
			}
		}
		ells[k] = -0.5 * float64(p.n) * lr
		if math.IsNaN(ells[k]) {
			ells[k] = math.Inf(-1)
		}
	}
	return lams, ells
}

// gridPass runs pass 1 (Σv, Σxc·v; storing q = e^{w/4} in p.u) or pass 2
// (Σ(v − v̄)², Σ(v − v̄ − b·xc)², with v̄ and b from pass 1) of gridLoglik
// over the readings i0 … i1−1 for the points lo … hi, into s.
//
// The readings are taken bcGridBlock at a time, and in each block point
// by point, so that a point's two sums stay in registers while the block's
// powers e^{λw} are carried from one point to the next in e. Each sum adds
// the same terms in the same order (the readings in order), and each power
// is the same product, as one reading at a time would give (the oracle,
// gridPassByReading in the tests, is the code before).
func (p *bcProfile) gridPass(s *bcGridSums, i0, i1, lo, hi, pass int, mu, slope *[bcGridN]float64) {
	w, xc, q := p.w[i0:i1], p.xc[i0:i1], p.u[i0:i1]
	var e, iq [bcGridBlock]float64
	for b0 := 0; b0 < len(w); b0 += bcGridBlock {
		b1 := min(b0+bcGridBlock, len(w))
		wb, xb, qb := w[b0:b1], xc[b0:b1], q[b0:b1]
		eb, ib := e[:len(wb)], iq[:len(wb)]
		if pass == 1 {
			for i, wi := range wb {
				qb[i] = math.Exp(bcGridStep * wi)
			}
		}
		// λ = 0: v = w.
		copy(eb, wb)
		gridPoint(s, bcGridZero, eb, xb, nil, pass, mu, slope, false)
		for i := range eb {
			eb[i] = 1
		}
		// (lo ≤ bcGridZero ≤ hi: every point from 0 outwards is summed.)
		k := bcGridZero + 1
		for ; k+3 <= hi; k += 4 {
			gridPoints4(s, k, 1, eb, xb, qb, pass, mu, slope)
		}
		for ; k <= hi; k++ {
			gridPoint(s, k, eb, xb, qb, pass, mu, slope, true)
		}
		for i, qi := range qb {
			eb[i], ib[i] = 1, 1/qi
		}
		k = bcGridZero - 1
		for ; k-3 >= lo; k -= 4 {
			gridPoints4(s, k, -1, eb, xb, ib, pass, mu, slope)
		}
		for ; k >= lo; k-- {
			gridPoint(s, k, eb, xb, ib, pass, mu, slope, true)
		}
	}
}

// bcGridBlock is the number of readings gridPass carries from one point
// to the next (their powers, factors and x fit in the first-level cache).
const bcGridBlock = 256

// gridPoint adds point k's terms of one block to s: e holds the block's
// powers e^{λw} of the point before, which are multiplied by f (nil: e
// holds v itself, the point λ = 0) to give this point's; v = e − 1. The
// sums are taken only when add is set (the powers are carried on anyway).
func gridPoint(s *bcGridSums, k int, e, x, f []float64, pass int, mu, slope *[bcGridN]float64, add bool) {
	if f == nil {
		// λ = 0: v = w, held in e.
		gridSums(s, k, e, x, pass, mu, slope, 0)
		return
	}
	f = f[:len(e)]
	for i := range e {
		e[i] *= f[i]
	}
	if add {
		gridSums(s, k, e, x, pass, mu, slope, 1)
	}
}

// gridPoints4 is gridPoint for the four points k, k+dk, k+2dk, k+3dk in
// one sweep of the block (their eight sums are independent chains, so
// that one addition need not wait for the one before): the same products
// and the same terms in the same order as four calls of gridPoint.
func gridPoints4(s *bcGridSums, k, dk int, e, x, f []float64, pass int, mu, slope *[bcGridN]float64) {
	k1, k2, k3 := k+dk, k+2*dk, k+3*dk
	f, x = f[:len(e)], x[:len(e)]
	if pass == 1 {
		a0, a1, a2, a3 := s.sv[k], s.sv[k1], s.sv[k2], s.sv[k3]
		b0, b1, b2, b3 := s.sxv[k], s.sxv[k1], s.sxv[k2], s.sxv[k3]
		for i, ei := range e {
			fi, xi := f[i], x[i]
			e0 := ei * fi
			e1 := e0 * fi
			e2 := e1 * fi
			e3 := e2 * fi
			e[i] = e3
			v0, v1, v2, v3 := e0-1, e1-1, e2-1, e3-1
			a0 += v0
			a1 += v1
			a2 += v2
			a3 += v3
			b0 += xi * v0
			b1 += xi * v1
			b2 += xi * v2
			b3 += xi * v3
		}
		s.sv[k], s.sv[k1], s.sv[k2], s.sv[k3] = a0, a1, a2, a3
		s.sxv[k], s.sxv[k1], s.sxv[k2], s.sxv[k3] = b0, b1, b2, b3
		return
	}
	m0, m1, m2, m3 := mu[k], mu[k1], mu[k2], mu[k3]
	c0, c1, c2, c3 := slope[k], slope[k1], slope[k2], slope[k3]
	a0, a1, a2, a3 := s.syy[k], s.syy[k1], s.syy[k2], s.syy[k3]
	b0, b1, b2, b3 := s.rss[k], s.rss[k1], s.rss[k2], s.rss[k3]
	for i, ei := range e {
		fi, xi := f[i], x[i]
		e0 := ei * fi
		e1 := e0 * fi
		e2 := e1 * fi
		e3 := e2 * fi
		e[i] = e3
		d0, d1, d2, d3 := (e0-1)-m0, (e1-1)-m1, (e2-1)-m2, (e3-1)-m3
		a0 += d0 * d0
		a1 += d1 * d1
		a2 += d2 * d2
		a3 += d3 * d3
		r0, r1, r2, r3 := d0-c0*xi, d1-c1*xi, d2-c2*xi, d3-c3*xi
		b0 += r0 * r0
		b1 += r1 * r1
		b2 += r2 * r2
		b3 += r3 * r3
	}
	s.syy[k], s.syy[k1], s.syy[k2], s.syy[k3] = a0, a1, a2, a3
	s.rss[k], s.rss[k1], s.rss[k2], s.rss[k3] = b0, b1, b2, b3
}

// gridSums adds to s the sums of point k over v = e − off of one block
// (pass 1: Σv, Σxc·v; pass 2: Σ(v − v̄)², Σ(v − v̄ − b·xc)²).
func gridSums(s *bcGridSums, k int, e, x []float64, pass int, mu, slope *[bcGridN]float64, off float64) {
	x = x[:len(e)]
	if pass == 1 {
		sv, sxv := s.sv[k], s.sxv[k]
		for i, ei := range e {
			v := ei - off
			sv += v
			sxv += x[i] * v
		}
		s.sv[k], s.sxv[k] = sv, sxv
		return
	}
	syy, rss, m, b := s.syy[k], s.rss[k], mu[k], slope[k]
	for i, ei := range e {
		d := (ei - off) - m
		syy += d * d
		r := d - b*x[i]
		rss += r * r
	}
	s.syy[k], s.rss[k] = syy, rss
}

// loglik returns ℓ(λ) up to a constant that does not depend on λ.
func (p *bcProfile) loglik(lam float64) float64 {
	v := -0.5 * float64(p.n) * p.logRSS(lam)
	if math.IsNaN(v) {
		return math.Inf(-1)
	}
	return v
}

// bcSlopeMax finds the maximum of ℓ on [a, b] (a < m < b, or m one of
// them; the grid's bracket around its best point m) as the root of the
// slope of the residual sum of squares, g(λ) = RSS′(λ)/RSS(m), which is
// close to a straight line near the minimum of the RSS (where ℓ′ is not:
// the RSS is near a parabola, ℓ = −n/2·log RSS is not). f returns ℓ and g;
// at m they are em and gm. From m a Newton step with RSS″/RSS(m) = c2 (the
// parabola's through neighbouring grid points) taken half again as far, so
// that it passes the root; once g has changed sign from − on the left to +
// on the right (which brackets a minimum of the RSS), the Illinois regula
// falsi (bcIllinois, as bcRoot) until a step is below 1e-10 in λ. ok is false when no
// such bracket is found with one more evaluation at the end, or g is not
// finite; the caller then uses bcBrentMax.
func bcSlopeMax(f func(float64) (float64, float64), a, m, b, gm, em, c2 float64) (lam, ell float64, ok bool) {
	if !isFiniteNum(gm) {
		return 0, 0, false
	}
	if gm == 0 {
		return m, em, true
	}
	dm := gm
	var memo [8]struct{ l, e, d float64 }
	nm := 0
	eval := func(l float64) (float64, float64) {
		for _, s := range memo[:min(nm, len(memo))] {
			if s.l == l {
				return s.e, s.d
			}
		}
		e, d := f(l)
		memo[nm%len(memo)] = struct{ l, e, d float64 }{l, e, d}
		nm++
		return e, d
	}
	dsl := func(l float64) float64 { _, d := eval(l); return d }
	end := a
	if dm < 0 {
		end = b
	}
	if end == m {
		return 0, 0, false
	}
	t := end
	if c2 > 0 {
		t = m - 1.5*dm/c2
		if (t-end)*(t-m) >= 0 { // beyond the end
			t = end
		}
	}
	dt := dsl(t)
	if !isFiniteNum(dt) {
		return 0, 0, false
	}
	if dt*dm > 0 && t != end {
		t, dt = end, dsl(end)
		if !isFiniteNum(dt) {
			return 0, 0, false
		}
	}
	if dt*dm > 0 {
		return 0, 0, false // ℓ′ keeps its sign to the end
	}
	// The Illinois regula falsi on g, whose sign is that of dm on the side
	// of m.
	c, ok := bcIllinois(func(l float64) (float64, bool) { d := dsl(l); return d, isFiniteNum(d) },
		m, dm, t, dt, t, func(d float64) bool { return (d > 0) == (dm > 0) }, 60, 1e-10)
	if !ok {
		return 0, 0, false
	}
	e, _ := eval(c)
	return c, e, true
}

// bcBrentMax maximizes f on [a, b] by Brent's method (golden section with
// parabolic steps; Brent 1973, "Algorithms for Minimization without
// Derivatives", ch. 5), to an absolute tolerance of about tol in x.
func bcBrentMax(f func(float64) float64, a, b, tol float64) (float64, float64) {
	const cgold = 0.3819660112501051
	const eps = 1.5e-8 // ≈ sqrt(machine epsilon)
	x := a + cgold*(b-a)
	w, v := x, x
	fx := -f(x)
	fw, fv := fx, fx
	var d, e float64
	for iter := 0; iter < 200; iter++ {
		xm := 0.5 * (a + b)
		tol1 := eps*math.Abs(x) + tol/3
		tol2 := 2 * tol1
		if math.Abs(x-xm) <= tol2-0.5*(b-a) {
			break
		}
		golden := true
		if math.Abs(e) > tol1 {
			r := (x - w) * (fx - fv)
			q := (x - v) * (fx - fw)
			pp := (x-v)*q - (x-w)*r
			q = 2 * (q - r)
			if q > 0 {
				pp = -pp
			}
			q = math.Abs(q)
			if math.Abs(pp) < math.Abs(0.5*q*e) && pp > q*(a-x) && pp < q*(b-x) {
				e = d
				d = pp / q
				u := x + d
				if u-a < tol2 || b-u < tol2 {
					d = math.Copysign(tol1, xm-x)
				}
				golden = false
			}
		}
		if golden {
			if x >= xm {
				e = a - x
			} else {
				e = b - x
			}
			d = cgold * e
		}
		u := x + d
		if math.Abs(d) < tol1 {
			u = x + math.Copysign(tol1, d)
		}
		fu := -f(u)
		if fu <= fx {
			if u >= x {
				a = x
			} else {
				b = x
			}
			v, fv = w, fw
			w, fw = x, fx
			x, fx = u, fu
		} else {
			if u < x {
				a = u
			} else {
				b = u
			}
			if fu <= fw || w == x {
				v, fv = w, fw
				w, fw = u, fu
			} else if fu <= fv || v == x || v == w {
				v, fv = u, fu
			}
		}
	}
	return x, -fx
}

// bcRoot finds the root of g between out (g(out) = gOut < 0) and in
// (g(in) = gIn ≥ 0) by the Illinois variant of regula falsi (Dowell &
// Jarratt 1971, BIT 11), which keeps the bracket and converges
// superlinearly, to about 1e-12 in λ.
func bcRoot(g func(float64) float64, out, gOut, in, gIn float64) float64 {
	c, _ := bcIllinois(func(l float64) (float64, bool) { return g(l), true },
		in, gIn, out, gOut, in, func(v float64) bool { return v >= 0 }, 100, 1e-13)
	return c
}

// bcIllinois is the Illinois variant of regula falsi (Dowell & Jarratt
// 1971, BIT 11) shared by bcRoot and bcSlopeMax: the root of g between in
// (g = gIn) and out (g = gOut), of opposite signs; isIn says on which side
// a value of g puts its point. It starts from c0 and stops after maxIt
// steps, when the bracket is below 1e-12, when a step is at most tol or g
// is 0 there, and returns the last point; ok is false when g said its
// value was not usable (the last point is then returned as well).
func bcIllinois(g func(float64) (float64, bool), in, gIn, out, gOut, c0 float64, isIn func(float64) bool, maxIt int, tol float64) (c float64, ok bool) {
	side := 0
	c = c0
	for k := 0; k < maxIt && math.Abs(in-out) > 1e-12; k++ {
		prev := c
		c = in - gIn*(in-out)/(gIn-gOut)
		if !(c > math.Min(in, out) && c < math.Max(in, out)) {
			c = 0.5 * (in + out)
		}
		gc, ok := g(c)
		if !ok {
			return c, false
		}
		if gc == 0 {
			break
		}
		if isIn(gc) {
			in, gIn = c, gc
			if side == 1 {
				gOut /= 2
			}
			side = 1
		} else {
			out, gOut = c, gc
			if side == -1 {
				gIn /= 2
			}
			side = -1
		}
		if math.Abs(c-prev) <= tol {
			break
		}
	}
	return c, true
}
