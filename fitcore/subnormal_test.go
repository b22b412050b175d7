package fitcore

import (
	"math"
	"testing"
)

// Residuals and readings in the subnormal range (below 2^-1022) must not
// overflow the power-of-two scaling (2^1073 is not a float64) and turn into
// NaN; found by FuzzChecks.
func TestSubnormalScaling(t *testing.T) {
	tiny := math.SmallestNonzeroFloat64
	x := []float64{1, 2, 3, 4, 5, 6}
	resid := []float64{3 * tiny, -tiny, 2 * tiny, -4 * tiny, tiny, -tiny}
	dw := DurbinWatson(x, resid, false)
	if math.IsNaN(dw.Statistic) || math.IsInf(dw.Statistic, 0) || math.IsNaN(dw.P) {
		t.Fatalf("Durbin–Watson on subnormal residuals: %+v", dw)
	}
	if k := lnPow2Scale(tiny); math.IsInf(k, 0) || k == 0 {
		t.Fatalf("lnPow2Scale(%v) = %v", tiny, k)
	}
	if k := ckWeightScale([]float64{tiny, 2 * tiny}); math.IsInf(k, 0) || k == 0 {
		t.Fatalf("ckWeightScale = %v", k)
	}
}
