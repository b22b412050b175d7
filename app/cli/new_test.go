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

// TestNewRefusals pins what `pairline new` says and returns for each way it
// can refuse (exit status, the start of the message) and that it then
// writes no file; and that --taken with today's date gives today's day.
func TestNewRefusals(t *testing.T) {
	dir := t.TempDir()
	csv := filepath.Join(dir, "cal.csv")
	if err := os.WriteFile(csv, []byte("standard,reading\n0,0.51\n5,8.02\n10,15.49\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	bad := filepath.Join(dir, "bad.csv")
	if err := os.WriteFile(bad, []byte("only words here\nand more words\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out.pairline")
	for _, tc := range []struct {
		args []string
		code int
		says string
	}{
		{[]string{"new", "-h"}, ExitOK, "Usage: pairline new"},
		{[]string{"new", "--bogus", csv, "-o", out}, ExitUsage, "flag provided but not defined: -bogus"},
		{[]string{"new", csv, "--bogus", "-o", out}, ExitUsage, "flag provided but not defined: -bogus"},
		{[]string{"new", csv, csv, "-o", out}, ExitUsage, "give one CSV file and -o OUT.pairline"},
		{[]string{"new", "-o", out}, ExitUsage, "give one CSV file and -o OUT.pairline"},
		{[]string{"new", csv}, ExitUsage, "give one CSV file and -o OUT.pairline"},
		{[]string{"new", "--taken", "1899-12-31", csv, "-o", out}, ExitUsage, "--taken must be a day YYYY-MM-DD from 1900 to today"},
		{[]string{"new", filepath.Join(dir, "missing.csv"), "-o", out}, ExitUsage, "missing.csv: cannot open the file"},
		{[]string{"new", bad, "-o", out}, ExitUsage, "bad.csv: "},
		{[]string{"new", "--title", strings.Repeat("t", 100_000), csv, "-o", out}, ExitUsage, "the session would not be valid"},
		{[]string{"new", csv, "-o", filepath.Join(dir, "no-such-dir", "x.pairline")}, ExitFailure, "cannot create the file (it is not overwritten if it exists)"},
	} {
		var so, se bytes.Buffer
		code := Main(tc.args, nil, &so, &se)
		if code != tc.code || !strings.Contains(se.String(), tc.says) {
			t.Errorf("%q: exit %d, stderr %q; want exit %d and %q", tc.args[:min(len(tc.args), 4)], code, se.String(), tc.code, tc.says)
		}
		if _, err := os.Stat(out); err == nil {
			t.Fatalf("%q wrote %s", tc.args[:min(len(tc.args), 4)], out)
		}
	}
	today := time.Now().UTC().Format(historyDateLayout)
	var so, se bytes.Buffer
	if code := Main([]string{"new", "--taken", today, csv, "-o", out}, nil, &so, &se); code != ExitOK {
		t.Fatalf("--taken %s: exit %d: %s", today, code, se.String())
	}
	f, err := openSessionFile(out)
	if err != nil {
		t.Fatal(err)
	}
	s := f.Sessions[0]
	if got := s.ReadingsDay().Format(historyDateLayout); got != today {
		t.Errorf("--taken %s: readings day %s", today, got)
	}
	for i, r := range s.Readings {
		if r.Taken.After(time.Now()) {
			t.Errorf("reading %d taken %v, in the future", i+1, r.Taken)
		}
	}
}
