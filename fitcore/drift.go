package fitcore

import (
	"errors"
	"fmt"
	"math"
)

// MaxDriftPoints is the largest number of calibrations Drift accepts; its
// cost is linear in the number.
const MaxDriftPoints = 100_000

// DriftAlpha is the significance level of Drift's verdicts: "drifting" when
// the p for rate = 0 is below DriftAlpha, "shifted" when both p of the step
// (after the allowance for the search) are.
const DriftAlpha = 0.01

// Drift statuses and verdicts. DriftShifted: the parameter jumped once,
// between two calibrations, and was level before and after (DriftResult.Step
// says where and by how much); a straight line through such values is not a
// trend and is not projected.
const (
	DriftTooFew   = "too few calibrations"
	DriftSteady   = "steady"
	DriftDrifting = "drifting"
	DriftShifted  = "shifted"
)

// LimitCrossing is the projected time at which the fitted trend leaves a
// limit. At is where the fitted line crosses Limit; [Low, High] is where the
// two edges of the confidence band of the trend line cross it (the
// band-inversion interval, as for an inverse prediction). When the trend is
// not significant at the level, the band never leaves the limit on one side
// and Bounded is false: Low and High are then 0 and must not be shown.
type LimitCrossing struct {
	Side    string  `json:"side"` // "lower" or "upper"
	Limit   float64 `json:"limit"`
	At      float64 `json:"at"`
	Low     float64 `json:"low"`
	High    float64 `json:"high"`
	Bounded bool    `json:"bounded"`
}

// DriftResult is the trend of one calibration parameter over time.
type DriftResult struct {
	N      int
	Status string // DriftTooFew, DriftSteady, DriftDrifting or DriftShifted

	Rate, RateSE, RateLow, RateHigh float64 // change per unit of t (per year when t is in years)
	P                               float64 // two-sided p for rate = 0, t with N − 2 df (or simulated, below)
	Intercept, InterceptSE          float64 // fitted value at t = 0
	MeanT                           float64 // weighted mean time
	Sigma                           float64 // residual scale s (1 when the se are exact)
	Level                           float64
	// Simulated is the number of simulated histories P and the rate's
	// interval (and a crossing's) come from (DriftEstimated, the standard
	// errors being estimates); 0 when they come from Student's t. PBound
	// says that none of them reached the observed statistic: P is then
	// 1/(Simulated + 1) and only a bound, p ≤ P.
	Simulated int
	PBound    bool

	// Leaves is the first limit the trend reaches after the last time, or
	// nil; always nil when Status is DriftShifted (there is no trend to
	// carry on).
	Leaves *LimitCrossing

	// Step is the best single step (see DriftStep), or nil when Drift
	// cannot look for one. It is filled in whether or not it is called;
	// Status DriftShifted says it is. The rate and the other figures above
	// stay those of the straight line, which for a step describe no trend.
	Step *DriftStep
}

// Drift fits the weighted least-squares line v = a + r·t with weights
// w = 1/se² (the parameter's standard error at each calibration), as R's
// lm(v ~ t, weights = 1/se^2):
//
//	t̄ = Σwt/Σw,  r = Σw(t−t̄)(v−v̄)/Σw(t−t̄)²,  s² = Σw e²/(N−2),
//	se(r) = s/√Σw(t−t̄)²,  se(a) = s·√(1/Σw + t̄²/Σw(t−t̄)²)
//
// (weighted least squares, e.g. Draper & Smith, "Applied Regression
// Analysis", §9; from memory). The interval is r ± t_{1−α/2,N−2}·se(r) and
// P is the two-sided t test of r = 0. The scale s is estimated as lm does,
// so the se need only be right relative to one another; when they are
// themselves estimates from a few readings each, DriftEstimated allows
// for that.
//
// With lower and/or upper limits (nil = none) the projected crossing is the
// first limit the fitted line reaches after the last time: At = t̄ + (L − v̄)/r.
// Its interval solves (L − v̄ − r·u)² = k·(1/Σw + u²/Σw(t−t̄)²), u = t − t̄,
// k = t²_{1−α/2}·s², where the band of the fitted line meets L (common
// practice, the same inversion as an inverse prediction's interval).
//
// Fewer than 3 calibrations give Status DriftTooFew and nothing else.
//
// A step is looked for with DriftStepMin calibrations or more (driftStep):
// the best split into a constant level before and another after, over
// every split between consecutive distinct times with DriftStepSide
// calibrations on each side. With RSS the weighted residual sum of squares
// of a model, the two F tests are
//
//	F = (RSS_level − RSS_step)/(RSS_step/(N−2))                on 1, N−2 df
//	F_over_line = (RSS_line − RSS_line+step)/(RSS_line+step/(N−3)) on 1, N−3 df
//
// (nested models, Draper & Smith §6; from memory). The split is chosen
// from the data, so each p is multiplied by the number of splits searched
// (Bonferroni): under flat values, or a straight line, with normal errors
// each split's F has its exact F distribution, and the bound keeps the
// chance of a false step at or below DriftAlpha whatever the times and
// weights, where a critical value simulated for one design would not carry
// over to another. It is conservative, the splits' F being correlated, but
// little at this level: for 12 equally spaced, equally weighted
// calibrations the 99th percentile of the largest F over the line among
// the 9 splits is 21.9 by simulation (200,000 trials, measured once; see
// DEVELOPERS.md) against Bonferroni's 22.1, that of the largest F against
// one level 19.6 against 20.4.
// Status is DriftShifted, in place of DriftDrifting or DriftSteady, when
// the step leaves less scatter than the line (its s is smaller, both on
// N − 2 df) and both adjusted p are below DriftAlpha: the step explains
// the values clearly better than the trend and is itself significant. A
// step on top of a real trend is called by whichever explains more; the
// trend after a step is not worked out.
//
// The stages: the weights and weighted means (driftSums), the line and
// its scale (fit), the results with their interval and verdict (report),
// the best step and its verdict (driftStep), then the first limit the line
// leaves (leaves). The cost is linear in N (driftStep's sort included).
func Drift(t, v, se []float64, level float64, lower, upper *float64) (*DriftResult, error) {
	return drift(t, v, se, nil, level, lower, upper)
}

// drift is Drift, and DriftEstimated when df is not nil: then the rate's
// p and interval come from simulated histories (driftReference) instead
// of Student's t.
func drift(t, v, se, df []float64, level float64, lower, upper *float64) (*DriftResult, error) {
	if len(t) != len(v) || len(t) != len(se) {
		return nil, errors.New("drift: times, values and standard errors must have the same length")
	}
	if df != nil && len(df) != len(t) {
		return nil, fmt.Errorf("drift: one number of degrees of freedom is needed for each calibration's standard error (%d given for %d calibrations)", len(df), len(t))
	}
	if len(t) > MaxDriftPoints {
		return nil, fmt.Errorf("drift: at most %d calibrations", MaxDriftPoints)
	}
	level = levelOrDefault(level)
	res := &DriftResult{N: len(t), Level: level}
	if len(t) < 3 {
		res.Status = DriftTooFew
		return res, nil
	}
	d, err := driftSums(t, v, se)
	if err != nil {
		return nil, err
	}
	if err := d.fit(t, v); err != nil {
		return nil, err
	}
	ref, err := driftReferenceFor(t, se, df, d.w)
	if err != nil {
		return nil, err
	}
	d.report(res, level, float64(len(t)-2), ref)
	res.Step = d.driftStep(t, v)
	if res.Step.shifted(res.Sigma) {
		res.Status = DriftShifted
		return res, nil
	}
	res.Leaves = d.leaves(lower, upper)
	return res, nil
}

// driftLine is the weighted fit of Drift as it is built: the weights w,
// Σw, the weighted means t̄ and v̄, the last time, Σw(t−t̄)², the rate r,
// s², and k = t²·s² for the crossings.
type driftLine struct {
	w                []float64
	sw, tb, vb, tmax float64
	stt, r, s2, k    float64
}

// driftSums checks every calibration and works out the weights, Σw and
// the weighted means of t and v.
func driftSums(t, v, se []float64) (*driftLine, error) {
	var sw, swt, swv, tmax float64
	tmax = math.Inf(-1)
	w := make([]float64, len(t))
	for i := range t {
		if !finiteWithin(t[i]) || !finiteWithin(v[i]) || !finiteWithin(se[i]) || !(se[i] > 0) {
			return nil, fmt.Errorf("drift: calibration %d has a time, value or standard error that is not a finite positive-se number (t=%g, value=%g, se=%g)", i+1, t[i], v[i], se[i])
		}
		w[i] = 1 / (se[i] * se[i])
		if math.IsInf(w[i], 0) {
			return nil, fmt.Errorf("drift: calibration %d has a standard error too small to weight (%g)", i+1, se[i])
		}
		sw += w[i]
		swt += w[i] * t[i]
		swv += w[i] * v[i]
		tmax = math.Max(tmax, t[i])
	}
	return &driftLine{w: w, sw: sw, tb: swt / sw, vb: swv / sw, tmax: tmax}, nil
}

// fit works out Σw(t−t̄)², the rate r and s² = Σw e²/(N−2); the dates must
// not all be the same.
func (d *driftLine) fit(t, v []float64) error {
	var stt, stv float64
	for i := range t {
		dt := t[i] - d.tb
		stt += d.w[i] * dt * dt
		stv += d.w[i] * dt * (v[i] - d.vb)
	}
	if !(stt > 0) {
		return errors.New("drift: the calibrations need at least two different dates")
	}
	r := stv / stt
	var sse float64
	for i := range t {
		e := v[i] - d.vb - r*(t[i]-d.tb)
		sse += d.w[i] * e * e
	}
	d.stt, d.r = stt, r
	d.s2 = sse / float64(len(t)-2)
	return nil
}

// report writes the rate, intercept, their standard errors, the interval
// of the rate at the level (df degrees of freedom, or the simulated
// reference ref when it is not nil), its p and the verdict into res.
func (d *driftLine) report(res *DriftResult, level, df float64, ref *driftReference) {
	r, s2, tb := d.r, d.s2, d.tb
	res.Sigma = math.Sqrt(s2)
	res.Rate = r
	res.RateSE = math.Sqrt(s2 / d.stt)
	res.MeanT = tb
	res.Intercept = d.vb - r*tb
	res.InterceptSE = math.Sqrt(s2 * (1/d.sw + tb*tb/d.stt))
	var tc float64
	if ref != nil {
		tc = ref.quantile(level)
		res.P, res.PBound = ref.p(lnRatio(r, res.RateSE))
		res.Simulated = len(ref.abs)
	} else {
		tc = lnTCrit(level, df)
		res.P = lnTwoSidedP(lnRatio(r, res.RateSE), df)
	}
	res.RateLow, res.RateHigh = r-tc*res.RateSE, r+tc*res.RateSE
	res.Status = DriftSteady
	if res.P < DriftAlpha {
		res.Status = DriftDrifting
	}
	d.k = tc * tc * s2
}

// leaves returns the first limit the line reaches after the last time:
// the lower one when it falls, the upper one when it rises (nil: none).
func (d *driftLine) leaves(lower, upper *float64) *LimitCrossing {
	var best *LimitCrossing
	if lower != nil && d.r < 0 {
		best = d.cross("lower", *lower)
	}
	if upper != nil && d.r > 0 {
		if c := d.cross("upper", *upper); c != nil && (best == nil || c.At < best.At) {
			best = c
		}
	}
	return best
}

// cross is where the line meets lim, with the band-inversion interval
// documented on Drift, or nil when it does not meet it after the last
// time.
func (d *driftLine) cross(side string, lim float64) *LimitCrossing {
	r, tb, vb := d.r, d.tb, d.vb
	if r == 0 {
		return nil
	}
	at := tb + (lim-vb)/r
	if !(at > d.tmax) {
		return nil
	}
	c := &LimitCrossing{Side: side, Limit: lim, At: at}
	dl := lim - vb
	a := r*r - d.k/d.stt
	b := -2 * r * dl
	cc := dl*dl - d.k/d.sw
	disc := b*b - 4*a*cc
	if a > 0 && disc >= 0 {
		q := math.Sqrt(disc)
		u1, u2 := (-b-q)/(2*a), (-b+q)/(2*a)
		c.Low, c.High, c.Bounded = tb+math.Min(u1, u2), tb+math.Max(u1, u2), true
	}
	return c
}

func finiteWithin(v float64) bool {
	return !math.IsNaN(v) && math.Abs(v) <= MaxMagnitude
}
