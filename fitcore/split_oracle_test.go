package fitcore

import (
	"errors"
	"fmt"
	"math"
	"math/bits"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// The functions below are influenceRun, adTry, Drift and checkAcceptance
// as they were before each was split into named stages (cyclomatic
// complexity 31, 29, 26 and 26), kept unchanged as the oracles of
// TestSplitMatchesOracle and FuzzSplitMatchesOracle: the split versions
// must give the same results bit for bit (Drift's step, added after the
// split, aside: see sameDrift).

// influenceRunOracle is influenceRun before the split.
func influenceRunOracle(x, resid, w []float64, origin, valid, keep bool) (out []PointInfluence, masks []uint8) {
	if !valid && ckValidate(x, resid, w, "residual") != "" {
		return nil, nil
	}
	n := len(x)
	p := 2
	if origin {
		p = 1
	}
	if n <= p {
		return nil, nil
	}
	lev, ok := ckNewLeverage(x, w, origin)
	if !ok {
		return nil, nil
	}
	nf, pf := float64(n), float64(p)
	// r_i = √w_i·e_i, evaluated where needed.
	rAt := func(i int) float64 {
		if w == nil {
			return resid[i]
		}
		return math.Sqrt(w[i]) * resid[i]
	}
	var big float64
	for i := range resid {
		big = max(big, math.Abs(rAt(i)))
	}
	// Work with r scaled by its largest magnitude so S cannot overflow.
	var sse float64
	if big > 0 {
		for i := range resid {
			v := rAt(i) / big
			sse += v * v
		}
	}
	dfRes := nf - pf
	s2 := sse / dfRes
	dfDel := dfRes - 1
	var tdist distuv.StudentsT
	// Below |t| = tOne the Bonferroni p, n·2·P(T > |t|), is at least 1 and
	// so exactly 1 after capping: skip the incomplete-beta call there.
	tOne := 0.0
	if dfDel >= 1 {
		tdist = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: dfDel}
		tOne = tdist.Quantile(1 - 1/(2*nf))
		if !ckFinite(tOne) {
			tOne = 0
		}
	}
	cut := newInfluenceCuts(pf, nf, dfRes, dfDel >= 1)

	if keep {
		out = make([]PointInfluence, n)
	}
	// Which reasons each reading has, as bits; the texts are written
	// afterwards into one buffer sized for them all.
	masks = make([]uint8, n)
	nReasons := 0
	var tmp PointInfluence
	for i := range n {
		pi := &tmp
		if keep {
			pi = &out[i]
		}
		h := lev.at(i)
		pi.Index, pi.Leverage, pi.Residual, pi.OutlierP = i, h, resid[i], 1
		pi.CooksD, pi.Studentized, pi.DFFITS = 0, 0, 0
		ri := 0.0
		if big > 0 {
			ri = rAt(i) / big
		}
		var m uint8
		switch {
		case h >= 1-1e-12:
			pi.Leverage = math.Min(h, 1)
			m = 1 << ckBitLeverageOne
		case sse == 0:
			// All residuals zero: nothing stands out.
		default:
			om := 1 - h
			if s2 > 0 {
				pi.CooksD = ri * ri * h / (pf * s2 * om * om)
			}
			if dfDel >= 1 {
				sd2 := (sse - ri*ri/om) / dfDel
				var t float64
				if sd2 > 1e-24*sse {
					t = ri / math.Sqrt(sd2*om)
				} else if ri != 0 {
					t = math.Copysign(ckStudentCap, ri)
				}
				if math.Abs(t) > ckStudentCap {
					t = math.Copysign(ckStudentCap, t)
				}
				pi.Studentized = t
				if math.Abs(t) > tOne {
					pi.OutlierP = ckClampP(nf * 2 * tdist.Survival(math.Abs(t)))
				}
				pi.DFFITS = t * math.Sqrt(h/om)
			}
		}
		if !ckFinite(pi.CooksD) {
			pi.CooksD = 0
		}
		if !ckFinite(pi.DFFITS) {
			pi.DFFITS = 0
		}
		m |= cut.mask(pi)
		if m != 0 {
			masks[i] = m
			pi.Flagged = true
			nReasons += bits.OnesCount8(m)
		}
	}
	if keep && nReasons > 0 {
		rw := newReasonWriter(nReasons)
		for i, m := range masks {
			if m != 0 {
				out[i].Reasons = rw.write(&out[i], m, &cut)
			}
		}
	}
	return out, masks
}

// adTryOracle is adTry before the split.
func adTryOracle(x, y []float64, opt Options, r Remedy, before CheckSummary, sc *anScratch) Candidate {
	c := Candidate{Remedy: r}
	o := Options{Model: ModelOLS, Level: opt.Level, SlopeRef: opt.SlopeRef, InterceptRef: opt.InterceptRef, SkipAdvice: true}
	cost := 0.0
	var note string
	switch r {
	case RemedyLogY:
		if why := adDomain("A log scale needs every y above zero", "y", y, adPositive); why != "" {
			c.Why = why
			return c
		}
		o.Transform = TransformLogY
	case RemedyLogLog:
		if why := adDomain("A log–log scale needs every x above zero", "x", x, adPositive); why != "" {
			c.Why = why
			return c
		}
		if why := adDomain("A log–log scale needs every y above zero", "y", y, adPositive); why != "" {
			c.Why = why
			return c
		}
		o.Transform = TransformLogLog
	case RemedySqrtY:
		if why := adDomain("A square-root scale needs every y at zero or above", "y", y, adNonNegative); why != "" {
			c.Why = why
			return c
		}
		o.Transform = TransformSqrtY
		cost = 0.25
	case RemedyReciprocal:
		if why := adDomain("A reciprocal scale needs every y above zero", "y", y, adPositive); why != "" {
			c.Why = why
			return c
		}
		o.Transform = TransformReciprocal
		cost = 0.5
	case RemedyBoxCox:
		if why := adDomain("The Box–Cox transform needs every y above zero", "y", y, adPositive); why != "" {
			c.Why = why
			return c
		}
		bc, err := sc.boxCox(x, y, opt.Level)
		if err != nil {
			c.Why = "The Box–Cox power could not be estimated: " + err.Error() + "."
			return c
		}
		lam := bc.Lambda
		c.Lambda = lam
		if (bc.CILow <= 1 && 1 <= bc.CIHigh) || math.Abs(lam-1) < 0.1 {
			// λ = 1 is the scale of the readings themselves, and a power
			// within 0.1 of it is no change a technician could explain: a
			// Box–Cox fit there would only look better by chance.
			c.Why = fmt.Sprintf("The Box–Cox power λ = %.3g (interval %.3g to %.3g) is at or next to 1: the readings themselves do not ask for a change of scale.", lam, bc.CILow, bc.CIHigh)
			return c
		}
		o.Transform = TransformBoxCox
		o.BoxCoxLambda = &lam
		cost = 0.75
		note = fmt.Sprintf("λ = %.3g (%g %% interval %.3g to %.3g).", lam, 100*adLevel(opt.Level), bc.CILow, bc.CIHigh)
		for _, s := range []struct {
			lam  float64
			name string
		}{{0, "the plain log scale"}, {0.5, "the square-root scale"}, {-1, "the reciprocal scale"}} {
			if bc.CILow <= s.lam && s.lam <= bc.CIHigh {
				cost += 0.75
				note += fmt.Sprintf(" The interval contains %g, so %s does the same job more simply.", s.lam, s.name)
				break
			}
		}
	case RemedyWeighted:
		if why := adDomain("Weights that follow a power of x need every x other than zero", "x", x, adNonZero); why != "" {
			c.Why = why
			return c
		}
		o.Weights = WeightsPowerFit
		o.Model = ModelWeighted
		cost = 0.5
	case RemedyWeightedX2:
		if why := adDomain("Weights 1/x² need every x other than zero", "x", x, adNonZero); why != "" {
			c.Why = why
			return c
		}
		o.Weights, o.Model = WeightsX2, ModelWeighted
		cost = 0.25
		note = "Scatter taken to grow in proportion to x."
	case RemedyWeightedFitted:
		o.Weights, o.Model = WeightsFitted2, ModelWeighted
		cost = 0.25
		note = "Scatter taken to grow in proportion to the reading."
	case RemedyWeightedRepeats:
		// Checked on the analysis's sorted order of x first, so that a
		// record without repeats costs no refit (and no second sort).
		if i, ok := adEveryXRepeated(x, sc.orderOf(x)); !ok {
			c.Why = fmt.Sprintf("Weights from repeats need at least two readings at every x; reading %d (x = %s) has none beside it.", i+1, ckG4(x[i]))
			return c
		}
		o.Weights, o.Model = WeightsRepeats, ModelWeighted
		cost = 0.5
		note = "Scatter taken from the repeats at each standard."
	}
	sc.refit = true
	rep, err := analyze(x, y, o, sc)
	sc.refit = false
	if err != nil {
		if _, _, ws := r.Settings(); ws != WeightsNone {
			c.Why = "These weights cannot be used on these readings: " + err.Error() + "."
		} else {
			c.Why = "The refit on this scale failed: " + err.Error() + "."
		}
		return c
	}
	if r == RemedyWeighted {
		c.Power = rep.WeightPower
		note = fmt.Sprintf("Scatter taken to grow as |x|^%.2g.", c.Power)
	}
	c.Usable = true
	c.Summary = adSummarize(rep)
	c.Slope = rep.Slope.Estimate
	c.Intercept = rep.Intercept.Estimate
	c.Score = adScore(c.Summary, before, cost)
	c.Why = strings.TrimSpace(fmt.Sprintf("%s: %s; %s: %s; score %.2f. %s",
		NameSpread, c.Summary.Assumptions.Spread.Verdict.Word(), NameLinearity, c.Summary.Assumptions.Linearity.Verdict.Word(), c.Score, note))
	return c
}

// driftOracle is Drift before the split.
func driftOracle(t, v, se []float64, level float64, lower, upper *float64) (*DriftResult, error) {
	if len(t) != len(v) || len(t) != len(se) {
		return nil, errors.New("drift: times, values and standard errors must have the same length")
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
	tb, vb := swt/sw, swv/sw
	var stt, stv float64
	for i := range t {
		dt := t[i] - tb
		stt += w[i] * dt * dt
		stv += w[i] * dt * (v[i] - vb)
	}
	if !(stt > 0) {
		return nil, errors.New("drift: the calibrations need at least two different dates")
	}
	r := stv / stt
	var sse float64
	for i := range t {
		e := v[i] - vb - r*(t[i]-tb)
		sse += w[i] * e * e
	}
	df := float64(len(t) - 2)
	s2 := sse / df
	res.Sigma = math.Sqrt(s2)
	res.Rate = r
	res.RateSE = math.Sqrt(s2 / stt)
	res.MeanT = tb
	res.Intercept = vb - r*tb
	res.InterceptSE = math.Sqrt(s2 * (1/sw + tb*tb/stt))
	tc := lnTCrit(level, df)
	res.RateLow, res.RateHigh = r-tc*res.RateSE, r+tc*res.RateSE
	res.P = lnTwoSidedP(lnRatio(r, res.RateSE), df)
	res.Status = DriftSteady
	if res.P < DriftAlpha {
		res.Status = DriftDrifting
	}
	k := tc * tc * s2
	cross := func(side string, lim float64) *LimitCrossing {
		if r == 0 {
			return nil
		}
		at := tb + (lim-vb)/r
		if !(at > tmax) {
			return nil
		}
		c := &LimitCrossing{Side: side, Limit: lim, At: at}
		d := lim - vb
		a := r*r - k/stt
		b := -2 * r * d
		cc := d*d - k/sw
		disc := b*b - 4*a*cc
		if a > 0 && disc >= 0 {
			q := math.Sqrt(disc)
			u1, u2 := (-b-q)/(2*a), (-b+q)/(2*a)
			c.Low, c.High, c.Bounded = tb+math.Min(u1, u2), tb+math.Max(u1, u2), true
		}
		return c
	}
	var best *LimitCrossing
	if lower != nil && r < 0 {
		best = cross("lower", *lower)
	}
	if upper != nil && r > 0 {
		if c := cross("upper", *upper); c != nil && (best == nil || c.At < best.At) {
			best = c
		}
	}
	res.Leaves = best
	return res, nil
}

// checkAcceptanceOracle is checkAcceptance before the split.
func checkAcceptanceOracle(c *Criteria, rep *Report, y []float64, residOrig []float64) *AcceptanceResult {
	res := &AcceptanceResult{Pass: true, Results: []CriterionResult{}}
	add := func(r CriterionResult) {
		if !r.Pass {
			res.Pass = false
		}
		res.Results = append(res.Results, r)
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
	if c.MinRSquared != nil {
		v, lim := rep.RSquared, *c.MinRSquared
		r := CriterionResult{Name: "r_squared", Value: v, Limit: "≥ " + g(lim), Pass: v >= lim}
		if r.Pass {
			r.Reason = fmt.Sprintf("R² = %s meets the minimum %s.", g(v), g(lim))
		} else {
			r.Reason = fmt.Sprintf("R² = %s is below the minimum %s: the readings scatter too much about the line.", g(v), g(lim))
		}
		add(r)
	}
	window := func(name, what string, v float64, lo, hi *float64) {
		if lo == nil && hi == nil {
			return
		}
		r := CriterionResult{Name: name, Value: v, Pass: true}
		switch {
		case lo != nil && hi != nil:
			r.Limit = g(*lo) + " to " + g(*hi)
		case lo != nil:
			r.Limit = "≥ " + g(*lo)
		default:
			r.Limit = "≤ " + g(*hi)
		}
		switch {
		case lo != nil && v < *lo:
			r.Pass = false
			r.Reason = fmt.Sprintf("The %s %s is below the lowest allowed value %s.", what, g(v), g(*lo))
		case hi != nil && v > *hi:
			r.Pass = false
			r.Reason = fmt.Sprintf("The %s %s is above the highest allowed value %s.", what, g(v), g(*hi))
		default:
			r.Reason = fmt.Sprintf("The %s %s is within %s.", what, g(v), r.Limit)
		}
		add(r)
	}
	window("slope", "slope", rep.Slope.Estimate, c.SlopeLow, c.SlopeHigh)
	if rep.Model == ModelOrigin && (c.InterceptLow != nil || c.InterceptHigh != nil) {
		add(CriterionResult{Name: "intercept", Value: 0, Limit: "not used", Pass: true,
			Reason: "The line is forced through zero, so the intercept criterion does not apply."})
	} else {
		window("intercept", "intercept", rep.Intercept.Estimate, c.InterceptLow, c.InterceptHigh)
	}
	if c.MaxResidual != nil {
		var big float64
		idx := 0
		for i, e := range residOrig {
			if a := math.Abs(e); a > big {
				big, idx = a, i
			}
		}
		lim := *c.MaxResidual
		v := big
		unit := ""
		if c.MaxResidualPercentOfSpan {
			lo, hi := rangeOf(y)
			if hi > lo {
				v = 100 * big / (hi - lo)
			}
			unit = " % of the span of y"
		}
		r := CriterionResult{Name: "max_residual", Value: v, Limit: "≤ " + g(lim) + unit, Pass: v <= lim}
		if r.Pass {
			r.Reason = fmt.Sprintf("The largest residual, %s%s, is within the limit %s%s.", g(v), unit, g(lim), unit)
		} else {
			r.Reason = fmt.Sprintf("The residual of pair %d, %s%s, exceeds the limit %s%s: check that reading.", idx+1, g(v), unit, g(lim), unit)
		}
		add(r)
	}
	failed := 0
	for _, r := range res.Results {
		if !r.Pass {
			failed++
		}
	}
	switch {
	case len(res.Results) == 0:
		res.Summary = "No acceptance criteria were set."
	case failed == 0:
		res.Summary = fmt.Sprintf("The line meets all %d acceptance criteria.", len(res.Results))
	default:
		res.Summary = fmt.Sprintf("The line fails %d of %d acceptance criteria.", failed, len(res.Results))
	}
	return res
}

// splitCase builds invented readings from data: n pairs on a line with
// scatter, and, as the bytes pick, repeats of x, an exact line, an
// outlier, a reading far out in x, zero or negative values (to reach the
// domain checks of the remedies), curvature and spread growing with x.
func splitCase(data []byte) (x, y []float64) {
	at := func(i int) byte {
		if len(data) == 0 {
			return 0
		}
		return data[i%len(data)]
	}
	n := 2 + int(at(0))%40
	flags := at(1)
	x, y = make([]float64, n), make([]float64, n)
	for i := range n {
		xi := float64(i + 1)
		if flags&1 != 0 {
			xi = float64(i/2 + 1) // every x twice
		}
		noise := (float64(at(i+2)) - 127.5) / 127.5
		if flags&2 != 0 {
			noise = 0 // an exact line
		}
		yi := 2 + 0.5*xi + 0.1*noise
		if flags&4 != 0 {
			yi += 0.02 * xi * xi // curvature
		}
		if flags&8 != 0 {
			yi += 0.05 * xi * noise // spread growing with x
		}
		x[i], y[i] = xi, yi
	}
	if flags&16 != 0 {
		y[n/2] += 5 // an outlier
	}
	if flags&32 != 0 {
		x[n-1] *= 10 // far out in x
	}
	if flags&64 != 0 {
		y[0] = 0 // reaches the y > 0 checks
	}
	if flags&128 != 0 {
		x[0] = -x[0] + float64(at(2)%3) - 1 // a negative or zero x
	}
	return x, y
}

// sameInfluence compares influenceRun with its oracle on one input.
func sameInfluence(t *testing.T, x, resid, w []float64, origin, valid bool) {
	t.Helper()
	for _, keep := range []bool{false, true} {
		go1, gm := influenceRun(x, resid, w, nil, origin, valid, keep)
		wo, wm := influenceRunOracle(x, resid, w, origin, valid, keep)
		got, want := fmt.Sprintf("%+v %v", go1, gm), fmt.Sprintf("%+v %v", wo, wm)
		if got != want {
			t.Fatalf("influenceRun(x=%v, resid=%v, w=%v, origin=%v, valid=%v, keep=%v):\n got %s\nwant %s", x, resid, w, origin, valid, keep, got, want)
		}
	}
}

// sameAdTry compares adTry with its oracle for every remedy, each side
// with its own work space shared across the remedies as advise shares it.
func sameAdTry(t *testing.T, x, y []float64, opt Options) {
	t.Helper()
	before, err := Analyze(x, y, Options{Level: opt.Level, SkipAdvice: true})
	if err != nil {
		return
	}
	sum := adSummarize(before)
	scNew, scOld := new(anScratch), new(anScratch)
	for _, r := range []Remedy{RemedyLogY, RemedyLogLog, RemedySqrtY, RemedyReciprocal, RemedyBoxCox,
		RemedyWeightedX2, RemedyWeightedFitted, RemedyWeightedRepeats, RemedyWeighted, RemedyNone} {
		got := fmt.Sprintf("%+v", adTry(x, y, opt, r, sum, scNew))
		want := fmt.Sprintf("%+v", adTryOracle(x, y, opt, r, sum, scOld))
		if got != want {
			t.Fatalf("adTry(x=%v, y=%v, %s):\n got %s\nwant %s", x, y, r, got, want)
		}
	}
}

// showDrift prints a Drift result with its crossing (not its address),
// without the step the oracle does not look for.
func showDrift(r *DriftResult, err error) string {
	if r == nil {
		return fmt.Sprintf("nil %v", err)
	}
	cp := *r
	cp.Leaves, cp.Step = nil, nil
	s := fmt.Sprintf("%+v %v", cp, err)
	if r.Leaves != nil {
		s += fmt.Sprintf(" leaves %+v", *r.Leaves)
	}
	return s
}

// sameDrift compares Drift with its oracle, which predates the step: the
// line's figures must agree bit for bit; where Drift calls a step
// (DriftShifted, never a verdict the oracle gives) the oracle's status must
// be one the step replaces and Drift must project no crossing, and the rest
// is compared with the oracle's status and crossing put back.
func sameDrift(t *testing.T, tm, v, se []float64, level float64, lower, upper *float64) {
	t.Helper()
	g, gerr := Drift(tm, v, se, level, lower, upper)
	w, werr := driftOracle(tm, v, se, level, lower, upper)
	if g != nil && w != nil && g.Status == DriftShifted {
		if g.Leaves != nil || g.Step == nil || w.Status != DriftSteady && w.Status != DriftDrifting {
			t.Fatalf("Drift(t=%v, v=%v, se=%v): shifted with crossing %+v, step %+v; oracle status %q", tm, v, se, g.Leaves, g.Step, w.Status)
		}
		cp := *g
		cp.Status, cp.Leaves = w.Status, w.Leaves
		g = &cp
	}
	got := showDrift(g, gerr)
	want := showDrift(w, werr)
	if got != want {
		t.Fatalf("Drift(t=%v, v=%v, se=%v, level=%v):\n got %s\nwant %s", tm, v, se, level, got, want)
	}
}

// sameAcceptance compares checkAcceptance with its oracle for criteria
// picked by the bits of pick from lists of limits that pass and fail.
func sameAcceptance(t *testing.T, rep *Report, y, resid []float64, pick uint16) {
	t.Helper()
	lim := func(k uint16, vals ...float64) *float64 {
		if k == 0 {
			return nil
		}
		v := vals[int(k-1)%len(vals)]
		return &v
	}
	c := &Criteria{
		MinRSquared:              lim(pick&3, 0.5, 0.9999999, math.NaN()),
		SlopeLow:                 lim(pick>>2&3, 0.4, 0.6, 1e300),
		SlopeHigh:                lim(pick>>4&3, 0.6, 0.4, -1),
		InterceptLow:             lim(pick>>6&3, 1, 3, -1e-9),
		InterceptHigh:            lim(pick>>8&3, 3, 1, 0),
		MaxResidual:              lim(pick>>10&3, 0.05, 10, 0),
		MaxResidualPercentOfSpan: pick>>12&1 != 0,
	}
	got := fmt.Sprintf("%+v", *checkAcceptance(c, rep, y, resid))
	want := fmt.Sprintf("%+v", *checkAcceptanceOracle(c, rep, y, resid))
	if got != want {
		t.Fatalf("checkAcceptance(pick=%#x):\n got %s\nwant %s", pick, got, want)
	}
}

// splitAll runs every comparison on the readings built from data.
func splitAll(t *testing.T, data []byte) {
	t.Helper()
	x, y := splitCase(data)
	var pick uint16
	if len(data) > 3 {
		pick = uint16(data[2]) | uint16(data[3])<<8
	}
	level := []float64{0, 0.95, 0.9, 0.99, MinLevel, MaxLevel}[int(pick>>13)%6]

	// Influence on the residuals of a line through the readings, with
	// and without weights, through the origin or not, and with invalid
	// input left for influenceRun to find.
	resid := make([]float64, len(x))
	w := make([]float64, len(x))
	for i := range x {
		resid[i] = y[i] - (2 + 0.5*x[i])
		w[i] = 1 / (1 + math.Abs(x[i]))
	}
	for _, origin := range []bool{false, true} {
		sameInfluence(t, x, resid, nil, origin, true)
		sameInfluence(t, x, resid, w, origin, true)
		sameInfluence(t, x, resid[:len(resid)-1], nil, origin, false)
		bad := append([]float64(nil), resid...)
		bad[0] = math.NaN()
		sameInfluence(t, x, bad, nil, origin, false)
		huge := append([]float64(nil), resid...)
		huge[len(huge)-1] = 1e200
		sameInfluence(t, x, huge, w, origin, true)
	}

	sameAdTry(t, x, y, Options{Level: level})

	// Drift on the readings as (time, value) with se from x.
	se := make([]float64, len(x))
	for i := range x {
		se[i] = 0.01 + 0.001*math.Abs(x[i])
	}
	lo, hi := -1.0, 40.0
	sameDrift(t, x, y, se, level, nil, nil)
	sameDrift(t, x, y, se, level, &lo, &hi)
	neg := make([]float64, len(y))
	for i := range y {
		neg[i] = -y[i]
	}
	sameDrift(t, x, neg, se, level, &lo, &hi)
	sameDrift(t, x, y, se[:len(se)-1], level, nil, nil)
	zero := append([]float64(nil), se...)
	zero[len(zero)-1] = 0
	sameDrift(t, x, y, zero, level, nil, nil)
	tiny := append([]float64(nil), se...)
	tiny[0] = 1e-170
	sameDrift(t, x, y, tiny, level, nil, nil)
	same := make([]float64, len(x))
	sameDrift(t, same, y, se, level, &lo, &hi)

	// Acceptance on a fit of the readings.
	for _, m := range []Model{ModelOLS, ModelOrigin} {
		rep, err := Analyze(x, y, Options{Model: m, SkipAdvice: true})
		if err != nil {
			continue
		}
		sameAcceptance(t, rep, y, rep.Residuals, pick)
		sameAcceptance(t, rep, y, rep.Residuals, ^pick)
		sameAcceptance(t, rep, y[:1], nil, pick|0xc00)
	}
}

func TestSplitMatchesOracle(t *testing.T) {
	for n := range 40 {
		for _, flags := range []byte{0, 1, 2, 3, 4, 8, 12, 16, 32, 48, 64, 128, 192, 255, 17, 9, 5} {
			data := []byte{byte(n), flags, byte(37 * n), byte(n * n), 11, 200, 3, 90, 250, 1}
			splitAll(t, data)
		}
	}
	// A few readings that agree exactly on one x (leverage 1) and sizes
	// at the edges of the degrees of freedom.
	for _, x := range [][]float64{{1, 1, 1, 5}, {1, 2}, {1, 2, 3}, {0, 0, 0}} {
		r := make([]float64, len(x))
		for i := range r {
			r[i] = float64(i%2) - 0.5
		}
		for _, origin := range []bool{false, true} {
			sameInfluence(t, x, r, nil, origin, false)
			sameInfluence(t, x, make([]float64, len(x)), nil, origin, false)
		}
	}
}

// FuzzSplitMatchesOracle: influenceRun, adTry, Drift and checkAcceptance
// give the results of the bodies they were split from, bit for bit, on
// any readings splitCase builds.
func FuzzSplitMatchesOracle(f *testing.F) {
	f.Add([]byte{10, 0, 1, 2, 3, 4})
	f.Add([]byte{30, 8, 200, 7, 1})
	f.Add([]byte{5, 255, 0})
	f.Add([]byte{39, 17, 3, 140, 9, 9, 9})
	f.Fuzz(func(t *testing.T, data []byte) {
		splitAll(t, data)
	})
}
