package fitcore

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
)

// DriftDraws is the number of simulated histories behind the p and the
// interval of DriftEstimated.
const DriftDraws = 999

// DriftSimulatedMax is the largest number of calibrations DriftEstimated
// simulates; past it the standard errors are taken as exact (Drift), so
// that the cost stays within DriftDraws × DriftSimulatedMax steps.
const DriftSimulatedMax = 2000

// DriftEstimated is Drift for standard errors that are themselves
// estimates: se[i] of calibration i comes from its own line, on df[i]
// degrees of freedom (a line fitted to m readings has m − 2), so that
// se[i]² scatters about the true variance σᵢ² as σᵢ²·χ²_df/df. Weighting
// by such se as if they were exact makes the t test of no drift claim
// more than it should: with 12 calibrations on 6 df each, Drift called
// 1.9 % of flat histories drifting at DriftAlpha = 1 % (simulation,
// TestDriftEstimatedRates).
//
// Everything but the rate's p and interval is Drift's. Those come from
// DriftDraws histories simulated under no drift from the calibrations as
// given: value vᵢ* = se[i]·z (z standard normal) and standard error
// seᵢ* = se[i]·√(χ²_df[i]/df[i]), the statistic T* = r*/se(r*) of each
// worked out exactly as Drift works out T = r/se(r) (a parametric
// bootstrap of the whole procedure; Davison & Hinkley, "Bootstrap Methods
// and their Application", 1997, §4.2, from memory). Then
//
//	P = (1 + #{|T*| ≥ |T|}) / (DriftDraws + 1),   rate ± q·se(r),
//
// (PBound when no |T*| reaches |T|: then p ≤ P = 1/(DriftDraws + 1)),
// q the level quantile of the |T*|, which also replaces Student's t in a
// limit crossing's interval. T is unchanged by the scale of se, so only
// the se relative to one another and their df matter. The draws are
// seeded by the number of calibrations, so the same history always gives
// the same verdict. With TestDriftEstimatedRates' 12 monthly calibrations
// (4,000 histories a case): flat ones called drifting in 1.1 % (Drift
// 1.9 %), drifts of 3 and 6 se a year in 43 and 95 % (Drift 53 and 97 %).
//
// df[i] must be positive; +Inf marks a standard error known exactly.
// When every df is +Inf, or there are more than DriftSimulatedMax
// calibrations, the result is Drift's (DriftResult.Simulated = 0).
func DriftEstimated(t, v, se, df []float64, level float64, lower, upper *float64) (*DriftResult, error) {
	if df == nil {
		// Not nil: drift then asks for one df per calibration, where nil
		// would quietly give Drift's t test.
		df = []float64{}
	}
	return drift(t, v, se, df, level, lower, upper)
}

// driftReference is the distribution of |T| under no drift, as the sorted
// absolute statistics of the simulated histories.
type driftReference struct {
	abs []float64
}

// p is the share of simulated |T*| at or beyond |t|, counting the
// observed history as one of them; bound is true when none of them
// reached |t| (p is then 1/(draws + 1), an upper bound).
func (r *driftReference) p(t float64) (p float64, bound bool) {
	if math.IsNaN(t) {
		return 1, false
	}
	// at is the first position holding |t| or more (the NaNs sort first).
	at, hi, abs := 0, len(r.abs), math.Abs(t)
	for at < hi {
		m := int(uint(at+hi) >> 1)
		if a := r.abs[m]; a < abs || a != a {
			at = m + 1
		} else {
			hi = m
		}
	}
	return float64(1+len(r.abs)-at) / float64(len(r.abs)+1), at == len(r.abs)
}

// quantile is the level quantile of |T*| (the smallest simulated value
// with at least that share at or below it).
func (r *driftReference) quantile(level float64) float64 {
	level = levelOrDefault(level)
	k := int(math.Ceil(level*float64(len(r.abs)))) - 1
	return r.abs[min(max(k, 0), len(r.abs)-1)]
}

// driftReferenceFor simulates the reference of DriftEstimated for the
// times t, standard errors se and their degrees of freedom df, with w =
// 1/se² already worked out by driftSums. It is nil for Drift (df nil),
// when every se is exact, and past DriftSimulatedMax calibrations.
func driftReferenceFor(t, se, df, w []float64) (*driftReference, error) {
	if df == nil {
		return nil, nil
	}
	estimated := false
	for i, d := range df {
		if !(d > 0) {
			return nil, fmt.Errorf("drift: calibration %d has %g degrees of freedom for its standard error; it needs more than 0 (+Inf when the standard error is exact)", i+1, d)
		}
		estimated = estimated || !math.IsInf(d, 1)
	}
	if !estimated || len(t) > DriftSimulatedMax {
		return nil, nil
	}
	return driftSimulate(t, se, df, w, DriftDraws, uint64(len(t))), nil
}

// driftSimulate draws the reference from draws histories, the generator
// seeded by seed.
func driftSimulate(t, se, df, w []float64, draws int, seed uint64) *driftReference {
	n := len(t)
	rng := rand.New(rand.NewPCG(0x7061_6972_6c69_6e65, seed))
	vs, ws := make([]float64, n), make([]float64, n)
	ref := &driftReference{abs: make([]float64, draws)}
	for b := range ref.abs {
		for i := range vs {
			vs[i] = se[i] * rng.NormFloat64()
			ws[i] = w[i]
			if !math.IsInf(df[i], 1) {
				ws[i] = w[i] * df[i] / chiSquaredDraw(rng, df[i])
			}
		}
		ref.abs[b] = math.Abs(driftT(t, vs, ws))
	}
	// (A NaN, from a degenerate draw, sorts first and so never counts as
	// beyond the observed |T|.)
	//lint:ignore S1032 sort.Float64s is slices.Sort, a generic sort of its own in app.wasm
	sort.Sort(sort.Float64Slice(ref.abs))
	return ref
}

// driftT is the t statistic r/se(r) of the weighted line v = a + r·t with
// weights w, worked out by driftLine.fit as Drift works it out (s² =
// Σw e²/(N−2)); NaN when t has no spread.
func driftT(t, v, w []float64) float64 {
	var sw, swt, swv float64
	for i := range t {
		sw += w[i]
		swt += w[i] * t[i]
		swv += w[i] * v[i]
	}
	d := driftLine{w: w, sw: sw, tb: swt / sw, vb: swv / sw}
	if d.fit(t, v) != nil {
		return math.NaN()
	}
	return lnRatio(d.r, math.Sqrt(d.s2/d.stt))
}

// chiSquaredDraw draws from χ² with k > 0 degrees of freedom as 2·G, G
// from the gamma distribution of shape k/2 and scale 1 by Marsaglia and
// Tsang's method ("A simple method for generating gamma variables", ACM
// TOMS 26(3), 2000, from memory); for a shape below 1, G = G'·U^{1/a}
// with G' of shape a + 1 (their §6).
func chiSquaredDraw(rng *rand.Rand, k float64) float64 {
	a := k / 2
	boost := 1.0
	if a < 1 {
		boost = math.Pow(rng.Float64(), 1/a)
		a++
	}
	d := a - 1.0/3
	c := 1 / math.Sqrt(9*d)
	for {
		x := rng.NormFloat64()
		v := 1 + c*x
		if v <= 0 {
			continue
		}
		v = v * v * v
		u := rng.Float64()
		if u < 1-0.0331*x*x*x*x || math.Log(u) < x*x/2+d*(1-v+math.Log(v)) {
			return 2 * d * v * boost
		}
	}
}
