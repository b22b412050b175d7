package fitcore

import "math"

// DriftStepMin is the fewest calibrations for which Drift looks for a
// step, and DriftStepSide the fewest on each side of one. Six leave the
// line-plus-step model of the comparison (three parameters) at least three
// residual degrees of freedom, and two on a side give each level a scatter
// of its own (our choice).
const (
	DriftStepMin  = 6
	DriftStepSide = 2
)

// DriftStep is the best single step in one parameter over time: a constant
// level up to From, another from To on (From and To are consecutive
// distinct times of the calibrations). Drift fills it in whenever it can
// look for a step (at least DriftStepMin calibrations and a split with
// DriftStepSide on each side), whether or not the step is called: the
// verdict is DriftResult.Status (DriftShifted).
type DriftStep struct {
	// Before and After are the positions, in the order given to Drift, of
	// the last calibration at time From and the first at time To.
	Before, After   int
	From, To        float64
	NBefore, NAfter int

	// The weighted mean of each side and its standard error, and the step
	// After − Before with its standard error, on the step model's scale
	// Sigma (N − 2 degrees of freedom).
	LevelBefore, LevelBeforeSE float64
	LevelAfter, LevelAfterSE   float64
	Size, SizeSE               float64
	Sigma                      float64
	// BetterThanLine: the step leaves less scatter than the straight line
	// (Sigma below DriftResult.Sigma, both on N − 2 df). Without a called
	// step it says that a jump would explain the values at least as well
	// as the trend, which the data cannot tell apart (a hint, not a
	// verdict).
	BetterThanLine bool

	// Splits is how many places the step was looked for. F is the step
	// against one constant level (1 and N − 2 df), FOverTrend the step
	// added to the straight line (1 and N − 3 df); PRaw and POverTrendRaw
	// are their p at this one split, P and POverTrend the same multiplied
	// by Splits (Bonferroni, at most 1), which allow for the search.
	Splits                                int
	F, PRaw, P                            float64
	FOverTrend, POverTrendRaw, POverTrend float64
}

// driftStep looks for the best single step in v over t (weights and the
// fitted line in d, which has been fitted) and returns it, or nil when
// there are too few calibrations or no split with DriftStepSide on each
// side and three distinct times (with two, a step and a line are the same
// model). The sort is linear (a radix sort for large inputs, none when t
// is already in order: Drift's callers give the times in order) and so is
// the search.
//
// With u = t − t̄, e the line's residuals, z the indicator of the side
// after a split and W, W_a the sums of the weights over all and after it:
//
//	RSS_step = Σw(v−v̄)² − S_b²/W_b − S_a²/W_a   (S = Σw(v−v̄) per side)
//	RSS_line+step = RSS_line − E_a²/Q_a,  E_a = Σ_after w·e,
//	Q_a = W_a − W_a²/W − U_a²/Σwu²,  U_a = Σ_after w·u
//
// (the second by projecting z on the line's columns first: the
// Frisch–Waugh–Lovell theorem, e.g. Davidson & MacKinnon, "Econometric
// Theory and Methods", §2.4; from memory). The search needs only
// RSS_step, a difference of prefix sums over the sorted order, so every
// split costs O(1); the best split minimises it (ties: the earliest). At
// that split alone the levels, RSS_step and the line-plus-step fit (its
// residuals e − γ·z̃, γ = E_a/Q_a, z̃ the indicator's residual on the
// line's columns) are then worked out directly, in two passes, for their
// digits.
func (d *driftLine) driftStep(t, v []float64) *DriftStep {
	n := len(t)
	if n < DriftStepMin {
		return nil
	}
	var buf ckSortBuf
	ord := buf.order(t)
	// Prefix sums over the sorted order of w and w·(v−v̄); the search
	// needs no more.
	var sw, sv float64
	best, bestGain, splits := -1, math.Inf(-1), 0
	distinct := 1
	for j := 1; j < n; j++ {
		i := ord[j-1]
		dv := v[i] - d.vb
		sw += d.w[i]
		sv += d.w[i] * dv
		if t[ord[j]] == t[i] {
			continue
		}
		distinct++
		if j < DriftStepSide || n-j < DriftStepSide {
			continue
		}
		splits++
		// RSS_step = Σw(v−v̄)² − gain; Σw(v−v̄) over all is 0 up to
		// rounding, so S_a = −S_b.
		wa := d.sw - sw
		gain := sv * sv * d.sw / (sw * wa)
		if gain > bestGain {
			best, bestGain = j, gain
		}
	}
	if best < 0 || distinct < 3 {
		return nil
	}
	return d.stepAt(t, v, ord, best, splits)
}

// stepAt works out the step between sorted positions j−1 and j directly:
// the levels, their scale and standard errors, and the two F tests.
func (d *driftLine) stepAt(t, v []float64, ord []int32, j, splits int) *DriftStep {
	n := len(t)
	nf := float64(n)
	st := &DriftStep{NBefore: j, NAfter: n - j, Splits: splits,
		Before: int(ord[j-1]), After: int(ord[j]), From: t[ord[j-1]], To: t[ord[j]]}
	var wb, wa, mb, ma float64
	for k, i := range ord {
		if k < j {
			wb += d.w[i]
			mb += d.w[i] * (v[i] - d.vb)
		} else {
			wa += d.w[i]
			ma += d.w[i] * (v[i] - d.vb)
		}
	}
	mb, ma = mb/wb, ma/wa
	// Residual sums of squares: around one level, two levels, the line,
	// and the line with the step (e − γ·z̃, z̃ the indicator's residual on
	// the line's columns, γ = E_a/Q_a).
	var sst, rssStep, rssLine, ea, ua float64
	for k, i := range ord {
		dv := v[i] - d.vb
		e := dv - d.r*(t[i]-d.tb)
		sst += d.w[i] * dv * dv
		rssLine += d.w[i] * e * e
		m := mb
		if k >= j {
			m = ma
			ea += d.w[i] * e
			ua += d.w[i] * (t[i] - d.tb)
		}
		rssStep += d.w[i] * (dv - m) * (dv - m)
	}
	qa := wa - wa*wa/d.sw - ua*ua/d.stt
	var rssBoth float64
	if qa > 0 {
		g := ea / qa
		for k, i := range ord {
			u := t[i] - d.tb
			z := -wa/d.sw - ua/d.stt*u
			if k >= j {
				z++
			}
			e := v[i] - d.vb - d.r*u - g*z
			rssBoth += d.w[i] * e * e
		}
	}
	s2 := rssStep / (nf - 2)
	st.Sigma = math.Sqrt(s2)
	st.LevelBefore, st.LevelAfter = d.vb+mb, d.vb+ma
	st.LevelBeforeSE, st.LevelAfterSE = math.Sqrt(s2/wb), math.Sqrt(s2/wa)
	st.Size = ma - mb
	st.SizeSE = math.Sqrt(s2 * (1/wb + 1/wa))
	st.F = fRatio(sst-rssStep, rssStep/(nf-2))
	st.PRaw = lnFUpperP(st.F, 1, nf-2)
	st.FOverTrend = fRatio(rssLine-rssBoth, rssBoth/(nf-3))
	if !(qa > 0) {
		st.FOverTrend = 0
	}
	st.POverTrendRaw = lnFUpperP(st.FOverTrend, 1, nf-3)
	m := float64(splits)
	st.P, st.POverTrend = math.Min(1, m*st.PRaw), math.Min(1, m*st.POverTrendRaw)
	return st
}

// fRatio is num/den for an F statistic: 0 when num ≤ 0 (rounding in a
// difference of sums), math.MaxFloat64 for an exact fit (den = 0), as
// lnRatio keeps a perfect fit without a non-finite number.
func fRatio(num, den float64) float64 {
	if !(num > 0) {
		return 0
	}
	if !(den > 0) {
		return math.MaxFloat64
	}
	return math.Min(num/den, math.MaxFloat64)
}

// shifted sets BetterThanLine and gives the step verdict: the step leaves
// less scatter than the line, it is significant against one level
// (P < DriftAlpha) and it adds significantly to the line
// (POverTrend < DriftAlpha), both after the Bonferroni allowance for the
// search.
func (st *DriftStep) shifted(lineSigma float64) bool {
	if st == nil {
		return false
	}
	st.BetterThanLine = st.Sigma < lineSigma
	return st.BetterThanLine && st.P < DriftAlpha && st.POverTrend < DriftAlpha
}
