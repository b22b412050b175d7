package fitcore_test

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"pairline/fitcore"

	"gonum.org/v1/gonum/stat/distuv"
)

// history.json is written by testdata/refgen/history_ref.R with R's lm and
// anova (version in its "generator" key); all its data are invented.
type historyGolden struct {
	Generator string `json:"generator"`
	Compare   []struct {
		Name                                   string
		X1, Y1, X2, Y2                         []float64
		FIntercepts                            float64 `json:"f_intercepts"`
		PIntercepts                            float64 `json:"p_intercepts"`
		FSlopes                                float64 `json:"f_slopes"`
		PSlopes                                float64 `json:"p_slopes"`
		FCoincident                            float64 `json:"f_coincident"`
		PCoincident                            float64 `json:"p_coincident"`
		DF2                                    int     `json:"df2"`
		Intercept1, Slope1, Intercept2, Slope2 float64
	} `json:"compare"`
	Drift []struct {
		Name        string
		T, S, SE    []float64
		Intercept   float64 `json:"intercept"`
		InterceptSE float64 `json:"intercept_se"`
		Rate        float64 `json:"rate"`
		RateSE      float64 `json:"rate_se"`
		P           float64 `json:"p"`
		RateLow     float64 `json:"rate_low"`
		RateHigh    float64 `json:"rate_high"`
	} `json:"drift"`
}

func loadHistoryGolden(t *testing.T) historyGolden {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(goldenDir, "history.json"))
	if err != nil {
		t.Fatal(err)
	}
	var g historyGolden
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	if len(g.Compare) < 3 || len(g.Drift) < 2 {
		t.Fatalf("history.json has %d comparisons and %d drifts", len(g.Compare), len(g.Drift))
	}
	return g
}

// TestCompareLinesR checks CompareLines against R's
// anova(lm(y ~ x), lm(y ~ x + g), lm(y ~ x * g)) and anova(lm(y ~ x), lm(y ~ x * g)).
func TestCompareLinesR(t *testing.T) {
	g := loadHistoryGolden(t)
	for _, tc := range g.Compare {
		t.Run(tc.Name, func(t *testing.T) {
			c := cmp{t, "R " + g.Generator + " anova/lm, testdata/refgen/history_ref.R"}
			got, err := fitcore.CompareLines(tc.X1, tc.Y1, tc.X2, tc.Y2)
			if err != nil {
				t.Fatal(err)
			}
			if got.DF2Slopes != tc.DF2 || got.DF2Coincident != tc.DF2 {
				t.Errorf("df2 %d/%d, want %d [R]", got.DF2Slopes, got.DF2Coincident, tc.DF2)
			}
			c.near("F slopes", got.FSlopes, tc.FSlopes, tolEstimate)
			c.near("p slopes", got.PSlopes, tc.PSlopes, tolP)
			c.near("F intercepts", got.FIntercepts, tc.FIntercepts, tolEstimate)
			c.near("p intercepts", got.PIntercepts, tc.PIntercepts, tolP)
			c.near("F coincident", got.FCoincident, tc.FCoincident, tolEstimate)
			c.near("p coincident", got.PCoincident, tc.PCoincident, tolP)
			c.near("slope 1", got.Slope1, tc.Slope1, tolEstimate)
			c.near("intercept 1", got.Intercept1, tc.Intercept1, tolEstimate)
			c.near("slope 2", got.Slope2, tc.Slope2, tolEstimate)
			c.near("intercept 2", got.Intercept2, tc.Intercept2, tolEstimate)
		})
	}
}

// TestDriftR checks Drift against R's lm(s ~ t, weights = 1/se^2):
// coefficients, standard errors, p of the slope and confint at 0.95.
func TestDriftR(t *testing.T) {
	g := loadHistoryGolden(t)
	for _, tc := range g.Drift {
		t.Run(tc.Name, func(t *testing.T) {
			c := cmp{t, "R " + g.Generator + " lm weights, testdata/refgen/history_ref.R"}
			got, err := fitcore.Drift(tc.T, tc.S, tc.SE, 0.95, nil, nil)
			if err != nil {
				t.Fatal(err)
			}
			c.near("rate", got.Rate, tc.Rate, tolEstimate)
			c.near("rate se", got.RateSE, tc.RateSE, tolEstimate)
			c.near("intercept", got.Intercept, tc.Intercept, tolEstimate)
			c.near("intercept se", got.InterceptSE, tc.InterceptSE, tolEstimate)
			c.near("p", got.P, tc.P, tolP)
			c.near("rate low", got.RateLow, tc.RateLow, tolEstimate)
			c.near("rate high", got.RateHigh, tc.RateHigh, tolEstimate)
		})
	}
}

// TestDriftLimitCrossing: the projected crossing lies inside its interval,
// the fitted line is at the limit there, and the band edges are at the
// limit at Low and High (the defining equations in Drift's doc comment,
// re-evaluated here from R-checked rate, intercept and standard errors).
func TestDriftLimitCrossing(t *testing.T) {
	g := loadHistoryGolden(t)
	tc := g.Drift[1] // drifting slope, downward
	lower := 1.47
	got, err := fitcore.Drift(tc.T, tc.S, tc.SE, 0.95, &lower, nil)
	if err != nil {
		t.Fatal(err)
	}
	x := got.Leaves
	if x == nil || !x.Bounded || x.Side != "lower" {
		t.Fatalf("want a bounded lower crossing, got %+v", x)
	}
	if !(x.Low < x.At && x.At < x.High) {
		t.Errorf("crossing %g not inside [%g, %g]", x.At, x.Low, x.High)
	}
	c := cmp{t, "Drift's defining equations"}
	c.near("fitted at crossing", got.Intercept+got.Rate*x.At, lower, tol{rel: 1e-12, abs: 1e-12})
	// var(fit(t)) = s²/Σw + (t − t̄)²·se(r)², and s²/Σw = se(a)² − t̄²·se(r)².
	tq := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(got.N - 2)}.Quantile(0.975)
	v0 := got.InterceptSE*got.InterceptSE - got.MeanT*got.MeanT*got.RateSE*got.RateSE
	band := func(at float64) float64 {
		u := at - got.MeanT
		return tq * math.Sqrt(v0+u*u*got.RateSE*got.RateSE)
	}
	// The falling line: the lower band edge reaches the limit first (Low),
	// the upper edge last (High).
	c.near("lower band at Low", got.Intercept+got.Rate*x.Low-band(x.Low), lower, tol{rel: 1e-9, abs: 1e-12})
	c.near("upper band at High", got.Intercept+got.Rate*x.High+band(x.High), lower, tol{rel: 1e-9, abs: 1e-12})
	// Without the rate's sign toward the limit there is no crossing.
	upper := 2.0
	got2, _ := fitcore.Drift(tc.T, tc.S, tc.SE, 0.95, nil, &upper)
	if got2.Leaves != nil {
		t.Errorf("falling trend reported to reach an upper limit: %+v", got2.Leaves)
	}
	few, _ := fitcore.Drift(tc.T[:2], tc.S[:2], tc.SE[:2], 0.95, &lower, nil)
	if few.Status != fitcore.DriftTooFew {
		t.Errorf("2 calibrations: status %q", few.Status)
	}
}

// TestDriftFalseAlarmRate: on a steady parameter (invented, seeded: 12
// monthly calibrations, exact se), "drifting" must be claimed in about
// DriftAlpha = 1 % of 4,000 trials (band ±3.5 binomial se, common practice),
// and a drift of 6 se per year must be detected in most trials.
func TestDriftFalseAlarmRate(t *testing.T) {
	for _, tc := range []struct {
		name     string
		rate     float64
		lo, hi   float64
		drifting bool
	}{
		{"steady", 0, 0.005, 0.016, true},
		{"6 se per year", 0.06, 0.9, 1, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := rand.New(rand.NewPCG(7, 12))
			tm := make([]float64, 12)
			s := make([]float64, 12)
			se := make([]float64, 12)
			hits := 0
			const trials = 4000
			for k := 0; k < trials; k++ {
				for i := range tm {
					tm[i] = float64(i) / 12
					se[i] = 0.01
					s[i] = 1.5 + tc.rate*tm[i] + se[i]*r.NormFloat64()
				}
				d, err := fitcore.Drift(tm, s, se, 0.95, nil, nil)
				if err != nil {
					t.Fatal(err)
				}
				if d.Status == fitcore.DriftDrifting {
					hits++
				}
			}
			rate := float64(hits) / trials
			t.Logf("%s: drifting in %.4f of %d trials", tc.name, rate, trials)
			if rate < tc.lo || rate > tc.hi {
				t.Errorf("rate %.4f outside [%g, %g]", rate, tc.lo, tc.hi)
			}
		})
	}
}
