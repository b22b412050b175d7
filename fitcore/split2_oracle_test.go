package fitcore

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// The functions below are curvatureGap, findSlip, XExactness,
// durbinWatsonW and newDWDesign as they were before each was split into
// named stages (cyclomatic complexity 25, 23, 21, 24 and 24), kept
// unchanged as the oracles of TestSplit2MatchesOracle and
// FuzzSplit2MatchesOracle: the split versions must give the same results
// bit for bit.

// curvatureGapOracle is curvatureGap before the split.
func curvatureGapOracle(x, y, w []float64, origin bool) (gap, pct, sq float64, ok bool) {
	b0, b1, okl := ckLineCoef(x, y, w, origin)
	if !okl || len(x) < 3 {
		return 0, 0, 0, false
	}
	lo, hi := x[0], x[0]
	var sw, swx float64
	for i, v := range x {
		lo, hi = min(lo, v), max(hi, v)
		sw += ckW(w, i)
		swx += ckW(w, i) * v
	}
	m := swx / sw
	// Normal equations of y = a0 + a1·u + a2·u², u = x − m (with origin the
	// line has no intercept but the quadratic's gap is judged the same way).
	var s [5]float64
	var t [3]float64
	for i, v := range x {
		u := v - m
		wi := ckW(w, i)
		p := wi
		for k := range 5 {
			s[k] += p
			if k < 3 {
				t[k] += p * y[i]
			}
			p *= u
		}
	}
	a := [3][4]float64{{s[0], s[1], s[2], t[0]}, {s[1], s[2], s[3], t[1]}, {s[2], s[3], s[4], t[2]}}
	for c := range 3 {
		piv := c
		for r := c + 1; r < 3; r++ {
			if math.Abs(a[r][c]) > math.Abs(a[piv][c]) {
				piv = r
			}
		}
		a[c], a[piv] = a[piv], a[c]
		if a[c][c] == 0 || math.Abs(a[c][c]) < 1e-13*math.Abs(s[0]+s[2]+s[4]) {
			return 0, 0, 0, false
		}
		for r := range 3 {
			if r != c {
				f := a[r][c] / a[c][c]
				for k := c; k < 4; k++ {
					a[r][k] -= f * a[c][k]
				}
			}
		}
	}
	q0, q1, q2 := a[0][3]/a[0][0], a[1][3]/a[1][1], a[2][3]/a[2][2]
	diff := func(v float64) float64 {
		u := v - m
		l := b1 * v
		if !origin {
			l += b0
		}
		return q0 + q1*u + q2*u*u - l
	}
	gap = math.Max(math.Abs(diff(lo)), math.Abs(diff(hi)))
	if q2 != 0 {
		if v := m - q1/(2*q2); v > lo && v < hi {
			gap = math.Max(gap, math.Abs(diff(v)))
		}
	}
	if span := math.Abs(b1 * (hi - lo)); span > 0 {
		pct = 100 * gap / span
	}
	if len(x) > 3 {
		var sse float64
		for i, v := range x {
			u := v - m
			r := y[i] - (q0 + q1*u + q2*u*u)
			sse += ckW(w, i) * r * r
		}
		sq = math.Sqrt(sse / float64(len(x)-3))
	}
	if !ckFinite(gap) || !ckFinite(pct) || !ckFinite(sq) {
		return 0, 0, 0, false
	}
	return gap, pct, sq, true
}

// findSlipOracle is findSlip before the split.
func findSlipOracle(x, y, w []float64, origin bool, infl []PointInfluence) *SlippedDecimal {
	n := len(x)
	p := 2
	if origin {
		p = 1
	}
	if n-p-1 < 2 {
		return nil
	}
	best := -1
	for i, pi := range infl {
		if pi.OutlierP < OutlierWarnP && (best < 0 || pi.OutlierP < infl[best].OutlierP) {
			best = i
		}
	}
	if best < 0 || y[best] == 0 {
		return nil
	}
	xs := make([]float64, 0, n-1)
	ys := make([]float64, 0, n-1)
	var ws []float64
	for j := range x {
		if j == best {
			continue
		}
		xs, ys = append(xs, x[j]), append(ys, y[j])
		if w != nil {
			ws = append(ws, w[j])
		}
	}
	b0, b1, resid, ok := ckLine(xs, ys, ws, origin)
	if !ok {
		return nil
	}
	var sse, sw, swx float64
	for j, e := range resid {
		sse += ckW(ws, j) * e * e
		sw += ckW(ws, j)
		swx += ckW(ws, j) * xs[j]
	}
	df := float64(n - 1 - p)
	s := math.Sqrt(sse / df)
	var h float64
	if origin {
		var sxx float64
		for j, v := range xs {
			sxx += ckW(ws, j) * v * v
		}
		h = x[best] * x[best] / sxx
	} else {
		mx := swx / sw
		var sxx float64
		for j, v := range xs {
			sxx += ckW(ws, j) * (v - mx) * (v - mx)
		}
		h = 1/sw + (x[best]-mx)*(x[best]-mx)/sxx
	}
	wi := 1.0
	if w != nil {
		wi = w[best]
	}
	half := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Quantile(0.975) * s * math.Sqrt(1/wi+h)
	fit := b1 * x[best]
	if !origin {
		fit += b0
	}
	if !ckFinite(half) || !ckFinite(fit) {
		return nil
	}
	for _, f := range slipFactors {
		if v := y[best] * f; math.Abs(v-fit) <= half {
			return &SlippedDecimal{Index: best, Value: y[best], Expected: fit, Likely: v, Factor: f}
		}
	}
	return nil
}

// xExactnessOracle is XExactness before the split.
func xExactnessOracle(x, y []float64, xu, yu float64, level float64) (Check, Assumption) {
	const name = "x exactness"
	na := func(why string) (Check, Assumption) {
		return ckNA(name, why), Assumption{Verdict: NA, Message: why}
	}
	if s := ckValidate(x, y, nil, "y value"); s != "" {
		return na(s)
	}
	if !(xu > 0) || !ckFinite(xu) {
		return na("No uncertainty was given for the x readings, so their exactness was not checked.")
	}
	if !(yu >= 0) || !ckFinite(yu) {
		return na(fmt.Sprintf("The y uncertainty %v is not a usable number.", yu))
	}
	n := len(x)
	if n < 3 {
		return na(fmt.Sprintf("The x exactness check needs at least 3 readings; there are %d.", n))
	}
	level = levelOrDefault(level)
	mx, _ := ckMeanSD(x)
	my, _ := ckMeanSD(y)
	var sxx, syy, sxy float64
	for i := range x {
		dx, dy := x[i]-mx, y[i]-my
		sxx += dx * dx
		syy += dy * dy
		sxy += dx * dy
	}
	if !(sxx > 0) || !ckFinite(sxx) || !ckFinite(syy) || !ckFinite(sxy) {
		return na("All x values are the same, so no slope can be fitted.")
	}
	if sxy == 0 {
		return na("The readings show no trend at all, so there is no slope to compare.")
	}
	b := sxy / sxx
	sse := syy - b*sxy
	if sse < 0 {
		sse = 0
	}
	s := math.Sqrt(sse / float64(n-2))
	se := s / math.Sqrt(sxx)
	if !(se > 0) || !ckFinite(se) {
		return na("The readings lie exactly on a line, so the slope's standard error is zero and no comparison is possible.")
	}
	uy := yu
	if uy == 0 {
		uy = s
	}
	delta := (uy * uy) / (xu * xu)
	bd, ok := ckDemingSlope(sxx, syy, sxy, delta)
	if !ok {
		return na("The Deming slope could not be computed for these readings.")
	}
	z := (bd - b) / se
	p := ckZ2(z)
	c := Check{Name: name, Statistic: z, P: p}
	az := math.Abs(z)
	switch {
	case az >= 1:
		c.Verdict = Fail
	case az >= 0.5:
		c.Verdict = Warn
	default:
		c.Verdict = Pass
	}
	zc := distuv.UnitNormal.Quantile(1 - (1-level)/2)
	cover := distuv.UnitNormal.CDF(zc-az) - distuv.UnitNormal.CDF(-zc-az)
	detail := fmt.Sprintf("slope %.6g treating x as exact, %.6g allowing for x error; difference %.2f standard errors", b, bd, z)
	if c.Verdict == Pass {
		c.Message = fmt.Sprintf("The uncertainty of the x readings is too small to matter for the slope (%s).", detail)
	} else {
		c.Message = fmt.Sprintf("The uncertainty of the x readings shifts the slope noticeably (%s); the %.0f %% interval for the slope would cover the true slope only about %.0f %% of the time.", detail, 100*level, 100*cover)
	}
	a := ckXExactAssumption(c)
	return c, a
}

// durbinWatsonWOracle is durbinWatsonW before the split.
func durbinWatsonWOracle(x, resid, w []float64, origin bool, pre *ckPre) Check {
	const name = "Durbin–Watson"
	if pre == nil || !pre.residValid {
		if s := ckValidate(x, resid, w, "residual"); s != "" {
			return ckNA(name, s)
		}
	} else if s := ckWeights(w, len(x)); s != "" {
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
	var shared *dwShared
	if pre != nil {
		shared = pre.dw
	}
	dz, mean, variance, ok := shared.design(x, w, origin)
	if !ok {
		return ckNA(name, "The x values do not spread enough to judge the order of the residuals.")
	}
	c := Check{Name: name, Statistic: d, DF: float64(n - k)}
	bcdf, bok := ckDWBetaCDF(d, mean, variance)
	exact := n <= DWExactMax
	how := "exact"
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
	cdf := bcdf
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
	if !ok {
		c.Verdict, c.P = NA, 1
		c.Message = fmt.Sprintf("Durbin–Watson d = %.3f, but too few readings to judge it.", d)
		return c
	}
	p := ckClampP(2 * math.Min(cdf, 1-cdf))
	c.P = p
	c.Verdict = ckVerdict(p, ckWarnP, ckFailP)
	what := "neighbouring readings tend to sit on the same side of the line (drift)"
	if d > mean {
		what = "neighbouring readings tend to alternate about the line"
	}
	switch c.Verdict {
	case Fail:
		c.Message = fmt.Sprintf("In the order entered, %s (Durbin–Watson d = %.3f, %s, %s).", what, d, ckFmtP(p), how)
	case Warn:
		c.Message = fmt.Sprintf("In the order entered, there are signs that %s (Durbin–Watson d = %.3f, %s, %s).", what, d, ckFmtP(p), how)
	default:
		c.Message = fmt.Sprintf("In the order entered, the residuals look independent (Durbin–Watson d = %.3f, %s, %s).", d, ckFmtP(p), how)
	}
	return c
}

// newDWDesignOracle is newDWDesign before the split (complexity 24).
func newDWDesignOracle(x, w []float64, origin bool) (*dwDesign, bool) {
	n := len(x)
	dz := &dwDesign{n: n}
	sw := func(int) float64 { return 1 }
	if w != nil {
		wk := ckWeightScale(w)
		sw = func(t int) float64 { return math.Sqrt(w[t] * wk) }
	}
	normalize := func(v []float64) float64 {
		var big float64
		for _, a := range v {
			big = max(big, math.Abs(a))
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
	if origin {
		var big float64
		for _, v := range x {
			big = max(big, math.Abs(v))
		}
		if big == 0 || !ckFinite(big) {
			return nil, false
		}
		u := make([]float64, n)
		for t, v := range x {
			u[t] = sw(t) * (v / big)
		}
		if normalize(u) == 0 {
			return nil, false
		}
		dz.u[0], dz.k = u, 1
		return dz, true
	}
	m, s := ckMeanSD(x)
	if s == 0 || !ckFinite(s) {
		return nil, false
	}
	u1 := make([]float64, n)
	u2 := make([]float64, n)
	for t, v := range x {
		u1[t] = sw(t)
		u2[t] = sw(t) * ((v - m) / s)
	}
	if normalize(u1) == 0 {
		return nil, false
	}
	var before float64
	for _, a := range u2 {
		before += a * a
	}
	for range 2 {
		var dot float64
		for t := range u2 {
			dot += u1[t] * u2[t]
		}
		for t := range u2 {
			u2[t] -= dot * u1[t]
		}
	}
	var after float64
	for _, a := range u2 {
		after += a * a
	}
	if !(math.Sqrt(after) > 1e-10*math.Sqrt(before)) || normalize(u2) == 0 {
		return nil, false
	}
	dz.u[0], dz.u[1], dz.k = u1, u2, 2
	return dz, true
}

// sameDWDesign compares newDWDesign with its oracle.
func sameDWDesign(t *testing.T, x, w []float64, origin bool) {
	t.Helper()
	show := func(d *dwDesign, ok bool) string {
		if d == nil {
			return fmt.Sprint("nil ", ok)
		}
		return fmt.Sprintf("%+v %v", *d, ok)
	}
	if got, want := show(newDWDesign(x, w, origin)), show(newDWDesignOracle(x, w, origin)); got != want {
		t.Fatalf("newDWDesign(x=%v, w=%v, origin=%v):\n got %s\nwant %s", x, w, origin, got, want)
	}
}

// split2All compares the four functions with their oracles on the
// readings splitCase builds from data (see split_oracle_test.go).
func split2All(t *testing.T, data []byte) {
	t.Helper()
	x, y := splitCase(data)
	w := make([]float64, len(x))
	for i := range x {
		w[i] = 1 / (1 + math.Abs(x[i]))
	}
	var k byte
	if len(data) > 2 {
		k = data[2]
	}
	for _, origin := range []bool{false, true} {
		for _, wt := range [][]float64{nil, w} {
			sameDWDesign(t, x, wt, origin)
			sameDWDesign(t, make([]float64, len(x)), wt, origin)
			if len(x) > 1 {
				sameDWDesign(t, append([]float64{math.Inf(1)}, x[1:]...), wt, origin)
			}
			g1, g2, g3, gok := curvatureGap(x, y, wt, origin)
			o1, o2, o3, ook := curvatureGapOracle(x, y, wt, origin)
			if got, want := fmt.Sprint(g1, g2, g3, gok), fmt.Sprint(o1, o2, o3, ook); got != want {
				t.Fatalf("curvatureGap(x=%v, y=%v, origin=%v, w=%v): got %s, want %s", x, y, origin, wt != nil, got, want)
			}
			_, _, resid, ok := ckLine(x, y, wt, origin)
			if !ok {
				continue
			}
			infl := Influence(x, resid, wt, origin)
			gs, os := findSlip(x, y, wt, origin, infl), findSlipOracle(x, y, wt, origin, infl)
			if got, want := showSlip(gs), showSlip(os); got != want {
				t.Fatalf("findSlip(x=%v, y=%v, origin=%v, w=%v): got %s, want %s", x, y, origin, wt != nil, got, want)
			}
			for _, pre := range []*ckPre{nil, {residValid: true}, {residValid: true, quick: true}, {residValid: true, quick: true, dw: &dwShared{}}} {
				var pre2 *ckPre
				if pre != nil {
					cp := *pre
					if pre.dw != nil {
						cp.dw = &dwShared{}
					}
					pre2 = &cp
				}
				got := fmt.Sprintf("%+v", durbinWatsonW(x, resid, wt, origin, pre))
				want := fmt.Sprintf("%+v", durbinWatsonWOracle(x, resid, wt, origin, pre2))
				if got != want {
					t.Fatalf("durbinWatsonW(x=%v, resid=%v, origin=%v, w=%v, pre=%+v): got %s, want %s", x, resid, origin, wt != nil, pre, got, want)
				}
			}
		}
	}
	bad := append([]float64(nil), x...)
	bad[0] = math.Inf(1)
	for _, tc := range []struct {
		x, y    []float64
		xu, yu  float64
		level   float64
		weights []float64
	}{
		{x, y, 0.01 * float64(k%7), 0.02 * float64(k%3), 0.95, nil},
		{x, y, 0.5, 0, 0.9, nil},
		{x, y, 5, 0.1, 0, nil},
		{x, y, math.NaN(), 0.1, 0.95, nil},
		{x, y, 0.1, -1, 0.95, nil},
		{x, y, 0.1, math.Inf(1), 0.95, nil},
		{bad, y, 0.1, 0.1, 0.95, nil},
		{x[:min(2, len(x))], y[:min(2, len(y))], 0.1, 0.1, 0.95, nil},
	} {
		gc, ga := XExactness(tc.x, tc.y, tc.xu, tc.yu, tc.level)
		oc, oa := xExactnessOracle(tc.x, tc.y, tc.xu, tc.yu, tc.level)
		if got, want := fmt.Sprintf("%+v %+v", gc, ga), fmt.Sprintf("%+v %+v", oc, oa); got != want {
			t.Fatalf("XExactness(x=%v, y=%v, %v, %v, %v): got %s, want %s", tc.x, tc.y, tc.xu, tc.yu, tc.level, got, want)
		}
	}
	// Durbin–Watson on invalid residuals (validated here) and weights.
	r := make([]float64, len(x))
	r[0] = math.NaN()
	if got, want := fmt.Sprintf("%+v", durbinWatsonW(x, r, nil, false, nil)), fmt.Sprintf("%+v", durbinWatsonWOracle(x, r, nil, false, nil)); got != want {
		t.Fatalf("durbinWatsonW(NaN residual): got %s, want %s", got, want)
	}
	if got, want := fmt.Sprintf("%+v", durbinWatsonW(x, y, []float64{-1}, false, &ckPre{residValid: true})), fmt.Sprintf("%+v", durbinWatsonWOracle(x, y, []float64{-1}, false, &ckPre{residValid: true})); got != want {
		t.Fatalf("durbinWatsonW(bad weights): got %s, want %s", got, want)
	}
}

// showSlip prints a slipped decimal (not its address).
func showSlip(s *SlippedDecimal) string {
	if s == nil {
		return "nil"
	}
	return fmt.Sprintf("%+v", *s)
}

func TestSplit2MatchesOracle(t *testing.T) {
	for n := range 40 {
		for _, flags := range []byte{0, 1, 2, 3, 4, 8, 12, 16, 32, 48, 64, 128, 192, 255, 17, 9, 5, 20, 24} {
			data := []byte{byte(n), flags, byte(37 * n), byte(n * n), 11, 200, 3, 90, 250, 1}
			split2All(t, data)
		}
	}
	// Durbin–Watson beyond DWExactMax readings, and far in the tail.
	for _, n := range []int{DWExactMax + 1, 300} {
		x, r := make([]float64, n), make([]float64, n)
		for i := range x {
			x[i] = float64(i)
			r[i] = math.Sin(float64(i) / 10)
		}
		for _, pre := range []*ckPre{nil, {residValid: true, quick: true}} {
			if got, want := fmt.Sprintf("%+v", durbinWatsonW(x, r, nil, false, pre)), fmt.Sprintf("%+v", durbinWatsonWOracle(x, r, nil, false, pre)); got != want {
				t.Fatalf("durbinWatsonW(n=%d): got %s, want %s", n, got, want)
			}
		}
	}
}

// FuzzSplit2MatchesOracle: curvatureGap, findSlip, XExactness and
// durbinWatsonW give the results of the bodies they were split from, bit
// for bit, on any readings splitCase builds.
func FuzzSplit2MatchesOracle(f *testing.F) {
	f.Add([]byte{10, 0, 1, 2, 3, 4})
	f.Add([]byte{30, 16, 200, 7, 1})
	f.Add([]byte{5, 255, 0})
	f.Fuzz(func(t *testing.T, data []byte) {
		split2All(t, data)
	})
}
