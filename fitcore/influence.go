package fitcore

import (
	"pairline/app/numfmt"

	"math"
	"math/bits"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"
)

// Opening words of the influence reasons. Summarize uses them to tell the
// serious findings (outlier, very influential) from the milder ones.
const (
	ckReasonOutlier       = "outlier"
	ckReasonLargeResid    = "out of line"
	ckReasonVeryInfluence = "very influential"
	ckReasonInfluence     = "influential"
	ckReasonDFFITS        = "moves its own fitted value"
	ckReasonVeryLeverage  = "very high leverage"
	ckReasonLeverage      = "high leverage"
	ckReasonLeverageOne   = "leverage 1"
)

// OutlierFailP and OutlierWarnP are the Bonferroni-corrected p values
// (n · two-sided p of the externally studentized residual with n − p − 1
// df; Cook & Weisberg 1982, §2.2) below which a reading fails or warns the
// influence check. With the correction the chance that good data give any
// such flag is at most OutlierFailP and OutlierWarnP per record.
const (
	OutlierFailP = 0.01
	OutlierWarnP = 0.05
)

// InfluenceCookQuantile is the F(p, n−p) quantile Cook's distance must pass
// for a reading to count as moving the line by more than its uncertainty:
// the estimate without it lies outside the line's 90 % joint confidence
// region (Cook 1977).
const InfluenceCookQuantile = 0.9

// ckStudentCap bounds |t| when the other readings fit their line exactly, so
// that the externally studentized residual stays finite.
const ckStudentCap = 1e10

// Influence returns the case diagnostics of every reading for the straight
// line with intercept (or through the origin when origin is true; p = 2 or 1
// parameters), weighted with w (nil = unweighted). resid are the raw residuals
// e_i = y_i − ŷ_i of that fit. With r_i = √w_i·e_i, S = Σ r_i², s² = S/(n−p):
//
//	leverage      h_i = w_i (1/Σw + (x_i − x̄_w)²/Σ w (x − x̄_w)²)   (origin: w_i x_i²/Σ w x²)
//	deleted s     s_(i)² = (S − r_i²/(1 − h_i)) / (n − p − 1)
//	studentized   t_i = r_i / (s_(i) √(1 − h_i))                 (externally)
//	outlier p     min(1, n · 2·P(T_{n−p−1} > |t_i|))              (Bonferroni)
//	Cook's D      D_i = r_i² h_i / (p s² (1 − h_i)²)
//	DFFITS        t_i √(h_i/(1 − h_i))
//
// Sources: Belsley, Kuh & Welsch, Regression Diagnostics (1980), ch. 2; Cook,
// "Detection of influential observation in linear regression", Technometrics
// 19 (1977); Cook & Weisberg, Residuals and Influence in Regression (1982),
// §2.2 (outlier test with Bonferroni bound). These equal statsmodels'
// OLSInfluence and outlier_test(method='bonf') for the fit of √w·y on √w·X.
//
// A reading is Flagged, with one Reason per finding, on these rules (tuned
// by simulation, TestOperatingCharacteristic; DEVELOPERS.md "How the checks
// decide"):
//
//	outlier            Bonferroni p < OutlierFailP (1 %): the influence check fails
//	large residual     Bonferroni p < OutlierWarnP (5 %): it warns
//	very influential   Cook's D above the F(p, n−p) 90 % point: deleting the
//	                   reading moves the line beyond its 90 % joint confidence
//	                   region (Cook 1977, §3): it warns
//	leverage 1         it alone fixes the line; its t, D and DFFITS are 0: it warns
//
// Leverage, Cook's distance below that point and DFFITS are shown as
// numbers, never a flag: a top standard far from the others has a high
// leverage by design. |t| is capped at 1e10 when the other readings lie
// exactly on a line. With n − p − 1 < 1 the studentized residual, outlier
// p and DFFITS are 0 and 1 (not computable) and Cook's distance is reported
// but not flagged.
//
// Influence returns nil when the inputs are invalid (lengths differ,
// non-finite values, non-positive weights, x without spread) or n ≤ p.
// Cost O(n).
func Influence(x, resid, w []float64, origin bool) []PointInfluence {
	return influence(x, resid, w, origin, false)
}

// influence is Influence; valid says the inputs are already known to be
// valid.
func influence(x, resid, w []float64, origin, valid bool) []PointInfluence {
	out, _ := influenceRun(x, resid, w, nil, origin, valid, true)
	return out
}

// influenceSummary is Summarize's influence assumption for Influence(x,
// resid, w, origin), found without keeping the per-reading results.
//
// lc, when not nil, keeps the leverages' sums of the first unweighted x
// it is asked about, for the refits of the advice that share that x.
func influenceSummary(x, resid, w, pr []float64, origin, valid bool, lc *ckLevCache) Assumption {
	_, masks := influenceRunWith(x, resid, w, pr, origin, valid, inflMasks, lc)
	return ckInfluenceFromMasks(masks)
}

// ckLevCache keeps ckNewLeverage(x, nil, origin) for one x (the slice).
type ckLevCache struct {
	lev ckLev
	ok  bool
}

// leverage returns ckNewLeverage(x, w, origin), from c when it holds the
// same unweighted x (c nil: nothing is kept). What c keeps is for the
// first x asked about (see anScratch.prepare).
func (c *ckLevCache) leverage(x, w []float64, origin bool) (ckLev, bool) {
	if c == nil || w != nil || len(x) == 0 {
		return ckNewLeverage(x, w, origin)
	}
	if l := &c.lev; len(l.x) == len(x) && &l.x[0] == &x[0] && l.w == nil && l.origin == origin {
		return c.lev, c.ok
	}
	lev, ok := ckNewLeverage(x, nil, origin)
	if c.lev.x == nil {
		c.lev, c.ok = lev, ok
	}
	return lev, ok
}

// ckInfluenceFromMasks is ckSummarizeInfluence from the reason bits of
// influenceRun (nil: Influence gave no results).
func ckInfluenceFromMasks(masks []uint8) Assumption {
	if masks == nil {
		return ckInfluenceNA()
	}
	const seriousBits = 1 << ckBitOutlier
	var serious, mild []int
	for i, m := range masks {
		switch {
		case m&seriousBits != 0:
			serious = append(serious, i+1)
		case m != 0:
			mild = append(mild, i+1)
		}
	}
	return ckWordInfluence(serious, mild)
}

// influenceRun computes the diagnostics of Influence and the bits of the
// reasons of every reading (masks; nil when Influence returns nil). With
// keep it also returns the per-reading results with their reasons
// written; without, only the bits. The stages: check the input, set up
// the scaled residuals and the t distribution of the deleted fits
// (newInfluenceStats), work out each reading (point), then write the
// reasons of the flagged readings into one buffer (writeInfluenceReasons).
// pr, when not nil, holds the Pearson residuals √w_i·e_i as the checks
// made them (math.Sqrt(w[i])·resid[i], the same expression, so the same
// bits), read instead of being worked out again.
func influenceRun(x, resid, w, pr []float64, origin, valid, keep bool) (out []PointInfluence, masks []uint8) {
	mode := inflMasks
	if keep {
		mode = inflAll
	}
	return influenceRunWith(x, resid, w, pr, origin, valid, mode, nil)
}

// What influenceRunWith returns besides the bits of the reasons.
const (
	inflMasks   = iota // nothing else
	inflAll            // every reading's diagnostics
	inflFlagged        // the diagnostics of the flagged readings only, in input order
)

// influenceRunWith is influenceRun with the leverages' sums from lc (see
// influenceSummary), returning what mode says. Without every reading's
// diagnostics, a reading that certainly has no reason (quiet) is skipped.
func influenceRunWith(x, resid, w, pr []float64, origin, valid bool, mode int, lc *ckLevCache) (out []PointInfluence, masks []uint8) {
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
	lev, ok := lc.leverage(x, w, origin)
	if !ok {
		return nil, nil
	}
	st := newInfluenceStats(resid, w, pr, float64(n), float64(p))
	keep := mode == inflAll
	if keep {
		out = make([]PointInfluence, n)
	}
	// Which reasons each reading has, as bits; the texts are written
	// afterwards into one buffer sized for them all.
	masks = make([]uint8, n)
	nReasons := 0
	var tmp PointInfluence
	var q ckQuiet
	if !keep {
		q = st.quietBounds(&lev)
	}
	for i := range n {
		pi := &tmp
		if keep {
			pi = &out[i]
		} else if q.ok && st.quiet(&q, &lev, i) {
			continue
		}
		if m := st.point(pi, i, lev.at(i)); m != 0 {
			masks[i] = m
			pi.Flagged = true
			nReasons += bits.OnesCount8(m)
			if mode == inflFlagged {
				out = append(out, *pi)
			}
		}
	}
	if mode != inflMasks && nReasons > 0 {
		writeInfluenceReasons(out, masks, nReasons, &st.cut)
	}
	return out, masks
}

// ckInfluenceStats is what every reading's diagnostics share: the
// residuals r_i = √w_i·e_i scaled by their largest magnitude big (so that
// S = Σ(r_i/big)² cannot overflow), s² = S/(n − p), the degrees of freedom
// of a deleted fit, the t distribution with them and the thresholds.
type ckInfluenceStats struct {
	resid, w    []float64
	pr          []float64 // the Pearson residuals the checks made, or nil (r works them out)
	big, sse    float64
	nf, pf, s2  float64
	dfDel, tOne float64
	tdist       distuv.StudentsT
	cut         ckInfluenceCuts
}

// newInfluenceStats sets up the shared part of influenceRun for n = nf
// readings and p = pf parameters.
func newInfluenceStats(resid, w, pr []float64, nf, pf float64) ckInfluenceStats {
	st := ckInfluenceStats{resid: resid, w: w, nf: nf, pf: pf}
	if w != nil && len(pr) == len(resid) {
		st.pr = pr
	}
	for i := range resid {
		st.big = absMax(st.big, st.r(i))
	}
	if st.big > 0 {
		for i := range resid {
			v := st.r(i) / st.big
			st.sse += v * v
		}
	}
	dfRes := nf - pf
	st.s2 = st.sse / dfRes
	st.dfDel = dfRes - 1
	// Below |t| = tOne the Bonferroni p, n·2·P(T > |t|), is at least 1 and
	// so exactly 1 after capping: skip the incomplete-beta call there.
	if st.dfDel >= 1 {
		st.tdist = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: st.dfDel}
		st.tOne = st.tdist.Quantile(1 - 1/(2*nf))
		if !ckFinite(st.tOne) {
			st.tOne = 0
		}
	}
	st.cut = newInfluenceCuts(pf, nf, dfRes, st.dfDel >= 1)
	return st
}

// r is r_i = √w_i·e_i (e_i without weights).
func (st *ckInfluenceStats) r(i int) float64 {
	if st.w == nil {
		return st.resid[i]
	}
	if st.pr != nil {
		return st.pr[i]
	}
	return math.Sqrt(st.w[i]) * st.resid[i]
}

// point writes reading i's diagnostics (leverage h) into pi, all but its
// reasons, and returns the bits of the reasons it is flagged for.
func (st *ckInfluenceStats) point(pi *PointInfluence, i int, h float64) uint8 {
	pi.Index, pi.Leverage, pi.Residual, pi.OutlierP = i, h, st.resid[i], 1
	pi.CooksD, pi.Studentized, pi.DFFITS = 0, 0, 0
	var m uint8
	switch {
	case h >= 1-1e-12:
		pi.Leverage = math.Min(h, 1)
		m = 1 << ckBitLeverageOne
	case st.sse == 0:
		// All residuals zero: nothing stands out.
	default:
		st.deleted(pi, i, h)
	}
	if !ckFinite(pi.CooksD) {
		pi.CooksD = 0
	}
	if !ckFinite(pi.DFFITS) {
		pi.DFFITS = 0
	}
	return m | st.cut.mask(pi)
}

// ckQuiet holds what quiet needs: the readings' bounds below which no
// reason can be found, each 1e-9 (relative) inside the threshold it
// stands for, and the reciprocals of the sums of the leverage.
type ckQuiet struct {
	ok           bool
	ib2          float64 // 1/big²
	hMax         float64 // bound on h: below it, no leverage 1
	cookK        float64 // 1/(p·s²): D ≈ r²·ib2·h·cookK/(1 − h)²
	cookMax      float64 // bound on D, or +Inf when Cook's D flags nothing
	t2Max        float64 // bound on t², or +Inf when t flags nothing
	isw, isxx    float64 // 1/Σw and 1/Sxx (origin: 1/(big_x²·Sxx))
	useT, useCoo bool
}

// quietBounds sets up quiet; ok is false when it cannot be used (every
// reading then goes through point).
func (st *ckInfluenceStats) quietBounds(l *ckLev) ckQuiet {
	const margin = 1 - 1e-9
	q := ckQuiet{hMax: (1 - 1e-12) * margin, cookMax: math.Inf(1), t2Max: math.Inf(1)}
	if st.sse == 0 || !(st.big > 0) || !(st.s2 > 0) || !ckFinite(st.sse) {
		return q
	}
	q.ib2 = 1 / (st.big * st.big)
	q.cookK = 1 / (st.pf * st.s2)
	if l.origin {
		q.isxx = 1 / (l.big * l.big * l.sxx)
	} else {
		q.isw, q.isxx = 1/l.sw, 1/l.sxx
	}
	if st.cut.studentOK && ckFinite(st.cut.fMedian) {
		q.cookMax, q.useCoo = st.cut.fMedian*margin, true
	}
	if st.dfDel >= 1 {
		if !(st.tOne > 0) {
			return q // every t goes through the t distribution
		}
		q.t2Max, q.useT = st.tOne*st.tOne*margin, true
	}
	q.ok = ckFinite(q.ib2) && ckFinite(q.cookK) && ckFinite(q.isw) && ckFinite(q.isxx) && q.ib2 > 0
	return q
}

// quiet says that reading i certainly has no reason (point would return
// 0): its leverage, Cook's distance and studentized residual, worked out
// with products instead of point's quotients and square roots (within a
// few units in the last place of point's), are each 1e-9 or more inside
// their thresholds. A reading near a threshold, or with any figure not
// finite, is not quiet and goes through point, so the reasons found are
// exactly point's.
func (st *ckInfluenceStats) quiet(q *ckQuiet, l *ckLev, i int) bool {
	var h float64
	v := l.x[i]
	if l.origin {
		h = ckW(l.w, i) * v * v * q.isxx
	} else {
		d := v - l.mx
		h = ckW(l.w, i) * (q.isw + d*d*q.isxx)
	}
	if !(h < q.hMax) {
		return false
	}
	r := st.r(i)
	r2 := r * r * q.ib2 // (r/big)²
	om := 1 - h
	if q.useCoo && !(r2*h*q.cookK < q.cookMax*om*om) {
		return false
	}
	// t² = r2/(s²₍ᵢ₎(1−h)), s²₍ᵢ₎(1−h) = (S(1−h) − r2)/(n−p−1).
	return !q.useT || r2*st.dfDel < q.t2Max*(st.sse*om-r2)
}

// deleted works out Cook's distance, the externally studentized residual
// t (capped at ±ckStudentCap), its Bonferroni p and DFFITS of reading i
// with leverage h < 1:
//
//	D = r²h/(p·s²·(1−h)²),  s²₍ᵢ₎ = (S − r²/(1−h))/(n−p−1),
//	t = r/√(s²₍ᵢ₎(1−h)),  DFFITS = t·√(h/(1−h))
//
// (r and S scaled by big, which cancels in every ratio).
func (st *ckInfluenceStats) deleted(pi *PointInfluence, i int, h float64) {
	ri := 0.0
	if st.big > 0 {
		ri = st.r(i) / st.big
	}
	om := 1 - h
	if st.s2 > 0 {
		pi.CooksD = ri * ri * h / (st.pf * st.s2 * om * om)
	}
	if st.dfDel < 1 {
		return
	}
	sd2 := (st.sse - ri*ri/om) / st.dfDel
	var t float64
	if sd2 > 1e-24*st.sse {
		t = ri / math.Sqrt(sd2*om)
	} else if ri != 0 {
		t = math.Copysign(ckStudentCap, ri)
	}
	if math.Abs(t) > ckStudentCap {
		t = math.Copysign(ckStudentCap, t)
	}
	pi.Studentized = t
	if math.Abs(t) > st.tOne {
		pi.OutlierP = ckClampP(st.nf * 2 * st.tdist.Survival(math.Abs(t)))
	}
	pi.DFFITS = t * math.Sqrt(h/om)
}

// writeInfluenceReasons writes the reasons of every flagged reading of out
// (its bits in masks, nReasons in all) into one buffer.
func writeInfluenceReasons(out []PointInfluence, masks []uint8, nReasons int, cut *ckInfluenceCuts) {
	rw := newReasonWriter(nReasons)
	for i := range out {
		if m := masks[out[i].Index]; m != 0 {
			out[i].Reasons = rw.write(&out[i], m, cut)
		}
	}
}

// The reasons Influence can give a reading, in the order they are listed.
const (
	ckBitLeverageOne = iota
	ckBitVeryLeverage
	ckBitLeverage
	ckBitOutlier
	ckBitLargeResid
	ckBitVeryInfluence
	ckBitInfluence
	ckBitDFFITS
)

// ckInfluenceCuts are the common-practice thresholds of Influence, with
// the text that shows each one.
type ckInfluenceCuts struct {
	levHigh, levVery float64
	fMedian, cookLow float64
	dffitsCut        float64
	studentOK        bool
	levHighTxt       string
	levVeryTxt       string
	fMedianTxt       string
	cookLowTxt       string
	dffitsTxt        string
}

func newInfluenceCuts(pf, nf, dfRes float64, studentOK bool) ckInfluenceCuts {
	c := ckInfluenceCuts{
		levHigh: 2 * pf / nf, levVery: 3 * pf / nf,
		fMedian:   distuv.F{D1: pf, D2: dfRes}.Quantile(InfluenceCookQuantile),
		cookLow:   4 / nf,
		dffitsCut: 2 * math.Sqrt(pf/nf),
		studentOK: studentOK,
	}
	c.levHighTxt = " > 2p/n = " + ckG3(c.levHigh) + " (its x is far from the others)"
	c.levVeryTxt = " > 3p/n = " + ckG3(c.levVery) + " (its x is far from the others)"
	c.fMedianTxt = " > " + ckG3(c.fMedian) + ", the 90 % point of F(p, n−p): without it the line moves beyond its 90 % confidence region"
	c.cookLowTxt = " > 4/n = " + ckG3(c.cookLow)
	c.dffitsTxt = " beyond ±2√(p/n) = ±" + ckG3(c.dffitsCut)
	return c
}

// ckG3 formats v as fmt's %.3g does.
func ckG3(v float64) string { return strconv.FormatFloat(v, 'g', 3, 64) }

// mask returns the bits of the thresholds one reading exceeds (all but
// leverage 1, which Influence sets itself).
func (c *ckInfluenceCuts) mask(pi *PointInfluence) uint8 {
	var m uint8
	if c.studentOK {
		switch {
		case pi.OutlierP < OutlierFailP:
			m |= 1 << ckBitOutlier
		case pi.OutlierP < OutlierWarnP:
			m |= 1 << ckBitLargeResid
		}
	}
	if c.studentOK && ckFinite(c.fMedian) && pi.CooksD > c.fMedian {
		m |= 1 << ckBitVeryInfluence
	}
	return m
}

// ckReasonWriter writes reason texts one after another into one buffer
// and hands out each as a substring, so a long record costs a handful of
// allocations; slab holds the strings of all readings.
type ckReasonWriter struct {
	sb   strings.Builder
	slab []string
	num  [32]byte
}

func newReasonWriter(nReasons int) *ckReasonWriter {
	rw := &ckReasonWriter{slab: make([]string, 0, nReasons)}
	rw.sb.Grow(nReasons * 96)
	return rw
}

// g3 writes v to 3 significant digits.
//
//go:noinline
func (rw *ckReasonWriter) g3(v float64) {
	rw.sb.Write(strconv.AppendFloat(rw.num[:0], v, 'g', 3, 64))
}

// s writes each of parts. It and g3 are not inlined: in the browser build
// write's nine wordings with them inlined cost about 8 kB of app.wasm, and
// write runs once per flagged reading.
//
//go:noinline
func (rw *ckReasonWriter) s(parts ...string) {
	for _, p := range parts {
		rw.sb.WriteString(p)
	}
}

// write returns the reasons of one reading for the bits m. The wording of
// each is part of the report.
func (rw *ckReasonWriter) write(pi *PointInfluence, m uint8, c *ckInfluenceCuts) []string {
	first := len(rw.slab)
	for b := range 8 {
		if m&(1<<b) == 0 {
			continue
		}
		start := rw.sb.Len()
		switch b {
		case ckBitLeverageOne:
			rw.s(ckReasonLeverageOne + ": this reading alone fixes the line at its x, so its residual says nothing")
		case ckBitVeryLeverage:
			rw.s(ckReasonVeryLeverage + ": h = ")
			rw.g3(pi.Leverage)
			rw.s(c.levVeryTxt)
		case ckBitLeverage:
			rw.s(ckReasonLeverage + ": h = ")
			rw.g3(pi.Leverage)
			rw.s(c.levHighTxt)
		case ckBitOutlier:
			// As a technician reads numbers (app/numfmt): one minus
			// sign, one p format ("p < 0.001").
			rw.s(ckReasonOutlier+": studentized residual ", numfmt.Sig(pi.Studentized, 3),
				", Bonferroni ", numfmt.PEq(pi.OutlierP), " (limit 0.01)")
		case ckBitLargeResid:
			// As a technician reads numbers (app/numfmt): one minus
			// sign, one p format ("p < 0.001").
			rw.s(ckReasonLargeResid+": studentized residual ", numfmt.Sig(pi.Studentized, 3),
				", Bonferroni ", numfmt.PEq(pi.OutlierP), " (limit 0.05)")
		case ckBitVeryInfluence:
			rw.s(ckReasonVeryInfluence + ": Cook's distance ")
			rw.g3(pi.CooksD)
			rw.s(c.fMedianTxt)
		case ckBitInfluence:
			rw.s(ckReasonInfluence + ": Cook's distance ")
			rw.g3(pi.CooksD)
			rw.s(c.cookLowTxt)
		case ckBitDFFITS:
			rw.s(ckReasonDFFITS + ": DFFITS ")
			rw.g3(pi.DFFITS)
			rw.s(c.dffitsTxt)
		}
		// Builder never changes bytes already written, so the substring
		// stays valid (and, within the size grown for, shares the buffer).
		rw.slab = append(rw.slab, rw.sb.String()[start:])
	}
	return rw.slab[first:len(rw.slab):len(rw.slab)]
}

// ckLev gives the hat-matrix diagonal of the weighted straight-line fit
// (see Influence) at any reading, from a few sums.
type ckLev struct {
	x, w     []float64
	origin   bool
	big, sxx float64 // origin: x scaled by its largest magnitude
	sw, mx   float64
}

// ckNewLeverage takes the sums behind the leverages; ok is false when x has
// no spread (all zero through the origin).
func ckNewLeverage(x, w []float64, origin bool) (ckLev, bool) {
	l := ckLev{x: x, w: w, origin: origin}
	if origin {
		for _, v := range x {
			l.big = absMax(l.big, v)
		}
		if l.big == 0 {
			return l, false
		}
		for i, v := range x {
			v /= l.big
			l.sxx += ckW(w, i) * v * v
		}
		return l, l.sxx > 0 && ckFinite(l.sxx)
	}
	for i, v := range x {
		l.sw += ckW(w, i)
		l.mx += ckW(w, i) * v
	}
	l.mx /= l.sw
	for i, v := range x {
		d := v - l.mx
		l.sxx += ckW(w, i) * d * d
	}
	return l, l.sxx > 0 && ckFinite(l.sxx) && ckFinite(l.sw)
}

// at is the leverage h_i.
func (l *ckLev) at(i int) float64 {
	v := l.x[i]
	if l.origin {
		v /= l.big
		return ckW(l.w, i) * v * v / l.sxx
	}
	d := v - l.mx
	return ckW(l.w, i) * (1/l.sw + d*d/l.sxx)
}
