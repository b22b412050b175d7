package fitcore

import (
	"fmt"
	"math"
	"sort"
	"testing"
)

// Reference values: Debian python3-scipy,
// scipy.stats.norm.ppf((i-0.375)/(n+0.25)) for i = 1 … n.
func TestNormalQuantilesScipy(t *testing.T) {
	cases := []struct {
		n    int
		want []float64
	}{
		{1, []float64{0}},
		{2, []float64{-0.5894557978497783, 0.5894557978497783}},
		{5, []float64{-1.1797611176118612, -0.49720057068155404, 0, 0.49720057068155404, 1.1797611176118612}},
		{10, []float64{-1.54663527139923, -1.0004905456193152, -0.6554235052344266, -0.3754617702355184,
			-0.12258084388880242, 0.12258084388880255, 0.3754617702355184, 0.6554235052344266,
			1.0004905456193152, 1.54663527139923}},
	}
	for _, c := range cases {
		got := NormalQuantiles(c.n)
		if len(got) != c.n {
			t.Fatalf("n=%d: %d values", c.n, len(got))
		}
		for i := range got {
			if math.Abs(got[i]-c.want[i]) > 1e-12 {
				t.Errorf("n=%d, i=%d: %v, want %v (scipy)", c.n, i, got[i], c.want[i])
			}
		}
	}
	if NormalQuantiles(0) != nil || NormalQuantiles(-3) != nil {
		t.Error("n ≤ 0 must give nil")
	}
}

func TestNormalQQOrder(t *testing.T) {
	v := []float64{3, -1, math.NaN(), 2, -1, math.Inf(1)}
	qq := NormalQQ(v)
	if len(qq) != 4 {
		t.Fatalf("%d points, want 4 (NaN and Inf left out)", len(qq))
	}
	wantIdx := []int{1, 4, 3, 0} // sorted, ties in input order
	z := NormalQuantiles(4)
	for r, p := range qq {
		if p.Index != wantIdx[r] || p.Rank != r || p.Sample != v[p.Index] || p.Theoretical != z[r] {
			t.Errorf("rank %d: %+v", r, p)
		}
	}
}

// TestNormalQQLargeTies: above the radix-sort size, the order is that of a
// stable comparison sort (ties, and −0 with +0, in input order).
func TestNormalQQLargeTies(t *testing.T) {
	n := 5000
	v := make([]float64, n)
	for i := range v {
		v[i] = float64((i*7919)%13) - 6
		if i%97 == 0 {
			v[i] = math.Copysign(0, -1)
		}
	}
	want := make([]int, n)
	for i := range want {
		want[i] = i
	}
	sort.SliceStable(want, func(a, b int) bool { return v[want[a]] < v[want[b]] })
	for r, p := range NormalQQ(v) {
		if p.Index != want[r] {
			t.Fatalf("rank %d is position %d, a stable sort gives %d", r, p.Index, want[r])
		}
	}
}

func FuzzNormalQQ(f *testing.F) {
	f.Add(1.0, -2.0, 3.0, 0.5)
	f.Fuzz(func(t *testing.T, a, b, c, d float64) {
		qq := NormalQQ([]float64{a, b, c, d})
		for i, p := range qq {
			if math.IsNaN(p.Theoretical) || math.IsInf(p.Theoretical, 0) || math.IsNaN(p.Sample) {
				t.Fatalf("non-finite point %+v", p)
			}
			if i > 0 && (p.Sample < qq[i-1].Sample || p.Theoretical <= qq[i-1].Theoretical) {
				t.Fatalf("not increasing at %d: %+v", i, qq)
			}
		}
	})
}

func ExampleNormalQuantiles() {
	for _, z := range NormalQuantiles(3) {
		fmt.Printf("%.4f\n", z)
	}
	// Output:
	// -0.8694
	// 0.0000
	// 0.8694
}
