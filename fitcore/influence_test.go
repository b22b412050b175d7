package fitcore

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
)

// TestInfluenceReference compares leverage, externally studentized residual,
// Cook's distance, DFFITS and the Bonferroni outlier p with statsmodels
// OLSInfluence (hat_matrix_diag, resid_studentized_external, cooks_distance,
// dffits) and outlier_test(method='bonf') on the fit of √w·y on √w·X
// (checks.json). Reference entries that are NaN/Inf (leverage 1, as reading
// 8 of Anscombe's fourth set) are null and checked for the documented 0.
func TestInfluenceReference(t *testing.T) {
	for _, c := range refCases(t) {
		t.Run(c.Name, func(t *testing.T) {
			got := Influence(c.X, refResid(t, c), c.W, c.Origin)
			if len(got) != c.N {
				t.Fatalf("%d results for %d readings", len(got), c.N)
			}
			ri := c.Influence
			for i, p := range got {
				if p.Index != i {
					t.Fatalf("index %d at %d", p.Index, i)
				}
				for _, v := range []float64{p.Leverage, p.Studentized, p.OutlierP, p.CooksD, p.DFFITS, p.Residual} {
					if !ckFinite(v) {
						t.Fatalf("reading %d: non-finite %+v", i+1, p)
					}
				}
				if ri.Leverage[i] != nil {
					refCheck(t, fmt.Sprintf("h[%d]", i), p.Leverage, *ri.Leverage[i], 1e-9, 1e-13)
				}
				if ri.Studentized[i] == nil || ri.DFFITS[i] == nil {
					if p.Studentized != 0 || p.DFFITS != 0 || !p.Flagged {
						t.Errorf("reading %d: reference undefined, want 0 and flagged, got %+v", i+1, p)
					}
					continue
				}
				refCheck(t, fmt.Sprintf("t[%d]", i), p.Studentized, *ri.Studentized[i], 1e-8, 1e-11)
				refCheck(t, fmt.Sprintf("D[%d]", i), p.CooksD, *ri.Cooks[i], 1e-8, 1e-13)
				refCheck(t, fmt.Sprintf("DFFITS[%d]", i), p.DFFITS, *ri.DFFITS[i], 1e-8, 1e-11)
				refCheck(t, fmt.Sprintf("Bonferroni p[%d]", i), p.OutlierP, *ri.BonfP[i], 1e-7, 1e-13)
			}
		})
	}
}

// TestInfluenceFlags checks the common-practice thresholds on invented data:
// reading 9 of syn_outlier14 carries a gross error (+2.5) and must be the
// only outlier.
func TestInfluenceFlags(t *testing.T) {
	var c refCase
	for _, k := range loadRef(t).Cases {
		if k.Name == "syn_outlier14" {
			c = k
		}
	}
	if c.X == nil {
		t.Fatal("syn_outlier14 missing from checks.json")
	}
	got := Influence(c.X, refResid(t, c), nil, false)
	for i, p := range got {
		isOut := false
		for _, r := range p.Reasons {
			isOut = isOut || strings.HasPrefix(r, ckReasonOutlier)
		}
		if isOut != (i == 8) {
			t.Errorf("reading %d: outlier flag %v, reasons %q", i+1, isOut, p.Reasons)
		}
	}
	a := Summarize(Checks{}, got)
	if a.Influence.Verdict != Fail || !strings.Contains(a.Influence.Message, "Reading 9") {
		t.Errorf("summary %+v", a.Influence)
	}
}

func TestInfluenceEdges(t *testing.T) {
	tests := []struct {
		name       string
		x, r, w    []float64
		origin     bool
		wantNil    bool
		wantFlagAt int // -1: none
	}{
		{"two readings", []float64{1, 2}, []float64{0, 0}, nil, false, true, -1},
		{"x constant", []float64{1, 1, 1}, []float64{1, -1, 0}, nil, false, true, -1},
		{"NaN", []float64{1, 2, 3}, []float64{1, nan(), 0}, nil, false, true, -1},
		{"bad weight", []float64{1, 2, 3}, []float64{1, -1, 0}, []float64{1, -1, 1}, false, true, -1},
		{"all zero residuals", []float64{1, 2, 3, 4, 5}, []float64{0, 0, 0, 0, 0}, nil, false, false, -1},
		{"leverage one", []float64{1, 1, 1, 1, 9}, []float64{0.1, -0.1, 0.2, -0.2, 0}, nil, false, false, 4},
		{"three points", []float64{1, 2, 3}, []float64{0.1, -0.2, 0.1}, nil, false, false, -1},
		{"origin, far x", []float64{1, 2, 3, 4}, []float64{0.1, -0.1, 0.05, 0}, nil, true, false, -1}, // h = 16/30 > 2/4: leverage alone is shown, not flagged
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := Influence(tc.x, tc.r, tc.w, tc.origin)
			if tc.wantNil {
				if got != nil {
					t.Fatalf("want nil, got %+v", got)
				}
				return
			}
			for i, p := range got {
				if tc.wantFlagAt >= 0 && i == tc.wantFlagAt && !p.Flagged {
					t.Errorf("reading %d should be flagged: %+v", i+1, p)
				}
				if tc.wantFlagAt < 0 && p.Flagged {
					t.Errorf("reading %d flagged: %q", i+1, p.Reasons)
				}
			}
		})
	}
}

func ExampleInfluence() {
	// Invented flow-gauge readings; reading 6 was mistyped.
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	y := []float64{2.1, 3.9, 6.1, 8.0, 9.9, 15.0, 14.1, 15.9}
	_, _, r, _ := ckLine(x, y, nil, false)
	for _, p := range Influence(x, r, nil, false) {
		if p.Flagged {
			fmt.Printf("reading %d: %s\n", p.Index+1, p.Reasons[0])
		}
	}
	// Output: reading 6: outlier: studentized residual 25.9, Bonferroni p < 0.001 (limit 0.01)
}

// TestInfluencePearsonGiven: influenceRun reading the Pearson residuals
// the checks made (pr) gives bit for bit what it gives working them out
// itself, on random weighted records with and without an intercept.
func TestInfluencePearsonGiven(t *testing.T) {
	r := rand.New(rand.NewPCG(31, 7))
	for trial := range 200 {
		n := 3 + r.IntN(400)
		x, e, w := make([]float64, n), make([]float64, n), make([]float64, n)
		pr := make([]float64, n)
		for i := range x {
			x[i] = r.Float64() * 10
			e[i] = r.NormFloat64() * (1 + x[i])
			w[i] = 1 / (0.1 + x[i]*x[i])
			pr[i] = math.Sqrt(w[i]) * e[i]
		}
		origin := trial%3 == 0
		out1, m1 := influenceRun(x, e, w, nil, origin, true, true)
		out2, m2 := influenceRun(x, e, w, pr, origin, true, true)
		if !reflect.DeepEqual(out1, out2) || !reflect.DeepEqual(m1, m2) {
			t.Fatalf("trial %d: influence with the Pearson residuals given differs", trial)
		}
	}
}

// TestInfluenceQuietSameMasks: the summary's shortcut (quiet, which skips
// readings certainly without a reason) finds exactly the reasons of every
// reading that the full diagnostics find (keep), on random records with
// heavy-tailed scatter, readings far out in x, weights, near-exact fits
// and through the origin. The oracle is influenceRun with keep, which
// works out every reading through point.
func TestInfluenceQuietSameMasks(t *testing.T) {
	r := rand.New(rand.NewPCG(41, 3))
	flagged := 0
	for trial := range 600 {
		n := 4 + r.IntN(3000)
		x, e, w := make([]float64, n), make([]float64, n), make([]float64, n)
		scale := math.Pow(10, float64(r.IntN(9)-4))
		for i := range x {
			x[i] = r.Float64() * 10
			switch trial % 4 {
			case 0:
				e[i] = r.NormFloat64()
			case 1:
				e[i] = r.NormFloat64() / (0.05 + math.Abs(r.NormFloat64())) // heavy tails
			case 2:
				e[i] = r.NormFloat64() * (1 + x[i])
			case 3:
				e[i] = 1e-9 * r.NormFloat64() // nearly exact, one large below
			}
			e[i] *= scale
			w[i] = 1 / (0.1 + x[i]*x[i])
		}
		for range r.IntN(4) {
			e[r.IntN(n)] *= 20 + 50*r.Float64()
		}
		if trial%5 == 0 {
			x[r.IntN(n)] = 100 + 1000*r.Float64() // high leverage
		}
		var ww []float64
		if trial%2 == 1 {
			ww = w
		}
		origin := trial%3 == 0
		_, want := influenceRun(x, e, ww, nil, origin, true, true)
		_, got := influenceRun(x, e, ww, nil, origin, true, false)
		if !reflect.DeepEqual(got, want) {
			t.Fatalf("trial %d (n = %d): the summary's reasons differ from the full diagnostics'", trial, n)
		}
		for _, m := range want {
			if m != 0 {
				flagged++
			}
		}
	}
	if flagged < 100 {
		t.Fatalf("only %d flagged readings in all trials: the test does not reach the thresholds", flagged)
	}
}
