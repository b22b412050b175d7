package fitcore

// The Box–Cox profile as it was before issue 13 (four passes over the data
// per evaluation, plain regula falsi on ℓ for the interval ends), kept
// unchanged as the oracle of TestBoxCoxAgainstExhaustive and
// FuzzBoxCoxAgainstExhaustive.

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sync"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// The search: [−3, 3] on a grid of step 0.25.
const (
	bcOracleMin  = -3.0
	bcOracleMax  = 3.0
	bcOracleStep = 0.25
)

// bcOracleProfile is BoxCoxProfile before issue 13.
func bcOracleProfile(x, y []float64, level float64) (*BoxCox, error) {
	p, err := bcOracleNew(x, y)
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
	nGrid := int(math.Round((bcOracleMax-bcOracleMin)/bcOracleStep)) + 1
	lams := make([]float64, nGrid)
	ells := make([]float64, nGrid)
	best := 0
	for i := range lams {
		lams[i] = bcOracleMin + float64(i)*bcOracleStep
		if i == nGrid-1 {
			lams[i] = bcOracleMax
		}
		ells[i] = p.loglik(lams[i])
		if ells[i] > ells[best] {
			best = i
		}
	}

	// Refine on the bracket around the best grid point.
	lo := lams[max(best-1, 0)]
	hi := lams[min(best+1, nGrid-1)]
	lamHat, ellHat := bcOracleBrentMax(p.loglik, lo, hi, 1e-10)
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
	ciLow, ciHigh := bcOracleMin, bcOracleMax
	inside, gInside := lamHat, cut
	for i := nGrid - 1; i >= 0; i-- { // largest grid point below λ̂ that is outside
		if lams[i] >= lamHat {
			continue
		}
		if gi := ells[i] - (ellHat - cut); gi < 0 {
			ciLow = bcOracleRoot(g, lams[i], gi, inside, gInside)
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
			ciHigh = bcOracleRoot(g, lams[i], gi, inside, gInside)
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

// bcOracle holds what every evaluation of ℓ(λ) needs.
type bcOracle struct {
	n       int
	xc      []float64 // x − x̄
	sxx     float64
	w       []float64 // log(y/ġ)
	wMin    float64
	wMax    float64
	u       []float64 // work space
	floored bool      // set when an RSS hit the exact-fit floor
}

// bcOracleNew validates the data and precomputes centred x and log(y/ġ).
func bcOracleNew(x, y []float64) (*bcOracle, error) {
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
	p := &bcOracle{n: n, xc: make([]float64, n), w: make([]float64, n), u: make([]float64, n)}
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
func (p *bcOracle) logRSS(lam float64) float64 {
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
			bcOracleExpm1(u[h:], p.w[h:], lam)
		}()
		bcOracleExpm1(u[:h], p.w[:h], lam)
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

// bcOracleExpm1 sets u_i = expm1(λ·w_i)/λ.
func bcOracleExpm1(u, w []float64, lam float64) {
	u = u[:len(w)]
	for i, v := range w {
		u[i] = math.Expm1(lam*v) / lam
	}
}

// loglik returns ℓ(λ) up to a constant that does not depend on λ.
func (p *bcOracle) loglik(lam float64) float64 {
	v := -0.5 * float64(p.n) * p.logRSS(lam)
	if math.IsNaN(v) {
		return math.Inf(-1)
	}
	return v
}

// bcOracleBrentMax maximizes f on [a, b] by Brent's method (golden section with
// parabolic steps; Brent 1973, "Algorithms for Minimization without
// Derivatives", ch. 5), to an absolute tolerance of about tol in x.
func bcOracleBrentMax(f func(float64) float64, a, b, tol float64) (float64, float64) {
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

// bcOracleRoot finds the root of g between out (g(out) = gOut < 0) and in
// (g(in) = gIn ≥ 0) by the Illinois variant of regula falsi (Dowell &
// Jarratt 1971, BIT 11), which keeps the bracket and converges
// superlinearly, to about 1e-12 in λ.
func bcOracleRoot(g func(float64) float64, out, gOut, in, gIn float64) float64 {
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

// TestBoxCoxAgainstExhaustive compares BoxCoxProfile with the profile it
// replaced (bcOracleProfile, above) on invented records of many
// shapes: straight lines, powers of a line (λ from −3 to 3 and beyond the
// search interval), exponential growth, scatter that grows, few readings
// (wide intervals), readings spread over many decades (the scaled branch),
// repeats, and levels from 0.5 to 0.9999. The interval ends must agree to
// 1e-9 (they are simple roots, found to 1e-12) and λ̂ to 1e-6: the profile
// is flat at its top, so the rounding of ℓ (different in the two, which sum
// in a different order) moves where Brent's method stops by up to about
// 1e-7 on 30,000 noisy readings. The report shows three or four digits. An
// error must be the same error.
func TestBoxCoxAgainstExhaustive(t *testing.T) {
	type gen func(r *rand.Rand, n int) (x, y []float64)
	line := func(a, b, sd float64) gen {
		return func(r *rand.Rand, n int) (x, y []float64) {
			for i := range n {
				xi := 1 + 9*float64(i)/float64(n-1)
				x = append(x, xi)
				y = append(y, a+b*xi+sd*r.NormFloat64())
			}
			return x, y
		}
	}
	power := func(lam0, sd float64) gen { // y^λ0 is a straight line in x
		return func(r *rand.Rand, n int) (x, y []float64) {
			for range n {
				xi := 1 + 9*r.Float64()
				x = append(x, xi)
				z := 2 + xi + sd*r.NormFloat64()
				if lam0 == 0 {
					y = append(y, math.Exp(z/4))
				} else {
					y = append(y, math.Pow(math.Abs(z), 1/lam0))
				}
			}
			return x, y
		}
	}
	gens := map[string]gen{
		"line":          line(5, 2, 0.5),
		"exact line":    line(5, 2, 0),
		"tight line":    line(100, 3, 0.001),
		"noisy line":    line(30, 1, 5),
		"log":           power(0, 0.3),
		"sqrt":          power(0.5, 0.3),
		"reciprocal":    power(-1, 0.2),
		"square":        power(2, 0.3),
		"cube":          power(3, 0.2),
		"minus three":   power(-3, 0.1),
		"beyond":        power(6, 0.1),
		"beyond minus":  power(-6, 0.1),
		"proportional":  func(r *rand.Rand, n int) (x, y []float64) { return bcBenchData(max(n, 5)) },
		"decades":       func(r *rand.Rand, n int) (x, y []float64) { return bcDecades(r, n) },
		"growing noise": func(r *rand.Rand, n int) (x, y []float64) { x, y, _ = benchData(n); return x, y },
		"repeats": func(r *rand.Rand, n int) (x, y []float64) {
			for i := range n {
				xi := float64(1 + i%4)
				x = append(x, xi)
				y = append(y, 3*xi*math.Exp(0.1*r.NormFloat64()))
			}
			return x, y
		},
	}
	levels := []float64{0, 0.5, 0.9, 0.95, 0.99, 0.9999}
	cases, errs := 0, 0
	worst := map[string]float64{}
	for name, g := range gens {
		for k, n := range []int{5, 6, 8, 12, 30, 100, 1000, 30000} {
			r := rand.New(rand.NewPCG(uint64(k), uint64(len(name))))
			x, y := g(r, n)
			level := levels[(k+len(name))%len(levels)]
			want, werr := bcOracleProfile(x, y, level)
			got, err := BoxCoxProfile(x, y, level)
			cases++
			if werr != nil || err != nil {
				errs++
				if werr == nil || err == nil || werr.Error() != err.Error() {
					t.Errorf("%s n=%d: error %v, exhaustive profile %v", name, n, err, werr)
				}
				continue
			}
			for _, d := range []struct {
				what      string
				got, want float64
				tol       float64
			}{{"λ", got.Lambda, want.Lambda, 1e-6}, {"low end", got.CILow, want.CILow, 1e-9}, {"high end", got.CIHigh, want.CIHigh, 1e-9}} {
				worst[d.what] = max(worst[d.what], math.Abs(d.got-d.want))
				if math.Abs(d.got-d.want) > d.tol {
					t.Errorf("%s n=%d level %g: %s = %.12g, exhaustive profile %.12g", name, n, level, d.what, d.got, d.want)
				}
			}
		}
	}
	t.Logf("%d records, %d errors; largest differences: %v", cases, errs, worst)
	if errs > cases/4 {
		t.Errorf("%d of %d records gave errors: the comparison tests too little", errs, cases)
	}
}

// FuzzBoxCoxAgainstExhaustive: BoxCoxProfile and the profile it replaced
// agree on any readings (x and y from bytes, y scaled by 1.05^k): λ̂ to
// 1e-6 plus 1e-5 of the interval's width, the interval ends to 1e-8, the
// same errors. The first seed is the
// record that ruled out evaluating the grid coarse to fine: its profile has
// two maxima (λ ≈ −0.03 and λ ≈ 2.52), and every fourth grid point and the
// quarters near the best of them found the lower one.
func FuzzBoxCoxAgainstExhaustive(f *testing.F) {
	f.Add([]byte{1, 2, 3, 55, 220, 5}, []byte{1, 2, 3, 55, 97, 5}, uint8(10))
	f.Add([]byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13}, []byte{3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8, 9}, uint8(7))
	f.Fuzz(func(t *testing.T, xb, yb []byte, k uint8) {
		n := min(len(xb), len(yb))
		x := make([]float64, n)
		y := make([]float64, n)
		for i := range n {
			x[i] = float64(xb[i])
			y[i] = math.Pow(1.05, float64(k%64)) * (1 + float64(yb[i]))
		}
		if bcRoundingOnly(x, y) || bcTwoValues(y) {
			// Readings on a line to rounding (repeats that agree exactly,
			// at two x), or y of only two values (every power of which is
			// a straight function of y): ℓ is flat up to rounding noise,
			// λ̂ is not determined, and the two searches, which round
			// differently, stop at different noise. Such records are left
			// out of the comparison.
			return
		}
		want, werr := bcOracleProfile(x, y, 0.95)
		got, err := BoxCoxProfile(x, y, 0.95)
		if (werr == nil) != (err == nil) || err != nil && err.Error() != werr.Error() {
			t.Fatalf("x=%v y=%v: error %v, before %v", x, y, err, werr)
		}
		if err != nil {
			return
		}
		// λ̂ within 1e-6 plus 1e-5 of the interval's width: where the
		// interval is wide the profile is flat at its top and its rounding
		// (larger where u − ū cancels) moves Brent's stop by a few 1e-6.
		if math.Abs(got.Lambda-want.Lambda) > 1e-6+1e-5*(want.CIHigh-want.CILow) ||
			math.Abs(got.CILow-want.CILow) > 1e-8 || math.Abs(got.CIHigh-want.CIHigh) > 1e-8 {
			t.Fatalf("x=%v y=%v: %+v, before %+v", x, y, *got, *want)
		}
	})
}

// bcTwoValues says whether y holds at most two different values.
func bcTwoValues(y []float64) bool {
	if len(y) == 0 {
		return false
	}
	a, b := y[0], y[0]
	for _, v := range y {
		switch {
		case v == a || v == b:
		case a == b:
			b = v
		default:
			return false
		}
	}
	return true
}

// bcRoundingOnly says whether the least-squares line of y on x leaves a
// residual sum of squares below 1e-20 of the total (n ≥ 3 and x varies;
// otherwise false).
func bcRoundingOnly(x, y []float64) bool {
	n := len(x)
	if n < 3 {
		return false
	}
	var mx, my float64
	for i := range x {
		mx += x[i]
		my += y[i]
	}
	mx /= float64(n)
	my /= float64(n)
	var sxx, sxy, syy float64
	for i := range x {
		sxx += (x[i] - mx) * (x[i] - mx)
		sxy += (x[i] - mx) * (y[i] - my)
		syy += (y[i] - my) * (y[i] - my)
	}
	if !(sxx > 0) || !(syy > 0) {
		return false
	}
	b := sxy / sxx
	var rss float64
	for i := range x {
		r := y[i] - my - b*(x[i]-mx)
		rss += r * r
	}
	return rss <= 1e-20*syy
}

// bcDecades is an invented record whose readings span about twelve decades,
// so that |λ|·|log(y/ġ)| passes 100 and the scaled branch of logRSS is used.
func bcDecades(r *rand.Rand, n int) (x, y []float64) {
	for i := range n {
		xi := 1 + 27*float64(i)/float64(n-1)
		x = append(x, xi)
		y = append(y, math.Exp(xi*(1+0.05*r.NormFloat64())))
	}
	return x, y
}

// BenchmarkBoxCoxSearch times BoxCoxProfile beside the profile it
// replaced, on the advice benchmark's record (benchData, 10⁶ readings),
// so the two are measured under the same load.
func BenchmarkBoxCoxSearch(b *testing.B) {
	x, y, _ := benchData(1000000)
	for _, c := range []struct {
		name string
		f    func(x, y []float64, level float64) (*BoxCox, error)
	}{{"now", BoxCoxProfile}, {"before", bcOracleProfile}} {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := c.f(x, y, 0.95); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestBoxCoxSlopeAgainstBrent checks the search for λ̂ by the slope of the
// RSS (bcSlopeMax) against Brent's method on the same grid bracket, which
// it replaced and which remains its fallback, on invented records (the
// benchmark's bending record with growing scatter, its square, and a
// reciprocal), at n = 1 000 and 100 000: the slope's search must be taken
// (no fallback) and λ̂ and ℓ̂ must agree to Brent's tolerance.
func TestBoxCoxSlopeAgainstBrent(t *testing.T) {
	for _, n := range []int{1000, 100000} {
		x, y, _ := benchData(n)
		for name, f := range map[string]func(v float64, i int) float64{
			"y":   func(v float64, _ int) float64 { return v },
			"y²":  func(v float64, i int) float64 { return v * v * (1 + 0.001*float64(i%7)) },
			"1/y": func(v float64, _ int) float64 { return 1 / v },
		} {
			yy := make([]float64, n)
			for i := range yy {
				yy[i] = f(y[i], i)
			}
			p, err := bcNewProfile(x, yy)
			if err != nil {
				t.Fatal(err)
			}
			lams, ells := p.gridLoglik()
			best := 0
			for i := range ells {
				if ells[i] > ells[best] {
					best = i
				}
			}
			if best == 0 || best == len(lams)-1 {
				t.Fatalf("%s n=%d: maximum at the bound", name, n)
			}
			lb, eb := bcBrentMax(p.loglik, lams[best-1], lams[best+1], 1e-10)
			nf := float64(n)
			vm, dlm := p.logRSSD(lams[best], true)
			em := -0.5 * nf * vm
			ells[best] = em
			slope := func(l float64) (float64, float64) {
				v, dl := p.logRSSD(l, true)
				return -0.5 * nf * v, dl * math.Exp(v-vm)
			}
			rel := func(i int) float64 { return math.Exp(-2 * (ells[i] - em) / nf) }
			c2 := (rel(best-1) - 2*rel(best) + rel(best+1)) / (bcGridStep * bcGridStep)
			ls, es, ok := bcSlopeMax(slope, lams[best-1], lams[best], lams[best+1], dlm, em, c2)
			if !ok {
				t.Fatalf("%s n=%d: the slope's search fell back", name, n)
			}
			if math.Abs(ls-lb) > 1e-7 || es < eb-1e-9*math.Abs(eb) {
				t.Errorf("%s n=%d: slope λ̂ %v ℓ̂ %v, Brent λ̂ %v ℓ̂ %v", name, n, ls, es, lb, eb)
			}
		}
	}
}

// gridPassByReading is gridPass as it was before it took the readings a
// block at a time: one reading at a time, every point's terms of it.
func (p *bcProfile) gridPassByReading(s *bcGridSums, i0, i1, lo, hi, pass int, mu, slope *[bcGridN]float64) {
	w, xc, q := p.w[i0:i1], p.xc[i0:i1], p.u[i0:i1]
	var v [bcGridN]float64
	for i, wi := range w {
		var qi float64
		if pass == 1 {
			qi = math.Exp(bcGridStep * wi)
			q[i] = qi
		} else {
			qi = q[i]
		}
		v[bcGridZero] = wi
		e := 1.0
		for k := bcGridZero + 1; k <= hi; k++ {
			e *= qi
			v[k] = e - 1
		}
		e, iq := 1.0, 1/qi
		for k := bcGridZero - 1; k >= lo; k-- {
			e *= iq
			v[k] = e - 1
		}
		x := xc[i]
		if pass == 1 {
			for k := lo; k <= hi; k++ {
				s.sv[k] += v[k]
				s.sxv[k] += x * v[k]
			}
			continue
		}
		for k := lo; k <= hi; k++ {
			d := v[k] - mu[k]
			s.syy[k] += d * d
			r := d - slope[k]*x
			s.rss[k] += r * r
		}
	}
}

// TestGridPassByBlock: the grid's two passes taken a block of readings at
// a time give every sum bit for bit as one reading at a time did
// (gridPassByReading), for every range of points, on invented records of
// 5 to 3 000 readings (lengths that are and are not a multiple of the
// block) whose log y spreads from 0.01 to 30.
func TestGridPassByBlock(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 12))
	for trial := range 60 {
		n := 5 + r.IntN(3000)
		if trial%5 == 0 {
			n = bcGridBlock * (1 + trial%3)
		}
		x, y := make([]float64, n), make([]float64, n)
		spread := math.Pow(10, -2+3.5*r.Float64())
		for i := range x {
			x[i] = r.Float64() * 10
			y[i] = math.Exp(spread * (r.Float64() - 0.5) * (1 + x[i]/10))
		}
		p, err := bcNewProfile(x, y)
		if err != nil {
			t.Fatal(err)
		}
		lo, hi := r.IntN(bcGridZero+1), bcGridZero+r.IntN(bcGridN-bcGridZero)
		var mu, slope [bcGridN]float64
		for k := range mu {
			mu[k], slope[k] = r.NormFloat64(), r.NormFloat64()
		}
		q := append([]float64(nil), p.u...)
		var got, want bcGridSums
		p.gridPassByReading(&want, 0, n, lo, hi, 1, nil, nil)
		wantQ := append([]float64(nil), p.u...)
		copy(p.u, q)
		p.gridPass(&got, 0, n, lo, hi, 1, nil, nil)
		if got != want || !slices.Equal(p.u, wantQ) {
			t.Fatalf("trial %d (n = %d, points %d…%d): pass 1 differs", trial, n, lo, hi)
		}
		p.gridPassByReading(&want, 0, n, lo, hi, 2, &mu, &slope)
		p.gridPass(&got, 0, n, lo, hi, 2, &mu, &slope)
		if got != want {
			t.Fatalf("trial %d (n = %d, points %d…%d): pass 2 differs", trial, n, lo, hi)
		}
	}
}

// BenchmarkBoxCoxGrid is the two passes of the Box–Cox grid over 10⁶
// readings of the bench record: by block (gridPass) and, beside it, one
// reading at a time (gridPassByReading, the code before).
func BenchmarkBoxCoxGrid(b *testing.B) {
	x, y, _ := benchData(1000000)
	p, err := bcNewProfile(x, y)
	if err != nil {
		b.Fatal(err)
	}
	n := len(x)
	var mu, slope [bcGridN]float64
	for name, pass := range map[string]func(s *bcGridSums, i0, i1, lo, hi, pass int, mu, slope *[bcGridN]float64){
		"block": p.gridPass, "by_reading": p.gridPassByReading,
	} {
		b.Run(name, func(b *testing.B) {
			for b.Loop() {
				var s bcGridSums
				pass(&s, 0, n, 0, bcGridN-1, 1, nil, nil)
				pass(&s, 0, n, 0, bcGridN-1, 2, &mu, &slope)
				sinkF = s.rss[0]
			}
		})
	}
}
