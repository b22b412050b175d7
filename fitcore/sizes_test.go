package fitcore

import (
	"math"
	"testing"
)

// The gap between an exact quadratic and its least-squares line on five
// equally spaced points, worked by hand: y = x² at x = 0…4 has the line
// y = 4x − 2 (least squares: mean y 6, Sxy 40, Sxx 10), and x² − 4x + 2 is
// largest in size at x = 0 and 4 (2) and at the vertex x = 2 (−2).
func TestCurvatureGap(t *testing.T) {
	x := []float64{0, 1, 2, 3, 4}
	y := []float64{0, 1, 4, 9, 16}
	gap, pct, ok := curvatureGap(x, y, nil, false)
	if !ok || math.Abs(gap-2) > 1e-12 || math.Abs(pct-12.5) > 1e-10 {
		t.Errorf("gap %v (%v %%), ok %v; want 2 (12.5 %% of the span 16)", gap, pct, ok)
	}
	// A straight line has no gap.
	gap, _, ok = curvatureGap(x, []float64{1, 3, 5, 7, 9}, nil, false)
	if !ok || gap > 1e-12 {
		t.Errorf("straight line: gap %v, ok %v", gap, ok)
	}
}
