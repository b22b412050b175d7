package fitcore

import (
	"fmt"

	"pairline/app/numfmt"
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
	var b ckSortBuf
	return lackOfFit(x, y, w, origin, b.order(x), nil)
}

// lofShared keeps, for the last x lackOfFit saw, its number of levels,
// where each level ends in ascending order and its x (once asked for), and
// the space y and w are gathered into; ysOf and ysIdx are the y and order
// that ys holds (a refit in the original units has the y of the one
// before, so it is not gathered again).
type lofShared struct {
	x      []float64
	m      int
	ends   []int32
	xl     []float64 // the x of each level
	ys, ws []float64
	ysOf   []float64
	ysIdx  []int32
}

// count returns the number of distinct values of x, in the order idx (nil:
// x in order), working it out only when x is not the slice it saw last.
func (sh *lofShared) count(x []float64, idx []int32) int {
	n := len(x)
	if n > 0 && len(sh.x) == n && &sh.x[0] == &x[0] {
		return sh.m
	}
	sh.x, sh.m, sh.ends, sh.xl = x, 0, nil, nil
	at := lofAt(idx)
	for k := range n {
		if k == 0 || x[at(k)] != x[at(k-1)] {
			sh.m++
		}
	}
	return sh.m
}

// levels returns the end (exclusive) of each run of equal values of x in
// the order idx; count must have been called with the same x and idx.
func (sh *lofShared) levels(x []float64, idx []int32) []int32 {
	if sh.ends != nil {
		return sh.ends
	}
	n := len(x)
	at := lofAt(idx)
	sh.ends = make([]int32, 0, sh.m)
	sh.xl = make([]float64, 0, sh.m)
	start := 0
	for k := 1; k <= n; k++ {
		if k == n || x[at(k)] != x[at(k-1)] {
			sh.ends = append(sh.ends, int32(k))
			sh.xl = append(sh.xl, x[at(start)])
			start = k
		}
	}
	return sh.ends
}

// lofAt maps the k-th position in ascending order to a reading.
func lofAt(idx []int32) func(k int) int {
	if idx == nil {
		return func(k int) int { return k }
	}
	return func(k int) int { return int(idx[k]) }
}

// lackOfFit is LackOfFit with the positions of x in ascending order given
// (equal values in any order): idx[k] is the position of the k-th smallest
// x, and nil idx means x is in ascending order already. Any order that
// sorts x non-decreasingly will do, so the order of x also serves for x
// scaled by a power of two or x on a log scale. sh, when not nil, keeps the
// levels of x and a work space between calls with the same x (the
// advice's refits of y on a new scale).
func lackOfFit(x, y, w []float64, origin bool, idx []int32, sh *lofShared) *Check {
	const name = "Lack of fit"
	n := len(x)
	if sh == nil || (sh.x != nil && (len(sh.x) != n || n == 0 || &sh.x[0] != &x[0])) {
		// What sh keeps is for the first x it saw (see anScratch.prepare).
		sh = new(lofShared)
	}
	m := sh.count(x, idx)
	npar := 2
	if origin {
		npar = 1
	}
	dfPE, dfLOF := n-m, m-npar
	if dfPE <= 0 || dfLOF <= 0 {
		return nil
	}
	b0, b1, ok := ckLineCoef(x, y, w, origin)
	if !ok {
		c := ckNA(name, "All x values are the same, so no line can be fitted.")
		return &c
	}
	// y and w in the order of x, gathered once, so that the sums below
	// read them in sequence.
	ys, ws := y, w
	if idx != nil {
		if len(sh.ysOf) != n || &sh.ysOf[0] != &y[0] || &sh.ysIdx[0] != &idx[0] || len(sh.ys) < n {
			sh.ys = ckGrowF64(sh.ys, n)
			for k, i := range idx[:n] {
				sh.ys[k] = y[i]
			}
			// (Holding y here also keeps its memory from being reused
			// for another slice while ys describes it.)
			sh.ysOf, sh.ysIdx = y, idx
		}
		ys = sh.ys[:n]
		if w != nil {
			sh.ws = ckGrowF64(sh.ws, n)
			ws = sh.ws[:n]
			for k, i := range idx[:n] {
				ws[k] = w[i]
			}
		}
	}
	var ssPE, ssLOF, ssY float64
	start := 0
	ends := sh.levels(x, idx)
	xl := sh.xl
	for l, e := range ends {
		end := int(e)
		if ws == nil && end == start+1 {
			// A single unweighted reading is its own mean: the general
			// sums below give exactly these (w = 1, d = 0).
			v := ys[start]
			ssY += v * v
			d := v - (b0 + b1*xl[l])
			ssLOF += d * d
			start = end
			continue
		}
		var sw, sy float64
		for k := start; k < end; k++ {
			wi := ckW(ws, k)
			sw += wi
			sy += wi * ys[k]
		}
		mean := sy / sw
		for k := start; k < end; k++ {
			d := ys[k] - mean
			ssPE += ckW(ws, k) * d * d
			ssY += ckW(ws, k) * ys[k] * ys[k]
		}
		d := mean - (b0 + b1*xl[l])
		ssLOF += sw * d * d
		start = end
	}
	if !ckFinite(ssPE) || !ckFinite(ssLOF) {
		c := ckNA(name, "The readings are too large to compare the line with the repeats.")
		return &c
	}
	if ssPE <= NoScatterTol*NoScatterTol*ssY { // the one no-scatter tolerance, on the repeats
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
		c.Message = fmt.Sprintf("The line misses the averages of the repeat readings by more than their scatter explains (F = %s, %s).", numfmt.Short(f, 3), ckFmtP(p))
	case Warn:
		c.Message = fmt.Sprintf("The line may miss the averages of the repeat readings by more than their scatter explains (F = %s, %s).", numfmt.Short(f, 3), ckFmtP(p))
	default:
		c.Message = fmt.Sprintf("The line passes through the averages of the repeat readings within their scatter (F = %s, %s).", numfmt.Short(f, 3), ckFmtP(p))
	}
	return &c
}
