package cli

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"time"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/fitcore"
)

// The session-file commands register themselves beside fit.

const inspectUsage = `usage: pairline inspect [--json] FILE

Show a .pairline session file: its format version and checksum status, each
session's metadata and reading counts, the cells that are not numbers, and the
analysis of the usable readings with the session's fit settings.

A file that cannot be read gives one line on stderr and exit status 2. A
session whose readings cannot be analysed (too few pairs, …) is shown with the
reason; that is not an error of the file.

Flags:
`

const exportUsage = `usage: pairline export-csv [--session N|ID] FILE

Write the readings of a .pairline session file to stdout as CSV: x, y (text as
typed), note, excluded, exclude_reason, taken. A file with several sessions
needs --session: its number (from 1) or its ID.

Flags:
`

// openSessionFile reads and checks a session file; the error is the one
// line a technician reads.
func openSessionFile(path string) (*session.File, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("cannot open the file: %w", unwrapPath(err))
	}
	defer f.Close()
	file, err := session.Decode(f)
	if err != nil {
		return nil, err
	}
	return file, nil
}

// sessionAnalysis is one session with what inspect found out about it.
type sessionAnalysis struct {
	Session       *session.Session      `json:"session"`
	Counts        session.Counts        `json:"counts"`
	Problems      []session.CellProblem `json:"problems"`
	Rows          []int                 `json:"rows"` // session row (from 0) of each pair given to Analyze
	Report        *fitcore.Report       `json:"report"`
	AnalysisError string                `json:"analysis_error,omitempty"`
}

type inspection struct {
	File     string            `json:"file"`
	Major    int               `json:"major"`
	Minor    int               `json:"minor"`
	Checksum string            `json:"checksum"` // "ok": Decode verified it
	SHA256   string            `json:"sha256"`
	Warnings []string          `json:"warnings"`
	Sessions []sessionAnalysis `json:"sessions"`
}

func analyse(s *session.Session) sessionAnalysis {
	x, y, rows, problems := s.Pairs()
	a := sessionAnalysis{Session: s, Counts: s.Count(), Problems: problems, Rows: rows}
	if a.Problems == nil {
		a.Problems = []session.CellProblem{}
	}
	rep, err := fitcore.Analyze(x, y, s.Settings.Options())
	if err != nil {
		a.AnalysisError = err.Error()
	} else {
		a.Report = rep
	}
	return a
}

// Inspect runs `pairline inspect [--json] FILE` and returns the exit status.
func Inspect(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("inspect", stderr)
	asJSON := fs.Bool("json", false, "print everything as JSON (the report in the form of `pairline fit --json`)")
	fs.Usage = func() { fmt.Fprint(stderr, inspectUsage); fs.PrintDefaults() }
	path, code, ok := oneFile(fs, args)
	if !ok {
		return code
	}
	file, err := openSessionFile(path)
	if err != nil {
		fmt.Fprintf(stderr, "pairline inspect: %s: %s\n", path, oneLine(err.Error()))
		return ExitUsage
	}
	in := inspection{File: path, Major: file.Major, Minor: file.Minor, Checksum: "ok", SHA256: file.Checksum,
		Warnings: file.Warnings}
	if in.Warnings == nil {
		in.Warnings = []string{}
	}
	for _, s := range file.Sessions {
		in.Sessions = append(in.Sessions, analyse(s))
	}
	if *asJSON {
		b, err := json.MarshalIndent(in, "", "  ")
		if err != nil {
			fmt.Fprintf(stderr, "pairline inspect: the analysis could not be written as JSON: %v\n", err)
			return ExitFailure
		}
		b = append(b, '\n')
		if _, err := stdout.Write(b); err != nil {
			fmt.Fprintf(stderr, "pairline inspect: %v\n", err)
			return ExitFailure
		}
		return ExitOK
	}
	if _, err := io.WriteString(stdout, inspectText(&in)); err != nil {
		fmt.Fprintf(stderr, "pairline inspect: %v\n", err)
		return ExitFailure
	}
	return ExitOK
}

// oneFile parses the flags and the single FILE argument.
func oneFile(fs *flag.FlagSet, args []string) (string, int, bool) {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return "", ExitOK, false
		}
		return "", ExitUsage, false
	}
	if fs.NArg() != 1 {
		fs.Usage()
		return "", ExitUsage, false
	}
	return fs.Arg(0), 0, true
}

func when(t time.Time) string {
	if t.IsZero() {
		return "not recorded"
	}
	return t.UTC().Format("2006-01-02 15:04:05 UTC")
}

func nameUnit(name, unit, def string) string {
	if name == "" {
		name = def
	}
	if unit != "" {
		name += " (" + unit + ")"
	}
	return name
}

func inspectText(in *inspection) string {
	var b strings.Builder
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	w("File %s: session file format %d.%d, %d session(s), checksum OK (SHA-256 %s)\n",
		in.File, in.Major, in.Minor, len(in.Sessions), in.SHA256)
	for _, warn := range in.Warnings {
		w("Warning: %s\n", warn)
	}
	for i, a := range in.Sessions {
		s := a.Session
		w("\nSession %d of %d: %s\n", i+1, len(in.Sessions), s.Title)
		field := func(label, v string) {
			if v != "" {
				w("  %-11s %s\n", label, oneLine(v))
			}
		}
		field("ID", s.ID)
		field("created", when(s.Created))
		field("modified", when(s.Modified))
		field("site", s.Site)
		inst := s.Instrument.Description
		if s.Instrument.Serial != "" {
			inst += " (serial " + s.Instrument.Serial + ")"
		}
		field("instrument", inst)
		field("operator", s.Operator)
		field("x", nameUnit(s.XName, s.XUnit, "x"))
		field("y", nameUnit(s.YName, s.YUnit, "y"))
		if l := s.Location; l != nil {
			field("location", fmt.Sprintf("%s, %s (within %s m, %s)", numfmt.Sig(l.Lat, 7), numfmt.Sig(l.Lon, 7),
				numfmt.Sig(l.AccuracyM, 3), when(l.Taken)))
		}
		field("notes", s.Notes)
		c := a.Counts
		w("  %-11s %d rows: %d usable, %d excluded, %d blank, %d cell(s) not numbers\n",
			"readings", c.Rows, c.Usable, c.Excluded, c.Blank, c.Problems)
		for r, rd := range s.Readings {
			if rd.Excluded {
				w("  %-11s row %d (x %q, y %q): %s\n", "excluded", r+1, rd.X, rd.Y, oneLine(rd.ExcludeReason))
			}
		}
		for _, p := range a.Problems {
			w("  %-11s %s\n", "problem", oneLine(p.String()))
		}
		if len(s.History) > 0 {
			w("  %-11s %d change(s), the last at %s\n", "history", len(s.History), when(s.History[len(s.History)-1].At))
		}
		w("\n")
		if a.Report == nil {
			w("Analysis not possible: %s\n", oneLine(a.AnalysisError))
			continue
		}
		lines := make([]int, len(a.Rows))
		for k, r := range a.Rows {
			lines[k] = r + 1 // rows as the table numbers them
		}
		fr := &fitResult{report: a.Report, lines: lines,
			xName: nameUnit(s.XName, s.XUnit, "x"), yName: nameUnit(s.YName, s.YUnit, "y")}
		b.WriteString(summary(strconv.Quote(s.Title), fr))
		if acc := a.Report.Acceptance; acc != nil {
			verdict := "FAIL"
			if acc.Pass {
				verdict = "PASS"
			}
			w("Acceptance criteria: %s. %s\n", verdict, oneLine(acc.Summary))
		}
	}
	return b.String()
}

// ExportCSV runs `pairline export-csv [--session N|ID] FILE`.
func ExportCSV(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("export-csv", stderr)
	which := fs.String("session", "", "the session to export: its number (from 1) or its ID")
	fs.Usage = func() { fmt.Fprint(stderr, exportUsage); fs.PrintDefaults() }
	path, code, ok := oneFile(fs, args)
	if !ok {
		return code
	}
	file, err := openSessionFile(path)
	if err != nil {
		fmt.Fprintf(stderr, "pairline export-csv: %s: %s\n", path, oneLine(err.Error()))
		return ExitUsage
	}
	var s *session.Session
	switch {
	case *which == "" && len(file.Sessions) == 1:
		s = file.Sessions[0]
	case *which == "":
		fmt.Fprintf(stderr, "pairline export-csv: %s holds %d sessions; choose one with --session 1 … %d or an ID\n",
			path, len(file.Sessions), len(file.Sessions))
		return ExitUsage
	default:
		if n, err := strconv.Atoi(*which); err == nil && n >= 1 && n <= len(file.Sessions) {
			s = file.Sessions[n-1]
		}
		for _, c := range file.Sessions {
			if c.ID == strings.ToLower(*which) {
				s = c
			}
		}
		if s == nil {
			fmt.Fprintf(stderr, "pairline export-csv: %s has no session %q (it holds %d)\n", path, *which, len(file.Sessions))
			return ExitUsage
		}
	}
	if err := session.WriteReadingsCSV(stdout, s); err != nil {
		fmt.Fprintf(stderr, "pairline export-csv: %v\n", err)
		return ExitFailure
	}
	return ExitOK
}
