package fitcore

import "testing"

// TestLackOfFitReference compares F, p and both df with statsmodels anova_lm
// of the line against the one-mean-per-x model (checks.json); LOADCELL and
// PONTIUS are the NIST/SEMATECH e-Handbook repeat-reading calibrations.
func TestLackOfFitReference(t *testing.T) {
	for _, c := range refCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			got := LackOfFit(c.X, c.Y, c.W, c.Origin)
			if c.LackOfFit == nil {
				if got != nil {
					t.Errorf("want nil (no repeats or no df), got %+v", *got)
				}
				return
			}
			if got == nil {
				t.Fatal("got nil, want a check")
			}
			assertFiniteCheck(t, *got)
			refCheck(t, "F", got.Statistic, c.LackOfFit.F, 1e-8, 1e-12)
			refCheck(t, "p", got.P, c.LackOfFit.P, 1e-6, 1e-300)
			refCheck(t, "df lack of fit", got.DF, c.LackOfFit.DFLOF, 0, 0)
			refCheck(t, "df pure error", got.DF2, c.LackOfFit.DFPE, 0, 0)
		})
	}
}

func TestLackOfFitEdges(t *testing.T) {
	tests := []struct {
		name    string
		x, y    []float64
		origin  bool
		wantNil bool
		want    Verdict
	}{
		{"no repeats", []float64{1, 2, 3, 4}, []float64{1, 2, 3, 5}, false, true, ""},
		{"two levels, no lack-of-fit df", []float64{1, 1, 2, 2}, []float64{1, 2, 3, 4}, false, true, ""},
		{"two levels through origin", []float64{1, 1, 2, 2}, []float64{1, 1.2, 3, 3.1}, true, false, Pass}, // p = 0.041 is above CheckWarnP (1 %)
		{"repeats agree exactly", []float64{1, 1, 2, 2, 3, 3}, []float64{1, 1, 2, 2, 4, 4}, false, false, NA},
		{"NaN y", []float64{1, 1, 2}, []float64{1, nan(), 2}, false, false, NA},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := LackOfFit(tc.x, tc.y, nil, tc.origin)
			if tc.wantNil {
				if got != nil {
					t.Fatalf("want nil, got %+v", *got)
				}
				return
			}
			if got == nil {
				t.Fatal("got nil")
			}
			assertFiniteCheck(t, *got)
			if got.Verdict != tc.want {
				t.Errorf("verdict %s, want %s (%s)", got.Verdict, tc.want, got.Message)
			}
		})
	}
}
