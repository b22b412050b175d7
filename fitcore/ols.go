package fitcore

import (
	"fmt"
	"math"
)

// This file holds the least-squares engine shared by every model: ordinary
// least squares with intercept, the fit through the origin and weighted
// least squares (Draper & Smith, Applied Regression Analysis, 3rd ed.,
// ch. 1, 9). The sums are taken about the (weighted) means in two passes
// with the Chan–Golub–LeVeque correction term (The American Statistician
// 37, 1983) and block-wise compensated (Neumaier) accumulation, and every
// value is first scaled by a power of two so that squares neither overflow
// nor underflow. Scaling by a power of two is exact, so no digit is lost.

// lnBlock is the length of the plain inner sums whose results are then
// added with compensation: the error grows like blk·ε inside a block and
// stays O(ε) across blocks.
const lnBlock = 256

// lnKSum is a Neumaier compensated sum.
type lnKSum struct{ s, c float64 }

func (k *lnKSum) add(v float64) {
	t := k.s + v
	if math.Abs(k.s) >= math.Abs(v) {
		k.c += (k.s - t) + v
	} else {
		k.c += (v - t) + k.s
	}
	k.s = t
}

func (k lnKSum) val() float64 { return k.s + k.c }

// lnPow2Scale returns a power of two k such that m·k lies in [0.5, 1) when m
// is outside the range where squares of n such numbers are safe, and 1
// otherwise (so ordinary data keep their exact values).
func lnPow2Scale(m float64) float64 {
	if m == 0 || (m > 0x1p-400 && m < 0x1p400) {
		return 1
	}
	return lnPow2Norm(m)
}

// lnPow2Norm returns the power of two k with m·k in [0.5, 1) (1 for m = 0).
func lnPow2Norm(m float64) float64 {
	if m == 0 {
		return 1
	}
	_, e := math.Frexp(m)
	return math.Ldexp(1, -max(e, -1000)) // 2^1073 for a subnormal would overflow
}

// lg2 is the exponent of a power of two k (k = 2^lg2(k)).
func lg2(k float64) int {
	_, e := math.Frexp(k)
	return e - 1
}

// unscale returns v·kx^a·ky^b·cw^c, a value in internal units taken back
// to the units of the readings, with one Ldexp so that no intermediate
// power of two overflows or underflows (kx/ky/ky can, while the result is
// an ordinary number).
func (f *lineFit) unscale(v float64, a, b, c int) float64 {
	return math.Ldexp(v, a*lg2(f.kx)+b*lg2(f.ky)+c*lg2(f.cw))
}

// lineFit is a least-squares straight line in internal (scaled) units:
// x_s = x·kx, y_s = y·ky, w_s = w·cw and ŷ_s = a + b1·(x_s − xc).
// Va, V1 and Cab are the variances of a and b1 and their covariance in
// internal units (s²/Σw, s²/Sxx and 0 for least squares; jackknife values
// for Deming).
type lineFit struct {
	n        int
	origin   bool
	weighted bool
	kx, ky   float64
	cw       float64
	xc, a    float64
	b1       float64
	b0       float64 // intercept, internal units (0 through the origin)
	sw       float64 // Σw (n when unweighted)
	sxx, syy float64 // centred (uncentred through the origin) weighted sums
	sxy      float64
	sse      float64
	df       float64
	va, v1   float64
	cab      float64
	w        []float64 // internal weights, nil when unweighted
}

// s2 is the residual mean square in internal units.
func (f *lineFit) s2() float64 {
	if f.df <= 0 {
		return 0
	}
	return f.sse / f.df
}

// slope and intercept in original units.
func (f *lineFit) slope() float64 { return f.unscale(f.b1, 1, -1, 0) }

func (f *lineFit) intercept() float64 {
	if f.origin {
		return 0
	}
	return f.b0 / f.ky
}

// fitLS fits y = b0 + b1·x (or y = b1·x when origin) by least squares with
// optional weights w (nil = unweighted; weights must already be validated
// positive and finite). Data must be finite with len(x) = len(y) ≥ 2.
//
// With Sxx = Σw(x−x̄)², Sxy = Σw(x−x̄)(y−ȳ): b1 = Sxy/Sxx, b0 = ȳ − b1·x̄;
// through the origin b1 = Σwxy/Σwx² (Draper & Smith §1.2, §9.2).
func fitLS(x, y, w []float64, origin bool) (*lineFit, error) {
	f := new(lineFit)
	if err := fitLine(f, x, y, w, origin); err != nil {
		return nil, err
	}
	return f, nil
}

// fitLine is fitLS writing into f (no allocation when unweighted).
func fitLine(f *lineFit, x, y, w []float64, origin bool) error {
	// Few unweighted readings: one block, so the compensated sums reduce to
	// the plain ones and the same arithmetic runs without the block
	// machinery.
	if w == nil && len(x) <= lnBlock {
		if done, err := fitSmall(f, x, y, origin); done {
			return err
		}
	} else if fitScaled(f, x, y, w, origin, 1, 1, 1) && f.safe() {
		return f.finish(x, y)
	}
	// Fast path: unscaled. Ordinary readings keep their exact values; only
	// when a sum overflows or a sum of squares leaves the safe range are
	// the readings scaled by powers of two and the sums taken again.
	var mx, my, mw float64
	for i := range x {
		mx = absMax(mx, x[i])
		my = absMax(my, y[i])
		if w != nil {
			mw = posMax(mw, w[i])
		}
	}
	cw := 1.0
	if w != nil {
		_, e := math.Frexp(mw)
		cw = math.Ldexp(1, -max(e, -1000))
	}
	// Here the readings are brought to [½, 1) whatever their size, so
	// that the sums land well inside the safe band.
	if !fitScaled(f, x, y, w, origin, lnPow2Norm(mx), lnPow2Norm(my), cw) || !(f.sxx > 0) || !isFiniteNum(f.sxx) {
		return ErrNoSpreadInX
	}
	return f.finish(x, y)
}

// fitSmall is fitLine for unweighted readings that fit in one block (n ≤
// lnBlock), where the compensated sums reduce to the plain ones (a
// compensated sum of one block is that block's sum, +0 for −0): the same
// arithmetic as fitScaled, safe, finish and refine, in the same order, kept
// in local variables. done is false when the readings need scaling (f is
// then to be fitted by the general path).
func fitSmall(f *lineFit, x, y []float64, origin bool) (done bool, err error) {
	n := len(x)
	y = y[:n]
	sw := float64(n)
	var xbar, ybar float64
	if !origin {
		var bx, by float64
		for i, xi := range x {
			bx += xi
			by += y[i]
		}
		xbar, ybar = (bx+0)/sw, (by+0)/sw
	}
	var bx, by, bxx, byy, bxy float64
	for i, xi := range x {
		dx := xi - xbar
		dy := y[i] - ybar
		bx += dx
		by += dy
		bxx += dx * dx
		byy += dy * dy
		bxy += dx * dy
	}
	sxx, syy, sxy := bxx+0, byy+0, bxy+0
	if !origin {
		ex, ey := bx+0, by+0
		sxx -= ex * ex / sw
		syy -= ey * ey / sw
		sxy -= ex * ey / sw
		xbar += ex / sw
		ybar += ey / sw
	}
	// safe
	const lo, hi = lnSafeLo, lnSafeHi
	if !(sxx > lo && sxx < hi && (syy == 0 || (syy > lo && syy < hi)) && isFiniteNum(sxy) &&
		isFiniteNum(xbar) && isFiniteNum(ybar) && math.Abs(xbar) < hi && math.Abs(ybar) < hi) {
		return false, nil
	}
	// finish and refine
	b1 := sxy / sxx
	xc, yc := xbar, ybar
	b0g := 0.0
	if !origin {
		b0g = ckFMA(-b1, xc, yc)
	} else {
		xc, yc = 0, 0
	}
	var be, bde, bee, bd float64
	for i, xi := range x {
		dx := xi - xc
		r := ckFMA(-b1, dx, y[i]-yc)
		be += r
		bde += dx * r
		bee += r * r
		bd += dx
	}
	se, sde, see, sd := be+0, bde+0, bee+0, bd+0
	var b0, a, sse, df float64
	a = ybar
	if origin {
		rho := sde
		delta := rho / sxx
		b1 += delta
		sse = max(see-delta*rho, 0)
		df = float64(n - 1)
	} else {
		me, md := se/sw, sd/sw
		rho := sde - sw*md*me
		delta := rho / sxx
		b1 += delta
		b0 = b0g + me - delta*(xc+md)
		a = yc + me - delta*md
		sse = max(see-sw*me*me-delta*rho, 0)
		df = float64(n - 2)
	}
	var s2, va float64
	if df > 0 {
		s2 = sse / df
	}
	if !origin {
		va = s2 / sw
	}
	*f = lineFit{n: n, origin: origin, kx: 1, ky: 1, cw: 1, xc: xbar, a: a, b1: b1, b0: b0, sw: sw,
		sxx: sxx, syy: syy, sxy: sxy, sse: sse, df: df, va: va, v1: s2 / sxx}
	return true, nil
}

// lnSafeLo and lnSafeHi bound the unscaled sums Sxx, Syy and the means:
// inside, b1 = Sxy/Sxx is at most √(Syy/Sxx) ≤ 2^400, and b1², Var(b1) =
// s²/Sxx and b1²·Sxx all stay below 2^800, far from overflow.
const lnSafeLo, lnSafeHi = 0x1p-400, 0x1p400

// safe says whether the unscaled sums stayed in the range where their
// squares and products are exact to rounding.
func (f *lineFit) safe() bool {
	const lo, hi = lnSafeLo, lnSafeHi
	return f.sxx > lo && f.sxx < hi && (f.syy == 0 || (f.syy > lo && f.syy < hi)) && isFiniteNum(f.sxy) &&
		isFiniteNum(f.xc) && isFiniteNum(f.a) && math.Abs(f.xc) < hi && math.Abs(f.a) < hi
}

// fitScaled takes the (weighted) means and centred sums of x·kx, y·ky with
// weights w·cw into f; false when the weights sum to nothing usable.
func fitScaled(f *lineFit, x, y, w []float64, origin bool, kx, ky, cw float64) bool {
	n := len(x)
	*f = lineFit{n: n, origin: origin, weighted: w != nil, kx: kx, ky: ky, cw: cw}
	if f.w = w; w != nil && cw != 1 {
		// (w·1 is w, bit for bit, and f.w is only read: no copy then.)
		f.w = scaledCopy(w, cw)
	}
	wi := f.w
	scaled := kx != 1 || ky != 1
	// Pass 1: (weighted) sums for the means.
	var ax, ay, aw lnKSum
	for s := 0; s < n; s += lnBlock {
		e := min(s+lnBlock, n)
		var bx, by, bw float64
		switch {
		case wi == nil && !scaled:
			for i := s; i < e; i++ {
				bx += x[i]
				by += y[i]
			}
		case wi == nil:
			for i := s; i < e; i++ {
				bx += x[i] * kx
				by += y[i] * ky
			}
		default:
			for i := s; i < e; i++ {
				ww := wi[i]
				bx += ww * x[i] * kx
				by += ww * y[i] * ky
				bw += ww
			}
		}
		ax.add(bx)
		ay.add(by)
		aw.add(bw)
	}
	sw := float64(n)
	if wi != nil {
		sw = aw.val()
	}
	if !(sw > 0) || !isFiniteNum(sw) {
		return false
	}
	f.sw = sw
	var xbar, ybar float64
	if !origin {
		xbar, ybar = ax.val()/sw, ay.val()/sw
	}
	// Pass 2: centred sums with the correction term.
	var cx, cy, cxx, cyy, cxy lnKSum
	for s := 0; s < n; s += lnBlock {
		e := min(s+lnBlock, n)
		var bx, by, bxx, byy, bxy float64
		if wi == nil {
			for i := s; i < e; i++ {
				dx := x[i]*kx - xbar
				dy := y[i]*ky - ybar
				bx += dx
				by += dy
				bxx += dx * dx
				byy += dy * dy
				bxy += dx * dy
			}
		} else {
			for i := s; i < e; i++ {
				dx := x[i]*kx - xbar
				dy := y[i]*ky - ybar
				ww := wi[i]
				wdx := ww * dx
				bx += wdx
				by += ww * dy
				bxx += wdx * dx
				byy += ww * dy * dy
				bxy += wdx * dy
			}
		}
		cx.add(bx)
		cy.add(by)
		cxx.add(bxx)
		cyy.add(byy)
		cxy.add(bxy)
	}
	f.sxx, f.syy, f.sxy = cxx.val(), cyy.val(), cxy.val()
	if !origin {
		ex, ey := cx.val(), cy.val()
		f.sxx -= ex * ex / sw
		f.syy -= ey * ey / sw
		f.sxy -= ex * ey / sw
		xbar += ex / sw
		ybar += ey / sw
	}
	f.xc, f.a = xbar, ybar
	return true
}

// finish computes the slope, the residual sum of squares (pass 3) and the
// coefficient variances.
func (f *lineFit) finish(x, y []float64) error {
	if !(f.sxx > 0) {
		return ErrNoSpreadInX
	}
	f.b1 = f.sxy / f.sxx
	// Pass 3: residuals, taken directly (never as Syy − b1·Sxy, which
	// cancels when R² is near 1), and one step of iterative refinement.
	f.refine(x, y)
	n := f.n
	if f.origin {
		f.df = float64(n - 1)
	} else {
		f.df = float64(n - 2)
	}
	s2 := f.s2()
	f.v1 = s2 / f.sxx
	if !f.origin {
		f.va = s2 / f.sw
	}
	return nil
}

// refine computes the residual sum of squares and refines the slope and
// intercept by one step of iterative refinement. With b1 the double slope,
// b0g = fma(−b1, x̄c, ȳc) and r_i = fma(−b1, x_i, y_i) − b0g (each fused
// multiply–add rounds once, so r_i keeps its digits even when |b0| ≪ |b1·x̄|),
// the exact least-squares slope is b1 + δ with δ = Σw(dx−m_dx)(r−m_r)/Sxx and
// the intercept b0g + m_r − δ·x̄. Plain ȳ − b1·x̄ cannot reach full accuracy
// there (NIST StRD Norris): b1's own rounding would be multiplied by x̄.
// SSE = Σw(r−m_r)² − δ·ρ. Source: Higham, Accuracy and Stability of
// Numerical Algorithms, 2nd ed., §4.3 (compensated sums), §12.1 (iterative
// refinement).
func (f *lineFit) refine(x, y []float64) {
	n := len(x)
	kx, ky, xc, yc, b1 := f.kx, f.ky, f.xc, f.a, f.b1
	b0g := 0.0
	if !f.origin {
		b0g = ckFMA(-b1, xc, yc)
	} else {
		xc, yc = 0, 0
	}
	var se, sde, see, sd lnKSum
	for s := 0; s < n; s += lnBlock {
		e := min(s+lnBlock, n)
		var be, bde, bee, bd float64
		if f.w == nil {
			for i := s; i < e; i++ {
				dx := x[i]*kx - xc
				r := ckFMA(-b1, dx, y[i]*ky-yc)
				be += r
				bde += dx * r
				bee += r * r
				bd += dx
			}
		} else {
			for i := s; i < e; i++ {
				dx := x[i]*kx - xc
				r := ckFMA(-b1, dx, y[i]*ky-yc)
				ww := f.w[i]
				wr := ww * r
				be += wr
				bde += dx * wr
				bee += wr * r
				bd += ww * dx
			}
		}
		se.add(be)
		sde.add(bde)
		see.add(bee)
		sd.add(bd)
	}
	if f.origin {
		rho := sde.val()
		delta := rho / f.sxx
		f.b1 = b1 + delta
		f.sse = math.Max(see.val()-delta*rho, 0)
		return
	}
	sw := f.sw
	me, md := se.val()/sw, sd.val()/sw
	rho := sde.val() - sw*md*me
	delta := rho / f.sxx
	f.b1 = b1 + delta
	f.b0 = b0g + me - delta*(xc+md)
	f.a = yc + me - delta*md
	f.sse = math.Max(see.val()-sw*me*me-delta*rho, 0)
}

// residualSS returns Σw(y_s − ŷ_s)² in internal units.
func (f *lineFit) residualSS(x, y []float64) float64 {
	n := len(x)
	kx, ky, xc, a, b1 := f.kx, f.ky, f.xc, f.a, f.b1
	var acc lnKSum
	for s := 0; s < n; s += lnBlock {
		e := min(s+lnBlock, n)
		var b float64
		if f.w == nil {
			for i := s; i < e; i++ {
				r := y[i]*ky - a - b1*(x[i]*kx-xc)
				b += r * r
			}
		} else {
			for i := s; i < e; i++ {
				r := y[i]*ky - a - b1*(x[i]*kx-xc)
				b += f.w[i] * r * r
			}
		}
		acc.add(b)
	}
	return acc.val()
}

// fittedResiduals returns fitted values and residuals in original units.
func (f *lineFit) fittedResiduals(x, y []float64) (fitted, resid []float64) {
	fitted = make([]float64, len(x))
	resid = make([]float64, len(x))
	f.fittedResidualsInto(x, y, fitted, resid)
	return fitted, resid
}

// fittedResidualsInto is fittedResiduals writing into fitted and resid.
func (f *lineFit) fittedResidualsInto(x, y, fitted, resid []float64) {
	n := len(x)
	kx, ky, xc, a, b1 := f.kx, f.ky, f.xc, f.a, f.b1
	iy := 1 / ky
	for i := range n {
		fs := a + b1*(x[i]*kx-xc)
		fitted[i] = fs * iy
		resid[i] = (y[i]*ky - fs) * iy
	}
}

// residualsInto is fittedResidualsInto without keeping the fitted values:
// the same residuals, bit for bit, and ok false when a fitted value or a
// residual is not finite (bad is then fitted + residual of the first).
func (f *lineFit) residualsInto(x, y, resid []float64) (bad float64, ok bool) {
	n := len(x)
	kx, ky, xc, a, b1 := f.kx, f.ky, f.xc, f.a, f.b1
	iy := 1 / ky
	ok = true
	for i := range n {
		fs := a + b1*(x[i]*kx-xc)
		fv := fs * iy
		r := (y[i]*ky - fs) * iy
		resid[i] = r
		if s := fv + r; s-s != 0 && ok {
			// (x − x is 0 for every finite x; a sum of finite values
			// can still overflow, so each is looked at.)
			if !isFiniteNum(fv) || !isFiniteNum(r) {
				bad, ok = s, false
			}
		}
	}
	return bad, ok
}

// fitAt is ŷ at x (original units in and out).
func (f *lineFit) fitAt(x float64) float64 {
	return (f.a + f.b1*(x*f.kx-f.xc)) / f.ky
}

// meanVarAt is the variance of the fitted line at x, in internal y units²:
// Va + 2·Cab·u + V1·u² with u = x_s − xc.
func (f *lineFit) meanVarAt(x float64) float64 {
	u := x*f.kx - f.xc
	return f.va + 2*f.cab*u + f.v1*u*u
}

// pearsonR is the (weighted) correlation of x and y about their means.
// Through the origin the sums are uncentred, so it is recomputed centred.
func (f *lineFit) pearsonR() float64 {
	if !(f.sxx > 0) || !(f.syy > 0) {
		return 0
	}
	r := f.sxy / math.Sqrt(f.sxx) / math.Sqrt(f.syy)
	return math.Max(-1, math.Min(1, r))
}

// weightModel gives the weight of a reading at any x (fitted scale), in
// original units, for predictions and inverse predictions of a weighted fit.
type weightModel struct {
	scheme WeightScheme
	power  float64
	first  *lineFit  // unweighted first pass, for WeightsFitted2
	x, w   []float64 // observed x and weights, for given and repeat weights
}

// at returns the weight at x; ok is false when the scheme gives no finite
// positive weight there.
func (m *weightModel) at(x float64) (float64, bool) {
	var w float64
	switch m.scheme {
	case WeightsNone:
		return 1, true
	case WeightsX:
		w = 1 / x
	case WeightsX2:
		w = 1 / (x * x)
	case WeightsFitted2:
		f := m.first.fitAt(x)
		w = 1 / (f * f)
	case WeightsPowerFit:
		w = math.Pow(math.Abs(x), -m.power)
	default: // given, repeats: the weight of the nearest observed x
		best, bd := -1, math.Inf(1)
		for i, xi := range m.x {
			if d := math.Abs(xi - x); d < bd {
				best, bd = i, d
			}
		}
		if best < 0 {
			return 0, false
		}
		w = m.w[best]
	}
	return w, w > 0 && isFiniteNum(w)
}

// schemeWeights returns the weights w_i = 1/var_i for a weighted fit and
// the model that extends them to any x:
//
//	given    Options.GivenWeights
//	x        w = 1/x                (var ∝ x; every x > 0)
//	x2       w = 1/x²               (var ∝ x²; every x ≠ 0)
//	fitted2  w = 1/ŷ²               (var ∝ ŷ², ŷ from an unweighted first fit)
//	repeats  w = 1/s²_j             (s²_j the sample variance of the repeats at x_j)
//	power    w = |x|^(−p)           (p the slope of ln e² on ln|x| over the
//	                                 unweighted residuals e; Carroll & Ruppert,
//	                                 Transformation and Weighting in Regression, 1988, §3.3)
//
// Source for the weighting: Draper & Smith §9.2; NIST/SEMATECH e-Handbook §4.4.5.2.
//
// The weights are written into buf when its capacity is at least len(x)
// (a new slice otherwise; nil: always new).
func schemeWeights(scheme WeightScheme, x, y, given []float64, origin bool, rep *Report, buf []float64) ([]float64, *weightModel, error) {
	n := len(x)
	m := &weightModel{scheme: scheme}
	w := ckGrowF64(buf, n)
	clear(w)
	bad := func(i int, col string, v float64, hint string) error {
		return &DataError{Index: i, Column: col, Value: v, Err: ErrBadWeight, Hint: hint}
	}
	switch scheme {
	case WeightsGiven:
		if len(given) != n {
			return nil, nil, fmt.Errorf("%w: %d weights for %d pairs", ErrLengthMismatch, len(given), n)
		}
		copy(w, given)
	case WeightsX:
		for i, v := range x {
			if !(v > 0) {
				return nil, nil, bad(i, "x", v, "Weights 1/x need every x above zero.")
			}
			w[i] = 1 / v
		}
	case WeightsX2:
		for i, v := range x {
			w[i] = 1 / (v * v)
			if v == 0 {
				return nil, nil, bad(i, "x", v, "Weights 1/x² cannot be used at x = 0.")
			}
		}
	case WeightsFitted2:
		f, err := fitLS(x, y, nil, origin)
		if err != nil {
			return nil, nil, err
		}
		m.first = f
		for i, v := range x {
			fv := f.fitAt(v)
			w[i] = 1 / (fv * fv)
			if fv == 0 {
				return nil, nil, bad(i, "fitted y", fv, "Weights 1/ŷ² cannot be used where the line passes through zero.")
			}
		}
	case WeightsRepeats:
		if err := repeatWeights(x, y, w); err != nil {
			return nil, nil, err
		}
	case WeightsPowerFit:
		p, err := estimatePower(x, y, origin)
		if err != nil {
			return nil, nil, err
		}
		m.power = p
		rep.WeightPower = p
		for i, v := range x {
			w[i] = math.Pow(math.Abs(v), -p)
		}
	}
	for i, v := range w {
		if !(v > 0) || !isFiniteNum(v) {
			col := "weight"
			val := v
			if scheme != WeightsGiven {
				col, val = "x", x[i]
			}
			return nil, nil, bad(i, col, val, "Every weight must be a positive finite number; check this reading or choose another weighting.")
		}
	}
	if scheme == WeightsGiven || scheme == WeightsRepeats {
		m.x, m.w = x, w
	}
	return w, m, nil
}

// repeatWeights sets w_i = 1/s²_j from the repeats at each distinct x,
// found in the ascending order of x (ckSortBuf.order: equal x in the order
// of the readings).
func repeatWeights(x, y, w []float64) error {
	var b ckSortBuf
	idx := b.order(x)
	for s := 0; s < len(idx); {
		e := s + 1
		for e < len(idx) && x[idx[e]] == x[idx[s]] {
			e++
		}
		g := idx[s:e]
		if len(g) < 2 {
			return &DataError{Index: int(g[0]), Column: "x", Value: x[g[0]], Err: ErrNoRepeats,
				Hint: "Weights from repeats need at least two readings at every x; add repeats here or choose another weighting."}
		}
		var mu float64
		for _, i := range g {
			mu += y[i]
		}
		mu /= float64(len(g))
		var ss float64
		for _, i := range g {
			d := y[i] - mu
			ss += d * d
		}
		v := ss / float64(len(g)-1)
		if !(v > 0) {
			return &DataError{Index: int(g[0]), Column: "x", Value: x[g[0]], Err: ErrNoRepeats,
				Hint: "The repeat readings at this x are identical, so their spread gives no weight; choose another weighting."}
		}
		for _, i := range g {
			w[i] = 1 / v
		}
		s = e
	}
	return nil
}

// estimatePower regresses ln e² on ln|x| over the unweighted residuals.
func estimatePower(x, y []float64, origin bool) (float64, error) {
	f, err := fitLS(x, y, nil, origin)
	if err != nil {
		return 0, err
	}
	lx := make([]float64, 0, len(x))
	le := make([]float64, 0, len(x))
	for i, v := range x {
		e := (y[i]*f.ky - f.a - f.b1*(v*f.kx-f.xc)) / f.ky
		if v == 0 || e == 0 {
			continue
		}
		lx = append(lx, math.Log(math.Abs(v)))
		le = append(le, 2*math.Log(math.Abs(e)))
	}
	if len(lx) < 3 || allEqual(lx) {
		return 0, fmt.Errorf("%w: the variance power cannot be estimated (needs at least 3 readings with x ≠ 0 at two or more x values)", ErrBadWeight)
	}
	g, err := fitLS(lx, le, nil, false)
	if err != nil {
		return 0, err
	}
	p := g.slope()
	if !isFiniteNum(p) {
		return 0, fmt.Errorf("%w: the variance power could not be estimated", ErrBadWeight)
	}
	return p, nil
}
