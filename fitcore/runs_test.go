package fitcore

import "testing"

// TestRunsReference compares z and p with statsmodels
// runstest_1samp(resid, cutoff=0, correction=True) where the two continuity
// conventions agree (see RunsTest; checks.json marks those cases).
func TestRunsReference(t *testing.T) {
	for _, c := range refCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			got := RunsTest(refResid(t, c))
			assertFiniteCheck(t, got)
			if !c.Runs.Comparable {
				t.Skipf("statsmodels' correction differs here (R = %d)", c.Runs.Runs)
			}
			refCheck(t, "z", got.Statistic, c.Runs.Z, 1e-12, 1e-12)
			refCheck(t, "p", got.P, c.Runs.P, 1e-10, 1e-14)
		})
	}
}

// TestRunsHand checks hand-computed values: signs + + − − + + − − (N = 8,
// n₊ = n₋ = 4, R = 4): μ = 5, σ² = 2·16·(32 − 8)/(64·7) = 12/7, and
// with the continuity correction z = (4 − 5 + 0.5)/√(12/7) (Wald & Wolfowitz
// 1940 moments; worked by hand).
func TestRunsHand(t *testing.T) {
	tests := []struct {
		name  string
		resid []float64
		z     float64
		want  Verdict
	}{
		{"blocks of two", []float64{1, 2, -1, -2, 3, 1, -1, -3}, -0.5 / 1.3093073414159542, Pass},
		{"zeros dropped", []float64{1, 0, 2, -1, -2, 0, 3, 1, -1, -3}, -0.5 / 1.3093073414159542, Pass},
		{"one negative", []float64{1, 2, -1, 3}, 0, NA},
		{"empty", nil, 0, NA},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := RunsTest(tc.resid)
			assertFiniteCheck(t, got)
			if got.Verdict != tc.want {
				t.Fatalf("verdict %s, want %s (%s)", got.Verdict, tc.want, got.Message)
			}
			if tc.want != NA {
				refCheck(t, "z", got.Statistic, tc.z, 1e-14, 1e-14)
			}
		})
	}
}
