package fitcore

import (
	"fmt"
	"maps"
	"math"
	"reflect"
	"strconv"
	"sync"
)

// Analyze fits a straight line to the pairs (x[i], y[i]) as opt asks and
// returns everything Pairline reports about it: estimates with standard
// errors, t tests, confidence intervals and the tests against SlopeRef and
// InterceptRef; residual standard error, r, R², adjusted R², F and the
// ANOVA table; fitted values and residuals; the assumption checks and their
// summary; case influence; the Box–Cox profile (when every y > 0); the
// transform advice (unless opt.SkipAdvice); predictions, inverse
// predictions, detection limits and acceptance criteria when asked for.
//
// Bad data give an error, never a panic: fewer than three pairs
// (ErrTooFewPoints), unequal lengths (ErrLengthMismatch), a NaN or infinite
// reading (*DataError wrapping ErrNotFinite), all x equal (ErrNoSpreadInX),
// all y equal (ErrNoSpreadInY), bad weights (*DataError wrapping
// ErrBadWeight), a transform the readings cannot take (*DataError wrapping
// ErrTransformDomain), invalid options (an *OptionError wrapping
// ErrBadOption: each option has its range in Options.Normalize) and
// readings larger than MaxMagnitude or whose sums of squares cannot be given
// in their units (ErrOutOfRange, with the advice to rescale the units). No
// NaN or Inf is ever stored in the Report, so it always marshals to JSON.
//
// The limits of the checks are in checkmin.go: a check below its minimum
// number of readings (MinResidualDF, MinInfluenceDF, MinCurvatureN,
// MinBoxCoxN) is n/a with the minimum and the reason, and readings within
// NoScatterTol of their line make every check n/a with NoScatterSentence.
func Analyze(x, y []float64, opt Options) (*Report, error) {
	return analyze(x, y, opt, new(anScratch))
}

// anScratch is the work space one analysis shares with the refits of its
// advice (which all see the same x).
type anScratch struct {
	sb     ckSortBuf // Shapiro–Wilk's
	x      []float64 // the readings xOrder belongs to
	xOrder []int32   // positions of x in ascending order; nil when x is in order

	// The Box–Cox profile of the original readings, worked out once and
	// shared with the scratch of a second worker of the advice (fork).
	bcc *bcCache

	// What the checks work out from x alone, for the last x they saw (the
	// original fit and the refits of y on a new scale have the same x).
	preX []float64
	pre  ckPre
	dw   dwShared
	lof  lofShared
	lev  ckLevCache // the leverages' sums of the unweighted refits
	xsf  xScaleFinite

	// refit is set while the advice refits a remedy: only what a Candidate
	// takes from the report is needed (no Box–Cox profile, no fitted
	// values, smearing factor, reasons texts or per-reading influence;
	// only the practical sizes a failed check reads; Shapiro–Wilk's W only
	// for a verdict other than Pass; buffers below), and each candidate is
	// that of the full analysis (TestRefitEqualsFullAnalysis).
	refit  bool
	resids []float64
	yt     []float64 // a refit's y on its scale
	w, pr  []float64 // a refit's weights and Pearson residuals
}

// bcCache keeps one Box–Cox profile; mu is held while it is worked out, so
// that a second asker waits for it rather than working it out again.
type bcCache struct {
	mu    sync.Mutex
	x, y  []float64
	level float64
	bc    *BoxCox
	err   error
}

// boxCox returns BoxCoxProfile(x, y, level), computing it only the first
// time it is asked about these readings and level. It may be called from
// the workers of the advice at once (after sharedBoxCox).
func (s *anScratch) boxCox(x, y []float64, level float64) (*BoxCox, error) {
	if level == 0 {
		level = DefaultLevel
	}
	s.sharedBoxCox()
	c := s.bcc
	c.mu.Lock()
	defer c.mu.Unlock()
	if c.x != nil && len(c.x) == len(x) && &c.x[0] == &x[0] && &c.y[0] == &y[0] && c.level == level {
		return c.bc, c.err
	}
	c.bc, c.err = BoxCoxProfile(x, y, level)
	c.x, c.y, c.level = x, y, level
	return c.bc, c.err
}

// sharedBoxCox makes the Box–Cox cache, before any worker is started.
func (s *anScratch) sharedBoxCox() {
	if s.bcc == nil {
		s.bcc = new(bcCache)
	}
}

// fork returns a work space for a second worker of the advice: its own
// buffers (sorts, residuals, lack of fit's gathered copies), and, to read
// only, what s has worked out from x (its order, the checks' basis, the
// Durbin–Watson design, the levels of x) and the Box–Cox cache (which
// locks). s must not be in use while fork copies it.
func (s *anScratch) fork() *anScratch {
	s.sharedBoxCox()
	f := &anScratch{
		x: s.x, xOrder: s.xOrder,
		bcc:  s.bcc,
		preX: s.preX, pre: s.pre, dw: s.dw, lev: s.lev, xsf: s.xsf,
		lof: lofShared{x: s.lof.x, m: s.lof.m, ends: s.lof.ends, xl: s.lof.xl},
	}
	f.sb.swA = maps.Clone(s.sb.swA)
	f.dw.buf = [2][]float64{} // (its own space for weighted designs)
	return f
}

// xScaleFinite is ckSafeScale and ckAllFinite of one x (the slice).
type xScaleFinite struct {
	x      []float64
	k      float64
	finite bool
	lo, hi float64 // rangeOf(x)
}

// scaleFinite returns ckSafeScale(x) and ckAllFinite(x), worked out once
// for the first x asked about (the analysis's, which every refit in the
// original units or on a new scale of y shares; see prepare).
func (s *anScratch) scaleFinite(x []float64) (k float64, finite bool) {
	if c := &s.xsf; len(x) > 0 && len(c.x) == len(x) && &c.x[0] == &x[0] {
		return c.k, c.finite
	}
	k, finite = ckSafeScale(x), ckAllFinite(x)
	if s.xsf.x == nil && len(x) > 0 {
		s.xsf = xScaleFinite{x: x, k: k, finite: finite}
		s.xsf.lo, s.xsf.hi = rangeOf(x)
	}
	return k, finite
}

// rangeOfX is rangeOf(x), from what scaleFinite keeps when x is its x.
func (s *anScratch) rangeOfX(x []float64) (lo, hi float64) {
	if c := &s.xsf; len(x) > 0 && len(c.x) == len(x) && &c.x[0] == &x[0] {
		return c.lo, c.hi
	}
	return rangeOf(x)
}

// prepare returns ckPrepare(x) with dw set, working it out only when x is
// not the slice it was asked about last.
//
// What is kept is for the first x asked about (the analysis's, which every
// refit in the original units shares): the x of a log–log refit is worked
// out on its own and not kept, so that the refits after it find the
// original x still there.
func (s *anScratch) prepare(x []float64) *ckPre {
	if len(x) == 0 {
		return ckPrepare(x)
	}
	if s.preX == nil {
		s.preX, s.pre = x, *ckPrepare(x)
	}
	if len(s.preX) != len(x) || &s.preX[0] != &x[0] {
		return ckPrepare(x) // dw nil: the design is not kept either
	}
	p := s.pre
	p.dw = &s.dw
	return &p
}

// anParallelMin is the number of readings from which the checks run side
// by side (below it, starting goroutines costs more than it saves).
const anParallelMin = 20000

// anAdviceWorkers is the number of remedies the advice refits at once on a
// record of anParallelMin readings or more (1: one after another). The
// candidates do not depend on it (TestAdviceWorkersSameReport).
var anAdviceWorkers = 2

// orderOf returns the positions of x in ascending order (nil when x is
// already in order), sorting only the first time it is asked about these
// readings.
func (s *anScratch) orderOf(x []float64) []int32 {
	if s.x != nil && len(s.x) == len(x) && &s.x[0] == &x[0] {
		return s.xOrder
	}
	s.x = x
	if ckAscending(x) {
		s.xOrder = nil
	} else {
		// The sort's work space (two key–position pairs a reading) is let
		// go at once; only the positions are kept.
		var b ckSortBuf
		s.xOrder = b.order(x)
	}
	return s.xOrder
}

// yBuf returns the space for a refit's y on its scale (nil outside a
// refit: a new slice), which lives in s until the next refit; lack of
// fit's copy of the last one, gathered in the order of x, no longer
// describes that space and is let go.
func (s *anScratch) yBuf(n int) []float64 {
	if !s.refit {
		return nil
	}
	s.yt = ckGrowF64(s.yt, n)
	if l := &s.lof; len(l.ysOf) > 0 && n > 0 && &l.ysOf[0] == &s.yt[0] {
		l.ysOf = nil
	}
	return s.yt
}

// wBuf returns the space for a refit's weights (nil outside a refit).
func (s *anScratch) wBuf(n int) []float64 {
	if !s.refit {
		return nil
	}
	s.w = ckGrowF64(s.w, n)
	return s.w
}

// residuals sets rep's fitted values and residuals of the fit f of yt on
// xt and refuses figures that cannot be given in the readings' units
// (unitsInRange). A refit's candidate takes neither: its residuals live
// in s and its fitted values are only looked at for being finite.
func (s *anScratch) residuals(f *lineFit, xt, yt []float64, rep *Report) error {
	fitOK, fitBad := true, 0.0
	if s.refit {
		s.resids = ckGrowF64(s.resids, len(xt))
		rep.Residuals = s.resids
		fitBad, fitOK = f.residualsInto(xt, yt, rep.Residuals)
	} else {
		rep.Fitted, rep.Residuals = f.fittedResiduals(xt, yt)
	}
	if err := unitsInRange(rep); err != nil {
		return err
	}
	if !fitOK {
		return unitsErr("the fitted values and residuals", fitBad)
	}
	return nil
}

// smearing sets Duan's factor of a log scale from rep's residuals, but
// not for a refit: the factor, an exponential of every residual, is for
// predictions, which a candidate has none of.
func (s *anScratch) smearing(tr *transformer, rep *Report) {
	if s.refit {
		return
	}
	tr.setSmearing(rep.Residuals)
	if tr.isLogY() {
		rep.Smearing = tr.smearing
	}
}

// analyze is Analyze with its work space in sc.
func analyze(x, y []float64, opt Options, sc *anScratch) (*Report, error) {
	o, err := normalizeOptions(opt)
	if err != nil {
		return nil, err
	}
	if !sc.refit {
		// (An advice refit sees the readings its analysis validated.)
		if err := validatePairs(x, y); err != nil {
			return nil, err
		}
	}
	if o.XStandardUncertainties != nil && len(o.XStandardUncertainties) != len(x) {
		return nil, optErr("x_standard_uncertainties", strconv.Itoa(len(o.XStandardUncertainties)), "one standard uncertainty per pair is needed (%d pairs)", len(x))
	}
	rep := &Report{N: len(x), Model: o.Model, Transform: o.Transform, Level: o.Level}
	if !o.SkipAdvice && !sc.refit && anAdviceWorkers > 1 && len(x) >= anParallelMin && allPositive(y) {
		// The Box–Cox profile needs only the readings: it is worked out
		// beside the fit and its checks, and complete takes it from the
		// cache (waiting for it if need be). Every way out of analyze waits
		// for it, so nothing reads x and y after Analyze returns.
		sc.sharedBoxCox()
		done := make(chan struct{})
		go func() { defer close(done); sc.boxCox(x, y, o.Level) }()
		defer func() { <-done }()
	}

	// Transformed scale.
	tr, err := newTransformer(o.Transform, x, y, o, rep, sc)
	if err != nil {
		return nil, err
	}
	xt, yt, err := tr.applyIn(x, y, sc.yBuf(len(y)))
	if err != nil {
		return nil, err
	}
	if err := checkSpread(xt, yt); err != nil {
		return nil, err
	}

	var f *lineFit
	var w []float64
	wm := &weightModel{scheme: WeightsNone}
	origin := o.Model == ModelOrigin
	switch o.Model {
	case ModelDeming:
		f, err = fitDeming(xt, yt, o.VarianceRatio)
	default:
		if o.Weights != WeightsNone {
			w, wm, err = schemeWeights(o.Weights, xt, yt, o.GivenWeights, origin, rep, sc.wBuf(len(xt)))
			if err != nil {
				return nil, err
			}
			rep.Weights = w
		}
		f, err = fitLS(xt, yt, w, origin)
	}
	if err != nil {
		return nil, err
	}
	slopeRef, interceptRef := 1.0, 0.0
	if o.SlopeRef != nil {
		slopeRef = *o.SlopeRef
	}
	if o.InterceptRef != nil {
		interceptRef = *o.InterceptRef
	}
	if o.Model == ModelDeming {
		inferDeming(f, o.Level, slopeRef, interceptRef, rep)
	} else {
		inferLS(f, o.Level, slopeRef, interceptRef, rep)
	}
	// r is always the centred (weighted) Pearson correlation.
	if origin {
		if c, err := fitLS(xt, yt, w, false); err == nil {
			rep.R = c.pearsonR()
			rep.MeanX, rep.MeanY = c.xc/c.kx, c.a/c.ky
		}
	} else {
		rep.R = f.pearsonR()
	}
	if err := sc.residuals(f, xt, yt, rep); err != nil {
		return nil, err
	}
	sc.smearing(tr, rep)

	fc := &fitContext{f: f, tr: tr, wm: wm, x: x, y: y, xt: xt, yt: yt, w: w, opt: o, rep: rep, sc: sc}
	fc.runChecks()
	fc.predictions()
	fc.inverses()
	fc.limits()
	fc.acceptance()
	if sc.refit {
		// The residuals live in sc and are not part of a candidate.
		rep.Fitted, rep.Residuals, rep.Weights = nil, nil, nil
	}
	scrubReport(rep)
	if !o.SkipAdvice {
		complete(rep, x, y, opt, o.Level, sc)
	}
	return rep, nil
}

// fitContext carries what the later stages of Analyze need.
type fitContext struct {
	f      *lineFit
	tr     *transformer
	wm     *weightModel
	x, y   []float64 // original units
	xt, yt []float64 // fitted scale
	w      []float64 // weights as used (original scale), nil when unweighted
	opt    Options
	rep    *Report
	sc     *anScratch

	xLo, xHi float64 // range of x (original units), once xRanged
	xRanged  bool

	noScatter bool // the residuals are within NoScatterTol of zero (runChecks)
}

// xRange returns the smallest and largest x, computed once per fit (every
// prediction and inverse asks for it).
func (fc *fitContext) xRange() (lo, hi float64) {
	if !fc.xRanged {
		fc.xLo, fc.xHi = fc.sc.rangeOfX(fc.x)
		fc.xRanged = true
	}
	return fc.xLo, fc.xHi
}

// runChecks runs the assumption checks on the fitted scale and summarises
// them. Weighted fits give the spread, independence and normality checks
// the Pearson residuals √w·e and the influence measures the raw residuals
// with w. The checks are all scale-free: they see x, y, the residuals and
// the weights each multiplied by a power of two (ckSafeScale) when their
// size would let a square or a fourth power overflow or underflow, and the
// one unit-bearing output, PointInfluence.Residual, is the residual in the
// report's units. The limits of checkmin.go apply here: when the residuals
// are within NoScatterTol of zero every check is n/a with
// NoScatterSentence, and a check below its minimum number of readings is
// n/a with the minimum and the reason.
func (fc *fitContext) runChecks() {
	r := fc.newCheckRun()
	r.run()
	fc.finishChecks(r.inflSummary)
}

// checkInputs are what the checks see: x, y, the residuals and the
// weights, each at a safe size, and the Pearson residuals √w·e (the
// residuals themselves without weights).
type checkInputs struct {
	xs, ys, res, w, pr []float64
	// whether every value of ys, res and pr is finite (ckAllFinite),
	// found in the passes that made them
	ysFinite, resFinite, prFinite bool
}

// checkInputs takes x, y, the residuals and the weights back from the
// fit's internal scale, then brings each to a safe size by a power of two
// (exact): every check is unchanged when they are multiplied by a
// constant, and the squares and fourth powers the checks take can then
// neither overflow nor underflow. Ordinary readings are not touched.
func (fc *fitContext) checkInputs() checkInputs {
	f, rep := fc.f, fc.rep
	in := checkInputs{xs: fc.xt, ys: fc.yt, res: rep.Residuals, w: fc.w}
	if f.kx != 1 || f.ky != 1 || f.cw != 1 {
		in.xs = scaledCopy(fc.xt, f.kx)
		in.ys = scaledCopy(fc.yt, f.ky)
		in.res = scaledCopy(rep.Residuals, f.ky)
		in.w = f.w
	}
	if k, _ := fc.sc.scaleFinite(in.xs); k != 1 {
		in.xs = scaledCopy(in.xs, k)
	}
	in.ys, in.ysFinite = safeScaledFinite(in.ys)
	in.res, in.resFinite = safeScaledFinite(in.res)
	if in.w != nil {
		in.w = safeScaled(in.w)
	}
	in.pr, in.prFinite = in.res, in.resFinite
	if in.w != nil && fc.sc.refit {
		fc.sc.pr = ckGrowF64(fc.sc.pr, len(in.res))
		in.pr = fc.sc.pr
	} else if in.w != nil {
		in.pr = make([]float64, len(in.res))
	}
	if in.w != nil {
		var s0 float64 // as ckAllFinite: 0 unless a value is not finite
		for i, e := range in.res {
			v := math.Sqrt(in.w[i]) * e
			in.pr[i] = v
			s0 += v * 0
		}
		in.prFinite = s0 == 0
	}
	return in
}

// safeScaledFinite is safeScaled(v) and ckAllFinite of it, from one pass
// over v (a power of two that brings the largest |v| into [½, 1) keeps
// every finite value finite, and ckSafeScale leaves v as it is when a
// value is not).
func safeScaledFinite(v []float64) ([]float64, bool) {
	k, finite := ckSafeScaleFinite(v)
	if k != 1 {
		return scaledCopy(v, k), finite
	}
	return v, finite
}

// ckSafeScaleFinite is ckSafeScale(v) and ckAllFinite(v) in one pass.
func ckSafeScaleFinite(v []float64) (k float64, finite bool) {
	var m0, m1, m2, m3, s0, s1 float64
	i := 0
	for ; i+4 <= len(v); i += 4 {
		a, b, c, d := v[i], v[i+1], v[i+2], v[i+3]
		m0 = absMax(m0, a)
		m1 = absMax(m1, b)
		m2 = absMax(m2, c)
		m3 = absMax(m3, d)
		s0 += a*0 + c*0
		s1 += b*0 + d*0
	}
	for ; i < len(v); i++ {
		m0 = absMax(m0, v[i])
		s0 += v[i] * 0
	}
	return ckScaleOfMax(max(max(m0, m1), max(m2, m3))), s0+s1 == 0
}

// safeScaled is v, or a copy of v scaled by ckSafeScale's power of two.
func safeScaled(v []float64) []float64 {
	if k := ckSafeScale(v); k != 1 {
		return scaledCopy(v, k)
	}
	return v
}

// checkRun is one run of the checks: their inputs, what the checks share
// about x (pre), validated once here rather than by every check, and the
// limits that make a check n/a.
type checkRun struct {
	fc        *fitContext
	in        checkInputs
	pre       *ckPre
	inflValid bool
	origin    bool
	n, np     int
	noScatter bool // the residuals are within NoScatterTol of zero
	fewDF     bool // n − p < MinResidualDF
	// lean: no advice refit will share the work space (opt.SkipAdvice,
	// not a refit), so each group of checks lets its own go when done.
	lean bool
	// inflSummary is what Summarize(rep.Checks, rep.Influence) words, from
	// the same reason bits, without reading the results back.
	inflSummary Assumption
}

func (fc *fitContext) newCheckRun() *checkRun {
	rep := fc.rep
	in := fc.checkInputs()
	r := &checkRun{fc: fc, in: in, origin: fc.opt.Model == ModelOrigin, n: len(in.xs), np: 2}
	r.pre = fc.sc.prepare(in.xs)
	r.lean = fc.opt.SkipAdvice && !fc.sc.refit
	if r.lean {
		r.pre.dw = nil // Durbin–Watson's design is not kept
	}
	// What ckValidate(xs, ys, w), ckValidate(xs, pr, nil) and
	// ckValidate(xs, res, w) would say is "", each array read once.
	n := len(in.xs)
	_, xsOK := fc.sc.scaleFinite(in.xs)
	wOK := ckWeights(in.w, n) == ""
	r.pre.xyValid = xsOK && wOK && len(in.ys) == n && in.ysFinite
	r.pre.residValid = xsOK && len(in.pr) == n && in.prFinite
	r.pre.quick = fc.sc.refit
	r.inflValid = r.pre.residValid && (in.w == nil || (wOK && len(in.res) == n && in.resFinite))
	if r.origin {
		r.np = 1
	}
	r.noScatter = ckNoScatter(fc.yt, rep.Residuals, fc.w)
	fc.noScatter = r.noScatter
	if r.noScatter && !fc.sc.refit && fc.f.sse != 0 {
		// (An exact zero has its own note from the inference.)
		rep.Notes = append(rep.Notes, noScatterNote)
	}
	r.fewDF = r.n-r.np < MinResidualDF
	return r
}

// run runs three independent groups of work: Shapiro–Wilk (a sort of all
// residuals), the influence of each reading, and the other checks. On a
// large record they run side by side. Each computes exactly what it would
// alone, so the results do not depend on this.
//
// A lean run (no refit shares the work space) runs them one after another
// and lets each group's work space go as soon as it is done, so that only
// one group's is held at a time. In `pairline fit --no-advice` on 10⁶
// rows the live heap then peaks at 76 MB instead of 122 MB (x, y and the
// file's line numbers, 20 MB, included), for about 0.03 s more on two
// cores (TestLeanRunPeakHeap; DEVELOPERS.md, "Memory of a big fit").
func (r *checkRun) run() {
	if len(r.in.pr) >= anParallelMin && !r.lean {
		var wg sync.WaitGroup
		wg.Add(2)
		go func() { defer wg.Done(); r.shapiroWilk() }()
		go func() { defer wg.Done(); r.others() }()
		r.influence()
		wg.Wait()
		return
	}
	r.shapiroWilk()
	if r.lean {
		r.fc.sc.sb = ckSortBuf{}
	}
	r.others()
	r.influence()
}

// limit returns the check as run, or n/a when the limits say so.
func (r *checkRun) limit(name string, run func() Check) Check {
	switch {
	case r.noScatter:
		return ckNA(name, NoScatterSentence)
	case r.fewDF:
		return ckNA(name, ckFewDF(name, r.n, r.np))
	}
	return run()
}

func (r *checkRun) shapiroWilk() {
	c, in := &r.fc.rep.Checks, &r.in
	c.ShapiroWilk = r.limit("Shapiro–Wilk", func() Check {
		return shapiroWilkCheckIf(in.pr, &r.fc.sc.sb, r.pre.residValid, r.pre.quick)
	})
}

// others runs curvature, lack of fit, the spread and the independence
// checks.
func (r *checkRun) others() {
	fc, c, in, pre := r.fc, &r.fc.rep.Checks, &r.in, r.pre
	if r.noScatter {
		c.Curvature = ckNA("Curvature", NoScatterSentence)
	} else {
		c.Curvature = curvatureTest(in.xs, in.ys, in.w, fc.rep.Level, pre)
	}
	if pre.xyValid {
		// Any order that sorts x also sorts xs, which is x scaled by a
		// power of two or on a log scale.
		c.LackOfFit = lackOfFit(in.xs, in.ys, in.w, r.origin, fc.sc.orderOf(fc.x), &fc.sc.lof)
		if r.lean {
			fc.sc.lof, fc.sc.x, fc.sc.xOrder = lofShared{}, nil, nil
		}
	} else {
		c.LackOfFit = LackOfFit(in.xs, in.ys, in.w, r.origin)
	}
	if r.noScatter && c.LackOfFit != nil {
		na := ckNA(c.LackOfFit.Name, NoScatterSentence)
		c.LackOfFit = &na
	}
	c.BreuschPagan = r.limit("Breusch–Pagan", func() Check { return ckSpread("Breusch–Pagan", in.xs, in.pr, false, pre) })
	c.White = r.limit("White", func() Check { return ckSpread("White", in.xs, in.pr, true, pre) })
	c.DurbinWatson = r.limit("Durbin–Watson", func() Check { return durbinWatsonW(in.xs, in.pr, in.w, r.origin, pre) })
	c.Runs = r.limit("Runs", func() Check { return runsTest(in.pr, pre.residValid) })
}

// influence runs the influence measures of each reading (for an advice
// refit only their summary) and words their summary.
func (r *checkRun) influence() {
	rep, in := r.fc.rep, &r.in
	if r.fc.sc.refit {
		// A candidate needs only the influence summary.
		r.inflSummary = influenceSummary(in.xs, in.res, in.w, in.pr, r.origin, r.inflValid, &r.fc.sc.lev)
	} else {
		var masks []uint8
		mode := inflAll
		if r.fc.opt.FlaggedInfluenceOnly {
			mode = inflFlagged
		}
		rep.Influence, masks = influenceRunWith(in.xs, in.res, in.w, in.pr, r.origin, r.inflValid, mode, nil)
		r.inflSummary = ckInfluenceFromMasks(masks)
	}
	switch {
	case r.noScatter:
		ckClearInfluence(rep.Influence)
		if r.fc.opt.FlaggedInfluenceOnly {
			rep.Influence = rep.Influence[:0] // none is flagged
		}
		r.inflSummary = Assumption{Verdict: NA, Message: NoScatterSentence}
	case r.n-r.np < MinInfluenceDF:
		r.inflSummary = ckFewInfluence(r.n, r.np)
	}
}

// finishChecks makes the assumptions from the checks and the influence
// summary: with the practical sizes (always for the report, for an advice
// refit only when a check whose Fail they could change has failed), the
// Fails capped by them, and for the report the influence residuals in its
// units, the x-exactness check and the slipped decimal point.
func (fc *fitContext) finishChecks(inflSummary Assumption) {
	rep := fc.rep
	origin := fc.opt.Model == ModelOrigin
	var dep *Departures
	parts := depAll
	if fc.sc.refit {
		// A refit's sizes are read only where a Fail could become a Warn.
		parts = fc.failedParts()
	}
	parts.xRange = fc.sc.rangeOfX
	if !fc.noScatter && (parts.curvature || parts.scatter || parts.drift) {
		dep = departuresOf(fc.xt, fc.yt, rep.Residuals, fc.w, origin, fc.allowedResidual(), parts)
	}
	if fc.sc.refit {
		rep.Assumptions = summarize(rep.Checks, inflSummary, dep)
		fc.capChecks()
		return
	}
	// The one unit-bearing figure of influence is the raw residual.
	for i := range rep.Influence {
		rep.Influence[i].Residual = rep.Residuals[rep.Influence[i].Index]
	}
	var xa *Assumption
	if fc.opt.XUncertainty > 0 {
		ck, a := XExactness(fc.x, fc.y, fc.opt.XUncertainty, fc.opt.YUncertainty, rep.Level)
		rep.Checks.XExactness = &ck
		xa = &a
	}
	rep.Assumptions = summarize(rep.Checks, inflSummary, dep)
	fc.capChecks()
	fc.nameSlip()
	rep.Departures = dep
	if xa != nil && rep.Assumptions.XExactness == nil {
		rep.Assumptions.XExactness = xa
	}
}

// nameSlip looks at the outliers first: a reading that looks like a
// slipped decimal point is named, and the checks whose result depends on
// it say so (plain straight lines only).
func (fc *fitContext) nameSlip() {
	rep := fc.rep
	origin := fc.opt.Model == ModelOrigin
	plain := (fc.opt.Model == "" || fc.opt.Model == ModelOLS || fc.opt.Model == ModelOrigin) &&
		(fc.opt.Transform == "" || fc.opt.Transform == TransformNone) && fc.w == nil
	if !plain || fc.opt.noSlip || fc.noScatter || rep.Assumptions.Influence.Verdict == Pass {
		return
	}
	if s := findSlip(fc.x, fc.y, nil, origin, rep.Influence); s != nil {
		slipClears(rep, fc.x, fc.y, fc.opt, s)
		rep.Slip = s
		rep.Assumptions.Influence.Message = slipSentence(s) + " " + rep.Assumptions.Influence.Message
		rep.Assumptions.Influence.Advice = "Check that reading against the record: if the decimal point slipped, correct it (about " +
			ckG4(s.Likely) + "); otherwise repeat the reading. Exclude a reading only with a recorded reason."
	}
}

// failedParts says which practical sizes a Fail of the checks needs: the
// curvature gap for a Fail of curvature or lack of fit, the scatter in
// thirds for Breusch–Pagan or White, the drift for Durbin–Watson or runs
// (summarize reads each only for a Fail of its assumption).
func (fc *fitContext) failedParts() depParts {
	c := &fc.rep.Checks
	failed := func(ks ...*Check) bool {
		for _, k := range ks {
			if k != nil && k.Verdict == Fail {
				return true
			}
		}
		return false
	}
	return depParts{
		curvature: failed(&c.Curvature, c.LackOfFit),
		scatter:   failed(&c.BreuschPagan, &c.White),
		drift:     failed(&c.DurbinWatson, &c.Runs),
	}
}

// allowedResidual is the largest residual the acceptance criteria allow,
// in y units (0 when none is set, or when the line is fitted on a
// transformed scale, where the criterion's units are not the fit's).
func (fc *fitContext) allowedResidual() float64 {
	a := fc.opt.Acceptance
	if a == nil || a.MaxResidual == nil || !(*a.MaxResidual > 0) ||
		(fc.opt.Transform != "" && fc.opt.Transform != TransformNone) {
		return 0
	}
	lim := *a.MaxResidual
	if a.MaxResidualPercentOfSpan {
		lo, hi := rangeOf(fc.y)
		lim = lim / 100 * (hi - lo)
	}
	if !ckFinite(lim) {
		return 0
	}
	return lim
}

// capChecks lowers to Warn the Fail of every test of an assumption that
// summarize turned into a Warn for its small size, so that the tests shown
// beside it agree (their p values stay).
func (fc *fitContext) capChecks() {
	c, a := &fc.rep.Checks, &fc.rep.Assumptions
	if a.Linearity.Verdict == Warn {
		sizeCapped(&c.Curvature, c.LackOfFit)
	}
	if a.Spread.Verdict == Warn {
		sizeCapped(&c.BreuschPagan, &c.White)
	}
	if a.Independence.Verdict == Warn {
		sizeCapped(&c.DurbinWatson, &c.Runs)
	}
}

// ckSafeScale returns a power of two k that brings the largest |v| into
// [½, 1) when it lies outside [2^-100, 2^100], and 1 otherwise (also for
// an all-zero v). Fourth powers of the scaled values stay between 2^-400
// and 2^400, far from overflow and underflow.
func ckSafeScale(v []float64) float64 {
	// Four running maxima (max is exact and order-free, a NaN carries
	// through), so the loop is not one chain of dependent steps.
	var m0, m1, m2, m3 float64
	i := 0
	for ; i+4 <= len(v); i += 4 {
		m0 = absMax(m0, v[i])
		m1 = absMax(m1, v[i+1])
		m2 = absMax(m2, v[i+2])
		m3 = absMax(m3, v[i+3])
	}
	for ; i < len(v); i++ {
		m0 = absMax(m0, v[i])
	}
	return ckScaleOfMax(max(max(m0, m1), max(m2, m3)))
}

// ckScaleOfMax is ckSafeScale's power of two for the largest magnitude m.
func ckScaleOfMax(m float64) float64 {
	if m == 0 || !isFiniteNum(m) || (m >= 0x1p-100 && m <= 0x1p100) {
		return 1
	}
	_, e := math.Frexp(m)
	return math.Ldexp(1, -max(e, -1000))
}

func scaledCopy(v []float64, k float64) []float64 {
	out := make([]float64, len(v))
	for i, a := range v {
		out[i] = a * k
	}
	return out
}

func allPositive(v []float64) bool {
	for _, a := range v {
		if !(a > 0) {
			return false
		}
	}
	return true
}

// normalizeOptions fills defaults and rejects invalid values (Options.Normalize).
func normalizeOptions(opt Options) (Options, error) { return opt.Normalize() }

func isFiniteNum(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// validatePairs checks lengths, count and finiteness.
func validatePairs(x, y []float64) error {
	if len(x) != len(y) {
		return fmt.Errorf("%w: %d x readings but %d y readings", ErrLengthMismatch, len(x), len(y))
	}
	if len(x) < 3 {
		return fmt.Errorf("%w: got %d; a straight line needs at least 3 pairs to be checked", ErrTooFewPoints, len(x))
	}
	for i := range x {
		if !isFiniteNum(x[i]) {
			return &DataError{Index: i, Column: "x", Value: x[i], Err: ErrNotFinite, Hint: "Correct or remove this reading."}
		}
		if !isFiniteNum(y[i]) {
			return &DataError{Index: i, Column: "y", Value: y[i], Err: ErrNotFinite, Hint: "Correct or remove this reading."}
		}
	}
	for i := range x {
		if !(math.Abs(x[i]) <= MaxMagnitude) {
			return &DataError{Index: i, Column: "x", Value: x[i], Err: ErrOutOfRange, Hint: tooLargeHint}
		}
		if !(math.Abs(y[i]) <= MaxMagnitude) {
			return &DataError{Index: i, Column: "y", Value: y[i], Err: ErrOutOfRange, Hint: tooLargeHint}
		}
	}
	return nil
}

var tooLargeHint = fmt.Sprintf("Readings may be at most %g in size; rescale the units (for example to kilo- or mega-units).", MaxMagnitude)

// unitsInRange refuses readings whose report figures in the units of the
// readings cannot be represented: Sxx = Σw(x − x̄)² and the total sum of
// squares of y must lie between 2^-1000 (about 1e-301, below which float64
// loses digits) and the largest float64, and the figures derived from them
// (residual SE, covariance, ANOVA table, fitted values, residuals) must be
// finite. The fit itself works in scaled units and is exact; only the
// figures shown in the readings' units are at stake.
func unitsInRange(rep *Report) error {
	const tiny = 0x1p-1000
	bad := unitsErr
	if !(rep.Sxx >= tiny) || !isFiniteNum(rep.Sxx) {
		return bad("the sum of squares of x about its mean", rep.Sxx)
	}
	if len(rep.Anova) == 3 {
		if v := rep.Anova[2].SS; !(v >= tiny) || !isFiniteNum(v) {
			return bad("the total sum of squares of y", v)
		}
		for _, r := range rep.Anova {
			if !isFiniteNum(r.SS) || !isFiniteNum(r.MS) {
				return bad("the analysis-of-variance table", r.SS)
			}
		}
	}
	for _, v := range []float64{rep.ResidualSE, rep.Slope.SE, rep.Intercept.SE, rep.Slope.Estimate, rep.Intercept.Estimate} {
		if !isFiniteNum(v) {
			return bad("the slope, the intercept and their standard errors", v)
		}
	}
	if !isFiniteNum(rep.CovSlopeIntercept) {
		return bad("the covariance of slope and intercept (in y²/x)", rep.CovSlopeIntercept)
	}
	for i := range rep.Fitted {
		if !isFiniteNum(rep.Fitted[i]) || !isFiniteNum(rep.Residuals[i]) {
			return bad("the fitted values and residuals", rep.Fitted[i]+rep.Residuals[i])
		}
	}
	return nil
}

// unitsErr is unitsInRange's error for the figure what, of value v (finite:
// too small to keep its digits; not finite: too large).
func unitsErr(what string, v float64) error {
	if isFiniteNum(v) {
		return fmt.Errorf("%w: the readings are too small (or too close together) for %s to be given in their units without losing its digits; rescale the units (for example to milli- or micro-units)", ErrOutOfRange, what)
	}
	return fmt.Errorf("%w: the readings are too large for %s to be given in their units (it exceeds 1.8e308); rescale the units (for example to kilo- or mega-units)", ErrOutOfRange, what)
}

// complete adds the Box–Cox profile (when every y > 0) and the advice to a
// scrubbed report, scrubs them and counts them in the report's note.
func complete(rep *Report, x, y []float64, opt Options, level float64, sc *anScratch) {
	rep.BoxCox = nil
	positive := allPositive(y)
	if positive && anAdviceWorkers > 1 && len(x) >= anParallelMin {
		// The profile is worked out beside the first refits of the advice
		// (when analyze has not already started it); the Box–Cox candidate,
		// which needs it, waits for it (boxCox).
		sc.sharedBoxCox()
		done := make(chan struct{})
		go func() { defer close(done); sc.boxCox(x, y, level) }()
		rep.Advice = adviseWith(x, y, opt, rep, sc)
		<-done
	} else {
		if positive {
			sc.boxCox(x, y, level)
		}
		rep.Advice = adviseWith(x, y, opt, rep, sc)
	}
	if positive {
		if bc, err := sc.boxCox(x, y, level); err == nil {
			rep.BoxCox = bc
		}
	}
	// The spread's "What to do" and the advice say the same.
	if sp := &rep.Assumptions.Spread; adBad(sp.Verdict) {
		sp.Advice = spreadWhatToDo
		if rep.Advice != nil && rep.Advice.Remedy == RemedyNone {
			sp.Advice = spreadNoRemedy
		}
	}
	n := 0
	if rep.BoxCox != nil {
		n += scrubValue(reflect.ValueOf(rep.BoxCox).Elem())
	}
	n += scrubValue(reflect.ValueOf(rep.Advice).Elem())
	if n > 0 {
		notes := append([]string(nil), rep.Notes...)
		if rep.scrubbed > 0 && len(notes) > 0 && notes[len(notes)-1] == scrubNote(rep.scrubbed) {
			notes = notes[:len(notes)-1]
		}
		rep.scrubbed += n
		rep.Notes = append(notes, scrubNote(rep.scrubbed))
	}
}

// checkSpread rejects constant x or constant y.
func checkSpread(x, y []float64) error {
	if allEqual(x) {
		return fmt.Errorf("%w (every x is %s): a slope needs readings at two or more different x values", ErrNoSpreadInX, formatValue(x[0]))
	}
	if allEqual(y) {
		return fmt.Errorf("%w (every y is %s): the instrument shows no response, so there is no line to check", ErrNoSpreadInY, formatValue(y[0]))
	}
	return nil
}

func allEqual(v []float64) bool {
	for _, a := range v[1:] {
		if a != v[0] {
			return false
		}
	}
	return true
}

// scrubReport is the last guard of the no-NaN/Inf promise: any non-finite
// float left anywhere in the report (including the checks) becomes 0 and a
// note says so. It should never fire.
func scrubReport(rep *Report) {
	if n := scrubValue(reflect.ValueOf(rep).Elem()); n > 0 {
		rep.scrubbed = n
		rep.Notes = append(rep.Notes, scrubNote(n))
	}
}

func scrubNote(n int) string {
	return fmt.Sprintf("%d value(s) could not be computed on these readings and are shown as 0.", n)
}

// Complete adds to a report that Analyze made with opt.SkipAdvice what that
// left out, the Box–Cox profile and the transform advice, so that the
// report equals Analyze(x, y, opt) without SkipAdvice. x, y and the other
// options must be those the report was made from. A screen can so show the
// line and its checks at once and the advice a moment later, without
// fitting the readings twice.
func Complete(rep *Report, x, y []float64, opt Options) error {
	if rep == nil {
		return fmt.Errorf("%w: there is no report to complete", ErrBadOption)
	}
	opt.SkipAdvice = false
	o, err := normalizeOptions(opt)
	if err != nil {
		return err
	}
	if err := validatePairs(x, y); err != nil {
		return err
	}
	if len(x) != rep.N {
		return fmt.Errorf("%w: the report was made from %d pairs, not %d", ErrLengthMismatch, rep.N, len(x))
	}
	complete(rep, x, y, opt, o.Level, new(anScratch))
	return nil
}

func scrubValue(v reflect.Value) int {
	switch v.Kind() {
	case reflect.Float64:
		if f := v.Float(); !isFiniteNum(f) {
			if v.CanSet() {
				v.SetFloat(0)
			}
			return 1
		}
	case reflect.Slice:
		if pi, ok := v.Interface().([]PointInfluence); ok {
			n := 0
			for i := range pi {
				p := &pi[i]
				// x − x is 0 for every finite x and NaN otherwise: one
				// test for the six numbers of a reading.
				if s := p.Leverage + p.Residual + p.Studentized + p.OutlierP + p.CooksD + p.DFFITS; s-s == 0 {
					continue
				}
				for _, f := range []*float64{&p.Leverage, &p.Residual, &p.Studentized, &p.OutlierP, &p.CooksD, &p.DFFITS} {
					if !isFiniteNum(*f) {
						*f = 0
						n++
					}
				}
			}
			return n
		}
		if fs, ok := v.Interface().([]float64); ok {
			n := 0
			for i, f := range fs {
				if !isFiniteNum(f) {
					fs[i] = 0
					n++
				}
			}
			return n
		}
		n := 0
		for i := range v.Len() {
			n += scrubValue(v.Index(i))
		}
		return n
	case reflect.Pointer:
		if !v.IsNil() {
			return scrubValue(v.Elem())
		}
	case reflect.Struct:
		n := 0
		for i := range v.NumField() {
			if v.Type().Field(i).IsExported() {
				n += scrubValue(v.Field(i))
			}
		}
		return n
	}
	return 0
}
