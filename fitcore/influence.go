package fitcore

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// Opening words of the influence reasons. Summarize uses them to tell the
// serious findings (outlier, very influential) from the milder ones.
const (
	ckReasonOutlier       = "outlier"
	ckReasonLargeResid    = "large residual"
	ckReasonVeryInfluence = "very influential"
	ckReasonInfluence     = "influential"
	ckReasonDFFITS        = "moves its own fitted value"
	ckReasonVeryLeverage  = "very high leverage"
	ckReasonLeverage      = "high leverage"
	ckReasonLeverageOne   = "leverage 1"
)

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
// A reading is Flagged, with one Reason per finding, on these common-practice
// thresholds: leverage h > 2p/n ("high"), > 3p/n ("very high"); Bonferroni
// p < 0.05 ("outlier"), else |t| > 3 ("large residual"); Cook's D above the
// median of F(p, n−p) ("very influential"), else D > 4/n ("influential");
// |DFFITS| > 2√(p/n). A reading with leverage 1 is flagged because it alone
// fixes the line; its t, D and DFFITS are reported as 0. |t| is capped at
// 1e10 when the other readings lie exactly on a line. With n − p − 1 < 1 the
// studentized residual, outlier p and DFFITS are 0 and 1 (not computable)
// and Cook's distance is reported but not flagged.
//
// Influence returns nil when the inputs are invalid (lengths differ,
// non-finite values, non-positive weights, x without spread) or n ≤ p.
// Cost O(n).
func Influence(x, resid, w []float64, origin bool) []PointInfluence {
	if ckValidate(x, resid, w, "residual") != "" {
		return nil
	}
	n := len(x)
	p := 2
	if origin {
		p = 1
	}
	if n <= p {
		return nil
	}
	h, ok := ckLeverage(x, w, origin)
	if !ok {
		return nil
	}
	nf, pf := float64(n), float64(p)
	r := make([]float64, n)
	var big float64
	for i, e := range resid {
		r[i] = math.Sqrt(ckW(w, i)) * e
		big = math.Max(big, math.Abs(r[i]))
	}
	// Work with r scaled by its largest magnitude so S cannot overflow.
	var sse float64
	if big > 0 {
		for _, v := range r {
			v /= big
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
	fMedian := distuv.F{D1: pf, D2: dfRes}.Quantile(0.5)
	levHigh, levVery := 2*pf/nf, 3*pf/nf
	cookLow := 4 / nf
	dffitsCut := 2 * math.Sqrt(pf/nf)

	out := make([]PointInfluence, n)
	for i := range out {
		pi := PointInfluence{Index: i, Leverage: h[i], Residual: resid[i], OutlierP: 1}
		ri := 0.0
		if big > 0 {
			ri = r[i] / big
		}
		switch {
		case h[i] >= 1-1e-12:
			pi.Leverage = math.Min(h[i], 1)
			pi.Reasons = append(pi.Reasons, fmt.Sprintf("%s: this reading alone fixes the line at its x, so its residual says nothing", ckReasonLeverageOne))
		case sse == 0:
			// All residuals zero: nothing stands out.
		default:
			om := 1 - h[i]
			if s2 > 0 {
				pi.CooksD = ri * ri * h[i] / (pf * s2 * om * om)
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
				pi.DFFITS = t * math.Sqrt(h[i]/om)
			}
		}
		if !ckFinite(pi.CooksD) {
			pi.CooksD = 0
		}
		if !ckFinite(pi.DFFITS) {
			pi.DFFITS = 0
		}
		pi.Reasons = append(pi.Reasons, ckInfluenceReasons(pi, levHigh, levVery, fMedian, cookLow, dffitsCut, dfDel >= 1)...)
		pi.Flagged = len(pi.Reasons) > 0
		out[i] = pi
	}
	return out
}

// ckInfluenceReasons lists the common-practice thresholds one reading exceeds.
func ckInfluenceReasons(pi PointInfluence, levHigh, levVery, fMedian, cookLow, dffitsCut float64, studentOK bool) []string {
	var rs []string
	if pi.Leverage < 1-1e-12 {
		switch {
		case pi.Leverage > levVery:
			rs = append(rs, fmt.Sprintf("%s: h = %.3g > 3p/n = %.3g (its x is far from the others)", ckReasonVeryLeverage, pi.Leverage, levVery))
		case pi.Leverage > levHigh:
			rs = append(rs, fmt.Sprintf("%s: h = %.3g > 2p/n = %.3g (its x is far from the others)", ckReasonLeverage, pi.Leverage, levHigh))
		}
	}
	if studentOK {
		switch {
		case pi.OutlierP < 0.05:
			rs = append(rs, fmt.Sprintf("%s: studentized residual %.3g, Bonferroni p = %.3g < 0.05", ckReasonOutlier, pi.Studentized, pi.OutlierP))
		case math.Abs(pi.Studentized) > 3:
			rs = append(rs, fmt.Sprintf("%s: studentized residual %.3g beyond ±3", ckReasonLargeResid, pi.Studentized))
		}
	}
	switch {
	case !studentOK:
		// With n − p − 1 < 1 there is no scatter left to judge influence by.
	case ckFinite(fMedian) && pi.CooksD > fMedian:
		rs = append(rs, fmt.Sprintf("%s: Cook's distance %.3g > %.3g, the median of F(p, n−p)", ckReasonVeryInfluence, pi.CooksD, fMedian))
	case pi.CooksD > cookLow:
		rs = append(rs, fmt.Sprintf("%s: Cook's distance %.3g > 4/n = %.3g", ckReasonInfluence, pi.CooksD, cookLow))
	}
	if studentOK && math.Abs(pi.DFFITS) > dffitsCut {
		rs = append(rs, fmt.Sprintf("%s: DFFITS %.3g beyond ±2√(p/n) = ±%.3g", ckReasonDFFITS, pi.DFFITS, dffitsCut))
	}
	return rs
}

// ckLeverage returns the hat-matrix diagonal of the weighted straight-line
// fit (see Influence). ok is false when x has no spread (all zero through
// the origin).
func ckLeverage(x, w []float64, origin bool) ([]float64, bool) {
	n := len(x)
	h := make([]float64, n)
	if origin {
		var big float64
		for _, v := range x {
			big = math.Max(big, math.Abs(v))
		}
		if big == 0 {
			return nil, false
		}
		var sxx float64
		for i, v := range x {
			v /= big
			sxx += ckW(w, i) * v * v
		}
		for i, v := range x {
			v /= big
			h[i] = ckW(w, i) * v * v / sxx
		}
		return h, sxx > 0 && ckFinite(sxx)
	}
	var sw, mx float64
	for i, v := range x {
		sw += ckW(w, i)
		mx += ckW(w, i) * v
	}
	mx /= sw
	var sxx float64
	for i, v := range x {
		d := v - mx
		sxx += ckW(w, i) * d * d
	}
	if !(sxx > 0) || !ckFinite(sxx) || !ckFinite(sw) {
		return nil, false
	}
	for i, v := range x {
		d := v - mx
		h[i] = ckW(w, i) * (1/sw + d*d/sxx)
	}
	return h, true
}
