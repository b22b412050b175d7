package fitcore

import (
	"math"
	"testing"
)

func nan() float64 { return math.NaN() }

// TestBreuschPaganReference compares n·R² and p with statsmodels
// het_breuschpagan(resid, [1, x]) (robust=True, Koenker's form), checks.json.
func TestBreuschPaganReference(t *testing.T) {
	for _, c := range refCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			got := BreuschPagan(c.X, refResid(t, c))
			assertFiniteCheck(t, got)
			refCheck(t, "LM", got.Statistic, c.BreuschPagan.LM, 1e-7, 1e-9)
			refCheck(t, "p", got.P, c.BreuschPagan.P, 1e-6, 1e-300)
		})
	}
}

// TestWhiteReference compares with statsmodels het_white(resid, [1, x]).
func TestWhiteReference(t *testing.T) {
	for _, c := range refCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			got := White(c.X, refResid(t, c))
			assertFiniteCheck(t, got)
			if c.White == nil {
				if got.Verdict != NA {
					t.Errorf("fewer than 3 distinct x: want NA, got %+v", got)
				}
				return
			}
			refCheck(t, "LM", got.Statistic, c.White.LM, 1e-7, 1e-9)
			refCheck(t, "p", got.P, c.White.P, 1e-6, 1e-300)
			refCheck(t, "df", got.DF, 2, 0, 0)
		})
	}
}

func TestSpreadEdges(t *testing.T) {
	tests := []struct {
		name     string
		x, resid []float64
		want     Verdict
	}{
		{"all residuals zero", []float64{1, 2, 3, 4}, []float64{0, 0, 0, 0}, NA},
		{"equal magnitudes", []float64{1, 2, 3, 4}, []float64{1, -1, 1, -1}, NA},
		{"two points", []float64{1, 2}, []float64{0.1, -0.1}, NA},
		{"x constant", []float64{3, 3, 3, 3}, []float64{1, -2, 3, -2}, NA},
		{"Inf residual", []float64{1, 2, 3, 4}, []float64{1, math.Inf(1), 3, -2}, NA},
		{"huge residual", []float64{1, 2, 3, 4}, []float64{1, 1e200, 3, -2}, NA},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			for _, got := range []Check{BreuschPagan(tc.x, tc.resid), White(tc.x, tc.resid)} {
				assertFiniteCheck(t, got)
				if got.Verdict != tc.want {
					t.Errorf("%s verdict %s, want %s (%s)", got.Name, got.Verdict, tc.want, got.Message)
				}
			}
		})
	}
}
