package cli

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"pairline/app/history"
	"pairline/app/session"
	"pairline/fitcore"
)

// writeScenario writes the invented Larkwater Valley scenario (seeded),
// one session per file, into dir and returns the file names.
func writeScenario(tb testing.TB, dir string, copies int) []string {
	tb.Helper()
	ss, err := history.Scenario(2026, time.Date(2025, 1, 6, 0, 0, 0, 0, time.UTC), copies)
	if err != nil {
		tb.Fatal(err)
	}
	var names []string
	for i, s := range ss {
		b, err := session.EncodeBytes([]*session.Session{s})
		if err != nil {
			tb.Fatal(err)
		}
		sub := filepath.Join(dir, session.InstrumentKey(s.Instrument))
		if err := os.MkdirAll(sub, 0o755); err != nil {
			tb.Fatal(err)
		}
		p := filepath.Join(sub, fmt.Sprintf("%05d.pairline", i))
		if err := os.WriteFile(p, b, 0o644); err != nil {
			tb.Fatal(err)
		}
		names = append(names, p)
	}
	return names
}

// TestHistoryJSON runs the command on a folder with the invented scenario,
// a damaged file and a foreign file. Expected: what the scenario was
// generated with (stable, drifting slope, one step after month 7), the
// damaged and foreign files listed as skipped, the JSON keys of
// HISTORY-JSON.md.
func TestHistoryJSON(t *testing.T) {
	dir := t.TempDir()
	names := writeScenario(t, dir, 1)
	good, _ := os.ReadFile(names[0])
	if err := os.WriteFile(filepath.Join(dir, "cut.pairline"), good[:len(good)/2], 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "notes.pairline"), []byte("not a session\x1b[2J"), 0o644); err != nil {
		t.Fatal(err)
	}
	var out, errb bytes.Buffer
	// The same file given again beside its folder is counted once.
	if code := Main([]string{"history", "--json", dir, names[0]}, nil, &out, &errb); code != ExitOK {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	var got struct {
		Instruments []struct {
			ID       string `json:"id"`
			Sessions []struct {
				ID, Taken, Verdict string
				Slope              float64
				SlopeSE            float64 `json:"slope_se"`
			} `json:"sessions"`
			Changes []struct {
				Verdict     string  `json:"verdict"`
				PCoincident float64 `json:"p_coincident"`
			} `json:"changes"`
			Drift struct {
				PerYear float64 `json:"slope_per_year"`
				Low     float64 `json:"slope_per_year_low"`
				High    float64 `json:"slope_per_year_high"`
				Verdict string  `json:"verdict"`
			} `json:"drift"`
			Intercept struct {
				Verdict string  `json:"verdict"`
				Leaves  *string `json:"leaves_limits"`
				Step    *struct {
					Before, After  string
					LevelBefore    float64 `json:"level_before"`
					LevelAfter     float64 `json:"level_after"`
					Size           float64 `json:"size"`
					SizeSE         float64 `json:"size_se"`
					P              float64 `json:"p"`
					PlacesSearched int     `json:"places_searched"`
				} `json:"step"`
			} `json:"intercept_drift"`
			Due        *string `json:"due"`
			Duplicates int     `json:"duplicates"`
		} `json:"instruments"`
		Skipped []skippedFile `json:"skipped"`
	}
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatalf("%v\n%s", err, out.String())
	}
	if len(got.Instruments) != 3 || len(got.Skipped) != 2 {
		t.Fatalf("%d instruments, %d skipped: %s", len(got.Instruments), len(got.Skipped), out.String())
	}
	if strings.Contains(out.String(), "\x1b") {
		t.Error("an escape character from a file reached the output")
	}
	for _, in := range got.Instruments {
		if len(in.Sessions) != 12 || len(in.Changes) != 11 || in.Due == nil || *in.Due != "2026-01-10" {
			t.Errorf("%s: %d sessions, %d changes, due %v", in.ID, len(in.Sessions), len(in.Changes), in.Due)
		}
		nchanged := 0
		for _, c := range in.Changes {
			if c.Verdict != fitcore.LinesSame {
				nchanged++
			}
		}
		switch in.ID {
		case "LVWB-TB-01":
			if nchanged != 0 || in.Drift.Verdict != fitcore.DriftSteady || in.Duplicates != 1 {
				t.Errorf("stable: %d changes, drift %s, duplicates %d", nchanged, in.Drift.Verdict, in.Duplicates)
			}
		case "LVWB-CL-02":
			if in.Drift.Verdict != fitcore.DriftDrifting || !(in.Drift.Low < -0.048 && -0.048 < in.Drift.High) {
				t.Errorf("drifting: %+v", in.Drift)
			}
		case "LVWB-EC-03":
			if nchanged != 1 || in.Changes[6].Verdict != fitcore.LinesMoved {
				t.Errorf("step: %d changes, change 7 %s", nchanged, in.Changes[6].Verdict)
			}
			// The intercept steps up by 0.8 after month 7 (generated):
			// shifted between months 7 and 8, not drifting, no day.
			ic := in.Intercept
			if st := ic.Step; ic.Verdict != fitcore.DriftShifted || ic.Leaves != nil || st == nil ||
				st.Before != in.Sessions[6].Taken || st.After != in.Sessions[7].Taken ||
				math.Abs(st.Size-0.8) > 4*st.SizeSE || !(st.P < 0.01) || st.PlacesSearched != 9 {
				t.Errorf("step: intercept %+v, step %+v; want shifted between %s and %s by about 0.8", ic, ic.Step, in.Sessions[6].Taken, in.Sessions[7].Taken)
			}
			if in.Drift.Verdict != fitcore.DriftSteady {
				t.Errorf("step: slope %s, want steady", in.Drift.Verdict)
			}
		default:
			t.Errorf("unexpected instrument %q", in.ID)
		}
	}
}

// TestHistoryTextAndCSV: the text names each instrument and its trend; the
// CSV has a header and one row per session; --instrument keeps one.
func TestHistoryTextAndCSV(t *testing.T) {
	dir := t.TempDir()
	writeScenario(t, dir, 1)
	var out, errb bytes.Buffer
	if code := Main([]string{"history", "--instrument", "lvwb-cl-02", dir}, nil, &out, &errb); code != ExitOK {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	if s := out.String(); !strings.Contains(s, "Instrument LVWB-CL-02: 12 sessions") || strings.Contains(s, "LVWB-TB-01") ||
		!strings.Contains(s, "Slope is drifting:") || !strings.Contains(s, "Next due") && !strings.Contains(s, "Overdue since") {
		t.Errorf("text:\n%s", s)
	}
	out.Reset()
	// The probe's intercept stepped once (after month 7, generated): the
	// shift and its warning, no projected day, not "drifting".
	if code := Main([]string{"history", "--instrument", "lvwb-ec-03", "--intercept-limits", "-1,2.5", dir}, nil, &out, &errb); code != ExitOK {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	if s := out.String(); !strings.Contains(s, "Intercept shifted once, between 6 Jul 2025 and 6 Aug 2025") ||
		!strings.Contains(s, "Find what changed then") || strings.Contains(s, "Intercept is drifting") || strings.Contains(s, "reaches its") {
		t.Errorf("text:\n%s", s)
	}
	out.Reset()
	if code := Main([]string{"history", "--csv", dir}, nil, &out, &errb); code != ExitOK {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	if lines := strings.Split(strings.TrimSpace(out.String()), "\n"); len(lines) != 37 || !strings.HasPrefix(lines[0], "instrument,session,taken,slope") {
		t.Errorf("csv: %d lines, first %q", len(lines), lines[0])
	}
	for _, bad := range [][]string{{"history"}, {"history", "--json", "--csv", dir}, {"history", "--interval", "-3", dir}} {
		if code := Main(bad, nil, &out, &errb); code != ExitUsage {
			t.Errorf("%q: exit %d, want %d", bad, code, ExitUsage)
		}
	}
}

// BenchmarkHistory1000 reads 1,008 generated files (the invented
// scenario with 84 instruments, one session per file) with the command's two workers.
func BenchmarkHistory1000(b *testing.B) { benchHistory(b, 28) }

// BenchmarkHistory10000 reads 10,080 generated files (840 instruments).
func BenchmarkHistory10000(b *testing.B) { benchHistory(b, 280) }

func benchHistory(b *testing.B, years int) {
	dir := b.TempDir()
	writeScenario(b, dir, years)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		var out, errb bytes.Buffer
		if code := Main([]string{"history", "--json", dir}, nil, &out, &errb); code != ExitOK {
			b.Fatalf("exit %d: %s", code, errb.String())
		}
	}
}

// TestHistoryLimits: with a lower slope limit of 1.40 the drifting analyser
// (generated slope 1.5 − 0.048/year) is projected to leave it after its
// last calibration, about two years after the first (1.5 − 1.40)/0.048 ≈
// 2.1 years, by construction of the scenario); the stable meter is not.
func TestHistoryLimits(t *testing.T) {
	dir := t.TempDir()
	writeScenario(t, dir, 1)
	var out, errb bytes.Buffer
	if code := Main([]string{"history", "--json", "--slope-limits", "1.40,", dir}, nil, &out, &errb); code != ExitOK {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	var got struct {
		Instruments []struct {
			ID    string `json:"id"`
			Drift struct {
				Leaves *string `json:"leaves_limits"`
			} `json:"drift"`
		} `json:"instruments"`
	}
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatal(err)
	}
	for _, in := range got.Instruments {
		switch in.ID {
		case "LVWB-CL-02":
			if in.Drift.Leaves == nil {
				t.Fatal("drifting: no projected day")
			}
			d, err := time.Parse("2006-01-02", *in.Drift.Leaves)
			if err != nil || d.Before(time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC)) || d.After(time.Date(2027, 8, 1, 0, 0, 0, 0, time.UTC)) {
				t.Errorf("drifting: leaves %s, want about 2027-02", *in.Drift.Leaves)
			}
		case "LVWB-TB-01":
			if in.Drift.Leaves != nil {
				t.Errorf("stable: leaves %s", *in.Drift.Leaves)
			}
		}
	}
	for _, bad := range []string{"1,2,3", "x,", "2,1"} {
		if code := Main([]string{"history", "--slope-limits", bad, dir}, nil, &out, &errb); code != ExitUsage {
			t.Errorf("--slope-limits %q: exit %d", bad, code)
		}
	}
}
