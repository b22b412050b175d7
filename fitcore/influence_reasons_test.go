package fitcore

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestReasonNumbers checks that the influence reasons format numbers
// exactly as fmt's %.3g does (the reference is the standard library's fmt),
// since the reason texts were written with fmt.Sprintf before.
func TestReasonNumbers(t *testing.T) {
	r := rand.New(rand.NewPCG(8, 9))
	vals := []float64{0, math.Copysign(0, -1), 1, -1, 0.05, 4e-6, 2.5e-300, 1e10, -1e10, 0.000999, 999.5, 1e21, 5e-324}
	for range 2000 {
		vals = append(vals, r.NormFloat64()*math.Pow(10, float64(r.IntN(40)-20)))
	}
	for _, v := range vals {
		if got, want := ckG3(v), fmt.Sprintf("%.3g", v); got != want {
			t.Errorf("ckG3(%v) = %q, fmt gives %q", v, got, want)
		}
	}
	// Whole reasons: one reading of each kind, against the fmt wording.
	cut := newInfluenceCuts(2, 50, 48, true)
	pi := PointInfluence{Leverage: 0.2, Studentized: -4.2, OutlierP: 0.01, CooksD: 2.5, DFFITS: -1.3}
	rw := newReasonWriter(8)
	got := rw.write(&pi, cut.mask(&pi)|1<<ckBitLeverageOne, &cut)
	want := []string{
		fmt.Sprintf("%s: this reading alone fixes the line at its x, so its residual says nothing", ckReasonLeverageOne),
		ckReasonLargeResid + ": studentized residual −4.20, Bonferroni p = 0.010 (limit 0.05)",
		fmt.Sprintf("%s: Cook's distance %.3g > %.3g, the 90 %% point of F(p, n−p): without it the line moves beyond its 90 %% confidence region", ckReasonVeryInfluence, pi.CooksD, cut.fMedian),
	}
	if !slices.Equal(got, want) {
		t.Errorf("reasons\n got %q\nwant %q", got, want)
	}
	// Leverage, a |t| beyond 3 without a Bonferroni p below 5 %, and a
	// Cook's distance above 4/n are shown, not flagged.
	pi = PointInfluence{Leverage: 0.09, Studentized: 3.5, OutlierP: 0.2, CooksD: 0.1, DFFITS: 0.1}
	if m := cut.mask(&pi); m != 0 {
		t.Errorf("mask %b, want none", m)
	}
	pi = PointInfluence{Leverage: 0.05, Studentized: -6, OutlierP: 0.001, CooksD: 0.5}
	got = rw.write(&pi, cut.mask(&pi), &cut)
	want = []string{ckReasonOutlier + ": studentized residual −6.00, Bonferroni p = 0.0010 (limit 0.01)"}
	if !slices.Equal(got, want) {
		t.Errorf("reasons\n got %q\nwant %q", got, want)
	}
}
