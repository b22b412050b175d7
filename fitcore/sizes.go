package fitcore

import (
	"pairline/app/numfmt"

	"fmt"
	"math"
)

// Departures gives the size of each departure from the straight line in the
// technician's units, beside the tests' p values: a tiny p on very precise
// readings can go with a bend, a change of scatter or a drift far too small
// to matter. A Fail needs both: the evidence (p below CheckFailP) and a
// size at or above its threshold (CurvatureSizeSD or CurvatureSizeAllowed,
// ScatterSizeRatio, DriftSizeSD); otherwise the assumption is at most a
// Check (warning) and its message says the effect is clear but small in
// units. A size that could not be computed (Known… false) leaves the
// evidence alone to decide.
type Departures struct {
	// CurvatureGap is the largest |q(x) − l(x)| for x inside the range of
	// the readings, with q the least-squares quadratic and l the line (same
	// weights), in y units of the fitted scale; CurvatureGapPercent is it
	// as a percentage of the line's span over the range, |l(x_max) − l(x_min)|
	// (0 when the span is 0).
	CurvatureGap        float64 `json:"curvature_gap"`
	CurvatureGapPercent float64 `json:"curvature_gap_percent"`
	// CurvatureGapSD is CurvatureGap in residual SDs of the quadratic,
	// √(Σw·(y − q)²/(n − 3)) (the scatter without the bend; 0 when the
	// quadratic fits exactly or n = 3).
	CurvatureGapSD float64 `json:"curvature_gap_sd"`
	// CurvatureGapOfAllowed is CurvatureGap as a fraction of the largest
	// residual the acceptance criteria allow (Criteria.MaxResidual, in y
	// units or as % of the span of y); 0 when no such criterion is set or
	// the line is fitted on a transformed scale.
	CurvatureGapOfAllowed float64 `json:"curvature_gap_of_allowed,omitempty"`
	// ScatterLow, ScatterMid and ScatterHigh are the root-mean-square
	// residuals of the readings in the lower, middle and upper third of the
	// range of x (fitted scale; for a weighted fit the weighted residuals
	// √w·e), 0 for a third with fewer than 2 readings. ScatterRatio is
	// ScatterHigh/ScatterLow (how the scatter at the top compares with the
	// bottom) and ScatterSpread the largest of the three over the smallest
	// (the size the spread rule uses, so that a bulge in the middle counts
	// too); both 0 when fewer than two thirds have 2 readings.
	ScatterLow    float64 `json:"scatter_low"`
	ScatterMid    float64 `json:"scatter_mid"`
	ScatterHigh   float64 `json:"scatter_high"`
	ScatterRatio  float64 `json:"scatter_ratio"`
	ScatterSpread float64 `json:"scatter_spread"`
	// Drift is the change in the level of the residuals from the first to
	// the last reading in entry order, in residual SDs: the slope of the
	// (weighted) residuals on the reading's position i = 0…n−1, times n − 1,
	// over the residual SD √(Σw·e²/(n − p)). Signed (positive: the readings
	// rise above the line as the record goes on).
	Drift float64 `json:"drift_sd"`
	// KnownCurvature, KnownScatter and KnownDrift say the size was
	// computed; Curvature, Scatter and DriftMatters whether it is at or
	// above its threshold.
	KnownCurvature   bool `json:"known_curvature"`
	KnownScatter     bool `json:"known_scatter"`
	KnownDrift       bool `json:"known_drift"`
	CurvatureMatters bool `json:"curvature_matters"`
	ScatterMatters   bool `json:"scatter_matters"`
	DriftMatters     bool `json:"drift_matters"`
}

// The practical sizes a Fail needs besides its p (common practice: a
// departure smaller than the scatter itself, or than half the tolerance the
// user set, does not change a result read from the line; a scatter that
// differs by less than a factor 2 between parts of the range changes a ±
// figure by less than that factor; a drift of less than one SD over the
// record is within the scatter of a single reading).
const (
	// CurvatureSizeSD: without acceptance criteria a bend matters when
	// CurvatureGap exceeds this many residual SDs of the quadratic.
	CurvatureSizeSD = 1.0
	// CurvatureSizeAllowed: with Criteria.MaxResidual a bend matters when
	// CurvatureGap exceeds this fraction of the allowed residual.
	CurvatureSizeAllowed = 0.5
	// ScatterSizeRatio: a change of scatter matters when ScatterSpread is
	// at least this.
	ScatterSizeRatio = 2.0
	// DriftSizeSD: a drift matters when |Drift| is at least this.
	DriftSizeSD = 1.0
)

// depParts says which of the sizes departuresOf works out; xRange, when
// set, gives rangeOf of x (from what an analysis keeps about its x).
type depParts struct {
	curvature, scatter, drift bool
	xRange                    func([]float64) (lo, hi float64)
}

var depAll = depParts{curvature: true, scatter: true, drift: true}

// departuresOf computes the sizes for the fit of yt on xt (fitted scale)
// with residuals e and weights w (nil when unweighted), only the parts
// asked for (depAll: every one; the fields of the others stay zero, Known…
// false). allowed is the largest residual the acceptance criteria allow in
// y units of the fitted scale (0: none).
func departuresOf(xt, yt, e, w []float64, origin bool, allowed float64, parts depParts) *Departures {
	d := &Departures{}
	if parts.curvature {
		d.curvature(xt, yt, w, origin, allowed)
	}
	var k float64 // the scale of the Pearson residuals, shared by both
	if parts.scatter || parts.drift {
		k = sizesScale(e, w)
	}
	if parts.scatter {
		rng := parts.xRange
		if rng == nil {
			rng = rangeOf
		}
		d.scatterThirds(xt, e, w, k, rng)
	}
	np := 2
	if origin {
		np = 1
	}
	if parts.drift {
		d.drift(e, w, np, k)
	}
	if !ckFinite(d.CurvatureGapSD) || !ckFinite(d.CurvatureGapOfAllowed) {
		d.CurvatureGapSD, d.CurvatureGapOfAllowed = 0, 0
	}
	return d
}

// curvature sets the Curvature… fields from curvatureGap.
func (d *Departures) curvature(xt, yt, w []float64, origin bool, allowed float64) {
	g, pc, sq, ok := curvatureGap(xt, yt, w, origin)
	if !ok {
		return
	}
	d.CurvatureGap, d.CurvatureGapPercent, d.KnownCurvature = g, pc, true
	if sq > 0 {
		d.CurvatureGapSD = g / sq
	}
	if allowed > 0 {
		d.CurvatureGapOfAllowed = g / allowed
		d.CurvatureMatters = g > CurvatureSizeAllowed*allowed
	} else {
		d.CurvatureMatters = (sq == 0 && g > 0) || g > CurvatureSizeSD*sq
	}
}

// sizesPearson returns √w_i·e_i divided by k, with k = max|√w·e| (so that
// squares neither overflow nor underflow), and k itself.
func sizesPearson(e, w []float64, i int, k float64) float64 {
	v := e[i]
	if w != nil {
		v *= math.Sqrt(w[i])
	}
	return v / k
}

func sizesScale(e, w []float64) float64 {
	var k float64
	for i := range e {
		k = max(k, math.Abs(sizesPearson(e, w, i, 1)))
	}
	return k
}

// scatterThirds sets the Scatter… fields: thirds of the range of x by
// value, lo + (hi − lo)/3 and lo + 2(hi − lo)/3 the boundaries (a reading
// on a boundary counts in the lower part).
//
// k is sizesScale(e, w) and rng is rangeOf (or gives what it gives).
func (d *Departures) scatterThirds(x, e, w []float64, k float64, rng func([]float64) (lo, hi float64)) {
	if !(k > 0) || !ckFinite(k) {
		return
	}
	lo, hi := rng(x)
	if !(hi > lo) {
		return
	}
	c1, c2 := lo+(hi-lo)/3, lo+2*(hi-lo)/3
	var ss [3]float64
	var nn [3]int
	for i, v := range x {
		j := 2
		if v <= c1 {
			j = 0
		} else if v <= c2 {
			j = 1
		}
		r := sizesPearson(e, w, i, k)
		ss[j] += r * r
		nn[j]++
	}
	var rms [3]float64
	big, small, parts := 0.0, math.Inf(1), 0
	for j := range 3 {
		if nn[j] < 2 {
			continue
		}
		rms[j] = math.Sqrt(ss[j] / float64(nn[j]))
		big, small = max(big, rms[j]), min(small, rms[j])
		parts++
	}
	d.ScatterLow, d.ScatterMid, d.ScatterHigh = rms[0]*k, rms[1]*k, rms[2]*k
	if parts < 2 {
		return
	}
	d.KnownScatter = true
	switch {
	case small > 0:
		d.ScatterSpread = big / small
		d.ScatterMatters = d.ScatterSpread >= ScatterSizeRatio
	case big > 0:
		// One part without scatter at all and another with: as uneven as
		// it gets (the ratio itself is not finite and is not shown).
		d.ScatterMatters = true
	}
	if rms[0] > 0 && rms[2] > 0 {
		d.ScatterRatio = rms[2] / rms[0]
	}
}

// drift sets Drift and DriftMatters from the (weighted) residuals in entry
// order; k is sizesScale(e, w).
func (d *Departures) drift(e, w []float64, np int, k float64) {
	n := len(e)
	if n-np < 1 || n < 3 || !(k > 0) || !ckFinite(k) {
		return
	}
	mi := float64(n-1) / 2
	var sr, sir, sii, srr float64
	for i := range e {
		r := sizesPearson(e, w, i, k)
		di := float64(i) - mi
		sr += r
		sir += di * r
		sii += di * di
		srr += r * r
	}
	s := math.Sqrt(srr / float64(n-np))
	if !(s > 0) {
		return
	}
	d.Drift = sir / sii * float64(n-1) / s
	if !ckFinite(d.Drift) {
		d.Drift = 0
		return
	}
	d.KnownDrift = true
	d.DriftMatters = math.Abs(d.Drift) >= DriftSizeSD
}

// curvatureGap computes Departures' curvature figures and the residual SD
// of the quadratic, sq (0 when n = 3). q − l is a quadratic in x, so its
// largest magnitude on [lo, hi] is at an end or at its vertex. ok is false
// when the quadratic cannot be fitted (fewer than 3 distinct x, or a
// singular system).
func curvatureGap(x, y, w []float64, origin bool) (gap, pct, sq float64, ok bool) {
	b0, b1, okl := ckLineCoef(x, y, w, origin)
	if !okl || len(x) < 3 {
		return 0, 0, 0, false
	}
	lo, hi, m := curvRangeMean(x, w)
	q0, q1, q2, okq := curvQuadratic(x, y, w, m)
	if !okq {
		return 0, 0, 0, false
	}
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
		sq = curvScatter(x, y, w, m, q0, q1, q2)
	}
	if !ckFinite(gap) || !ckFinite(pct) || !ckFinite(sq) {
		return 0, 0, 0, false
	}
	return gap, pct, sq, true
}

// curvRangeMean is the range of x and its weighted mean m = Σwx/Σw.
func curvRangeMean(x, w []float64) (lo, hi, m float64) {
	lo, hi = x[0], x[0]
	var sw, swx float64
	for i, v := range x {
		lo, hi = ckMin(lo, v), ckMax(hi, v)
		sw += ckW(w, i)
		swx += ckW(w, i) * v
	}
	return lo, hi, swx / sw
}

// curvQuadratic fits y = q0 + q1·u + q2·u², u = x − m, by weighted least
// squares: the normal equations solved by Gauss–Jordan elimination with
// partial pivoting; ok is false when a pivot is negligible (below 1e-13 of
// the size of the equations).
func curvQuadratic(x, y, w []float64, m float64) (q0, q1, q2 float64, ok bool) {
	// Normal equations of y = a0 + a1·u + a2·u², u = x − m (with origin the
	// line has no intercept but the quadratic's gap is judged the same way).
	var s [5]float64
	var t [3]float64
	// The powers p = w·u^k, k = 0 … 4, and their sums, written out (the
	// same products and sums, in the same order, as a loop over k).
	s0, s1, s2, s3, s4 := s[0], s[1], s[2], s[3], s[4]
	t0, t1, t2 := t[0], t[1], t[2]
	y = y[:len(x)]
	for i, v := range x {
		u := v - m
		yi := y[i]
		p := 1.0
		if w != nil {
			p = w[i]
		}
		s0 += p
		t0 += p * yi
		p *= u
		s1 += p
		t1 += p * yi
		p *= u
		s2 += p
		t2 += p * yi
		p *= u
		s3 += p
		p *= u
		s4 += p
	}
	s = [5]float64{s0, s1, s2, s3, s4}
	t = [3]float64{t0, t1, t2}
	a := [3][4]float64{{s[0], s[1], s[2], t[0]}, {s[1], s[2], s[3], t[1]}, {s[2], s[3], s[4], t[2]}}
	tiny := 1e-13 * math.Abs(s[0]+s[2]+s[4])
	for c := range 3 {
		if !curvEliminate(&a, c, tiny) {
			return 0, 0, 0, false
		}
	}
	return a[0][3] / a[0][0], a[1][3] / a[1][1], a[2][3] / a[2][2], true
}

// curvEliminate is one column c of Gauss–Jordan elimination on the
// augmented 3×4 system a: the largest pivot is swapped up and column c is
// cleared from the other rows; false when the pivot is zero or below tiny.
func curvEliminate(a *[3][4]float64, c int, tiny float64) bool {
	piv := c
	for r := c + 1; r < 3; r++ {
		if math.Abs(a[r][c]) > math.Abs(a[piv][c]) {
			piv = r
		}
	}
	a[c], a[piv] = a[piv], a[c]
	if a[c][c] == 0 || math.Abs(a[c][c]) < tiny {
		return false
	}
	for r := range 3 {
		if r != c {
			f := a[r][c] / a[c][c]
			for k := c; k < 4; k++ {
				a[r][k] -= f * a[c][k]
			}
		}
	}
	return true
}

// curvScatter is the residual scale of the quadratic, √(Σw r²/(n − 3)).
func curvScatter(x, y, w []float64, m, q0, q1, q2 float64) float64 {
	var sse float64
	for i, v := range x {
		u := v - m
		r := y[i] - (q0 + q1*u + q2*u*u)
		sse += ckW(w, i) * r * r
	}
	return math.Sqrt(sse / float64(len(x)-3))
}

// The sentences of an assumption whose Fail was turned into a Check
// because its size is below the threshold.
func (d *Departures) smallCurvature() string {
	if d == nil || !d.KnownCurvature || d.CurvatureMatters {
		return ""
	}
	if d.CurvatureGapOfAllowed > 0 {
		return fmt.Sprintf("The bend is statistically clear but small in units: the curve and the line differ by at most %s, %s %% of the largest residual allowed (a Fail needs more than %g %%).",
			ckG2(d.CurvatureGap), ckG2(100*d.CurvatureGapOfAllowed), 100*CurvatureSizeAllowed)
	}
	return fmt.Sprintf("The bend is statistically clear but small in units: the curve and the line differ by at most %s, %s residual SDs (a Fail needs more than %g).",
		ckG2(d.CurvatureGap), ckG2(d.CurvatureGapSD), CurvatureSizeSD)
}

func (d *Departures) smallScatter() string {
	if d == nil || !d.KnownScatter || d.ScatterMatters {
		return ""
	}
	return fmt.Sprintf("The change of scatter is statistically clear but small in units: the scatter in the widest third of the range is %s times that in the narrowest (a Fail needs %g times or more).",
		ckG2(d.ScatterSpread), ScatterSizeRatio)
}

func (d *Departures) smallDrift() string {
	if d == nil || !d.KnownDrift || d.DriftMatters {
		return ""
	}
	return fmt.Sprintf("The pattern is statistically clear but small in units: the level of the residuals changes by %s residual SDs from the first reading to the last (a Fail needs %g or more).",
		ckG2(math.Abs(d.Drift)), DriftSizeSD)
}

// ckG2 writes a size with two significant digits (numfmt.Short).
func ckG2(v float64) string { return numfmt.Short(v, 2) }

// sizeCapped lowers Fail to Warn in the given checks (their p is kept).
func sizeCapped(cs ...*Check) {
	for _, c := range cs {
		if c != nil && c.Verdict == Fail {
			c.Verdict = Warn
		}
	}
}
