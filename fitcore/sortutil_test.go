package fitcore

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"sort"
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

// TestSortKeysAgainstRadix is the oracle test of ckSortFloats (a most
// significant digit pass, then the buckets in the cache): on many random
// samples, above and below ckMSDMin, it must give exactly what the plain
// least significant digit sort ckRadixKeys gives, and both what
// slices.Sort gives on the keys (the reference). The samples have ties,
// signed zeros, subnormals, values sharing their top 16 bits (one bucket),
// values over 600 decades, and buckets on both sides of ckInsMax.
func TestSortKeysAgainstRadix(t *testing.T) {
	r := rand.New(rand.NewPCG(13, 2026))
	specials := []float64{0, math.Copysign(0, -1), 5e-324, -5e-324, math.MaxFloat64, -math.MaxFloat64, 1, -1, 2}
	gens := []struct {
		name string
		gen  func(i int) float64
	}{
		{"normal", func(int) float64 { return r.NormFloat64() }},
		{"normal scaled", func(int) float64 { return 1e-7 * r.NormFloat64() }},
		{"one bucket", func(int) float64 { return 1 + r.Float64()/32 }},
		{"ties", func(int) float64 { return float64(r.IntN(50)) }},
		{"specials", func(int) float64 { return specials[r.IntN(len(specials))] }},
		{"wide", func(int) float64 { return r.NormFloat64() * math.Pow(10, float64(r.IntN(600)-300)) }},
		{"sorted", func(i int) float64 { return float64(i) }},
		{"reversed", func(i int) float64 { return -float64(i) / 7 }},
		{"few per bucket", func(int) float64 { return math.Ldexp(1+r.Float64(), r.IntN(2000)-1000) }},
		{"uniform", func(int) float64 { return r.Float64() - 0.5 }},
	}
	for trial := range 60 {
		g := gens[trial%len(gens)]
		n := []int{ckMSDMin - 1, ckMSDMin, ckMSDMin + 1 + r.IntN(5000), 100000 + r.IntN(200000)}[trial%4]
		vals := make([]float64, n)
		keys := make([]uint64, n)
		for i := range keys {
			vals[i] = g.gen(i)
			keys[i] = ckSortKey(vals[i])
		}
		want := slices.Clone(keys)
		slices.Sort(want)
		old := ckRadixKeys(slices.Clone(keys), make([]uint64, n))
		var b ckSortBuf
		got := make([]uint64, n)
		for i, v := range b.sortedCopy(vals) {
			got[i] = ckSortKey(v)
		}
		for i := range want {
			if old[i] != want[i] {
				t.Fatalf("%s, n = %d: ckRadixKeys[%d] = %x, slices.Sort %x", g.name, n, i, old[i], want[i])
			}
			if got[i] != want[i] {
				t.Fatalf("%s, n = %d: sortedCopy[%d] = %x, slices.Sort %x", g.name, n, i, got[i], want[i])
			}
		}
	}
}

// BenchmarkSortKeys compares ckRadixKeys with sortedCopy (ckSortFloats) on
// 10⁶ residuals of the invented benchData record.
func BenchmarkSortKeys(b *testing.B) {
	_, _, res := benchData(1000000)
	keys := make([]uint64, len(res))
	k, tmp := make([]uint64, len(res)), make([]uint64, len(res))
	for i, v := range res {
		keys[i] = ckSortKey(v)
	}
	b.Run("radix", func(b *testing.B) {
		for b.Loop() {
			copy(k, keys)
			ckRadixKeys(k, tmp)
		}
	})
	var sb ckSortBuf
	b.Run("msd", func(b *testing.B) {
		for b.Loop() {
			sb.sortedCopy(res)
		}
	})
}

// TestOrderLarge: the order of x from ckMSDMin readings (orderLarge: the
// positions dealt into buckets, each bucket sorted as pairs or dealt
// again) gives exactly the order of slices.SortStableFunc on the keys (the
// reference), and ckRadixPairs (the plain stable sort of pairs) agrees, on
// samples with many ties, signed zeros, one bucket past ckPairMax, two
// close values and two values each filling a bucket past ckPairMax (dealt
// again down to the last bits), buckets on both sides of ckInsMax, sorted
// and reversed.
func TestOrderLarge(t *testing.T) {
	r := rand.New(rand.NewPCG(17, 2026))
	gens := []func(i int) float64{
		func(int) float64 { return r.NormFloat64() },
		func(int) float64 { return float64(r.IntN(40)) }, // repeats at 40 standards
		func(i int) float64 { return float64(i%997) + 0.001*float64(i) },
		func(int) float64 { return 1 + r.Float64()/32 }, // one bucket
		func(int) float64 { return []float64{0, math.Copysign(0, -1), 1, -1}[r.IntN(4)] },
		func(i int) float64 { return -float64(i) / 7 },
		func(int) float64 { return math.Ldexp(1+r.Float64(), r.IntN(2000)-1000) },
		func(int) float64 { return 1 + float64(r.IntN(2))*0x1p-45 }, // one bucket, two keys
		func(int) float64 { return []float64{2, 3}[r.IntN(2)] },     // two buckets of ties
		func(int) float64 { return 1 + float64(r.IntN(3000))*0x1p-50 },
	}
	for trial := range 40 {
		g := gens[trial%len(gens)]
		n := []int{ckMSDMin, ckMSDMin + 1 + r.IntN(5000), 150000 + r.IntN(100000), 2 * ckMSDMin}[trial%4]
		v := make([]float64, n)
		p := make([]ckKeyIdx, n)
		for i := range p {
			v[i] = g(i)
			p[i] = ckKeyIdx{ckSortKey(v[i]), int32(i)}
		}
		want := slices.Clone(p)
		slices.SortStableFunc(want, func(a, b ckKeyIdx) int { return cmp.Compare(a.k, b.k) })
		old := ckRadixPairs(slices.Clone(p), make([]ckKeyIdx, n))
		var b ckSortBuf
		got := b.order(v)
		if !slices.Equal(old, want) {
			t.Fatalf("trial %d (n = %d): ckRadixPairs differs from the stable sort", trial, n)
		}
		for j := range want {
			if got[j] != want[j].i {
				t.Fatalf("trial %d (n = %d): order[%d] = %d, the stable sort %d", trial, n, j, got[j], want[j].i)
			}
		}
	}
}

// BenchmarkOrder compares ckRadixPairs (the pairs sorted whole) with
// ckSortBuf.order (positions dealt into buckets, orderLarge) on the x of
// 10⁶ readings of the invented benchData record (the order of x).
func BenchmarkOrder(b *testing.B) {
	x, _, _ := benchData(1000000)
	p := make([]ckKeyIdx, len(x))
	for i, v := range x {
		p[i] = ckKeyIdx{ckSortKey(v), int32(i)}
	}
	q, tmp := make([]ckKeyIdx, len(p)), make([]ckKeyIdx, len(p))
	b.Run("radix", func(b *testing.B) {
		for b.Loop() {
			copy(q, p)
			ckRadixPairs(q, tmp)
		}
	})
	var sb ckSortBuf
	b.Run("buckets", func(b *testing.B) {
		for b.Loop() {
			sb.order(x)
		}
	})
}

// TestInterfaceSortsMatchSlices: the small-sample sorts go through package
// sort's interface sort (to keep generic sorts out of app.wasm). On the
// same input the sort of values gives, bit for bit, what slices.Sort gave
// before (the two are generated from one template of the standard library,
// sort/gen_sort_variants.go), signed zeros and ties included; order gives
// what slices.SortStableFunc gave (a sort by key, then position, has one
// answer).
func TestInterfaceSortsMatchSlices(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for _, n := range []int{0, 1, 2, 5, 11, 12, 13, 40, 100, 511, 700, 3000} {
		for trial := range 20 {
			v := make([]float64, n)
			for i := range v {
				switch rng.IntN(4) {
				case 0:
					v[i] = math.Copysign(0, float64(rng.IntN(2))-0.5)
				case 1:
					v[i] = float64(rng.IntN(5))
				default:
					v[i] = rng.NormFloat64()
				}
			}
			want := slices.Clone(v)
			slices.Sort(want)
			got := slices.Clone(v)
			//lint:ignore S1032 the code under test spells it this way (see sortedCopy)
			sort.Sort(sort.Float64Slice(got))
			for i := range want {
				if math.Float64bits(got[i]) != math.Float64bits(want[i]) {
					t.Fatalf("n=%d trial %d: value %d is %v, slices.Sort gives %v", n, trial, i, got[i], want[i])
				}
			}
			// order: by value, equal values by position (a stable sort).
			ws := make([]int32, n)
			for i := range ws {
				ws[i] = int32(i)
			}
			slices.SortStableFunc(ws, func(a, b int32) int { return cmp.Compare(ckSortKey(v[a]), ckSortKey(v[b])) })
			var b ckSortBuf
			if got := b.order(v); !slices.Equal(got, ws) {
				t.Fatalf("n=%d trial %d: order %v, a stable sort gives %v", n, trial, got, ws)
			}
		}
	}
}
