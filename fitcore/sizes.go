package fitcore

import "math"

// Departures gives the size of a departure from the straight line in the
// technician's units, beside the tests' p values: a tiny p on very precise
// readings can go with a bend far too small to matter.
type Departures struct {
	// CurvatureGap is the largest |q(x) − l(x)| for x inside the range of
	// the readings, with q the least-squares quadratic and l the line (same
	// weights), in y units of the fitted scale; CurvatureGapPercent is it
	// as a percentage of the line's span over the range, |l(x_max) − l(x_min)|
	// (0 when the span is 0).
	CurvatureGap        float64 `json:"curvature_gap"`
	CurvatureGapPercent float64 `json:"curvature_gap_percent"`
}

// curvatureGap computes Departures' curvature figures. q − l is a
// quadratic in x, so its largest magnitude on [lo, hi] is at an end or at
// its vertex. ok is false when the quadratic cannot be fitted (fewer than 3
// distinct x, or a singular system).
func curvatureGap(x, y, w []float64, origin bool) (gap, pct float64, ok bool) {
	b0, b1, okl := ckLineCoef(x, y, w, origin)
	if !okl || len(x) < 3 {
		return 0, 0, false
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
			return 0, 0, false
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
	if !ckFinite(gap) || !ckFinite(pct) {
		return 0, 0, false
	}
	return gap, pct, true
}
