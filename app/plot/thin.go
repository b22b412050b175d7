package plot

import (
	"math"
	"sort"
)

// Thin chooses at most maxDraw of the n points (xs[i], ys[i]) to draw,
// returned as increasing indexes. Drawing only, never statistics: with n ≤
// maxDraw every index is returned. Otherwise it keeps, in this order, the
// points keep(i) reports (flagged or left-out readings, the selected one),
// the extremes of x and y, one point from each cell of a grid laid over the
// data (so that isolated points and the outline survive), and then evenly
// spaced points of the rest until the budget is used. The choice is
// deterministic. keep may be nil; xs and ys must have n entries (shorter
// slices are treated as non-finite values).
func Thin(n, maxDraw int, xs, ys []float64, keep func(i int) bool) []int {
	if n <= 0 {
		return nil
	}
	if maxDraw <= 0 {
		maxDraw = 1
	}
	if n <= maxDraw {
		out := make([]int, n)
		for i := range out {
			out[i] = i
		}
		return out
	}
	at := func(v []float64, i int) float64 {
		if i < len(v) {
			return v[i]
		}
		return math.NaN()
	}
	chosen := make([]bool, n)
	count := 0
	take := func(i int) {
		if i >= 0 && i < n && !chosen[i] && count < maxDraw {
			chosen[i] = true
			count++
		}
	}
	if keep != nil {
		for i := 0; i < n; i++ {
			if keep(i) {
				take(i)
			}
		}
	}
	ext := [4]int{-1, -1, -1, -1}
	for i := 0; i < n; i++ {
		x, y := at(xs, i), at(ys, i)
		if finite(x) {
			if ext[0] < 0 || x < at(xs, ext[0]) {
				ext[0] = i
			}
			if ext[1] < 0 || x > at(xs, ext[1]) {
				ext[1] = i
			}
		}
		if finite(y) {
			if ext[2] < 0 || y < at(ys, ext[2]) {
				ext[2] = i
			}
			if ext[3] < 0 || y > at(ys, ext[3]) {
				ext[3] = i
			}
		}
	}
	for _, i := range ext {
		take(i)
	}
	if xr, okx := Extent(xs); okx {
		if yr, oky := Extent(ys); oky {
			g := int(math.Sqrt(float64(maxDraw) / 2))
			if g >= 2 {
				cells := make(map[int]bool, g*g)
				cx, cy := xr.Span(), yr.Span()
				for i := 0; i < n && count < maxDraw; i++ {
					x, y := at(xs, i), at(ys, i)
					if !finite(x) || !finite(y) {
						continue
					}
					ix, iy := 0, 0
					if cx > 0 {
						ix = min(g-1, int(float64(g)*(x-xr.Lo)/cx))
					}
					if cy > 0 {
						iy = min(g-1, int(float64(g)*(y-yr.Lo)/cy))
					}
					k := ix*g + iy
					if !cells[k] {
						cells[k] = true
						take(i)
					}
				}
			}
		}
	}
	if rest := maxDraw - count; rest > 0 {
		stride := float64(n) / float64(rest)
		for k := 0; k < rest; k++ {
			i := int(float64(k) * stride)
			for i < n && chosen[i] {
				i++
			}
			take(i)
		}
	}
	out := make([]int, 0, count)
	for i, c := range chosen {
		if c {
			out = append(out, i)
		}
	}
	sort.Ints(out)
	return out
}
