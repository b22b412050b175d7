package fitcore

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"pairline/app/numfmt"
)

// TestLackOfFitAgainstBefore: lackOfFit with a shared lofShared (the x of
// each level kept, y gathered in the order of x once for the refits in the
// original units, single unweighted readings taken on their own) gives bit
// for bit the statistic, p, degrees of freedom and message of the code
// before, on random records: x in and out of order, with and without
// weights, few and many repeats, through the origin or not, and several
// calls on one x in a row as the advice's refits make them: a new y, then
// the y of an earlier call again (from the kept gathered copy), with and
// without weights.
func TestLackOfFitAgainstBefore(t *testing.T) {
	r := rand.New(rand.NewPCG(21, 12))
	for trial := range 300 {
		n := 6 + r.IntN(3000)
		levels := 2 + r.IntN(n)
		x := make([]float64, n)
		for i := range x {
			x[i] = float64(r.IntN(levels)) * 0.37
			if trial%4 == 0 {
				x[i] = float64(i/3) * 0.37 // in order
			}
		}
		var sb ckSortBuf
		idx := ckSortOrNil(&sb, x)
		var sh lofShared
		origin := trial%5 == 0
		var first []float64
		for call := range 5 {
			y := make([]float64, n)
			var w []float64
			for i := range y {
				y[i] = 1 + 0.5*x[i] + 0.01*x[i]*x[i]*float64(call) + r.NormFloat64()*0.1
			}
			if call == 0 {
				first = y
			} else if call >= 3 {
				y = first // the y of the first call again
			}
			if call%2 == 1 {
				w = make([]float64, n)
				for i := range w {
					w[i] = 0.5 + r.Float64()
				}
			}
			got := lackOfFit(x, y, w, origin, idx, &sh)
			want := lackOfFitBefore(x, y, w, origin, idx, new(lofShared))
			if (got == nil) != (want == nil) {
				t.Fatalf("trial %d call %d: nil %v, before nil %v", trial, call, got == nil, want == nil)
			}
			if got == nil {
				continue
			}
			if math.Float64bits(got.Statistic) != math.Float64bits(want.Statistic) || math.Float64bits(got.P) != math.Float64bits(want.P) ||
				got.DF != want.DF || got.DF2 != want.DF2 || got.Message != want.Message || got.Verdict != want.Verdict {
				t.Fatalf("trial %d call %d: F %v p %v (%s), before F %v p %v (%s)", trial, call, got.Statistic, got.P, got.Message, want.Statistic, want.P, want.Message)
			}
		}
	}
}

// ckSortOrNil is the order of x as the analysis gives it (nil when x is in
// order).
func ckSortOrNil(sb *ckSortBuf, x []float64) []int32 {
	if ckAscending(x) {
		return nil
	}
	return append([]int32(nil), sb.order(x)...)
}

// lackOfFitBefore is lackOfFit as it was before it kept the x of each
// level and the gathered y, and took single unweighted readings on their
// own (the oracle of TestLackOfFitAgainstBefore). lackOfFit was LackOfFit with the positions of x in ascending order given
// (equal values in any order): idx[k] is the position of the k-th smallest
// x, and nil idx means x is in ascending order already. Any order that
// sorts x non-decreasingly will do, so the order of x also serves for x
// scaled by a power of two or x on a log scale. sh, when not nil, keeps the
// levels of x and a work space between calls with the same x (the
// advice's refits of y on a new scale).
func lackOfFitBefore(x, y, w []float64, origin bool, idx []int32, sh *lofShared) *Check {
	const name = "Lack of fit"
	n := len(x)
	if sh == nil {
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
		sh.ys = ckGrowF64(sh.ys, n)
		ys = sh.ys[:n]
		for k, i := range idx[:n] {
			ys[k] = y[i]
		}
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
	for _, e := range sh.levels(x, idx) {
		end := int(e)
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
		xg := x[start]
		if idx != nil {
			xg = x[idx[start]]
		}
		d := mean - (b0 + b1*xg)
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
