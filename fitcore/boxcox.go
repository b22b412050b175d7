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
	// bcGridStep is the coarse grid before the 1-D maximizer. ℓ(λ) is a
	// smooth function of λ (each RSS is), so a quarter step brackets its
	// maximum as a tenth did on every reference dataset (tests), with 25
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
// y^(λ) on x. The search is over [−3, 3]: a coarse grid (step 0.25) and then
// Brent's parabolic/golden-section maximizer on the bracket around the best
// grid point. The interval is the likelihood-ratio set
//
//	{λ : 2·(ℓ(λ̂) − ℓ(λ)) ≤ χ²₁(level)}
//
// (Box & Cox 1964, section 4), with its ends found by the Illinois regula falsi; an end that
// does not fall inside [−3, 3] is reported as the bound itself. level is the
// confidence level, from MinLevel to MaxLevel (0 means 0.95); any other
// level is an *OptionError, never a panic.
//
// Numerics: y is rescaled by its geometric mean ġ, which turns ℓ into
// −n/2·log(RSS_u/n) + constant with u_i = ((y_i/ġ)^λ − 1)/λ, computed as
// expm1(λ·log(y_i/ġ))/λ (so λ → 0 gives log(y_i/ġ) smoothly) or, when λ·log
// is large, as a scaled exponential whose logarithm carries the scale, so no
// power overflows. Each evaluation is O(n).
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

	// Coarse grid.
	nGrid := int(math.Round((bcLambdaMax-bcLambdaMin)/bcGridStep)) + 1
	lams := make([]float64, nGrid)
	ells := make([]float64, nGrid)
	best := 0
	for i := range lams {
		lams[i] = bcLambdaMin + float64(i)*bcGridStep
		if i == nGrid-1 {
			lams[i] = bcLambdaMax
		}
		ells[i] = p.loglik(lams[i])
		if ells[i] > ells[best] {
			best = i
		}
	}

	// Refine on the bracket around the best grid point.
	lo := lams[max(best-1, 0)]
	hi := lams[min(best+1, nGrid-1)]
	lamHat, ellHat := bcBrentMax(p.loglik, lo, hi, 1e-10)
	if ells[best] > ellHat { // a bound is the maximum
		lamHat, ellHat = lams[best], ells[best]
	}
	if !isFiniteNum(ellHat) {
		return nil, fmt.Errorf("%w: the Box–Cox likelihood could not be computed for these readings (n = %d)", ErrDegenerate, p.n)
	}
	if p.floored {
		return nil, fmt.Errorf("%w: the readings lie on an exact straight line after a power transform, so the Box–Cox power is not defined (n = %d)", ErrDegenerate, p.n)
	}

	// Likelihood-ratio interval: g(λ) = ℓ(λ) − (ℓ̂ − cut) ≥ 0 inside.
	g := func(l float64) float64 { return p.loglik(l) - (ellHat - cut) }
	ciLow, ciHigh := bcLambdaMin, bcLambdaMax
	inside, gInside := lamHat, cut
	for i := nGrid - 1; i >= 0; i-- { // largest grid point below λ̂ that is outside
		if lams[i] >= lamHat {
			continue
		}
		if gi := ells[i] - (ellHat - cut); gi < 0 {
			ciLow = bcRoot(g, lams[i], gi, inside, gInside)
			break
		} else {
			inside, gInside = lams[i], gi
		}
	}
	inside, gInside = lamHat, cut
	for i := 0; i < nGrid; i++ {
		if lams[i] <= lamHat {
			continue
		}
		if gi := ells[i] - (ellHat - cut); gi < 0 {
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
	u       []float64 // work space
	floored bool      // set when an RSS hit the exact-fit floor
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
		p.wMin = min(p.wMin, p.w[i])
		p.wMax = max(p.wMax, p.w[i])
	}
	if p.wMax-p.wMin == 0 {
		return nil, fmt.Errorf("%w (all %d are %v), so the Box–Cox power cannot be estimated", ErrNoSpreadInY, n, y[0])
	}
	return p, nil
}

// logRSS returns log RSS_u(λ) for u = ((y/ġ)^λ − 1)/λ regressed on x.
func (p *bcProfile) logRSS(lam float64) float64 {
	wAbs := math.Max(-p.wMin, p.wMax)
	logScale := 0.0
	// The mean of u is summed as u is made (the same sum, in the same order).
	var mu float64
	u := p.u[:len(p.w)]
	switch {
	case math.Abs(lam)*wAbs > 100:
		// u ≡ e^{λw}/λ up to a constant = e^{λc}/λ · e^{λ(w−c)}, with c chosen
		// so that every exponent is ≤ 0; RSS scales by e^{2λc}/λ².
		c := p.wMax
		if lam < 0 {
			c = p.wMin
		}
		for i, w := range p.w {
			v := math.Exp(lam * (w - c))
			u[i] = v
			mu += v
		}
		logScale = 2*lam*c - 2*math.Log(math.Abs(lam))
	case lam == 0:
		for i, w := range p.w {
			u[i] = w
			mu += w
		}
	case len(u) >= anParallelMin:
		// The exponentials (most of the cost) are taken in two halves side
		// by side; the mean is then summed in order, as below.
		h := len(u) / 2
		var wg sync.WaitGroup
		wg.Add(1)
		go func() {
			defer wg.Done()
			bcExpm1(u[h:], p.w[h:], lam)
		}()
		bcExpm1(u[:h], p.w[:h], lam)
		wg.Wait()
		for _, v := range u {
			mu += v
		}
	default:
		for i, w := range p.w {
			v := math.Expm1(lam*w) / lam
			u[i] = v
			mu += v
		}
	}
	mu /= float64(p.n)
	xc := p.xc[:len(u)]
	var sxy, syy float64
	for i, v := range u {
		d := v - mu
		sxy += xc[i] * d
		syy += d * d
	}
	b := sxy / p.sxx
	var rss float64
	for i, v := range u {
		r := v - mu - b*xc[i]
		rss += r * r
	}
	// An exact fit would make ℓ infinite; floor the RSS at the rounding level
	// of the data (the one no-scatter tolerance, NoScatterTol, on the
	// transformed readings) and remember that it happened.
	if floor := syy * NoScatterTol * NoScatterTol; rss <= floor {
		rss = floor
		p.floored = true
	}
	if !(rss > 0) || !isFiniteNum(rss) {
		return math.Inf(1) // treated as the worst possible λ
	}
	return math.Log(rss) + logScale
}

// bcExpm1 sets u_i = expm1(λ·w_i)/λ.
func bcExpm1(u, w []float64, lam float64) {
	u = u[:len(w)]
	for i, v := range w {
		u[i] = math.Expm1(lam*v) / lam
	}
}

// loglik returns ℓ(λ) up to a constant that does not depend on λ.
func (p *bcProfile) loglik(lam float64) float64 {
	v := -0.5 * float64(p.n) * p.logRSS(lam)
	if math.IsNaN(v) {
		return math.Inf(-1)
	}
	return v
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
	side := 0
	c := in
	for k := 0; k < 100 && math.Abs(in-out) > 1e-12; k++ {
		prev := c
		c = in - gIn*(in-out)/(gIn-gOut)
		if !(c > math.Min(in, out) && c < math.Max(in, out)) {
			c = 0.5 * (in + out)
		}
		gc := g(c)
		if gc >= 0 {
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
		if math.Abs(c-prev) <= 1e-13 || gc == 0 {
			break
		}
	}
	return c
}
