package fitcore

import "math"

// ckBasis is an orthogonal basis {1, d, g} of the polynomials of degree at
// most two in x under the weights w (Σ_i w_i·p(x_i)·q(x_i) = 0 for two
// different members), held as the few numbers that define it so that no
// n-sized column is ever stored:
//
//	z = (x − m)/s           x standardized by its plain mean m and rms s
//	d = z − mz              mz the weighted mean of z
//	g = d² − α − β·d        α, β making g orthogonal to 1 and d
//
// This is Gram–Schmidt on the columns 1, z, z² (the three-term recurrence
// of orthogonal polynomials; Forsythe, "Generation and use of orthogonal
// polynomials for data-fitting with a digital computer", J. SIAM 5, 1957),
// with each step repeated once on the result ("twice is enough", Giraud,
// Langou & Rozložník, Computers & Mathematics with Applications 50, 2005),
// so it has the conditioning of Gram–Schmidt on the explicit columns while
// taking only a few O(n) passes over x and storing no column.
type ckBasis struct {
	m, is       float64 // z = (x − m)·is
	mz          float64
	alpha, beta float64
	wk          float64 // power of two the weights are scaled by (their largest to [½, 1))
	s0          float64 // Σw
	sdd, sgg    float64 // Σw·d², Σw·g²
	okD, okG    bool    // d and g are not, to rounding, combinations of the earlier members
}

func (b *ckBasis) d(x float64) float64 { return (x-b.m)*b.is - b.mz }

func (b *ckBasis) g(d float64) float64 { return d*d - b.alpha - b.beta*d }

// ckNewBasis builds the basis for x with weights w (nil = 1), with g only
// when quad. ok is false when x has no spread (or its mean and rms are not
// finite). okD and okG say a member is not degenerate: one is when its norm
// after orthogonalisation is at most 1e-10 of the norm of its column.
func ckNewBasis(x, w []float64, quad bool) (b ckBasis, ok bool) {
	m, s := ckMeanSD(x)
	if s == 0 || !ckFinite(s) {
		return b, false
	}
	b.m, b.is = m, 1/s
	b.wk = ckWeightScale(w)
	wk := b.wk
	var s0, sz, szz, sz4 float64
	if w == nil {
		for _, v := range x {
			z := (v - m) * b.is
			sz += z
			z2 := z * z
			szz += z2
			sz4 += z2 * z2
		}
		s0 = float64(len(x))
	} else {
		for i, v := range x {
			z := (v - m) * b.is
			wi := w[i] * wk
			s0 += wi
			sz += wi * z
			z2 := z * z
			szz += wi * z2
			sz4 += wi * z2 * z2
		}
	}
	b.s0 = s0
	b.mz = sz / s0
	// Centre z, with the correction term of Chan, Golub & LeVeque (1983).
	var sd, sdd, sd3 float64
	if w == nil {
		for _, v := range x {
			d := b.d(v)
			sd += d
			d2 := d * d
			sdd += d2
			sd3 += d2 * d
		}
	} else {
		for i, v := range x {
			d := b.d(v)
			wd := w[i] * wk * d
			sd += wd
			sdd += wd * d
			sd3 += wd * d * d
		}
	}
	b.mz += sd / s0
	b.sdd = sdd - sd*sd/s0
	b.okD = b.sdd > 0 && math.Sqrt(b.sdd) > 1e-10*math.Sqrt(szz)
	if !quad || !b.okD {
		return b, ckFinite(b.sdd)
	}
	b.alpha = b.sdd / s0
	b.beta = sd3 / b.sdd
	// Second Gram–Schmidt step for g, then its norm.
	var sg, sgd float64
	if w == nil {
		for _, v := range x {
			d := b.d(v)
			g := b.g(d)
			sg += g
			sgd += g * d
		}
	} else {
		for i, v := range x {
			d := b.d(v)
			wg := w[i] * wk * b.g(d)
			sg += wg
			sgd += wg * d
		}
	}
	b.alpha += sg / s0
	b.beta += sgd / b.sdd
	var sgg float64
	if w == nil {
		for _, v := range x {
			g := b.g(b.d(v))
			sgg += g * g
		}
	} else {
		for i, v := range x {
			g := b.g(b.d(v))
			sgg += w[i] * wk * g * g
		}
	}
	b.sgg = sgg
	b.okG = sgg > 0 && math.Sqrt(sgg) > 1e-10*math.Sqrt(sz4)
	return b, ckFinite(b.sdd) && ckFinite(sgg)
}

// ckProj is the least-squares fit of a response v on the basis: v ≈ a +
// b·d (+ c·g), with pd = Σw·d·v/√Σw·d² and pg = Σw·g·v/√Σw·g² the
// coordinates of v along the normalised members and sse the residual sum of
// squares Σw·r².
type ckProj struct {
	a, b, c float64
	pd, pg  float64
	sse     float64
}

// project fits the response v_i = y_i (sq false) or v_i = (y_i² − mean)·is
// (sq true) by classical Gram–Schmidt repeated once on the residual (twice
// is enough): a first pass projects v, a second projects the residual and
// corrects the coefficients; the residual sum of squares is that of the
// second residual minus the squares of its (tiny) projections. quad says
// whether g takes part.
func (b *ckBasis) project(x, w []float64, quad bool, y []float64, sq bool, mean, is float64) ckProj {
	return b.projectFrom(b.firstPass(x, w, quad, y, sq, mean, is), x, w, quad, y, sq, mean, is)
}

// ckFirstPass holds the sums of project's first pass: Σv, Σv·d and (with
// quad) Σv·g.
type ckFirstPass struct{ sv, sdv, sgv float64 }

// firstPass is project's first pass. Its Σv and Σv·d do not depend on
// quad, so one pass with quad serves a projection without it as well.
func (b *ckBasis) firstPass(x, w []float64, quad bool, y []float64, sq bool, mean, is float64) ckFirstPass {
	var sv, sdv, sgv float64
	for i, xi := range x {
		vi := y[i]
		if sq {
			vi = (vi*vi - mean) * is
		}
		if w != nil {
			vi *= w[i] * b.wk
		}
		d := b.d(xi)
		sv += vi
		sdv += vi * d
		if quad {
			sgv += vi * b.g(d)
		}
	}
	return ckFirstPass{sv, sdv, sgv}
}

// projectFrom is project from the sums of its first pass, f1.
func (b *ckBasis) projectFrom(f1 ckFirstPass, x, w []float64, quad bool, y []float64, sq bool, mean, is float64) ckProj {
	val := func(i int) float64 {
		v := y[i]
		if sq {
			v = (v*v - mean) * is
		}
		return v
	}
	sv, sdv, sgv := f1.sv, f1.sdv, f1.sgv
	var p ckProj
	p.a, p.b = sv/b.s0, sdv/b.sdd
	if quad {
		p.c = sgv / b.sgg
	}
	var sr, sdr, sgr, srr float64
	for i, xi := range x {
		d := b.d(xi)
		r := val(i) - p.a - p.b*d
		var g float64
		if quad {
			g = b.g(d)
			r -= p.c * g
		}
		wr := r
		if w != nil {
			wr *= w[i] * b.wk
		}
		sr += wr
		sdr += wr * d
		sgr += wr * g
		srr += wr * r
	}
	p.a += sr / b.s0
	p.b += sdr / b.sdd
	p.pd = (sdv + sdr) / math.Sqrt(b.sdd)
	sse := srr - sr*sr/b.s0 - sdr*sdr/b.sdd
	if quad {
		p.c += sgr / b.sgg
		p.pg = (sgv + sgr) / math.Sqrt(b.sgg)
		sse -= sgr * sgr / b.sgg
	}
	p.sse = math.Max(sse, 0)
	return p
}

// ckWeightScale returns a power of two that brings the largest weight of w
// into [½, 1), or 1 for nil w. Every check is unchanged by scaling all
// weights alike, and scaling by a power of two is exact.
func ckWeightScale(w []float64) float64 {
	if w == nil {
		return 1
	}
	var mw float64
	for _, v := range w {
		mw = posMax(mw, v)
	}
	if !(mw > 0) || !ckFinite(mw) {
		return 1
	}
	_, e := math.Frexp(mw)
	return math.Ldexp(1, -max(e, -1000)) // 2^1073 for a subnormal would overflow
}

// ckPre is what several checks need to know about x, worked out once:
// whether x takes at least 3 different values and its unweighted
// quadratic basis (ok false when x has no spread).
type ckPre struct {
	distinct int // min(3, number of distinct values)
	basis    ckBasis
	ok       bool
	// Set by a caller that has already validated the inputs (lengths,
	// finiteness, weights) of the checks on x and y, or on x and the
	// residuals, so the checks need not do it again.
	xyValid, residValid bool
	// quick says only the verdicts are wanted (the advice's refits), so a
	// check may take a cheaper approximation where it cannot change them.
	quick bool
	// dw, when set, keeps the Durbin–Watson design between the analyses
	// that share it (the advice's refits).
	dw *dwShared
	// sq keeps the moments of e² that Breusch–Pagan worked out for White,
	// which asks about the same residuals (sqOf) next.
	sqOf []float64
	sq   ckSqMoments
	// sqFirst, when sqFirstOK, is the first pass of the projection of e²
	// on the quadratic basis (the linear one takes its first two sums).
	sqFirst   ckFirstPass
	sqFirstOK bool
}

func ckPrepare(x []float64) *ckPre {
	p := &ckPre{distinct: ckDistinctAtLeast(x, 3)}
	p.basis, p.ok = ckNewBasis(x, nil, true)
	return p
}
