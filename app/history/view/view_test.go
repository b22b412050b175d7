package view

import (
	"math"
	"strings"
	"testing"
	"time"

	"pairline/app/history"
	"pairline/app/session"
	"pairline/fitcore"
)

var instStart = time.Date(2026, 1, 5, 9, 0, 0, 0, time.UTC)

func instSums(t *testing.T, keep func(s *session.Session, month int) bool) []history.Summary {
	t.Helper()
	ss, err := history.ScenarioRecords(2026, instStart)
	if err != nil {
		t.Fatal(err)
	}
	var out []history.Summary
	for i, s := range ss {
		if keep != nil && !keep(s, i%12+1) {
			continue
		}
		sum, err := history.Summarize(s)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, sum)
	}
	return out
}

func instByKey(t *testing.T, v View) map[string]Item {
	t.Helper()
	m := map[string]Item{}
	for _, it := range v.Items {
		m[it.Key] = it
	}
	return m
}

// TestInstViewScenario words the invented three-instrument year
// (history.ScenarioRecords). What is expected follows from how the data
// were generated, not from Pairline's output: the analyser's slope falls
// by 0.004 a month and reaches the lower limit 1.40 in month 26; the
// probe's line steps up by 0.8 in y after month 7, which at a slope of 1.5
// is 0.8/1.5 = 0.53 in x (1.07 % at x = 50, 0.53 % at x = 100).
func TestInstViewScenario(t *testing.T) {
	now := instStart.AddDate(0, 11, 10) // 10 days after the last session
	v, err := Build(instSums(t, nil), now)
	if err != nil {
		t.Fatal(err)
	}
	by := instByKey(t, v)
	if len(by) != 3 || v.Unnamed != 0 {
		t.Fatalf("%d instruments, %d unnamed; want 3, 0", len(by), v.Unnamed)
	}
	for k, it := range by {
		if len(it.Rows) != 12 || it.Count != 12 || it.Accepted != 12 {
			t.Errorf("%s: %d rows, %d counted, %d accepted; want 12 each", k, len(it.Rows), it.Count, it.Accepted)
		}
		for i, r := range it.Rows {
			if i > 0 && r.Taken.Before(it.Rows[i-1].Taken) {
				t.Errorf("%s: row %d out of time order", k, i)
			}
			if r.Signed != "A. Technician (invented)" || r.SlopeText == "" || r.SlopeSEText == "" {
				t.Errorf("%s row %d: signed %q, slope %q ± %q", k, i, r.Signed, r.SlopeText, r.SlopeSEText)
			}
		}
		// Interval 35 days from month 12 (instStart + 11 months): due in 25 days.
		if it.Due.State != DueLater || it.Due.Days != 25 {
			t.Errorf("%s: due %+v, want ok in 25 days", k, it.Due)
		}
		if m, ok := v.Due[it.Rows[11].ID]; !ok || m.State != DueLater {
			t.Errorf("%s: the newest session carries no due mark", k)
		}
		if _, ok := v.Due[it.Rows[10].ID]; ok {
			t.Errorf("%s: an older session carries a due mark", k)
		}
		if !strings.Contains(it.Slope.SVG, `data-limits="2"`) || !strings.Contains(it.Slope.SVG, `data-n="12"`) || len(it.Slope.Marks) != 12 {
			t.Errorf("%s: slope chart without its 12 points and 2 limits", k)
		}
	}
	drift := by["LVWB-CL-02"].Drift[0]
	if drift.Status != fitcore.DriftDrifting || !(drift.Low < -0.004 && -0.004 < drift.High) {
		t.Errorf("analyser slope: %s, %.5g per month [%.5g, %.5g], want drifting around −0.004", drift.Status, drift.PerMonth, drift.Low, drift.High)
	}
	truth := instStart.AddDate(0, 25, 0) // month 26
	if !drift.Bounded || !(drift.LeavesLo.Before(truth) && truth.Before(drift.LeavesHi)) {
		t.Errorf("analyser leaves the limit %v [%v, %v], want an interval holding %v", drift.LeavesAt, drift.LeavesLo, drift.LeavesHi, truth)
	}
	if !strings.Contains(drift.Leaves, "lower limit 1.4") {
		t.Errorf("leaves: %q", drift.Leaves)
	}
	if s := by["LVWB-TB-01"].Drift[0]; s.Status != fitcore.DriftSteady || !strings.Contains(s.Text, "no drift shown") {
		t.Errorf("stable slope: %s: %s", s.Status, s.Text)
	}
	if c := by["LVWB-TB-01"].Compare; c == nil || c.Verdict != fitcore.LinesSame || c.Today != by["LVWB-TB-01"].Rows[11].ID {
		t.Errorf("stable today-vs-last: %+v", c)
	}
}

// TestInstViewStep: with the probe's months 1–8 only, today (month 8) is
// compared with month 7, before the step: the line moved, the slope did
// not, and today reads about 0.53 higher in x (generated step 0.8 / 1.5).
func TestInstViewStep(t *testing.T) {
	sums := instSums(t, func(s *session.Session, m int) bool { return s.Instrument.ID == "LVWB-EC-03" && m <= 8 })
	v, err := Build(sums, instStart.AddDate(0, 7, 3))
	if err != nil {
		t.Fatal(err)
	}
	it := instByKey(t, v)["LVWB-EC-03"]
	c := it.Compare
	if c == nil || c.Verdict != fitcore.LinesMoved {
		t.Fatalf("step: %+v, want the line moved", c)
	}
	if len(c.Diffs) != 2 || c.Diffs[0].Where != "middle" || c.Diffs[1].Where != "top" {
		t.Fatalf("diffs %+v", c.Diffs)
	}
	for _, d := range c.Diffs {
		want := 100 * (0.8 / 1.5) / d.X
		if math.Abs(d.Percent-want) > 0.35*want || !strings.Contains(d.Text, "higher at") || !strings.Contains(d.Text, "µS/cm") {
			t.Errorf("%s: %.3g %% (%q), want about %.3g %% higher", d.Where, d.Percent, d.Text, want)
		}
	}
	if !strings.Contains(c.Headline, "moved") || !strings.Contains(c.Slopes, "no difference") {
		t.Errorf("words: %q / %q", c.Headline, c.Slopes)
	}
}

// TestInstViewDueAndDuplicates: the turbidity meter's last two months are
// missing, so it is overdue; a session given twice is counted once; too
// few calibrations are said plainly.
func TestInstViewDueAndDuplicates(t *testing.T) {
	sums := instSums(t, func(s *session.Session, m int) bool {
		return s.Instrument.ID != "LVWB-TB-01" || m <= 10
	})
	sums = append(sums, sums[0], sums[1]) // imported again
	now := instStart.AddDate(0, 11, 10)
	v, err := Build(sums, now)
	if err != nil {
		t.Fatal(err)
	}
	by := instByKey(t, v)
	tb := by["LVWB-TB-01"]
	// Month 10 is instStart + 9 months; 5 Oct 2026, due 35 days later, 9 Nov 2026; now is 15 Dec 2026.
	if tb.Due.State != DueOverdue || tb.Due.Days != -36 || !strings.Contains(tb.Due.Text, "Overdue since 9 Nov 2026 (36 days)") {
		t.Errorf("overdue: %+v", tb.Due)
	}
	if tb.Count != 10 || tb.Duplicates != 2 {
		t.Errorf("meter: %d counted, %d duplicates; want 10, 2", tb.Count, tb.Duplicates)
	}
	if v.Unnamed != 0 {
		t.Errorf("unnamed %d, want 0", v.Unnamed)
	}
	loose := sums[0]
	loose.ID, loose.Key = "0123456789abcdef0123456789abcdef", ""
	if v, err := Build(append(sums, loose), now); err != nil || v.Unnamed != 1 || len(v.Items) != 3 {
		t.Errorf("a session naming no instrument: %d unnamed, %d instruments (%v); want 1, 3", v.Unnamed, len(v.Items), err)
	}
	few, err := Build(sums[:2], now)
	if err != nil {
		t.Fatal(err)
	}
	d := few.Items[0].Drift[0]
	if d.Status != fitcore.DriftTooFew || !strings.Contains(d.Text, "too few calibrations") {
		t.Errorf("two calibrations: %s: %s", d.Status, d.Text)
	}
	if due := DueOf(history.Instrument{Due: now.AddDate(0, 0, 3)}, 35, now); due.State != DueSoon || due.Days != 3 {
		t.Errorf("due in 3 days: %+v", due)
	}
}

// TestInstViewStepInTable: over the whole year the probe's line moved once,
// between months 7 and 8 (the generated step), and nowhere else.
func TestInstViewStepInTable(t *testing.T) {
	v, err := Build(instSums(t, nil), instStart.AddDate(0, 11, 10))
	if err != nil {
		t.Fatal(err)
	}
	for i, r := range instByKey(t, v)["LVWB-EC-03"].Rows {
		want := fitcore.LinesSame
		if i == 0 {
			want = ""
		}
		if i == 7 {
			want = fitcore.LinesMoved
		}
		if r.Change != want {
			t.Errorf("month %d: %q, want %q", i+1, r.Change, want)
		}
	}
}

// BenchmarkInstView: summarising the invented year (36 sessions:
// history.Summarize fits each) and wording its history.
func BenchmarkInstView(b *testing.B) {
	ss, err := history.ScenarioRecords(2026, instStart)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		sums := make([]history.Summary, 0, len(ss))
		for _, s := range ss {
			sum, err := history.Summarize(s)
			if err != nil {
				b.Fatal(err)
			}
			sums = append(sums, sum)
		}
		if _, err := Build(sums, instStart.AddDate(1, 0, 0)); err != nil {
			b.Fatal(err)
		}
	}
}

// TestCopiesText: the words for copies and revisions not counted (the app,
// the page and the command use them), and nothing for none.
func TestCopiesText(t *testing.T) {
	for _, tc := range []struct {
		n          int
		copies, rv string
	}{
		{0, "", ""},
		{1, "1 extra copy of a calibration (imported again, or kept with “Keep both”) not counted again", "1 earlier revision of changed records kept apart, not counted"},
		{3, "3 extra copies of a calibration (imported again, or kept with “Keep both”) not counted again", "3 earlier revisions of changed records kept apart, not counted"},
	} {
		if got := CopiesText(tc.n); got != tc.copies {
			t.Errorf("CopiesText(%d) = %q, want %q", tc.n, got, tc.copies)
		}
		if got := RevisionsText(tc.n); got != tc.rv {
			t.Errorf("RevisionsText(%d) = %q, want %q", tc.n, got, tc.rv)
		}
	}
}

// TestInstViewShift: over the whole invented year the probe's intercept
// steps up by 0.8 mV after month 7 and is level before and after (how the
// data were generated, history.ScenarioInstruments): it is worded as one
// shift between the days of months 7 and 8, of about +0.8 mV, with the
// levels 0.5 and 1.3 mV inside a few standard errors, with the warning to
// look for what changed and no projected day of leaving a limit (the
// records set intercept limits, so a line through the step would have
// been projected to leave the upper one). The probe's slope, flat, stays
// "no drift shown", and the analyser's slope, a real trend, stays drifting
// (TestInstViewScenario).
func TestInstViewShift(t *testing.T) {
	v, err := Build(instSums(t, nil), instStart.AddDate(0, 11, 10))
	if err != nil {
		t.Fatal(err)
	}
	it := instByKey(t, v)["LVWB-EC-03"]
	if s := it.Drift[0]; s.Status != fitcore.DriftSteady {
		t.Errorf("probe slope: %s: %s", s.Status, s.Text)
	}
	d := it.Drift[1]
	if d.Status != fitcore.DriftShifted {
		t.Fatalf("probe intercept: %s: %s", d.Status, d.Text)
	}
	m7, m8 := instStart.AddDate(0, 6, 0), instStart.AddDate(0, 7, 0)
	if !d.StepFrom.Equal(it.Rows[6].Taken) || !d.StepTo.Equal(it.Rows[7].Taken) || Day(d.StepFrom) != Day(m7) || Day(d.StepTo) != Day(m8) {
		t.Errorf("step between %v and %v, want the days of months 7 and 8 (%s, %s)", d.StepFrom, d.StepTo, Day(m7), Day(m8))
	}
	if math.Abs(d.Step-0.8) > 4*d.StepSE || math.Abs(d.Before-0.5) > 0.1 || math.Abs(d.After-1.3) > 0.1 || !(d.StepP < fitcore.DriftAlpha) {
		t.Errorf("step %.4g ± %.2g from %.4g to %.4g (p %.2g), want about +0.8 from 0.5 to 1.3", d.Step, d.StepSE, d.Before, d.After, d.StepP)
	}
	for _, want := range []string{"Intercept shifted once, between " + Day(m7) + " and " + Day(m8) + ", by +0.", " mV", "no date of leaving a limit is projected"} {
		if !strings.Contains(d.Text, want) {
			t.Errorf("text %q lacks %q", d.Text, want)
		}
	}
	if !strings.Contains(d.StepAlert, "Find what changed then") || !strings.Contains(d.StepAlert, "maker's procedure") {
		t.Errorf("alert %q", d.StepAlert)
	}
	if d.Leaves != "" || !d.LeavesAt.IsZero() || strings.Contains(it.Leaves, "intercept") || strings.Contains(d.Text, "drifting") {
		t.Errorf("a step projected or called drifting: %q / %q / %q", d.Text, d.Leaves, it.Leaves)
	}
	if DriftWord(d.Status) != "shifted once" {
		t.Errorf("word %q", DriftWord(d.Status))
	}
}

// TestWordDriftJumpHint: invented monthly values, level, then 5 se higher
// from month 7 on, with a fixed wobble of up to 2 se: too close to call
// between a step and a line (fitcore says drifting, and that the step
// leaves less scatter), so the words add that a single jump between the
// days of months 6 and 7 would explain them at least as well. The
// analyser's slope in the invented scenario, a clear trend, gets no such
// hint.
func TestWordDriftJumpHint(t *testing.T) {
	wobble := []float64{1, -1, 2, 0, -2, 1, -1, 0, 2, -1, 1, -2}
	tm, v, se := make([]float64, 12), make([]float64, 12), make([]float64, 12)
	days := make([]time.Time, 12)
	for i := range tm {
		days[i] = instStart.AddDate(0, i, 0)
		tm[i] = history.Years(days[i].Sub(instStart))
		se[i] = 0.01
		v[i] = 1.5 + 0.01*wobble[i]
		if i >= 6 {
			v[i] += 0.052
		}
	}
	r, err := fitcore.Drift(tm, v, se, 0.95, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if r.Status != fitcore.DriftDrifting || r.Step == nil || !r.Step.BetterThanLine || r.Step.NBefore != 6 {
		t.Fatalf("the invented values no longer fall between the verdicts: %s, step %+v", r.Status, r.Step)
	}
	d := wordDrift("intercept", r, "mV", instStart, false, days)
	if want := "A single jump between " + Day(days[5]) + " and " + Day(days[6]) + " would explain these values at least as well"; !strings.Contains(d.Text, want) || !strings.Contains(d.Text, "Intercept is drifting") {
		t.Errorf("text %q lacks %q", d.Text, want)
	}
	v2, err := Build(instSums(t, nil), instStart.AddDate(0, 11, 10))
	if err != nil {
		t.Fatal(err)
	}
	if s := instByKey(t, v2)["LVWB-CL-02"].Drift[0]; s.Status != fitcore.DriftDrifting || strings.Contains(s.Text, "single jump") {
		t.Errorf("analyser slope: %s: %s", s.Status, s.Text)
	}
}

// TestWordDriftPBound: a drift whose p comes from simulated histories of
// which none reached the observed one (fitcore.DriftResult.PBound) is
// worded "p ≤ 0.0010", not "p = 0.0010"; the same trend with exact
// standard errors keeps "p < 0.001" (Student's t). Invented: a clear
// monthly trend of 12 calibrations, each se on 6 degrees of freedom.
func TestWordDriftPBound(t *testing.T) {
	tm, v, se, df := make([]float64, 12), make([]float64, 12), make([]float64, 12), make([]float64, 12)
	days := make([]time.Time, 12)
	for i := range tm {
		days[i] = instStart.AddDate(0, i, 0)
		tm[i] = history.Years(days[i].Sub(instStart))
		se[i], df[i] = 0.01, 6
		v[i] = 1.5 - 0.2*tm[i] + 0.002*float64(i%3-1)
	}
	r, err := fitcore.DriftEstimated(tm, v, se, df, 0.95, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !r.PBound || r.Status != fitcore.DriftDrifting {
		t.Fatalf("the invented trend is no longer beyond every simulated history: %+v", r)
	}
	if d := wordDrift("slope", r, "", instStart, false, days); !strings.Contains(d.Text, "p ≤ 0.0010 for no drift") {
		t.Errorf("text %q: want p ≤ 0.0010", d.Text)
	}
	e, err := fitcore.Drift(tm, v, se, 0.95, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if d := wordDrift("slope", e, "", instStart, false, days); !strings.Contains(d.Text, "p < 0.001 for no drift") {
		t.Errorf("text %q: want p < 0.001", d.Text)
	}
}
