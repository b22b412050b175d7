package plot

import (
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"
)

// thinOracle is Thin as it was before it was split into stages (one
// function of cyclomatic complexity 41), kept unchanged as the oracle of
// TestThinMatchesOracle and FuzzThinMatchesOracle.
func thinOracle(n, maxDraw int, xs, ys []float64, keep func(i int) bool) []int {
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

// thinData makes xs (n values) and ys (ny values) from data: each value is
// 8 bytes of data read as IEEE 754 bits when bits is set (so NaN, ±Inf,
// subnormals and ±1.8e308 occur), else a small integer, so that repeats and
// ties are common.
func thinData(n, ny int, data []byte, bits bool) (xs, ys []float64) {
	val := func(k int) float64 {
		if len(data) == 0 {
			return float64(k % 7)
		}
		if !bits {
			return float64(int(data[k%len(data)])%23 - 11)
		}
		var u uint64
		for j := 0; j < 8; j++ {
			u = u<<8 | uint64(data[(8*k+j)%len(data)])
		}
		return math.Float64frombits(u)
	}
	xs, ys = make([]float64, n), make([]float64, ny)
	for i := range xs {
		xs[i] = val(2 * i)
	}
	for i := range ys {
		ys[i] = val(2*i + 1)
	}
	return xs, ys
}

func TestThinMatchesOracle(t *testing.T) {
	rng := rand.New(rand.NewPCG(14, 41))
	random := func(n int, f func() float64) []float64 {
		v := make([]float64, n)
		for i := range v {
			v[i] = f()
		}
		return v
	}
	sine := func(n int) ([]float64, []float64) {
		xs, ys := make([]float64, n), make([]float64, n)
		for i := range xs {
			xs[i], ys[i] = float64(i), math.Sin(float64(i)/50)
		}
		return xs, ys
	}
	sx, sy := sine(10000)
	sy[7777] = 40
	tests := []struct {
		name       string
		n, maxDraw int
		xs, ys     []float64
		keep       func(int) bool
	}{
		{"none", 0, 10, nil, nil, nil},
		{"all fit", 5, 10, nil, nil, nil},
		{"budget 0", 50, 0, random(50, rng.Float64), random(50, rng.Float64), nil},
		{"budget 1", 50, 1, random(50, rng.Float64), random(50, rng.Float64), nil},
		{"no grid (budget 7)", 300, 7, random(300, rng.NormFloat64), random(300, rng.NormFloat64), nil},
		{"sine with outlier and flags", 10000, 2000, sx, sy, func(i int) bool { return i == 123 || i == 4567 }},
		{"normal cloud", 5000, 500, random(5000, rng.NormFloat64), random(5000, rng.NormFloat64), nil},
		{"flags fill the budget", 3000, 100, random(3000, rng.Float64), random(3000, rng.Float64), func(i int) bool { return i%7 == 0 }},
		{"constant x", 1000, 200, make([]float64, 1000), random(1000, rng.Float64), nil},
		{"constant both", 1000, 200, make([]float64, 1000), make([]float64, 1000), nil},
		{"short ys", 1000, 200, random(1000, rng.Float64), random(300, rng.Float64), nil},
		{"no ys", 1000, 200, random(1000, rng.Float64), nil, nil},
		{"longer xs than n", 500, 60, random(900, rng.ExpFloat64), random(900, rng.ExpFloat64), nil},
		{"infinite span", 400, 80, append([]float64{-math.MaxFloat64, math.MaxFloat64}, random(398, rng.Float64)...), random(400, rng.Float64), nil},
		{"NaN and Inf", 400, 80, append([]float64{math.NaN(), math.Inf(1), math.Inf(-1)}, random(397, rng.Float64)...), random(400, rng.NormFloat64), nil},
	}
	for _, tc := range tests {
		got := Thin(tc.n, tc.maxDraw, tc.xs, tc.ys, tc.keep)
		want := thinOracle(tc.n, tc.maxDraw, tc.xs, tc.ys, tc.keep)
		if !slices.Equal(got, want) {
			t.Errorf("%s: Thin kept %d points, the oracle %d; first difference at %d", tc.name, len(got), len(want), firstDiff(got, want))
		}
	}
}

func firstDiff(a, b []int) int {
	for i := range min(len(a), len(b)) {
		if a[i] != b[i] {
			return i
		}
	}
	return min(len(a), len(b))
}

// FuzzThinMatchesOracle: Thin and the body it was split from choose the
// same points, for any sizes, budgets, values (as raw float bits or small
// integers), shorter slices and flag pattern.
func FuzzThinMatchesOracle(f *testing.F) {
	f.Add(50, 7, 40, uint8(5), false, []byte{1, 2, 3, 4, 5})
	f.Add(3000, 400, 3000, uint8(0), false, []byte{9, 200, 31})
	f.Add(700, 90, 700, uint8(3), true, []byte{0x7f, 0xf0, 0, 0, 0, 0, 0, 1, 0xff, 0xef, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff, 0x40})
	f.Fuzz(func(t *testing.T, n, maxDraw, ny int, every uint8, bits bool, data []byte) {
		n, maxDraw, ny = abs(n%4000), maxDraw%600, abs(ny%4500)
		xs, ys := thinData(n, ny, data, bits)
		var keep func(int) bool
		if every > 0 {
			keep = func(i int) bool { return i%int(every) == 0 }
		}
		got := Thin(n, maxDraw, xs, ys, keep)
		want := thinOracle(n, maxDraw, xs, ys, keep)
		if !slices.Equal(got, want) {
			t.Fatalf("Thin(%d, %d) kept %d points, the oracle %d; first difference at %d", n, maxDraw, len(got), len(want), firstDiff(got, want))
		}
	})
}

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}
