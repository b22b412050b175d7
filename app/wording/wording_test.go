package wording

import (
	"fmt"
	"testing"

	"pairline/app/numfmt"
	"pairline/fitcore"
)

func TestNumbersInWords(t *testing.T) {
	cases := []struct {
		what, got, want string
	}{
		{"P small", P(3e-9), "< 0.001"},
		{"P at the limit", P(0.001), "0.0010"},
		{"P ordinary", P(0.04567), "0.046"},
		{"P one", P(1), "> 0.99"},
		{"PEq small", PEq(1e-20), "p < 0.001"},
		{"PEq ordinary", PEq(0.25), "p = 0.25"},
		{"Percent 95", Percent(0.95), "95 %"},
		{"Percent binary noise", Percent(0.9), "90 %"},
		{"Percent 99.9", Percent(0.999), "99.9 %"},
		{"Percent 99.99", Percent(0.9999), "99.99 %"},
		{"Interval", Interval(0.99), "99 % interval"},
		{"Range", Range("1", "2"), "1 to 2"},
		{"DF whole", DF(48), "48"},
		{"DF fraction", DF(12.3456), "12.35"},
		{"Ref negative", Ref(-2.5), "−2.5"},
		{"Ref one", Ref(1), "1"},
		{"TAgainst", TAgainst(Ref(0.98)), "t (against 0.98)"},
		{"PAgainst", PAgainst(Ref(0)), "p (against 0)"},
		{"Fit plain", Fit(fitcore.ModelOLS, fitcore.TransformNone), "ordinary least squares"},
		{"Fit log", Fit(fitcore.ModelWeighted, fitcore.TransformLogY), "weighted least squares, fitted on the ln y scale"},
	}
	for _, c := range cases {
		if c.got != c.want {
			t.Errorf("%s: %q, want %q", c.what, c.got, c.want)
		}
	}
}

// TestShowPlainTest: the test against 0 is shown only when the reference
// value differs from 0; with a reference of 0 it is the same test.
func TestShowPlainTest(t *testing.T) {
	for _, c := range []struct {
		ref  float64
		want bool
	}{{0, false}, {1, true}, {-0.5, true}, {1e-300, true}} {
		if got := ShowPlainTest(c.ref); got != c.want {
			t.Errorf("ShowPlainTest(%g) = %v, want %v", c.ref, got, c.want)
		}
	}
}

func TestVerdictWords(t *testing.T) {
	seen := map[string]bool{}
	for _, v := range []fitcore.Verdict{fitcore.Pass, fitcore.Warn, fitcore.Fail, fitcore.NA} {
		icon, word := Verdict(v)
		if icon == "" || word == "" || seen[word] {
			t.Errorf("verdict %s: %q %q (words must differ)", v, icon, word)
		}
		seen[word] = true
	}
}

// TestEquation: one writing of the line for every model and scale (the
// forms are our own; common practice writes the fitted scale on the left).
func TestEquation(t *testing.T) {
	lam := 0.5
	num := func(v float64) string { return numfmt.Sig(v, 2) }
	for _, tc := range []struct {
		rep  fitcore.Report
		want string
	}{
		{fitcore.Report{Model: fitcore.ModelOLS, Transform: fitcore.TransformNone}, "y = −0.50 + 2.0 · x"},
		{fitcore.Report{Model: fitcore.ModelOrigin}, "y = 2.0 · x"},
		{fitcore.Report{Model: fitcore.ModelOLS, Transform: fitcore.TransformLogLog}, "ln y = −0.50 + 2.0 · ln x"},
		{fitcore.Report{Model: fitcore.ModelWeighted, Transform: fitcore.TransformSqrtY}, "√y = −0.50 + 2.0 · x"},
		{fitcore.Report{Model: fitcore.ModelOLS, Transform: fitcore.TransformBoxCox, TransformLambda: &lam}, "Box–Cox y (λ = 0.500) = −0.50 + 2.0 · x"},
	} {
		tc.rep.Slope.Estimate, tc.rep.Intercept.Estimate = 2, -0.5
		if got := Equation(&tc.rep, num); got != tc.want {
			t.Errorf("%s/%s: %q, want %q", tc.rep.Model, tc.rep.Transform, got, tc.want)
		}
	}
}

// Equal units make the slope a plain ratio (common practice: a slope of
// µS/cm against µS/cm has no unit).
func TestSlopeUnit(t *testing.T) {
	for _, c := range [][3]string{
		{"mV", "mg/L", "mV per mg/L"},
		{"µS/cm", "µS/cm", "ratio"},
		{" µS/cm", "µS/cm ", "ratio"},
		{"", "mg/L", "y unit per mg/L"},
		{"mV", "", "mV per x unit"},
		{"", "", "y unit per x unit"},
	} {
		if got := SlopeUnit(c[0], c[1]); got != c[2] {
			t.Errorf("SlopeUnit(%q, %q) = %q, want %q", c[0], c[1], got, c[2])
		}
	}
}

func ExampleSlopeUnit() {
	fmt.Println(SlopeUnit("mV", "mg/L") + "; " + SlopeUnit("µS/cm", "µS/cm"))
	// Output: mV per mg/L; ratio
}

// TestCriterionWords: every criterion fitcore reports on invented readings has
// a name in words (never its key).
func TestCriterionWords(t *testing.T) {
	for _, k := range []string{"r_squared", "slope", "intercept", "max_residual"} {
		if w := Criterion(k); w == k || w == "" {
			t.Errorf("Criterion(%q) = %q, want words", k, w)
		}
	}
	if Criterion("other") != "other" {
		t.Error("an unknown name is not kept")
	}
}

// TestRemedyTag: the heading of the advice's "after" column names the
// scale of the refit, both scales for a log–log fit (common practice: the
// fit is ln y against ln x, and "ln y" alone would read as a log of y only).
func TestRemedyTag(t *testing.T) {
	for _, c := range []struct {
		r    fitcore.Remedy
		want string
	}{
		{fitcore.RemedyLogY, "ln y"},
		{fitcore.RemedyLogLog, "ln y on ln x"},
		{fitcore.RemedySqrtY, "√y"},
		{fitcore.RemedyReciprocal, "1/y"},
		{fitcore.RemedyBoxCox, "power of y"},
		{fitcore.RemedyWeightedX2, "weighted 1/x²"},
		{fitcore.RemedyNone, ""},
	} {
		if got := RemedyTag(c.r); got != c.want {
			t.Errorf("RemedyTag(%s) = %q, want %q", c.r, got, c.want)
		}
	}
}
