package plot

import "math"

// Thin chooses at most maxDraw of the n points (xs[i], ys[i]) to draw,
// returned as increasing indexes. Drawing only, never statistics: with n ≤
// maxDraw every index is returned. Otherwise it keeps, in this order, the
// points keep(i) reports (flagged or left-out readings, the selected one),
// the extremes of x and y, one point from each cell of a grid laid over the
// data (so that isolated points and the outline survive), and then evenly
// spaced points of the rest until the budget is used. The choice is
// deterministic. keep may be nil; xs and ys must have n entries (shorter
// slices are treated as non-finite values). The cost is linear in n.
func Thin(n, maxDraw int, xs, ys []float64, keep func(i int) bool) []int {
	if n <= 0 {
		return nil
	}
	maxDraw = max(maxDraw, 1)
	if n <= maxDraw {
		out := make([]int, n)
		for i := range out {
			out[i] = i
		}
		return out
	}
	t := &thinning{n: n, budget: maxDraw, chosen: make([]bool, n)}
	t.keepMarked(keep)
	t.keepExtremes(xs, ys)
	t.keepOnePerCell(xs, ys)
	t.fillEvenly()
	return t.indexes()
}

// thinning is the choice Thin builds up, stage by stage: which of the n
// points are chosen so far, and how many of the budget that used.
type thinning struct {
	n, budget int
	chosen    []bool
	count     int
}

// take chooses point i, unless it is out of range, already chosen or the
// budget is used up.
func (t *thinning) take(i int) {
	if i >= 0 && i < t.n && !t.chosen[i] && t.count < t.budget {
		t.chosen[i] = true
		t.count++
	}
}

// keepMarked is the first stage: the points keep reports.
func (t *thinning) keepMarked(keep func(i int) bool) {
	if keep == nil {
		return
	}
	for i := 0; i < t.n; i++ {
		if keep(i) {
			t.take(i)
		}
	}
}

// keepExtremes is the second stage: the first point of smallest and of
// largest x, then of smallest and of largest y (finite values only).
func (t *thinning) keepExtremes(xs, ys []float64) {
	xlo, xhi := argExtremes(t.n, xs)
	ylo, yhi := argExtremes(t.n, ys)
	for _, i := range [4]int{xlo, xhi, ylo, yhi} {
		t.take(i)
	}
}

// argExtremes is the index of the first smallest and of the first largest
// finite value among the first n of v (-1 when there is none).
func argExtremes(n int, v []float64) (lo, hi int) {
	lo, hi = -1, -1
	for i := 0; i < n; i++ {
		x := valueAt(v, i)
		if !finite(x) {
			continue
		}
		if lo < 0 || x < valueAt(v, lo) {
			lo = i
		}
		if hi < 0 || x > valueAt(v, hi) {
			hi = i
		}
	}
	return lo, hi
}

// valueAt is v[i], or NaN past the end of v.
func valueAt(v []float64, i int) float64 {
	if i < len(v) {
		return v[i]
	}
	return math.NaN()
}

// keepOnePerCell is the third stage: a grid of g × g cells over the extent
// of the data, g = ⌊√(budget/2)⌋ (so that the grid can use at most half of
// the budget), and the first point of each cell, in index order, until the
// budget is used. Without finite data or with g < 2 it keeps nothing.
func (t *thinning) keepOnePerCell(xs, ys []float64) {
	xr, okx := Extent(xs)
	yr, oky := Extent(ys)
	g := int(math.Sqrt(float64(t.budget) / 2))
	if !okx || !oky || g < 2 {
		return
	}
	cells := make(map[int]bool, g*g)
	for i := 0; i < t.n && t.count < t.budget; i++ {
		x, y := valueAt(xs, i), valueAt(ys, i)
		if !finite(x) || !finite(y) {
			continue
		}
		k := gridCell(g, x, xr)*g + gridCell(g, y, yr)
		if !cells[k] {
			cells[k] = true
			t.take(i)
		}
	}
}

// gridCell is the column (0 … g−1) of v among g equal parts of r; 0 when r
// is a single value.
func gridCell(g int, v float64, r Range) int {
	span := r.Span()
	if span > 0 {
		return min(g-1, int(float64(g)*(v-r.Lo)/span))
	}
	return 0
}

// fillEvenly is the last stage: what is left of the budget goes to evenly
// spaced points, each the first not yet chosen at or after k·n/rest.
func (t *thinning) fillEvenly() {
	rest := t.budget - t.count
	if rest <= 0 {
		return
	}
	stride := float64(t.n) / float64(rest)
	for k := 0; k < rest; k++ {
		i := int(float64(k) * stride)
		for i < t.n && t.chosen[i] {
			i++
		}
		t.take(i)
	}
}

// indexes is the chosen points in increasing order.
func (t *thinning) indexes() []int {
	out := make([]int, 0, t.count)
	for i, c := range t.chosen {
		if c {
			out = append(out, i)
		}
	}
	return out
}
