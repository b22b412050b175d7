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

// New runs `pairline new` and returns the exit status. The stages: read
// the flags and the one CSV file name (newParse), check the day given with
// --taken (newTakenDay), build and check the session (newSession), then
// write it to a new file (writeNewFile).
func New(args []string, stdout, stderr io.Writer) int {
	a, code, ok := newParse(args, stderr)
	if !ok {
		return code
	}
	now := time.Now().UTC()
	day, ok := newTakenDay(a.taken, now)
	if !ok {
		fail(stderr, "new", "--taken must be a day YYYY-MM-DD from 1900 to today, not %s", quoted(a.taken))
		return ExitUsage
	}
	s, code := newSession(a, day, now, stderr)
	if s == nil {
		return code
	}
	b, err := session.EncodeBytes([]*session.Session{s})
	if err != nil {
		fail(stderr, "new", "could not encode the session: %s", oneLine(err.Error()))
		return ExitFailure
	}
	if code := writeNewFile(a.out, b, stderr); code != ExitOK {
		return code
	}
	fmt.Fprintf(stdout, "Wrote %s: session %s with %d readings.\n", term(a.out), s.ID, len(s.Readings))
	return ExitOK
}

// newField is one flag of `pairline new` that sets a field of the record.
type newField struct {
	flag, field, help string
	v                 *string
}

// newArgs are the parsed arguments of `pairline new`.
type newArgs struct {
	csvPath, out, taken string
	fields              []newField
}

// newParse reads the flags of `pairline new`, which may come before and
// after the one CSV file name. When ok is false the command ends with
// code (help was asked for, or the arguments were wrong and said so).
func newParse(args []string, stderr io.Writer) (a newArgs, code int, ok bool) {
	fset := newFlags("new", stderr)
	out := fset.String("o", "", "session file to write (must not exist)")
	taken := fset.String("taken", "", "day the readings were taken, YYYY-MM-DD (default: today)")
	a.fields = []newField{
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
	for i := range a.fields {
		a.fields[i].v = fset.String(a.fields[i].flag, "", a.fields[i].help)
	}
	fset.Usage = func() {
		fmt.Fprint(fset.Output(), newUsage)
		fset.PrintDefaults()
	}
	// Flags may follow the CSV file name: parse, take one argument, parse the rest.
	if err := parseArgs(fset, args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return a, ExitOK, false
		}
		return a, ExitUsage, false
	}
	if fset.NArg() > 0 {
		a.csvPath = fset.Arg(0)
		if err := parseArgs(fset, fset.Args()[1:]); err != nil {
			return a, ExitUsage, false
		}
	}
	if a.csvPath == "" || fset.NArg() > 0 || *out == "" {
		fail(stderr, "new", "give one CSV file and -o OUT.pairline")
		fset.Usage()
		return a, ExitUsage, false
	}
	a.out, a.taken = *out, *taken
	return a, ExitOK, true
}

// newTakenDay is the time the readings are dated with --taken: noon UTC
// of the day, or now when that is still to come; the zero time without
// --taken. ok is false for anything but a day from 1900 to today.
func newTakenDay(taken string, now time.Time) (day time.Time, ok bool) {
	if taken == "" {
		return time.Time{}, true
	}
	d, err := time.Parse(historyDateLayout, taken)
	if err != nil || d.Year() < 1900 || d.After(now) {
		return time.Time{}, false
	}
	day = d.Add(12 * time.Hour)
	if day.After(now) {
		day = now
	}
	return day, true
}

// newSession reads the CSV file into a new session with the flags'
// fields, dates its readings with day (unless zero) and checks it as the
// app does. On failure it says why and returns nil and the exit status.
func newSession(a newArgs, day, now time.Time, stderr io.Writer) (*session.Session, int) {
	f, err := os.Open(a.csvPath)
	if err != nil {
		fail(stderr, "new", "%s: cannot open the file: %v", a.csvPath, unwrapPath(err))
		return nil, ExitUsage
	}
	res, err := session.ReadCSV(f, session.CSVOptions{})
	f.Close()
	if err != nil {
		fail(stderr, "new", "%s: %s", a.csvPath, oneLine(err.Error()))
		return nil, ExitUsage
	}
	s, err := session.New("", now, nil)
	if err != nil {
		fail(stderr, "new", "%v", err)
		return nil, ExitFailure
	}
	for _, fl := range a.fields {
		if *fl.v == "" {
			continue
		}
		if err := s.SetField(fl.field, *fl.v, now); err != nil {
			fail(stderr, "new", "--%s: %s", fl.flag, oneLine(err.Error()))
			return nil, ExitUsage
		}
	}
	if _, err := s.Import(res, now); err != nil {
		fail(stderr, "new", "%s: %s", a.csvPath, oneLine(err.Error()))
		return nil, ExitUsage
	}
	newDate(s, day, now)
	if err := s.Validate(); err != nil {
		fail(stderr, "new", "the session would not be valid: %s", oneLine(err.Error()))
		return nil, ExitUsage
	}
	return s, ExitOK
}

// newDate dates the readings imported at now with day (not when zero).
func newDate(s *session.Session, day, now time.Time) {
	if day.IsZero() {
		return
	}
	for i := range s.Readings {
		if s.Readings[i].Taken.Equal(now) {
			s.Readings[i].Taken = day
		}
	}
}

// writeNewFile writes b to the new file out (never over an existing one);
// a file that could not be written in full is removed.
func writeNewFile(out string, b []byte, stderr io.Writer) int {
	w, err := os.OpenFile(out, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		fail(stderr, "new", "%s: cannot create the file (it is not overwritten if it exists): %v", out, unwrapPath(err))
		return ExitFailure
	}
	_, werr := w.Write(b)
	cerr := w.Close()
	if werr != nil || cerr != nil {
		os.Remove(out)
		fail(stderr, "new", "%s: the file could not be written: %v", out, errors.Join(werr, cerr))
		return ExitFailure
	}
	return ExitOK
}
