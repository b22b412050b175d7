package cli

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"pairline/app/history"
)

// TestNew makes a session from an invented CSV (Larkwater Valley) and reads
// it back with the session decoder: the flags' fields, the readings as
// typed, the day given with --taken, and the instrument key history uses.
// An existing output is not overwritten; a bad day is refused.
func TestNew(t *testing.T) {
	dir := t.TempDir()
	csv := filepath.Join(dir, "cal.csv")
	if err := os.WriteFile(csv, []byte("standard (mg/L),reading (mV)\n0,0.51\n5,8.02\n10,15.49\n20,30.6\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "cal.pairline")
	var so, se bytes.Buffer
	args := []string{"new", "--title", "Monthly check (invented)", "--id", "LVWB-CL-02", "--site", "Fenwick reservoir (invented)",
		"--taken", "2025-03-04", csv, "-o", out, "--y-unit", "mV"}
	if code := Main(args, nil, &so, &se); code != ExitOK {
		t.Fatalf("exit %d: %s", code, se.String())
	}
	f, err := openSessionFile(out)
	if err != nil {
		t.Fatal(err)
	}
	s := f.Sessions[0]
	if s.Title != "Monthly check (invented)" || s.Instrument.ID != "LVWB-CL-02" || s.YUnit != "mV" || len(s.Readings) != 4 ||
		s.Readings[3].X != "20" || s.Readings[3].Y != "30.6" {
		t.Errorf("session read back: %+v", s)
	}
	if d := s.ReadingsDay(); !d.Equal(time.Date(2025, 3, 4, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("readings day %v", d)
	}
	if sum, err := history.Summarize(s); err != nil || sum.Key != "LVWB-CL-02" || !sum.Fitted {
		t.Errorf("history summary %+v, %v", sum, err)
	}
	if !strings.Contains(so.String(), "4 readings") {
		t.Errorf("stdout %q", so.String())
	}
	before, _ := os.ReadFile(out)
	if code := Main(args, nil, &so, &se); code != ExitFailure {
		t.Errorf("second run: exit %d, want %d (no overwrite)", code, ExitFailure)
	}
	if after, _ := os.ReadFile(out); !bytes.Equal(before, after) {
		t.Error("the existing file was changed")
	}
	for _, bad := range [][]string{
		{"new", csv},
		{"new", "--taken", "2025-13-01", csv, "-o", filepath.Join(dir, "x.pairline")},
		{"new", "--taken", "2999-01-01", csv, "-o", filepath.Join(dir, "y.pairline")},
	} {
		if code := Main(bad, nil, &so, &se); code != ExitUsage {
			t.Errorf("%q: exit %d, want %d", bad, code, ExitUsage)
		}
	}
}
