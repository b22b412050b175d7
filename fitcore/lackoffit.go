package fitcore

import (
	"fmt"
	"sort"
)

// LackOfFit is the lack-of-fit F test of a straight line against pure error,
// possible when some x values are repeated. With m distinct x levels, group
// weights W_g = Σ_{i∈g} w_i, group means ȳ_g and the fitted line ŷ(x),
//
//	SS_pe  = Σ_g Σ_{i∈g} w_i (y_i − ȳ_g)²,     df_pe  = n − m
//	SS_lof = Σ_g W_g (ȳ_g − ŷ(x_g))²,          df_lof = m − p
//	F = (SS_lof/df_lof) / (SS_pe/df_pe),        p = P(F(df_lof, df_pe) > F)
//
// where p = 2 parameters (p = 1 when origin is true: the line y = b1·x) and
// w nil means all weights 1. SS_lof + SS_pe is the residual sum of squares of
// the line; computing SS_lof from the group means keeps it non-negative.
// Source: Draper & Smith, Applied Regression Analysis, 3rd ed. 1998, §2.1;
// NIST/SEMATECH e-Handbook of Statistical Methods §4.4.4.3 ("lack-of-fit
// test"), worked on the LOADCELL data in §2.3.6.
//
// x values count as repeats only when exactly equal. LackOfFit returns nil
// when no x value repeats, or when df_lof or df_pe would be 0. It returns an
// NA check (with the reason) for invalid input or when the repeat readings
// agree exactly, so that there is no pure error to compare with.
//
// Verdict (common practice): p < 0.01 fails, p < 0.05 warns.
func LackOfFit(x, y, w []float64, origin bool) *Check {
	const name = "Lack of fit"
	if s := ckValidate(x, y, w, "y value"); s != "" {
		c := ckNA(name, s)
		return &c
	}
	n := len(x)
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return x[idx[a]] < x[idx[b]] })
	m := 0
	for k := range idx {
		if k == 0 || x[idx[k]] != x[idx[k-1]] {
			m++
		}
	}
	npar := 2
	if origin {
		npar = 1
	}
	dfPE, dfLOF := n-m, m-npar
	if dfPE <= 0 || dfLOF <= 0 {
		return nil
	}
	b0, b1, _, ok := ckLine(x, y, w, origin)
	if !ok {
		c := ckNA(name, "All x values are the same, so no line can be fitted.")
		return &c
	}
	var ssPE, ssLOF, ssY float64
	for start := 0; start < n; {
		end := start + 1
		for end < n && x[idx[end]] == x[idx[start]] {
			end++
		}
		var sw, sy float64
		for _, i := range idx[start:end] {
			wi := ckW(w, i)
			sw += wi
			sy += wi * y[i]
		}
		mean := sy / sw
		for _, i := range idx[start:end] {
			d := y[i] - mean
			ssPE += ckW(w, i) * d * d
			ssY += ckW(w, i) * y[i] * y[i]
		}
		d := mean - (b0 + b1*x[idx[start]])
		ssLOF += sw * d * d
		start = end
	}
	if !ckFinite(ssPE) || !ckFinite(ssLOF) {
		c := ckNA(name, "The readings are too large to compare the line with the repeats.")
		return &c
	}
	if ssPE <= 1e-28*ssY {
		c := ckNA(name, "The repeat readings agree exactly, so there is no repeat scatter to compare the line with.")
		c.DF, c.DF2 = float64(dfLOF), float64(dfPE)
		return &c
	}
	f := (ssLOF / float64(dfLOF)) / (ssPE / float64(dfPE))
	p := ckFSF(f, float64(dfLOF), float64(dfPE))
	c := Check{Name: name, Statistic: f, DF: float64(dfLOF), DF2: float64(dfPE), P: p,
		Verdict: ckVerdict(p, ckWarnP, ckFailP)}
	switch c.Verdict {
	case Fail:
		c.Message = fmt.Sprintf("The line misses the averages of the repeat readings by more than their scatter explains (F = %.3g, %s).", f, ckFmtP(p))
	case Warn:
		c.Message = fmt.Sprintf("The line may miss the averages of the repeat readings by more than their scatter explains (F = %.3g, %s).", f, ckFmtP(p))
	default:
		c.Message = fmt.Sprintf("The line passes through the averages of the repeat readings within their scatter (F = %.3g, %s).", f, ckFmtP(p))
	}
	return &c
}
