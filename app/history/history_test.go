package history_test

import (
	"math"
	"testing"
	"time"

	"pairline/app/history"
	"pairline/app/session"
	"pairline/fitcore"
)

var scenarioStart = time.Date(2025, 1, 6, 0, 0, 0, 0, time.UTC)

func summarize(t testing.TB, ss []*session.Session) []history.Summary {
	t.Helper()
	var out []history.Summary
	for _, s := range ss {
		sum, err := history.Summarize(s)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, sum)
	}
	return out
}

// TestScenario runs the invented three-instrument year (Scenario) through
// Build. What is expected follows from how the data were generated (not
// from Pairline's output): the stable meter shows no change and no drift,
// the drifting analyser's slope trend is "drifting" with a negative rate
// whose interval holds the generated −0.048/year, and the probe's line moves
// once, between months 7 and 8, and nowhere else: its intercept is a step
// (shifted), not a drift.
func TestScenario(t *testing.T) {
	ss, err := history.Scenario(2026, scenarioStart, 1)
	if err != nil {
		t.Fatal(err)
	}
	now := scenarioStart.AddDate(1, 1, 0)
	ins, err := history.Build(summarize(t, ss), history.Options{Now: now})
	if err != nil {
		t.Fatal(err)
	}
	if len(ins) != 3 {
		t.Fatalf("%d instruments, want 3", len(ins))
	}
	by := map[string]history.Instrument{}
	for _, in := range ins {
		by[in.Key] = in
		if len(in.Entries) != 12 {
			t.Errorf("%s: %d entries, want 12", in.Key, len(in.Entries))
		}
		for i := 1; i < len(in.Entries); i++ {
			if in.Entries[i].Taken.Before(in.Entries[i-1].Taken) {
				t.Errorf("%s: entries out of order at %d", in.Key, i)
			}
		}
		// Interval 35 days from the last calibration (month 12).
		if want := scenarioStart.AddDate(0, 11, 35); !in.Due.Equal(want) {
			t.Errorf("%s: due %v, want %v", in.Key, in.Due, want)
		}
		if in.Overdue != now.After(in.Due) {
			t.Errorf("%s: overdue %v", in.Key, in.Overdue)
		}
	}
	stable, drifting, step := by["LVWB-TB-01"], by["LVWB-CL-02"], by["LVWB-EC-03"]
	for _, c := range stable.Changes {
		if c.Verdict != fitcore.LinesSame {
			t.Errorf("stable: %s vs %s: %s (p coincident %.3g)", c.Session, c.Previous, c.Verdict, c.PCoincident)
		}
	}
	if stable.SlopeDrift.Status != fitcore.DriftSteady {
		t.Errorf("stable slope: %s", stable.SlopeDrift.Status)
	}
	d := drifting.SlopeDrift
	if d.Status != fitcore.DriftDrifting || !(d.RateLow < -0.048 && -0.048 < d.RateHigh) {
		t.Errorf("drifting slope: %s, rate %.4g [%.4g, %.4g]", d.Status, d.Rate, d.RateLow, d.RateHigh)
	}
	moved := 0
	for i, c := range step.Changes {
		if c.Verdict != fitcore.LinesSame {
			moved++
			if i != 6 || c.Verdict != fitcore.LinesMoved {
				t.Errorf("step: change %d (%s vs %s): %s", i, c.Session, c.Previous, c.Verdict)
			}
		}
	}
	if moved != 1 {
		t.Errorf("step: %d changes, want 1", moved)
	}
	// The probe's intercept is level, steps up by 0.8 after month 7 and is
	// level again: one shift between the 7th and 8th accepted
	// calibrations, not a drift, and nothing projected; its slope stays
	// steady.
	ic := step.InterceptDrift
	if st := ic.Step; ic.Status != fitcore.DriftShifted || st == nil || st.Before != 6 || st.After != 7 || ic.Leaves != nil ||
		math.Abs(st.Size-0.8) > 4*st.SizeSE {
		t.Errorf("step intercept: %s, step %+v", ic.Status, ic.Step)
	}
	if acc := step.DriftEntries(); len(acc) != 12 || !acc[ic.Step.Before].Taken.Equal(step.Entries[6].Taken) || !acc[ic.Step.After].Taken.Equal(step.Entries[7].Taken) {
		t.Errorf("step: DriftEntries does not name months 7 and 8")
	}
	if step.SlopeDrift.Status != fitcore.DriftSteady || stable.InterceptDrift.Status != fitcore.DriftSteady || drifting.InterceptDrift.Status != fitcore.DriftSteady {
		t.Errorf("flat parameters: probe slope %s, meter intercept %s, analyser intercept %s", step.SlopeDrift.Status, stable.InterceptDrift.Status, drifting.InterceptDrift.Status)
	}
}

// TestDedupe: the same session given twice counts once; a sealed session
// changed after its seal, given in both revisions, is one calibration and
// one earlier revision kept apart.
func TestDedupe(t *testing.T) {
	ss, err := history.Scenario(7, scenarioStart, 1)
	if err != nil {
		t.Fatal(err)
	}
	ss = ss[:12] // the stable instrument
	first := ss[0]
	if err := first.SignPerformed("A. Technician (invented)", scenarioStart); err != nil {
		t.Fatal(err)
	}
	sealedCopy := *first
	sealedCopy.Readings = append([]session.Reading(nil), first.Readings...)
	if err := first.SetField(session.FieldNotes, "re-read after the seal (invented)", scenarioStart.Add(time.Hour)); err != nil {
		t.Fatal(err)
	}
	if first.Revision != 2 {
		t.Fatalf("revision %d after a change to a sealed record, want 2", first.Revision)
	}
	sums := summarize(t, append(append(ss, ss[3]), &sealedCopy))
	ins, err := history.Build(sums, history.Options{})
	if err != nil {
		t.Fatal(err)
	}
	in := ins[0]
	if in.Duplicates != 1 {
		t.Errorf("duplicates %d, want 1", in.Duplicates)
	}
	superseded, accepted := 0, 0
	for _, e := range in.Entries {
		switch e.Verdict {
		case history.Superseded:
			superseded++
			if e.Revision != 1 {
				t.Errorf("superseded entry has revision %d, want 1", e.Revision)
			}
		case history.Accepted:
			accepted++
		}
	}
	if superseded != 1 || len(in.Changes) != accepted-1 {
		t.Errorf("superseded %d (want 1), changes %d for %d accepted", superseded, len(in.Changes), accepted)
	}
}

// TestDedupeKeptBoth: a session kept twice on import ("Keep both" gives
// the copy a new ID and nothing else) is one calibration; a copy whose
// readings differ is another.
func TestDedupeKeptBoth(t *testing.T) {
	ss, err := history.Scenario(7, scenarioStart, 1)
	if err != nil {
		t.Fatal(err)
	}
	ss = ss[:12] // the stable instrument
	for _, tc := range []struct {
		name       string
		change     func(*session.Session)
		entries    int
		duplicates int
	}{
		{"same content, new ID", func(*session.Session) {}, 12, 1},
		{"one reading changed", func(s *session.Session) { s.Readings[2].Y += "1" }, 13, 0},
	} {
		cp := *ss[4]
		cp.Readings = append([]session.Reading(nil), ss[4].Readings...)
		id, err := session.NewID(nil)
		if err != nil {
			t.Fatal(err)
		}
		cp.ID = id
		tc.change(&cp)
		ins, err := history.Build(summarize(t, append(append([]*session.Session(nil), ss...), &cp)), history.Options{})
		if err != nil {
			t.Fatal(err)
		}
		if len(ins) != 1 || len(ins[0].Entries) != tc.entries || ins[0].Duplicates != tc.duplicates {
			t.Errorf("%s: %d instruments, %d entries, %d duplicates; want 1, %d, %d", tc.name, len(ins), len(ins[0].Entries), ins[0].Duplicates, tc.entries, tc.duplicates)
		}
	}
}

// TestLatest: the newest session with a line is compared with the last
// accepted one before it, whether or not the newest is accepted itself.
// The probe's month 8 against month 7 straddles the generated step (the
// line moved); a month 12 that fails its criteria is still compared, with
// month 11.
func TestLatest(t *testing.T) {
	ss, err := history.Scenario(2026, scenarioStart, 1)
	if err != nil {
		t.Fatal(err)
	}
	probe := ss[24:36]
	ins, err := history.Build(summarize(t, probe[:8]), history.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if l := ins[0].Latest; l == nil || l.Session != probe[7].ID || l.Previous != probe[6].ID || l.Verdict != fitcore.LinesMoved {
		t.Errorf("month 8: %+v (%s), want month 8 against 7, line moved", l, ins[0].LatestReason)
	}
	high := 1.0
	probe[11].Settings.Acceptance = &fitcore.Criteria{SlopeHigh: &high} // slope 1.5 fails
	ins, err = history.Build(summarize(t, probe), history.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if v := ins[0].Entries[11].Verdict; v != history.NotAccepted {
		t.Fatalf("month 12 verdict %q, want not accepted", v)
	}
	if l := ins[0].Latest; l == nil || l.Session != probe[11].ID || l.Previous != probe[10].ID {
		t.Errorf("month 12 not accepted: %+v, want it against month 11", l)
	}
	ins, err = history.Build(summarize(t, probe[11:]), history.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if ins[0].Latest != nil || ins[0].LatestReason == "" {
		t.Errorf("one session that is not accepted: %+v, reason %q", ins[0].Latest, ins[0].LatestReason)
	}
}
