package fitcore

import "testing"

// TestDurbinWatsonReference compares d with statsmodels durbin_watson, the
// null mean and variance of d with the dense-matrix traces tr(MA), tr(MAMA)
// of Durbin & Watson (1950) computed by numpy, and the beta-approximation p
// with scipy.stats.beta (checks.json).
func TestDurbinWatsonReference(t *testing.T) {
	for _, c := range refCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			r := refResid(t, c)
			got := DurbinWatson(c.X, r, c.Origin)
			assertFiniteCheck(t, got)
			refCheck(t, "d", got.Statistic, c.DurbinWatson.D, 1e-9, 1e-12)
			mean, variance, ok := ckDWMoments(c.X, c.Origin)
			if !ok {
				t.Fatal("moments failed")
			}
			refCheck(t, "E[d]", mean, c.DurbinWatson.Mean, 1e-10, 1e-12)
			refCheck(t, "Var[d]", variance, c.DurbinWatson.Var, 1e-8, 1e-12)
			refCheck(t, "p", got.P, c.DurbinWatson.P, 1e-6, 1e-300)
		})
	}
}

func TestDurbinWatsonEdges(t *testing.T) {
	tests := []struct {
		name     string
		x, resid []float64
		origin   bool
		want     Verdict
	}{
		{"too few", []float64{1, 2, 3}, []float64{1, -2, 1}, false, NA},
		{"zeros", []float64{1, 2, 3, 4, 5}, []float64{0, 0, 0, 0, 0}, false, NA},
		{"alternating", []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, []float64{1, -1, 1, -1, 1, -1, 1, -1, 1, -1}, false, Fail},
		{"through origin, few", []float64{1, 2, 3, 4}, []float64{0.1, -0.2, 0.1, 0.05}, true, Pass},
		{"x all zero through origin", []float64{0, 0, 0, 0, 0}, []float64{1, -1, 1, -1, 1}, true, NA},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := DurbinWatson(tc.x, tc.resid, tc.origin)
			assertFiniteCheck(t, got)
			if got.Verdict != tc.want {
				t.Errorf("verdict %s, want %s (%s)", got.Verdict, tc.want, got.Message)
			}
		})
	}
}
