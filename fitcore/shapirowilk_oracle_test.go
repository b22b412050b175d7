package fitcore

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

// swOracleGroups is the large-sample Shapiro–Wilk as it was before the
// groups were dealt from one tagged sort: W from a sorted copy of all
// values, then each interleaved group gathered and sorted on its own. It is
// kept as the oracle of shapiroWilk's n > 5000 path.
func swOracleGroups(x []float64) (w, p float64, ok bool) {
	var b ckSortBuf
	n := len(x)
	s := b.sortedCopy(x)
	w, _, ok = swSorted(s, b.swCoef(n))
	if !ok {
		return 0, 0, false
	}
	k := (n + swBlock - 1) / swBlock
	var fisher float64
	groups := 0
	for j := range k {
		g := s[:0]
		for i := j; i < n; i += k {
			g = append(g, x[i])
		}
		b.sortInPlace(g)
		_, pj, ok := swSorted(g, b.swCoef(len(g)))
		if !ok {
			pj = 1
		}
		fisher += -2 * math.Log(math.Max(pj, 1e-300))
		groups++
	}
	return w, ckChi2SF(fisher, float64(2*groups)), true
}

// TestShapiroWilkGroupsAgainstOracle compares the n > 5000 path with the
// sort-per-group oracle on invented samples: normal, skewed, heavy ties
// (a few levels), signed zeros, a spike among constants, and sizes on both
// sides of multiples of 5000. W and p must agree bit for bit: every group
// holds the same values in the same order either way.
func TestShapiroWilkGroupsAgainstOracle(t *testing.T) {
	r := rand.New(rand.NewPCG(13, 2))
	gens := map[string]func(i int) float64{
		"normal":  func(int) float64 { return r.NormFloat64() },
		"skewed":  func(int) float64 { return math.Exp(2 * r.NormFloat64()) },
		"levels":  func(int) float64 { return float64(r.IntN(4)) - 1.5 },
		"zeros":   func(i int) float64 { return []float64{0, math.Copysign(0, -1), 1e-300, -1e-300}[i%4] },
		"spike":   func(i int) float64 { return map[bool]float64{true: 7, false: 3}[i == 4321] },
		"ramp":    func(i int) float64 { return float64(i) * 1e-3 },
		"descend": func(i int) float64 { return -float64(i) + 0.25*r.Float64() },
	}
	var b ckSortBuf // shared, as the advice's refits share it
	for _, n := range []int{5001, 9999, 10000, 10001, 17777, 60013, 250000} {
		for name, gen := range gens {
			x := make([]float64, n)
			for i := range x {
				x[i] = gen(i)
			}
			t.Run(name+"/n="+strconv.Itoa(n), func(t *testing.T) {
				w0, p0, ok := swOracleGroups(x)
				w, p, err := shapiroWilk(x, &b, false)
				if !ok {
					if err != errSWConstant {
						t.Fatalf("oracle: no spread; got W %v, p %v, err %v", w, p, err)
					}
					return
				}
				if err != nil {
					t.Fatal(err)
				}
				if math.Float64bits(w) != math.Float64bits(w0) || math.Float64bits(p) != math.Float64bits(p0) {
					t.Errorf("W %v, p %v; oracle W %v, p %v", w, p, w0, p0)
				}
			})
		}
	}
}

// FuzzShapiroWilkGroupsAgainstOracle compares the two on fuzzed samples
// made long (over 5000 values) by repeating the fuzzed bytes with a twist.
func FuzzShapiroWilkGroupsAgainstOracle(f *testing.F) {
	f.Add([]byte{1, 2, 3, 4, 5, 6, 7, 8, 9}, uint16(1))
	f.Add([]byte{0, 0, 0, 128}, uint16(4000))
	f.Fuzz(func(t *testing.T, data []byte, extra uint16) {
		if len(data) == 0 {
			return
		}
		n := swBlock + 1 + int(extra)%30000
		x := make([]float64, n)
		for i := range x {
			c := data[i%len(data)]
			x[i] = float64(int(c)-128) + float64(i/len(data)%7)*0.125
		}
		w0, p0, ok := swOracleGroups(x)
		var b ckSortBuf
		w, p, err := shapiroWilk(x, &b, false)
		if !ok {
			if err != errSWConstant {
				t.Fatalf("oracle: no spread; got W %v, p %v, err %v", w, p, err)
			}
			return
		}
		if err != nil {
			t.Fatal(err)
		}
		if math.Float64bits(w) != math.Float64bits(w0) || math.Float64bits(p) != math.Float64bits(p0) {
			t.Errorf("W %v, p %v; oracle W %v, p %v", w, p, w0, p0)
		}
	})
}

// BenchmarkShapiroWilkGroups is the n > 5000 path at 10⁶ invented normal
// values, beside the sort-per-group oracle.
func BenchmarkShapiroWilkGroups(b *testing.B) {
	r := rand.New(rand.NewPCG(13, 6))
	x := make([]float64, 1000000)
	for i := range x {
		x[i] = r.NormFloat64()
	}
	b.Run("tagged", func(b *testing.B) {
		var sb ckSortBuf
		for b.Loop() {
			if _, _, err := shapiroWilk(x, &sb, true); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("oracle", func(b *testing.B) {
		for b.Loop() {
			if _, _, ok := swOracleGroups(x); !ok {
				b.Fatal("no spread")
			}
		}
	})
}
