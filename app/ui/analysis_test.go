package ui

import (
	"math"
	"strings"
	"testing"

	"pairline/app/session"
	"pairline/fitcore"
)

// Repeat readings of an unknown are split at spaces and semicolons; a
// comma followed by one or two digits is a decimal comma (the number rules
// of app/session, ParseNumber).
func TestSplitReadings(t *testing.T) {
	c := newShell()
	cases := []struct {
		in      string
		want    []float64
		problem string
	}{
		{"12.5", []float64{12.5}, ""},
		{"12,5; 12,7 12.6", []float64{12.5, 12.7, 12.6}, ""},
		{"  3\t4\n5 ;; 6 ", []float64{3, 4, 5, 6}, ""},
		{"", []float64{}, ""},
		{"1.5 abc", nil, "Reading 2"},
		{"−2.5", []float64{-2.5}, ""},
	}
	for _, k := range cases {
		got, problem := splitReadings(c.ctl.sess, k.in)
		if k.problem != "" {
			if !strings.Contains(problem, k.problem) {
				t.Errorf("%q: problem %q, want it to name %q", k.in, problem, k.problem)
			}
			continue
		}
		if problem != "" || len(got) != len(k.want) {
			t.Errorf("%q: got %v (%q), want %v", k.in, got, problem, k.want)
			continue
		}
		for i := range got {
			if got[i] != k.want[i] {
				t.Errorf("%q: reading %d = %v, want %v", k.in, i+1, got[i], k.want[i])
			}
		}
	}
}

// FuzzSplitReadings: any text gives numbers or a sentence, never a panic,
// and every number returned is finite.
func FuzzSplitReadings(f *testing.F) {
	for _, s := range []string{"12,5; 12,7", "1e3 2", "abc", ";;", "1,234"} {
		f.Add(s)
	}
	c := newShell()
	f.Fuzz(func(t *testing.T, s string) {
		got, problem := splitReadings(c.ctl.sess, s)
		if problem != "" && got != nil {
			t.Fatalf("%q: both numbers %v and a problem %q", s, got, problem)
		}
		for _, v := range got {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%q gave %v", s, v)
			}
		}
	})
}

// Applying the advice sets exactly what the advice fitted: an intercept
// line on the recommended scale, or a weighted fit with an estimated power;
// the other settings (level, references, criteria) stay.
func TestWithRemedy(t *testing.T) {
	ref := 1.0
	base := session.DefaultSettings()
	base.Model, base.Level, base.SlopeRef = fitcore.ModelOrigin, 0.99, &ref
	lam := 0.37
	cases := []struct {
		ad   fitcore.Advice
		want session.Settings
	}{
		{fitcore.Advice{Remedy: fitcore.RemedyLogY},
			session.Settings{Model: fitcore.ModelOLS, Transform: fitcore.TransformLogY}},
		{fitcore.Advice{Remedy: fitcore.RemedyLogLog},
			session.Settings{Model: fitcore.ModelOLS, Transform: fitcore.TransformLogLog}},
		{fitcore.Advice{Remedy: fitcore.RemedyWeighted},
			session.Settings{Model: fitcore.ModelWeighted, Weights: fitcore.WeightsPowerFit, Transform: fitcore.TransformNone}},
		{fitcore.Advice{Remedy: fitcore.RemedyBoxCox, Candidates: []fitcore.Candidate{{Remedy: fitcore.RemedyBoxCox, Lambda: lam}}},
			session.Settings{Model: fitcore.ModelOLS, Transform: fitcore.TransformBoxCox, BoxCoxLambda: &lam}},
	}
	for _, k := range cases {
		got := anWithRemedy(base, &k.ad)
		if got.Model != k.want.Model || got.Transform != k.want.Transform || got.Weights != k.want.Weights {
			t.Errorf("%s: got model %q transform %q weights %q, want %q %q %q", k.ad.Remedy,
				got.Model, got.Transform, got.Weights, k.want.Model, k.want.Transform, k.want.Weights)
		}
		if (got.BoxCoxLambda == nil) != (k.want.BoxCoxLambda == nil) || got.BoxCoxLambda != nil && *got.BoxCoxLambda != lam {
			t.Errorf("%s: λ %v", k.ad.Remedy, got.BoxCoxLambda)
		}
		if got.Level != 0.99 || got.SlopeRef != &ref {
			t.Errorf("%s: level or reference changed", k.ad.Remedy)
		}
		if !anApplied(got) {
			t.Errorf("%s: the applied settings are not seen as applied", k.ad.Remedy)
		}
	}
	if anApplied(session.DefaultSettings()) {
		t.Error("the default settings are seen as applied")
	}
}

// Every verdict has its own icon and word, so that none depends on colour.
func TestVerdictWords(t *testing.T) {
	seenIcon, seenWord := map[string]bool{}, map[string]bool{}
	for _, v := range []fitcore.Verdict{fitcore.Pass, fitcore.Warn, fitcore.Fail, fitcore.NA} {
		icon, word, class := anVerdict(v)
		if icon == "" || word == "" || class == "" || seenIcon[icon] || seenWord[word] {
			t.Errorf("verdict %q: icon %q word %q class %q not distinct", v, icon, word, class)
		}
		seenIcon[icon], seenWord[word] = true, true
	}
}

func TestNumberTexts(t *testing.T) {
	cases := []struct{ got, want string }{
		{anP(0.0432), "0.043"},
		{anP(3e-9), "< 0.001"},
		{anP(0.996), "> 0.99"},
		{anDF(10), "10"},
		{anDF(7.25), "7.250"},
		{anPercent(0.9), "90 %"},
		{anPercent(0.95), "95 %"},
		{anPercent(0.975), "97.5 %"},
		{anFullText(-2), "−2"},
	}
	for _, k := range cases {
		if k.got != k.want {
			t.Errorf("got %q, want %q", k.got, k.want)
		}
	}
}

// The queries ride along in the one analysis: the inverse readings, the
// x values to predict at, and, on a transformed scale only, five x across
// the readings for the line in original units.
func TestQueries(t *testing.T) {
	c := newShell()
	c.an.anInvY, c.an.anPredX = []float64{2, 3}, []float64{7}
	var o fitcore.Options
	c.an.queries(&o, []float64{1, 5, 3})
	if len(o.Inverse) != 1 || len(o.Inverse[0].Y) != 2 || len(o.PredictX) != 1 || len(c.an.anLineX) != 0 {
		t.Fatalf("untransformed: %+v, line x %v", o, c.an.anLineX)
	}
	o = fitcore.Options{Transform: fitcore.TransformLogY}
	c.an.queries(&o, []float64{1, 5, 3})
	want := []float64{7, 1, 2, 3, 4, 5}
	if len(o.PredictX) != len(want) {
		t.Fatalf("PredictX = %v, want %v", o.PredictX, want)
	}
	for i := range want {
		if o.PredictX[i] != want[i] {
			t.Errorf("PredictX = %v, want %v", o.PredictX, want)
			break
		}
	}
}
