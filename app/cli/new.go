package cli

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"time"

	"pairline/app/session"
)

const newUsage = `Usage: pairline new [flags] FILE.csv -o OUT.pairline

Make a session file from a CSV or TSV file of readings (x in the first
numeric column, y in the next, as the app's import detects them), with the
record's details from the flags. The session is checked as the app checks
it before it is written; an existing OUT is never overwritten.

Flags:
`

// New runs `pairline new` and returns the exit status.
func New(args []string, stdout, stderr io.Writer) int {
	fset := newFlags("new", stderr)
	out := fset.String("o", "", "session file to write (must not exist)")
	taken := fset.String("taken", "", "day the readings were taken, YYYY-MM-DD (default: today)")
	fields := []struct {
		flag, field, help string
		v                 *string
	}{
		{"title", session.FieldTitle, "title of the session", nil},
		{"site", session.FieldSite, "site", nil},
		{"instrument", session.FieldInstrument, "instrument description", nil},
		{"serial", session.FieldSerial, "instrument serial number", nil},
		{"id", session.FieldInstrumentID, "instrument ID (asset tag)", nil},
		{"operator", session.FieldOperator, "operator", nil},
		{"x-name", session.FieldXName, "name of x (default from the CSV header)", nil},
		{"x-unit", session.FieldXUnit, "unit of x", nil},
		{"y-name", session.FieldYName, "name of y (default from the CSV header)", nil},
		{"y-unit", session.FieldYUnit, "unit of y", nil},
	}
	for i := range fields {
		fields[i].v = fset.String(fields[i].flag, "", fields[i].help)
	}
	fset.Usage = func() {
		fmt.Fprint(fset.Output(), newUsage)
		fset.PrintDefaults()
	}
	// Flags may follow the CSV file name: parse, take one argument, parse the rest.
	if err := parseArgs(fset, args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return ExitOK
		}
		return ExitUsage
	}
	var csvPath string
	if fset.NArg() > 0 {
		csvPath = fset.Arg(0)
		if err := parseArgs(fset, fset.Args()[1:]); err != nil {
			return ExitUsage
		}
	}
	if csvPath == "" || fset.NArg() > 0 || *out == "" {
		fail(stderr, "new", "give one CSV file and -o OUT.pairline")
		fset.Usage()
		return ExitUsage
	}
	now := time.Now().UTC()
	var day time.Time
	if *taken != "" {
		d, err := time.Parse(historyDateLayout, *taken)
		if err != nil || d.Year() < 1900 || d.After(now) {
			fail(stderr, "new", "--taken must be a day YYYY-MM-DD from 1900 to today, not %s", quoted(*taken))
			return ExitUsage
		}
		day = d.Add(12 * time.Hour)
		if day.After(now) {
			day = now
		}
	}
	f, err := os.Open(csvPath)
	if err != nil {
		fail(stderr, "new", "%s: cannot open the file: %v", csvPath, unwrapPath(err))
		return ExitUsage
	}
	res, err := session.ReadCSV(f, session.CSVOptions{})
	f.Close()
	if err != nil {
		fail(stderr, "new", "%s: %s", csvPath, oneLine(err.Error()))
		return ExitUsage
	}
	s, err := session.New("", now, nil)
	if err != nil {
		fail(stderr, "new", "%v", err)
		return ExitFailure
	}
	for _, fl := range fields {
		if *fl.v == "" {
			continue
		}
		if err := s.SetField(fl.field, *fl.v, now); err != nil {
			fail(stderr, "new", "--%s: %s", fl.flag, oneLine(err.Error()))
			return ExitUsage
		}
	}
	if _, err := s.Import(res, now); err != nil {
		fail(stderr, "new", "%s: %s", csvPath, oneLine(err.Error()))
		return ExitUsage
	}
	if !day.IsZero() {
		for i := range s.Readings {
			if s.Readings[i].Taken.Equal(now) {
				s.Readings[i].Taken = day
			}
		}
	}
	if err := s.Validate(); err != nil {
		fail(stderr, "new", "the session would not be valid: %s", oneLine(err.Error()))
		return ExitUsage
	}
	b, err := session.EncodeBytes([]*session.Session{s})
	if err != nil {
		fail(stderr, "new", "could not encode the session: %s", oneLine(err.Error()))
		return ExitFailure
	}
	w, err := os.OpenFile(*out, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		fail(stderr, "new", "%s: cannot create the file (it is not overwritten if it exists): %v", *out, unwrapPath(err))
		return ExitFailure
	}
	_, werr := w.Write(b)
	cerr := w.Close()
	if werr != nil || cerr != nil {
		os.Remove(*out)
		fail(stderr, "new", "%s: the file could not be written: %v", *out, errors.Join(werr, cerr))
		return ExitFailure
	}
	fmt.Fprintf(stdout, "Wrote %s: session %s with %d readings.\n", term(*out), s.ID, len(s.Readings))
	return ExitOK
}
