package demo

import (
	"bytes"
	"crypto/rand"
	"math"
	"testing"
	"time"

	"pairline/app/session"
	"pairline/fitcore"
)

// TestEmbeddedIsBuilt: the embedded file is exactly what Build writes (run
// `go run ./testdata/demo` after changing build.go).
func TestEmbeddedIsBuilt(t *testing.T) {
	ss, err := Build()
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := session.Encode(&buf, ss); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(buf.Bytes(), File) {
		t.Fatal("app/demo/demo.pairline is out of date: run `go run ./testdata/demo` from the repository root")
	}
}

func analyze(t *testing.T, s *session.Session) (*fitcore.Report, []int) {
	t.Helper()
	x, y, rows, problems := s.Pairs()
	if len(problems) > 0 {
		t.Fatalf("%s: cells that are not numbers: %v", s.Title, problems)
	}
	rep, err := fitcore.Analyze(x, y, s.Settings.Options())
	if err != nil {
		t.Fatalf("%s: %v", s.Title, err)
	}
	return rep, rows
}

// TestDemoVerdicts checks that fitcore says of each invented session what
// the demo is meant to teach (the verdicts are fitcore's; the data were
// chosen so that they come out this way, see the package doc).
func TestDemoVerdicts(t *testing.T) {
	ss, err := Sessions(time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC), rand.Reader)
	if err != nil {
		t.Fatal(err)
	}
	if len(ss) != 4 {
		t.Fatalf("%d demo sessions, want 4", len(ss))
	}
	for i, s := range ss {
		if s.Title != Titles[i] {
			t.Errorf("session %d is titled %q, want %q", i, s.Title, Titles[i])
		}
		if !bytes.Contains([]byte(s.Notes), []byte("Invented")) {
			t.Errorf("%s: the notes do not say the data are invented", s.Title)
		}
	}

	// A: every assumption passes and the acceptance criteria are met.
	a, _ := analyze(t, ss[0])
	for name, v := range map[string]fitcore.Verdict{"linearity": a.Assumptions.Linearity.Verdict, "spread": a.Assumptions.Spread.Verdict,
		"independence": a.Assumptions.Independence.Verdict, "normality": a.Assumptions.Normality.Verdict, "influence": a.Assumptions.Influence.Verdict} {
		if v != fitcore.Pass {
			t.Errorf("A: %s is %s, want pass", name, v)
		}
	}
	if a.Acceptance == nil || !a.Acceptance.Pass {
		t.Errorf("A: acceptance %+v, want pass", a.Acceptance)
	}
	if a.Advice == nil || a.Advice.Remedy != fitcore.RemedyNone {
		t.Errorf("A: advice %+v, want none", a.Advice)
	}

	// B: spread not constant; the advice is log–log.
	b, _ := analyze(t, ss[1])
	if b.Assumptions.Spread.Verdict == fitcore.Pass {
		t.Errorf("B: spread passes; the demo needs it to grow with the level")
	}
	if b.Advice == nil || b.Advice.Remedy != fitcore.RemedyLogLog {
		t.Errorf("B: advice %v, want log_log (%+v)", b.Advice.Remedy, b.Advice.Candidates)
	}

	// C: the mistyped reading is flagged, and only it.
	c, rows := analyze(t, ss[2])
	for i, p := range c.Influence {
		if rows[p.Index] == MistypedRow && !p.Flagged {
			t.Errorf("C: the mistyped reading %d is not flagged: %+v", MistypedRow, p)
		}
		if rows[p.Index] != MistypedRow && p.Flagged {
			t.Errorf("C: reading %d is flagged too: %+v", rows[i], p)
		}
	}
	if c.Assumptions.Influence.Verdict == fitcore.Pass {
		t.Error("C: influence passes with a decimal slip in the data")
	}
	if c.Slip == nil || rows[c.Slip.Index] != MistypedRow {
		t.Errorf("C: the mistyped reading is not named as a slipped decimal point: %+v; %q", c.Slip, c.Assumptions.Influence.Message)
	} else {
		t.Logf("C: %s", c.Assumptions.Influence.Message)
	}

	// D: independence warns or fails.
	d, _ := analyze(t, ss[3])
	if v := d.Assumptions.Independence.Verdict; v != fitcore.Warn && v != fitcore.Fail {
		t.Errorf("D: independence is %s (DW %v p %v), want warn or fail", v, d.Checks.DurbinWatson.Statistic, d.Checks.DurbinWatson.P)
	}
	t.Logf("A R²=%v slope=%v; B advice=%s; C flagged; D DW=%v p=%v (%s)", a.RSquared, a.Slope.Estimate, b.Advice.Remedy,
		d.Checks.DurbinWatson.Statistic, d.Checks.DurbinWatson.P, d.Assumptions.Independence.Verdict)
}

// TestSessionsFreshIDs: loading twice gives new IDs, never the same twice.
func TestSessionsFreshIDs(t *testing.T) {
	now := time.Now()
	a, err := Sessions(now, nil)
	if err != nil {
		t.Fatal(err)
	}
	b, err := Sessions(now, nil)
	if err != nil {
		t.Fatal(err)
	}
	seen := map[string]bool{}
	for _, s := range append(a, b...) {
		if seen[s.ID] {
			t.Fatalf("ID %s used twice", s.ID)
		}
		seen[s.ID] = true
		if err := s.Validate(); err != nil {
			t.Fatal(err)
		}
	}
}

// FuzzSessions: any random source either gives four valid sessions or an
// error (a source that runs dry), never a panic.
func FuzzSessions(f *testing.F) {
	f.Add(bytes.Repeat([]byte{7}, 64), int64(0))
	f.Add([]byte{1, 2, 3}, int64(1e18))
	f.Fuzz(func(t *testing.T, random []byte, unix int64) {
		ss, err := Sessions(time.Unix(unix%4e9, 0), bytes.NewReader(random))
		if err != nil {
			if len(random) >= 64 {
				t.Fatalf("enough random bytes but %v", err)
			}
			return
		}
		if len(ss) != 4 {
			t.Fatalf("%d sessions", len(ss))
		}
	})
}

// With the mistyped reading of session C left out, the advice must not
// propose a Box–Cox power next to 1: that is the readings' own scale, and a
// "transform" to it would only look better by chance.
func TestDemoPressureWithoutTheSlip(t *testing.T) {
	ss, err := Sessions(time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC), rand.Reader)
	if err != nil {
		t.Fatal(err)
	}
	c := ss[2]
	if err := c.Exclude(MistypedRow, "decimal slip, re-read on site", time.Date(2026, 4, 1, 1, 0, 0, 0, time.UTC)); err != nil {
		t.Fatal(err)
	}
	rep, _ := analyze(t, c)
	if rep.Advice == nil {
		t.Fatal("no advice")
	}
	for _, cand := range rep.Advice.Candidates {
		if cand.Remedy == fitcore.RemedyBoxCox && cand.Usable && math.Abs(cand.Lambda-1) < 0.1 {
			t.Errorf("Box–Cox λ = %v is offered: that is next to the readings' own scale", cand.Lambda)
		}
	}
	t.Logf("C without the slip: advice %s (%s)", rep.Advice.Remedy, rep.Advice.Reason)
}
