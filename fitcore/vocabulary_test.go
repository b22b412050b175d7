package fitcore

import (
	"errors"
	"fmt"
	"reflect"
	"strings"
	"testing"
)

func TestParseVocabulary(t *testing.T) {
	for _, tc := range []struct {
		name, in, want, option string
		parse                  func(string) (string, error)
	}{
		{"model", "deming", "deming", "", func(s string) (string, error) { v, err := ParseModel(s); return string(v), err }},
		{"model blank", "", "", "model", func(s string) (string, error) { v, err := ParseModel(s); return string(v), err }},
		{"model unknown", "OLS", "", "model", func(s string) (string, error) { v, err := ParseModel(s); return string(v), err }},
		{"transform", "log_log", "log_log", "", func(s string) (string, error) { v, err := ParseTransform(s); return string(v), err }},
		{"transform unknown", "log", "", "transform", func(s string) (string, error) { v, err := ParseTransform(s); return string(v), err }},
		{"transform spaced", " log_y", "", "transform", func(s string) (string, error) { v, err := ParseTransform(s); return string(v), err }},
		{"weights power", "power", "power", "", func(s string) (string, error) { v, err := ParseWeightScheme(s); return string(v), err }},
		{"weights none", "none", "", "", func(s string) (string, error) { v, err := ParseWeightScheme(s); return string(v), err }},
		{"weights empty", "", "", "", func(s string) (string, error) { v, err := ParseWeightScheme(s); return string(v), err }},
		{"weights unknown", "1/x", "", "weights", func(s string) (string, error) { v, err := ParseWeightScheme(s); return string(v), err }},
		{"remedy", "weighted", "weighted", "", func(s string) (string, error) { v, err := ParseRemedy(s); return string(v), err }},
		{"verdict", "n/a", "n/a", "", func(s string) (string, error) { v, err := ParseVerdict(s); return string(v), err }},
		{"verdict unknown", "ok", "", "verdict", func(s string) (string, error) { v, err := ParseVerdict(s); return string(v), err }},
	} {
		got, err := tc.parse(tc.in)
		if tc.option == "" {
			if err != nil || got != tc.want {
				t.Errorf("%s: parse(%q) = %q, %v; want %q", tc.name, tc.in, got, err, tc.want)
			}
			continue
		}
		var oe *OptionError
		if !errors.As(err, &oe) || oe.Option != tc.option || !errors.Is(err, ErrBadOption) {
			t.Errorf("%s: parse(%q) error %v; want an *OptionError for %s", tc.name, tc.in, err, tc.option)
		}
	}
}

// Every value listed parses back to itself, and every listed option value is
// one Normalize accepts.
func TestValuesRoundTripAndNormalize(t *testing.T) {
	for _, m := range Model("").Values() {
		if v, err := ParseModel(string(m)); err != nil || v != m {
			t.Errorf("model %q: %q, %v", m, v, err)
		}
		o := Options{Model: m}
		if m == ModelWeighted {
			o.Weights = WeightsX
		}
		if _, err := o.Normalize(); err != nil {
			t.Errorf("Normalize refuses model %q: %v", m, err)
		}
	}
	for _, tr := range Transform("").Values() {
		if v, err := ParseTransform(string(tr)); err != nil || v != tr {
			t.Errorf("transform %q: %q, %v", tr, v, err)
		}
		if _, err := (Options{Transform: tr}).Normalize(); err != nil {
			t.Errorf("Normalize refuses transform %q: %v", tr, err)
		}
	}
	for _, w := range WeightScheme("").Values() {
		if v, err := ParseWeightScheme(string(w)); err != nil || v != w {
			t.Errorf("weights %q: %q, %v", w, v, err)
		}
		o := Options{Weights: w}
		if w == WeightsGiven {
			o.GivenWeights = []float64{1}
		}
		n, err := o.Normalize()
		if err != nil {
			t.Errorf("Normalize refuses weights %q: %v", w, err)
		}
		if w != WeightsNone && n.Model != ModelWeighted {
			t.Errorf("weights %q: model %q, want weighted", w, n.Model)
		}
	}
	for _, r := range Remedy("").Values() {
		if v, err := ParseRemedy(string(r)); err != nil || v != r {
			t.Errorf("remedy %q: %q, %v", r, v, err)
		}
	}
	for _, v := range Verdict("").Values() {
		if p, err := ParseVerdict(string(v)); err != nil || p != v {
			t.Errorf("verdict %q: %q, %v", v, p, err)
		}
	}
}

// jsonKeys gives the JSON keys of the fields of a struct type, in order.
func jsonKeys(t reflect.Type) []string {
	var keys []string
	for i := 0; i < t.NumField(); i++ {
		keys = append(keys, strings.Split(t.Field(i).Tag.Get("json"), ",")[0])
	}
	return keys
}

// The lists name every field of Checks and Assumptions once, with the JSON
// key as id, and Get returns that very field.
func TestCheckListCoversReport(t *testing.T) {
	var ids []string
	for _, c := range CheckList() {
		ids = append(ids, string(c.ID))
	}
	if want := jsonKeys(reflect.TypeOf(Checks{})); !reflect.DeepEqual(ids, want) {
		t.Errorf("CheckList ids %v; Checks fields %v", ids, want)
	}
	ids = nil
	for _, a := range AssumptionList() {
		ids = append(ids, string(a.ID))
	}
	if want := jsonKeys(reflect.TypeOf(Assumptions{})); !reflect.DeepEqual(ids, want) {
		t.Errorf("AssumptionList ids %v; Assumptions fields %v", ids, want)
	}
	r := &Report{}
	r.Checks.LackOfFit, r.Checks.XExactness = &Check{}, &Check{}
	r.Assumptions.XExactness = &Assumption{}
	rv := reflect.ValueOf(&r.Checks).Elem()
	for i, c := range CheckList() {
		f := rv.Field(i)
		if f.Kind() != reflect.Pointer {
			f = f.Addr()
		}
		if c.Get(r) != f.Interface().(*Check) {
			t.Errorf("%s: Get returns another field", c.ID)
		}
		if c.Symbol == "" {
			t.Errorf("%s: no symbol", c.ID)
		}
	}
	av := reflect.ValueOf(&r.Assumptions).Elem()
	for i, a := range AssumptionList() {
		f := av.Field(i)
		if f.Kind() != reflect.Pointer {
			f = f.Addr()
		}
		if a.Get(r) != f.Interface().(*Assumption) {
			t.Errorf("%s: Get returns another field", a.ID)
		}
		for _, id := range a.Tests {
			if c, ok := id.Info(); !ok || c.Assumption != a.ID {
				t.Errorf("%s lists test %s of assumption %s", a.ID, id, c.Assumption)
			}
		}
	}
}

// The symbols against the names fitcore gives its tests (the statistics as
// their papers write them: Durbin & Watson's d, Shapiro & Wilk's W, the χ² of
// Breusch–Pagan and White; t and F of the added term and lack of fit, and
// the normal z of the runs and x-exactness tests — common practice).
func TestCheckSymbolsOnAReport(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 1, 4}
	y := []float64{1.1, 2.3, 2.9, 4.2, 4.8, 6.1, 7.2, 7.9, 0.9, 4.1}
	rep, err := Analyze(x, y, Options{XUncertainty: 0.01, YUncertainty: 0.1, SkipAdvice: true})
	if err != nil {
		t.Fatal(err)
	}
	want := map[CheckID]string{CheckCurvature: "Curvature", CheckLackOfFit: "Lack of fit", CheckDurbinWatson: "Durbin–Watson",
		CheckRuns: "Runs", CheckShapiroWilk: "Shapiro–Wilk", CheckBreuschPagan: "Breusch", CheckWhite: "White", CheckXExactness: "x exactness"}
	got := rep.Present()
	if len(got) != len(checkList) {
		t.Fatalf("%d tests present, want all %d", len(got), len(checkList))
	}
	for _, c := range got {
		if !strings.HasPrefix(c.Check.Name, want[c.ID]) {
			t.Errorf("%s: the report names it %q", c.ID, c.Check.Name)
		}
	}
}

func ExampleCheckList() {
	for _, c := range CheckList() {
		fmt.Printf("%s %s (%s)\n", c.ID, c.Symbol, c.Assumption)
	}
	w, err := ParseWeightScheme("power")
	fmt.Println(w, err)
	_, err = ParseModel("quadratic")
	fmt.Println(err)
	// Output:
	// curvature t (linearity)
	// lack_of_fit F (linearity)
	// breusch_pagan χ² (spread)
	// white χ² (spread)
	// durbin_watson d (independence)
	// runs z (independence)
	// shapiro_wilk W (normality)
	// x_exactness z (x_exactness)
	// power <nil>
	// an option is not valid: model = "quadratic": use ols, origin, weighted or deming
}

// Every remedy the advice can give stands for options that Normalize
// accepts, and a weighting stands for a weighted model (what the screen's
// "use this" and the command's flag hint apply).
func TestRemedySettings(t *testing.T) {
	for _, r := range Remedy("").Values() {
		m, tr, w := r.Settings()
		o := Options{Model: m, Transform: tr, Weights: w}
		if tr == TransformBoxCox {
			l := 0.5
			o.BoxCoxLambda = &l
		}
		if _, err := o.Normalize(); err != nil {
			t.Errorf("%s: settings %s/%s/%q refused: %v", r, m, tr, w, err)
		}
		if (w != WeightsNone) != (m == ModelWeighted) {
			t.Errorf("%s: model %s with weights %q", r, m, w)
		}
		if r == RemedyNone && (tr != TransformNone || w != WeightsNone) {
			t.Errorf("none stands for %s/%q", tr, w)
		}
	}
}
