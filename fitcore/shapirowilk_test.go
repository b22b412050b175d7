package fitcore

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// Tolerances against scipy.stats.shapiro. scipy's swilk routine computes in
// single precision (its results are float32), so W agrees to about 1e-6.
// Near W = 1 the p-value amplifies that: dp ≈ φ(z)·dW/((1 − W)·σ), so the
// end-to-end p is compared loosely (swTolP), while Royston's p-formula itself
// is checked tightly (swTolPFormula) by feeding it scipy's own W.
const (
	swTolW        = 2e-6
	swTolP        = 1e-3
	swTolPFormula = 2e-6
)

// TestShapiroWilkReference compares W and p with scipy.stats.shapiro on
// invented seeded samples (values in checks.json), n = 3 … 5000, plus W only
// for n = 6001 (scipy's p there is an extrapolation; fitcore combines groups).
func TestShapiroWilkReference(t *testing.T) {
	for _, c := range loadRef(t).Shapiro {
		t.Run(c.Name, func(t *testing.T) {
			w, p, err := ShapiroWilk(c.X)
			if err != nil {
				t.Fatal(err)
			}
			refCheck(t, "W", w, c.W, 0, swTolW)
			if len(c.X) <= swBlock {
				refCheck(t, "p", p, c.P, 0, swTolP)
				refCheck(t, "p from scipy's W", swP(len(c.X), c.W, 1-c.W), c.P, 0, swTolPFormula)
			}
		})
	}
}

// TestShapiroWilkResiduals compares ShapiroWilkCheck on the residuals of the
// reference fits with scipy.stats.shapiro (checks.json).
func TestShapiroWilkResiduals(t *testing.T) {
	for _, c := range refCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			got := ShapiroWilkCheck(refResid(t, c))
			assertFiniteCheck(t, got)
			refCheck(t, "W", got.Statistic, c.Shapiro.W, 0, swTolW)
			refCheck(t, "p", got.P, c.Shapiro.P, 0, swTolP)
		})
	}
}

// TestShapiroWilkExactN3 checks the exact n = 3 p-value,
// p = (6/π)(asin √W − π/3) (Shapiro & Wilk 1965), at hand-worked points:
// equally spaced values give W = 1, p = 1.
func TestShapiroWilkExactN3(t *testing.T) {
	w, p, err := ShapiroWilk([]float64{1, 2, 3})
	if err != nil {
		t.Fatal(err)
	}
	refCheck(t, "W", w, 1, 0, 1e-14)
	refCheck(t, "p", p, 1, 0, 1e-12)
}

func TestShapiroWilkErrors(t *testing.T) {
	tests := []struct {
		name string
		x    []float64
		err  error
	}{
		{"two values", []float64{1, 2}, errSWTooFew},
		{"constant", []float64{4, 4, 4, 4}, errSWConstant},
		{"NaN", []float64{1, math.NaN(), 3}, errSWNotFinite},
		{"Inf", []float64{1, 2, math.Inf(-1)}, errSWNotFinite},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if _, _, err := ShapiroWilk(tc.x); !errors.Is(err, tc.err) {
				t.Errorf("err %v, want %v", err, tc.err)
			}
			c := ShapiroWilkCheck(tc.x)
			assertFiniteCheck(t, c)
			if c.Verdict != NA {
				t.Errorf("check verdict %s, want n/a", c.Verdict)
			}
		})
	}
}

// TestShapiroWilkLarge checks the n > 5000 path: a normal-looking
// deterministic sample (normal quantiles in a scrambled order) passes, a
// skewed one fails, and the message says how p was obtained.
func TestShapiroWilkLarge(t *testing.T) {
	const n = 20000
	normal := make([]float64, n)
	skewed := make([]float64, n)
	for i := range normal {
		j := (i * 7919) % n // a fixed permutation (7919 is prime to n)
		u := (float64(j) + 0.5) / n
		normal[i] = math.Sqrt2 * math.Erfinv(2*u-1)
		skewed[i] = math.Exp(normal[i])
	}
	c := ShapiroWilkCheck(normal)
	assertFiniteCheck(t, c)
	if c.Verdict != Pass {
		t.Errorf("normal quantiles: %+v", c)
	}
	c = ShapiroWilkCheck(skewed)
	assertFiniteCheck(t, c)
	if c.Verdict != Fail {
		t.Errorf("lognormal quantiles: %+v", c)
	}
}

// scipy.stats.shapiro gives W = 0.97959, p = 0.96294 for these values.
func ExampleShapiroWilk() {
	// Invented readings from a pressure sensor bench test.
	x := []float64{10.2, 9.8, 10.1, 10.0, 9.7, 10.4, 9.9, 10.3, 10.0, 9.6}
	w, p, err := ShapiroWilk(x)
	fmt.Printf("W = %.3f, p = %.2f, err = %v\n", w, p, err)
	// Output: W = 0.980, p = 0.96, err = <nil>
}

// TestShapiroWilkGroupsFirst: taking the groups' p first and W only when
// asked (shapiroWilkIf, for the advice's refits) gives ShapiroWilk's W and
// p bit for bit, and its error for values without spread. The oracle is
// ShapiroWilk itself (W from the sort of all values, then the groups).
func TestShapiroWilkGroupsFirst(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 13))
	for _, n := range []int{5001, 12345, 30000} {
		for kind := range 4 {
			v := make([]float64, n)
			for i := range v {
				switch kind {
				case 0:
					v[i] = r.NormFloat64()
				case 1:
					v[i] = r.ExpFloat64()
				case 2:
					v[i] = math.Round(3 * r.NormFloat64()) // ties
				case 3:
					v[i] = 2.5 // no spread
				}
			}
			w0, p0, err0 := ShapiroWilk(v)
			var b ckSortBuf
			w1, p1, have1, err1 := shapiroWilkIf(v, &b, false, func(float64) bool { return true })
			_, p2, have2, err2 := shapiroWilkIf(v, &b, false, func(float64) bool { return false })
			if (err0 == nil) != (err1 == nil) || (err0 == nil) != (err2 == nil) {
				t.Fatalf("n = %d, kind %d: errors %v, %v, %v", n, kind, err0, err1, err2)
			}
			if err0 != nil {
				continue
			}
			if w1 != w0 || p1 != p0 || p2 != p0 || !have1 || have2 {
				t.Fatalf("n = %d, kind %d: W %v, p %v; groups first: W %v (%v), p %v, %v (%v)", n, kind, w0, p0, w1, have1, p1, p2, have2)
			}
		}
	}
}
