package fitcore

import (
	"strings"
	"testing"
)

// TestSummarize checks how verdicts combine (worst of the checks that ran;
// NA only when none ran) and that readings are named from 1.
func TestSummarize(t *testing.T) {
	pass := Check{Name: "a", Verdict: Pass, Message: "ok"}
	warn := Check{Name: "b", Verdict: Warn, Message: "hmm"}
	fail := Check{Name: "c", Verdict: Fail, Message: "bad"}
	na := Check{Name: "d", Verdict: NA, Message: "too few readings"}
	tests := []struct {
		name string
		c    Checks
		infl []PointInfluence
		lin  Verdict
		spr  Verdict
		ind  Verdict
		nor  Verdict
		inf  Verdict
	}{
		{"all pass", Checks{Curvature: pass, BreuschPagan: pass, White: pass, DurbinWatson: pass, Runs: pass, ShapiroWilk: pass},
			[]PointInfluence{{Index: 0}, {Index: 1}}, Pass, Pass, Pass, Pass, Pass},
		{"lack of fit fails", Checks{Curvature: pass, LackOfFit: &fail, BreuschPagan: warn, White: pass, DurbinWatson: na, Runs: pass, ShapiroWilk: na},
			[]PointInfluence{{Index: 0}, {Index: 6, Flagged: true, Reasons: []string{ckReasonLeverage + ": h"}}}, Fail, Warn, Pass, NA, Warn},
		{"nothing ran", Checks{Curvature: na, BreuschPagan: na, White: na, DurbinWatson: na, Runs: na, ShapiroWilk: na},
			nil, NA, NA, NA, NA, NA},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			a := Summarize(tc.c, tc.infl)
			for _, g := range []struct {
				what string
				as   Assumption
				want Verdict
			}{{"linearity", a.Linearity, tc.lin}, {"spread", a.Spread, tc.spr}, {"independence", a.Independence, tc.ind},
				{"normality", a.Normality, tc.nor}, {"influence", a.Influence, tc.inf}} {
				if g.as.Verdict != g.want {
					t.Errorf("%s: %s, want %s (%s)", g.what, g.as.Verdict, g.want, g.as.Message)
				}
				if g.as.Message == "" {
					t.Errorf("%s: no message", g.what)
				}
				if (g.want == Warn || g.want == Fail) && g.as.Advice == "" {
					t.Errorf("%s: no advice", g.what)
				}
			}
			if a.XExactness != nil {
				t.Errorf("x exactness should be absent")
			}
		})
	}
	a := Summarize(Checks{}, []PointInfluence{{Index: 6, Flagged: true, Reasons: []string{ckReasonLeverage + ": h"}}})
	if !strings.HasPrefix(a.Influence.Message, "Reading 7 ") {
		t.Errorf("influence message %q should name Reading 7", a.Influence.Message)
	}
}

func TestReadingList(t *testing.T) {
	tests := []struct {
		ix   []int
		want string
	}{
		{[]int{7}, "Reading 7"},
		{[]int{3, 7}, "Readings 3 and 7"},
		{[]int{1, 2, 3}, "Readings 1, 2 and 3"},
		{[]int{1, 2, 3, 4, 5, 6, 7}, "Readings 1, 2, 3, 4, 5 and 2 more"},
	}
	for _, tc := range tests {
		if got := ckReadingList(tc.ix); got != tc.want {
			t.Errorf("%v: %q, want %q", tc.ix, got, tc.want)
		}
	}
}

// TestSummarizeNIST runs every check on NIST/SEMATECH data with a known
// diagnosis and checks the summary: PONTIUS (handbook: a straight line leaves
// systematic curvature) must fail linearity.
func TestSummarizeNIST(t *testing.T) {
	for _, c := range refCases(t) {
		if c.Name != "pontius" {
			continue
		}
		r := refResid(t, c)
		ch := Checks{
			Curvature:    CurvatureTest(c.X, c.Y, nil, 0.95),
			LackOfFit:    LackOfFit(c.X, c.Y, nil, false),
			BreuschPagan: BreuschPagan(c.X, r),
			White:        White(c.X, r),
			DurbinWatson: DurbinWatson(c.X, r, false),
			Runs:         RunsTest(r),
			ShapiroWilk:  ShapiroWilkCheck(r),
		}
		a := Summarize(ch, Influence(c.X, r, nil, false))
		if a.Linearity.Verdict != Fail {
			t.Errorf("Pontius linearity %+v", a.Linearity)
		}
	}
}
