package fitcore

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"testing"
)

// weightsRef is testdata/golden/weights.json (testdata/refgen/weights_ref.R).
type weightsRef struct {
	R      string `json:"r"`
	LMTest string `json:"lmtest"`
	Sets   []struct {
		Name string    `json:"name"`
		X    []float64 `json:"x"`
		Y    []float64 `json:"y"`
		Fits map[string]struct {
			Intercept   float64 `json:"intercept"`
			Slope       float64 `json:"slope"`
			SEIntercept float64 `json:"se_intercept"`
			SESlope     float64 `json:"se_slope"`
			Sigma       float64 `json:"sigma"`
			BP          float64 `json:"bp"`
			BPP         float64 `json:"bp_p"`
		} `json:"fits"`
	} `json:"sets"`
}

// TestWeightedRemediesR compares the weightings the advice offers for
// growing scatter with R (version in the golden): lm(y ~ x, weights = 1/x^2),
// weights 1/fitted(lm(y ~ x))^2, weights 1/ave(y, x, FUN = var) from the
// repeats, and the plain line; coefficients, standard errors and sigma to
// 1e-9 relative, and the Breusch–Pagan statistic of the weighted residuals
// √w·e (Koenker's form, n·R² of lm(pe^2 ~ x) in R; for the plain line
// checked there against lmtest::bptest) to 1e-8. Then the advice on the
// same readings: every weighting is a usable candidate whose spread check
// is that of its own weighted residuals.
func TestWeightedRemediesR(t *testing.T) {
	raw, err := os.ReadFile(filepath.Join("..", "testdata", "golden", "weights.json"))
	if err != nil {
		t.Fatal(err)
	}
	var ref weightsRef
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	if len(ref.Sets) == 0 {
		t.Fatal("no sets in weights.json")
	}
	near := func(got, want, tol float64) bool { return math.Abs(got-want) <= tol*math.Max(1e-300, math.Abs(want)) }
	compared := 0
	schemes := map[string]WeightScheme{"none": WeightsNone, "x2": WeightsX2, "fitted2": WeightsFitted2, "repeats": WeightsRepeats}
	for _, s := range ref.Sets {
		for key, want := range s.Fits {
			rep, err := Analyze(s.X, s.Y, Options{Weights: schemes[key], SkipAdvice: true})
			if err != nil {
				t.Fatalf("%s, %s: %v", s.Name, key, err)
			}
			for _, c := range []struct {
				what      string
				got, want float64
				tol       float64
			}{
				{"intercept", rep.Intercept.Estimate, want.Intercept, 1e-9},
				{"slope", rep.Slope.Estimate, want.Slope, 1e-9},
				{"SE intercept", rep.Intercept.SE, want.SEIntercept, 1e-9},
				{"SE slope", rep.Slope.SE, want.SESlope, 1e-9},
				{"residual SE", rep.ResidualSE, want.Sigma, 1e-9},
				{"Breusch–Pagan", rep.Checks.BreuschPagan.Statistic, want.BP, 1e-8},
				{"Breusch–Pagan p", rep.Checks.BreuschPagan.P, want.BPP, 1e-8},
			} {
				if !near(c.got, c.want, c.tol) {
					t.Errorf("%s, weights %s: %s %.17g, R (%s) %.17g", s.Name, key, c.what, c.got, ref.R, c.want)
				}
			}
		}
		rep, err := Analyze(s.X, s.Y, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if rep.Advice == nil || !adBad(rep.Assumptions.Spread.Verdict) {
			continue
		}
		for _, c := range rep.Advice.Candidates {
			_, _, ws := c.Remedy.Settings()
			fit, ok := s.Fits[map[WeightScheme]string{WeightsX2: "x2", WeightsFitted2: "fitted2", WeightsRepeats: "repeats"}[ws]]
			if !ok {
				continue
			}
			compared++
			if !c.Usable || !near(c.Slope, fit.Slope, 1e-9) || !near(c.Summary.BreuschPaganP, fit.BPP, 1e-8) {
				t.Errorf("%s: candidate %s usable %v slope %v BP p %v; R slope %v BP p %v (%s)", s.Name, c.Remedy, c.Usable, c.Slope, c.Summary.BreuschPaganP, fit.Slope, fit.BPP, c.Why)
			}
		}
	}
	if compared < 3 {
		t.Errorf("the advice was compared with R on %d weighted candidates, want at least 3 (one set whose spread check flags)", compared)
	}
}
