package fitcore

import (
	"encoding/binary"
	"math"
	"testing"
)

// fuzzFloats turns fuzz bytes into float64 values (8 bytes each), so the
// fuzzer can reach NaN, Inf, subnormals and huge values.
func fuzzFloats(b []byte) []float64 {
	out := make([]float64, 0, len(b)/8)
	for len(b) >= 8 {
		out = append(out, math.Float64frombits(binary.LittleEndian.Uint64(b)))
		b = b[8:]
	}
	return out
}

func fuzzSeedBytes(v ...float64) []byte {
	b := make([]byte, 8*len(v))
	for i, f := range v {
		binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(f))
	}
	return b
}

// FuzzShapiroWilk asserts ShapiroWilk never panics and returns W, p in [0, 1].
func FuzzShapiroWilk(f *testing.F) {
	f.Add(fuzzSeedBytes(1, 2, 3))
	f.Add(fuzzSeedBytes(1, 1, 1, 2))
	f.Add(fuzzSeedBytes(1e300, -1e300, 0, 1))
	f.Add(fuzzSeedBytes(5e-324, 0, 1e-310, 2e-310, 3))
	f.Fuzz(func(t *testing.T, b []byte) {
		x := fuzzFloats(b)
		w, p, err := ShapiroWilk(x)
		if err != nil {
			return
		}
		if !(w >= 0 && w <= 1) || !(p >= 0 && p <= 1) {
			t.Fatalf("W = %v, p = %v for %v", w, p, x)
		}
		assertFiniteCheck(t, ShapiroWilkCheck(x))
	})
}

// FuzzChecks asserts that every check, Influence and Summarize never panic
// and never return NaN/Inf. The bytes are split into x and y halves; the
// flags choose origin and weights.
func FuzzChecks(f *testing.F) {
	f.Add(fuzzSeedBytes(1, 2, 3, 4, 5, 2.1, 3.9, 6.2, 7.8, 10.1), false, false)
	f.Add(fuzzSeedBytes(1, 1, 2, 2, 3, 3, 1, 1.1, 2, 2.1, 2.9, 3.2), true, true)
	f.Add(fuzzSeedBytes(0, 0, 0, 1, 2, 3), false, true)
	f.Add(fuzzSeedBytes(1e308, -1e308, 1, 2, 1e-300, 3), true, false)
	f.Fuzz(func(t *testing.T, b []byte, origin, weighted bool) {
		v := fuzzFloats(b)
		n := len(v) / 2
		x, y := v[:n], v[n:2*n]
		var w []float64
		if weighted {
			w = make([]float64, n)
			for i := range w {
				w[i] = 1 + math.Abs(math.Mod(float64(i), 3))
			}
		}
		_, _, r, ok := ckLine(x, y, w, origin)
		if !ok {
			r = y
		}
		cs := Checks{
			Curvature:    CurvatureTest(x, y, w, 0.95),
			LackOfFit:    LackOfFit(x, y, w, origin),
			BreuschPagan: BreuschPagan(x, r),
			White:        White(x, r),
			DurbinWatson: DurbinWatson(x, r, origin),
			Runs:         RunsTest(r),
			ShapiroWilk:  ShapiroWilkCheck(r),
		}
		xc, xa := XExactness(x, y, 0.1, 0, 0.95)
		cs.XExactness = &xc
		for _, c := range []Check{cs.Curvature, cs.BreuschPagan, cs.White, cs.DurbinWatson, cs.Runs, cs.ShapiroWilk, xc} {
			assertFiniteCheck(t, c)
		}
		if cs.LackOfFit != nil {
			assertFiniteCheck(t, *cs.LackOfFit)
		}
		if xa.Message == "" {
			t.Fatal("x exactness assumption without message")
		}
		infl := Influence(x, r, w, origin)
		for _, p := range infl {
			for _, v := range []float64{p.Leverage, p.Residual, p.Studentized, p.OutlierP, p.CooksD, p.DFFITS} {
				if !ckFinite(v) {
					t.Fatalf("non-finite influence %+v", p)
				}
			}
		}
		a := Summarize(cs, infl)
		for _, as := range []Assumption{a.Linearity, a.Spread, a.Independence, a.Normality, a.Influence} {
			if as.Message == "" {
				t.Fatal("assumption without message")
			}
		}
	})
}
