package fitcore

import (
	"math"
	"testing"
)

// TestAbsMaxIsMax: absMax and posMax (and ckMin, ckMax) give the builtin max's value, bit for
// bit, for running maxima that start at +0 (the only way the loops use
// them), NaNs and infinities included.
func TestAbsMaxIsMax(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	negZero := math.Copysign(0, -1)
	vals := []float64{0, negZero, 1, -1, 0.5, -2.5, 1e-310, -1e-310, 1e308, -1e308, inf, -inf, nan, 3, -3}
	same := func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) || (a != a && b != b) }
	for _, seq := range [][]float64{vals, {negZero, 0, negZero}, {nan, 1, 2}, {1, nan, 2}, {-inf, 1}, {2, 1, inf, 5}} {
		var a, b, p, q float64 // running maxima from +0
		for _, v := range seq {
			a, b = absMax(a, v), max(b, math.Abs(v))
			if !same(a, b) {
				t.Fatalf("absMax over %v: %v, max gives %v", seq, a, b)
			}
			p, q = posMax(p, v), max(q, v)
			if !same(p, q) {
				t.Fatalf("posMax over %v: %v, max gives %v", seq, p, q)
			}
		}
	}
	for _, a := range vals {
		for _, b := range vals {
			if got, want := ckMin(a, b), min(a, b); !same(got, want) {
				t.Errorf("ckMin(%v, %v) = %v, min gives %v", a, b, got, want)
			}
			if got, want := ckMax(a, b), max(a, b); !same(got, want) {
				t.Errorf("ckMax(%v, %v) = %v, max gives %v", a, b, got, want)
			}
		}
	}
}

// FuzzAbsMaxIsMax: the same over any three values, as a running maximum
// from +0.
func FuzzAbsMaxIsMax(f *testing.F) {
	f.Add(1.0, -2.0, math.NaN())
	f.Add(math.Copysign(0, -1), 0.0, math.Inf(-1))
	f.Fuzz(func(t *testing.T, u, v, w float64) {
		var a, b, p, q float64
		for _, x := range []float64{u, v, w} {
			a, b = absMax(a, x), max(b, math.Abs(x))
			p, q = posMax(p, x), max(q, x)
			if math.Float64bits(a) != math.Float64bits(b) && !(a != a && b != b) {
				t.Fatalf("absMax(%v, %v, %v) = %v, max %v", u, v, w, a, b)
			}
			if math.Float64bits(p) != math.Float64bits(q) && !(p != p && q != q) {
				t.Fatalf("posMax(%v, %v, %v) = %v, max %v", u, v, w, p, q)
			}
		}
		for _, ab := range [][2]float64{{u, v}, {v, w}, {w, u}} {
			if g, m := ckMin(ab[0], ab[1]), min(ab[0], ab[1]); math.Float64bits(g) != math.Float64bits(m) && !(g != g && m != m) {
				t.Fatalf("ckMin(%v, %v) = %v, min %v", ab[0], ab[1], g, m)
			}
			if g, m := ckMax(ab[0], ab[1]), max(ab[0], ab[1]); math.Float64bits(g) != math.Float64bits(m) && !(g != g && m != m) {
				t.Fatalf("ckMax(%v, %v) = %v, max %v", ab[0], ab[1], g, m)
			}
		}
	})
}
