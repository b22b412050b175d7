package fitcore

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

// Regression tests for the limits of checkmin.go and options.go, each on a
// case that misled or panicked before (common practice; the expected texts
// are ours).

// TestThreeReadings: three equally spaced readings leave one residual
// degree of freedom, so their residuals are always in the proportion
// 1 : −2 : 1; Shapiro–Wilk "failed" (W = 0.75), the Box–Cox interval had
// zero width and the advice said the readings follow a straight line
// while linearity was n/a.
func TestThreeReadings(t *testing.T) {
	rep, err := Analyze([]float64{1, 2, 3}, []float64{1, 2.1, 2.9}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	c := rep.Checks
	for _, k := range []Check{c.ShapiroWilk, c.BreuschPagan, c.White, c.DurbinWatson, c.Runs} {
		if k.Verdict != NA {
			t.Errorf("%s: %s (%s), want n/a below %d residual df", k.Name, k.Verdict, k.Message, MinResidualDF)
		}
	}
	if !strings.Contains(c.ShapiroWilk.Message, "needs at least 6 readings") || !strings.Contains(c.ShapiroWilk.Message, "residual degrees of freedom") {
		t.Errorf("Shapiro–Wilk message does not give the minimum and the reason: %s", c.ShapiroWilk.Message)
	}
	a := rep.Assumptions
	for name, v := range map[string]Verdict{"linearity": a.Linearity.Verdict, "spread": a.Spread.Verdict,
		"independence": a.Independence.Verdict, "normality": a.Normality.Verdict, "influence": a.Influence.Verdict} {
		if v != NA {
			t.Errorf("%s: %s, want n/a", name, v)
		}
	}
	if rep.BoxCox != nil {
		t.Errorf("Box–Cox profile on 3 readings: %+v, want none (MinBoxCoxN = %d)", *rep.BoxCox, MinBoxCoxN)
	}
	if strings.Contains(rep.Advice.Reason, "follow a straight line") || !strings.Contains(rep.Advice.Reason, "neither the straightness") {
		t.Errorf("advice claims what was not checked: %s", rep.Advice.Reason)
	}
	if _, err := Analyze([]float64{1, 2, 3}, []float64{1, 2.1, 2.9}, Options{Transform: TransformBoxCox}); !errors.Is(err, ErrTransformDomain) || !strings.Contains(err.Error(), "at least 5 readings") {
		t.Errorf("Box–Cox fit with an estimated power on 3 readings: %v, want the minimum named", err)
	}
}

// TestNoScatterOneSentence: readings on a line up to rounding (y = 0.3x +
// 0.7 at x = 0.1 … 1.0 leaves residuals of 1.1e-16) made curvature say
// "exactly on a straight line" while a reading was flagged an outlier
// (studentized residual capped at 1e10), normality failed and influence
// warned. Every check and assumption must now say NoScatterSentence, for
// ordinary, weighted and through-the-origin fits, and nothing is flagged.
func TestNoScatterOneSentence(t *testing.T) {
	x := []float64{0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0}
	y := make([]float64, len(x))
	yo := make([]float64, len(x))
	for i, v := range x {
		y[i] = 0.3*v + 0.7
		yo[i] = 0.3 * v * 1.1
	}
	w := make([]float64, len(x))
	for i, v := range x {
		w[i] = 1 / v
	}
	for _, tc := range []struct {
		name string
		y    []float64
		opt  Options
	}{
		{"ols", y, Options{}},
		{"weighted", y, Options{Weights: WeightsGiven, GivenWeights: w}},
		{"origin", yo, Options{Model: ModelOrigin}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rep, err := Analyze(x, tc.y, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			nonzero := false
			for _, e := range rep.Residuals {
				nonzero = nonzero || e != 0
			}
			if tc.name == "ols" && !nonzero {
				t.Fatal("the case needs residuals of rounding size, not exact zeros")
			}
			c := rep.Checks
			for _, k := range []Check{c.Curvature, c.BreuschPagan, c.White, c.DurbinWatson, c.Runs, c.ShapiroWilk} {
				if k.Verdict != NA || k.Message != NoScatterSentence {
					t.Errorf("%s: %s %q, want n/a %q", k.Name, k.Verdict, k.Message, NoScatterSentence)
				}
			}
			a := rep.Assumptions
			for name, as := range map[string]Assumption{"linearity": a.Linearity, "spread": a.Spread,
				"independence": a.Independence, "normality": a.Normality, "influence": a.Influence} {
				if as.Verdict != NA || as.Message != NoScatterSentence {
					t.Errorf("%s: %s %q", name, as.Verdict, as.Message)
				}
			}
			for _, p := range rep.Influence {
				if p.Flagged || p.Studentized != 0 {
					t.Errorf("reading %d flagged (t = %v): %v", p.Index+1, p.Studentized, p.Reasons)
				}
			}
			if rep.Limits != nil {
				t.Errorf("detection limits from rounding errors: %+v", *rep.Limits)
			}
			if tc.name == "ols" && !slices.Contains(rep.Notes, noScatterNote) {
				t.Errorf("no note that the figures describe rounding: %v", rep.Notes)
			}
			if !strings.HasPrefix(rep.Advice.Reason, "The readings lie on a straight line to the precision of the arithmetic") {
				t.Errorf("advice: %s", rep.Advice.Reason)
			}
		})
	}
	// Real scatter a little above the tolerance is still checked.
	yn := make([]float64, len(x))
	for i, v := range x {
		yn[i] = 0.3*v + 0.7 + 1e-9*float64(i%3-1)
	}
	rep, err := Analyze(x, yn, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Checks.ShapiroWilk.Verdict == NA {
		t.Errorf("scatter of 1e-9 taken for none: %s", rep.Checks.ShapiroWilk.Message)
	}
}

// TestLevelsNeverPanic: levels of 1e-300, 5e-324 and 4.6e-216 panicked in
// gonum's quantiles (the Box–Cox χ² quantile: "parameter out of bounds";
// elsewhere a root finder). Analyze refuses them with an OptionError and
// every internal function that takes a level falls back to DefaultLevel.
func TestLevelsNeverPanic(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	y := []float64{1.1, 2.3, 2.9, 4.2, 5.1, 5.8, 7.2, 7.9}
	for _, lv := range []float64{1e-300, 5e-324, 4.6e-216, 1e-10, 0.49, 0.99999, 1 - 1e-17, 1, 2, -1, math.NaN(), math.Inf(1)} {
		_, err := Analyze(x, y, Options{Level: lv})
		var oe *OptionError
		if !errors.As(err, &oe) || oe.Option != "level" {
			t.Errorf("level %v: %v, want an OptionError for level", lv, err)
		}
		if _, err := BoxCoxProfile(x, y, lv); !errors.Is(err, ErrBadOption) {
			t.Errorf("BoxCoxProfile level %v: %v", lv, err)
		}
		if tc := lnTCrit(lv, 6); !(tc > 0) || math.IsInf(tc, 0) {
			t.Errorf("lnTCrit(%v) = %v", lv, tc)
		}
		assertFiniteCheck(t, CurvatureTest(x, y, nil, lv))
		ck, _ := XExactness(x, y, 0.1, 0.1, lv)
		assertFiniteCheck(t, ck)
	}
}

// TestMisleadingReasons: a Box–Cox power of 500 was refused with "needs
// every y above zero" and a variance ratio of 1e308 with "x and y are
// uncorrelated"; an unknown's reading of 1e160 gave "the slope is not
// clearly different from zero" for a slope of 1.000 ± 0.029. Each is now
// refused naming the option and its range, and an unknown as far as the
// limit allows still gets its bounded interval.
func TestMisleadingReasons(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	y := []float64{1.1, 2.3, 2.9, 4.2, 5.1, 5.8, 7.2, 7.9}
	lam := 500.0
	for _, tc := range []struct {
		opt    Options
		option string
		want   string
	}{
		{Options{Transform: TransformBoxCox, BoxCoxLambda: &lam}, "box_cox_lambda", "must be from -5 to 5"},
		{Options{Model: ModelDeming, VarianceRatio: 1e308}, "variance_ratio", "must be from 1e-06 to 1e+06"},
		{Options{Inverse: []InverseQuery{{Y: []float64{1e160}}}}, "inverse_y", "rescale the units"},
		{Options{PredictX: []float64{-1e200}}, "predict_x", "rescale the units"},
		{Options{SlopeRef: &lam, XUncertainty: 1e300}, "x_uncertainty", "at most 1e+150"},
	} {
		_, err := Analyze(x, y, tc.opt)
		var oe *OptionError
		if !errors.As(err, &oe) || oe.Option != tc.option || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %v, want an OptionError naming it with %q", tc.option, err, tc.want)
		}
	}
	rep, err := Analyze(x, y, Options{Inverse: []InverseQuery{{Y: []float64{MaxMagnitude}}}})
	if err != nil {
		t.Fatal(err)
	}
	inv := rep.Inverse[0]
	if !inv.Bounded || strings.Contains(inv.Message, "not clearly different") || !(inv.Low < inv.X && inv.X < inv.High) {
		t.Errorf("far unknown: %+v", inv)
	}
	// x̂ = (y0 − b0)/b1 exactly as computed another way.
	want := (MaxMagnitude - rep.Intercept.Estimate) / rep.Slope.Estimate
	if math.Abs(inv.X-want) > 1e-12*want {
		t.Errorf("x̂ = %v, want %v", inv.X, want)
	}
	if _, err := Analyze([]float64{1, 2, 1e151}, []float64{1, 2, 3}, Options{}); !errors.Is(err, ErrOutOfRange) || !strings.Contains(err.Error(), "rescale the units") {
		t.Errorf("a reading above MaxMagnitude: %v", err)
	}
}
