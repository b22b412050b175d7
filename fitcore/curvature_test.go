package fitcore

import (
	"fmt"
	"testing"
)

// TestCurvatureReference compares the quadratic-term t and p with the t-value
// of the (x − x̄)² coefficient in statsmodels OLS/WLS (checks.json).
func TestCurvatureReference(t *testing.T) {
	for _, c := range refCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			got := CurvatureTest(c.X, c.Y, c.W, 0.95)
			assertFiniteCheck(t, got)
			if c.Curvature == nil {
				if got.Verdict != NA {
					t.Errorf("fewer than 3 distinct x: want NA, got %+v", got)
				}
				return
			}
			if c.Curvature.P == 1 && c.Curvature.T == 0 {
				// NIST NoInt1 is exactly linear: statsmodels t is 0.
				if got.Verdict != NA && !refClose(got.Statistic, 0, 0, 1e-6) {
					t.Errorf("exact line: got %+v", got)
				}
				return
			}
			refCheck(t, "t", got.Statistic, c.Curvature.T, 1e-8, 1e-10)
			refCheck(t, "p", got.P, c.Curvature.P, 1e-6, 1e-300)
			refCheck(t, "df", got.DF, c.Curvature.DF, 0, 0)
		})
	}
}

// TestCurvatureEdges covers the NA paths and the level thresholds.
func TestCurvatureEdges(t *testing.T) {
	bent := []float64{1, 4, 9, 16, 25.5, 36}
	x6 := []float64{1, 2, 3, 4, 5, 6}
	tests := []struct {
		name    string
		x, y, w []float64
		level   float64
		want    Verdict
	}{
		{"three points", []float64{1, 2, 3}, []float64{1, 2, 4}, nil, 0.95, NA},
		{"x constant", []float64{2, 2, 2, 2}, []float64{1, 2, 3, 4}, nil, 0.95, NA},
		{"two x levels", []float64{1, 1, 2, 2}, []float64{1, 2, 3, 4}, nil, 0.95, NA},
		{"exact line", x6, []float64{3, 5, 7, 9, 11, 13}, nil, 0.95, NA},
		{"strong bend", x6, bent, nil, 0.95, Fail},
		{"level 0 means 0.95", x6, bent, nil, 0, Fail},
		{"bad weight", x6, bent, []float64{1, 1, 0, 1, 1, 1}, 0.95, NA},
		{"length mismatch", x6, bent[:5], nil, 0.95, NA},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := CurvatureTest(tc.x, tc.y, tc.w, tc.level)
			assertFiniteCheck(t, got)
			if got.Verdict != tc.want {
				t.Errorf("verdict %s, want %s (%s)", got.Verdict, tc.want, got.Message)
			}
		})
	}
}

// ExampleCurvatureTest shows an invented gauge whose readings bend upward.
func ExampleCurvatureTest() {
	x := []float64{0, 1, 2, 3, 4, 5, 6, 7}
	y := []float64{0.1, 1.0, 2.2, 3.1, 4.5, 5.6, 7.1, 8.4}
	c := CurvatureTest(x, y, nil, 0.95)
	fmt.Println(c.Verdict)
	// Output: warn
}
