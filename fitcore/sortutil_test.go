package fitcore

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestSortBuf checks the radix sort and the stable ordering against the
// standard library's slices.Sort and slices.SortStableFunc (the reference),
// on both sides of the size where the radix sort takes over, with ties,
// signed zeros, subnormals and huge values.
func TestSortBuf(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	specials := []float64{0, math.Copysign(0, -1), 5e-324, -5e-324, math.MaxFloat64, -math.MaxFloat64, 1, -1, 1, 2}
	for _, tc := range []struct {
		name string
		n    int
		gen  func(i int) float64
	}{
		{"small normal", 100, func(int) float64 { return r.NormFloat64() }},
		{"just below radix", ckRadixMin - 1, func(int) float64 { return r.NormFloat64() }},
		{"radix normal", 5000, func(int) float64 { return r.NormFloat64() }},
		{"radix ties", 7000, func(int) float64 { return float64(r.IntN(10)) }},
		{"radix specials", 3000, func(int) float64 { return specials[r.IntN(len(specials))] }},
		{"radix wide", 4000, func(int) float64 { return r.NormFloat64() * math.Pow(10, float64(r.IntN(600)-300)) }},
		{"sorted", 2000, func(i int) float64 { return float64(i / 3) }},
		{"reversed", 2000, func(i int) float64 { return -float64(i) }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			v := make([]float64, tc.n)
			for i := range v {
				v[i] = tc.gen(i)
			}
			want := slices.Clone(v)
			slices.Sort(want)
			var b ckSortBuf
			got := b.sortedCopy(v)
			for i := range want {
				if got[i] != want[i] {
					t.Fatalf("sortedCopy[%d] = %v, want %v", i, got[i], want[i])
				}
			}
			wantIdx := make([]int32, tc.n)
			for i := range wantIdx {
				wantIdx[i] = int32(i)
			}
			slices.SortStableFunc(wantIdx, func(p, q int32) int {
				if v[p] < v[q] || (v[p] == v[q] && math.Signbit(v[p]) && !math.Signbit(v[q])) {
					return -1
				}
				if v[p] > v[q] || (v[p] == v[q] && !math.Signbit(v[p]) && math.Signbit(v[q])) {
					return 1
				}
				return 0
			})
			idx := b.order(v)
			for j := range wantIdx {
				if idx[j] != wantIdx[j] {
					t.Fatalf("order[%d] = %d, want %d", j, idx[j], wantIdx[j])
				}
			}
		})
	}
}
