package cli

import (
	"bufio"
	"bytes"
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

const exportUsage = `usage: pairline export-csv [--session N|ID] [--results] FILE

Write the readings of a .pairline session file to stdout as CSV: x, y (text as
typed), note, excluded, exclude_reason, taken. With --results, write the
results instead: the line with its uncertainties, the checks' verdicts, the
acceptance verdict with its criteria in words and the unknowns converted to x,
with their units (the table the tablet's results export writes). A file with
several sessions needs --session: its number (from 1) or its ID.

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
	// A folder opens like a file on most systems and then fails to read,
	// which Decode would call a file cut short.
	if st, err := f.Stat(); err == nil && st.IsDir() {
		return nil, errFolder
	}
	file, err := session.Decode(f)
	if err != nil {
		return nil, err
	}
	return file, nil
}

// sessionAnalysis is one session with what inspect found out about it.
type sessionAnalysis struct {
	Session       inspectedSession      `json:"session"`
	Counts        session.Counts        `json:"counts"`
	Problems      []session.CellProblem `json:"problems"`
	Rows          []int                 `json:"rows"` // session row (from 0) of each pair given to Analyze
	Report        *fitcore.Report       `json:"report"`
	AnalysisError string                `json:"analysis_error,omitempty"`
	// SealValid is true when the record is sealed and every digest
	// matches (session.VerifySeal), false when a seal is broken, null when
	// the record is not sealed; SealProblem says why it is not true.
	SealValid   *bool  `json:"seal_valid"`
	SealProblem string `json:"seal_problem,omitempty"`
	// ExpiredStandards are the standards past expiry on the day of the
	// readings (session.ExpiredStandards); RecordProblems the unknowns not
	// converted and the standards that could not be read, in words.
	ExpiredStandards []session.StandardExpiry `json:"expired_standards"`
	RecordProblems   []string                 `json:"record_problems"`
}

// inspectedSession is the session as stored, with each unknown's
// conversion beside its readings (session.unknowns in the JSON).
type inspectedSession struct {
	*session.Session
	Unknowns []inspectedUnknown `json:"unknowns"`
}

// inspectedUnknown is an unknown with the x read back from its readings
// (fitcore's inverse prediction, Options.Inverse) in x units: x, its
// interval low … high and its standard error se (the combined standard
// uncertainty, with se_fit and u_standards its parts when the standards'
// uncertainties were included). The numbers are null when the unknown
// was not converted; message says why, or what to know about the value.
type inspectedUnknown struct {
	Name       string   `json:"name"`
	Readings   []string `json:"readings"`
	X          *float64 `json:"x"`
	Low        *float64 `json:"low"`
	High       *float64 `json:"high"`
	SE         *float64 `json:"se"`
	SEFit      *float64 `json:"se_fit"`
	UStandards *float64 `json:"u_standards"`
	Bounded    bool     `json:"bounded"`
	Message    string   `json:"message"`
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

// analyse checks the session's stored settings with fitcore's one
// validation of options (the one the fit command's flags go through) and
// only then analyses the usable readings, so that a setting out of range is
// reported as such and never reaches the statistics.
func analyse(s *session.Session) sessionAnalysis {
	x, y, rows, problems := s.Pairs()
	a := sessionAnalysis{Session: inspectedSession{Session: s}, Counts: countsOf(s, rows, problems), Problems: problems, Rows: rows}
	if a.Problems == nil {
		a.Problems = []session.CellProblem{}
	}
	a.Session.Unknowns = make([]inspectedUnknown, len(s.Unknowns))
	for i, u := range s.Unknowns {
		a.Session.Unknowns[i] = inspectedUnknown{Name: u.Name, Readings: u.Readings, Message: "not converted: the line could not be fitted"}
		if u.Readings == nil {
			a.Session.Unknowns[i].Readings = []string{}
		}
	}
	switch ok, err := s.VerifySeal(); {
	case ok:
		a.SealValid = &ok
	case errors.Is(err, session.ErrNotSealed):
		a.SealProblem = err.Error()
	default:
		a.SealValid, a.SealProblem = &ok, err.Error()
	}
	a.ExpiredStandards = s.ExpiredStandards()
	if a.ExpiredStandards == nil {
		a.ExpiredStandards = []session.StandardExpiry{}
	}
	ro, set, rp := s.RecordOptions(x)
	a.RecordProblems = rp
	if a.RecordProblems == nil {
		a.RecordProblems = []string{}
	}
	for _, p := range set.Problems {
		for i := range s.Unknowns {
			if strings.HasPrefix(p, fmt.Sprintf("unknown %d ", i+1)) {
				a.Session.Unknowns[i].Message = p
			}
		}
	}
	opt, err := ro.Normalize()
	if err != nil {
		a.AnalysisError = settingsError(err)
		return a
	}
	rep, err := fitcore.Analyze(x, y, opt)
	if err != nil {
		a.AnalysisError = err.Error()
		return a
	}
	a.Report = rep
	for k, inv := range rep.Inverse {
		u := &a.Session.Unknowns[set.Index[k]]
		u.X, u.SE, u.Bounded, u.Message = fp(inv.X), fp(inv.SE), inv.Bounded, inv.Message
		if inv.Bounded {
			u.Low, u.High = fp(inv.Low), fp(inv.High)
		}
		if inv.UStandards > 0 {
			u.SEFit, u.UStandards = fp(inv.SEFit), fp(inv.UStandards)
		}
	}
	return a
}

func fp(v float64) *float64 { return &v }

// countsOf is s.Count() from the pairing already made (Count pairs the
// readings again, which at 250,000 readings costs tens of MB): a reading that
// is not left out is usable, has a cell that is not a number, or is blank.
func countsOf(s *session.Session, rows []int, problems []session.CellProblem) session.Counts {
	c := session.Counts{Rows: len(s.Readings), Usable: len(rows), Problems: len(problems)}
	for i := range s.Readings {
		if s.Readings[i].Excluded {
			c.Excluded++
		}
	}
	bad := 0
	for i, p := range problems {
		if i == 0 || problems[i-1].Row != p.Row {
			bad++
		}
	}
	c.Blank = c.Rows - c.Excluded - c.Usable - bad
	return c
}

// settingsError says why a session's stored fit settings cannot be used,
// naming the setting by its key in the session file.
func settingsError(err error) string {
	var oe *fitcore.OptionError
	if errors.As(err, &oe) {
		return fmt.Sprintf("the session's fit settings cannot be used: %s = %s: %s", oe.Option, oe.Value, oe.Want)
	}
	return "the session's fit settings cannot be used: " + err.Error()
}

// fileError is the one line of a file that cannot be used.
func fileError(stderr io.Writer, cmd, path string, err error) {
	if errors.Is(err, errFolder) {
		fail(stderr, cmd, "%s is a folder, not a session file", path)
		return
	}
	fail(stderr, cmd, "%s: %s", path, oneLine(err.Error()))
}

// Inspect runs `pairline inspect [--json] FILE` and returns the exit status.
func Inspect(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("inspect", stderr)
	asJSON := fs.Bool("json", false, "print everything as JSON (the report in the form of \"pairline fit --json\")")
	fs.Usage = func() { fmt.Fprint(fs.Output(), inspectUsage); fs.PrintDefaults() }
	path, code, ok := oneFile(fs, args)
	if !ok {
		return code
	}
	file, err := openSessionFile(path)
	if err != nil {
		fileError(stderr, "inspect", path, err)
		return ExitUsage
	}
	in := inspection{File: path, Major: file.Major, Minor: file.Minor, Checksum: "ok", SHA256: file.Checksum,
		Warnings: file.Warnings}
	if in.Warnings == nil {
		in.Warnings = []string{}
	}
	n := len(file.Sessions)
	weights := make([]int, n)
	for i, s := range file.Sessions {
		weights[i] = len(s.Readings)
	}
	// Sessions are analysed ahead of the writer on every core, within a
	// budget of readings (see prefetch); each is dropped from the file
	// once handed to its analysis, and its analysis once written.
	next, stop := prefetch(n, func(i int) int { return weights[i] }, func(i int) sessionAnalysis {
		s := file.Sessions[i]
		file.Sessions[i] = nil
		return analyse(s)
	})
	defer stop()
	var err2 error
	if *asJSON {
		err2 = inspectJSON(stdout, &in, n, next)
	} else {
		err2 = inspectTextTo(stdout, &in, n, next)
	}
	if err2 != nil {
		fail(stderr, "inspect", "%v", err2)
		return ExitFailure
	}
	return ExitOK
}

// inspectJSON writes what json.MarshalIndent(in, "", "  ") would write with
// the n sessions next gives in in.Sessions, one session at a time.
func inspectJSON(w io.Writer, in *inspection, n int, next func(int) sessionAnalysis) error {
	head, err := json.MarshalIndent(in, "", "  ")
	if err != nil {
		return fmt.Errorf("the analysis could not be written as JSON: %v", err)
	}
	// in.Sessions is nil, so the head ends in `"sessions": null\n}`.
	const tail = "null\n}"
	if !bytes.HasSuffix(head, []byte(tail)) {
		return errors.New("the analysis could not be written as JSON")
	}
	head = append(jsonText(head[:len(head)-len(tail)]), '[')
	bw := bufio.NewWriterSize(w, 64<<10)
	if _, err := bw.Write(head); err != nil {
		return err
	}
	for i := 0; i < n; i++ {
		sep := ",\n    "
		if i == 0 {
			sep = "\n    "
		}
		if _, err := bw.WriteString(sep); err != nil {
			return err
		}
		// Written member by member: a session of 250,000 readings is
		// about 160 MB of JSON, which must not be built in memory.
		if err := writeJSONIndented(bw, next(i), "    ", "  "); err != nil {
			return fmt.Errorf("the analysis could not be written as JSON: %v", err)
		}
	}
	end := "\n  ]\n}\n"
	if n == 0 {
		end = "]\n}\n"
	}
	if _, err := bw.WriteString(end); err != nil {
		return err
	}
	return bw.Flush()
}

// oneFile parses the flags and the single FILE argument.
func oneFile(fs *flag.FlagSet, args []string) (string, int, bool) {
	if err := parseArgs(fs, args); err != nil {
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

// nameUnit is a quantity's name with its unit, both from the file and made
// visible.
func nameUnit(name, unit, def string) string {
	if name == "" {
		name = def
	}
	if unit != "" {
		name += " (" + unit + ")"
	}
	return term(name)
}

// longText is text of several lines from the file (notes, reasons): its
// whitespace, newlines included, folded to single spaces and the rest made
// visible.
func longText(s string) string { return term(oneLine(s)) }

// inspectTextTo writes the text of the file and of the n sessions next
// gives, each session written as soon as it is analysed.
func inspectTextTo(out io.Writer, in *inspection, n int, next func(int) sessionAnalysis) error {
	var b strings.Builder
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	w("File %s: session file format %d.%d, %d session(s), checksum OK (SHA-256 %s)\n",
		term(in.File), in.Major, in.Minor, n, in.SHA256)
	for _, warn := range in.Warnings {
		w("Warning: %s\n", longText(warn))
	}
	for i := 0; i < n; i++ {
		a := next(i)
		sessionText(&b, i, n, &a)
		if _, err := io.WriteString(out, termLines(b.String())); err != nil {
			return err
		}
		b.Reset()
	}
	return nil
}

// sessionText writes the text of session i of n.
func sessionText(b *strings.Builder, i, n int, a *sessionAnalysis) {
	w := func(format string, a ...any) { fmt.Fprintf(b, format, a...) }
	{
		s := a.Session
		w("\nSession %d of %d: %s\n", i+1, n, term(s.Title))
		field := func(label, v string) {
			if v != "" {
				w("  %-11s %s\n", label, v)
			}
		}
		field("ID", term(s.ID))
		field("created", when(s.Created))
		field("modified", when(s.Modified))
		field("site", term(s.Site))
		inst := s.Instrument.Description
		if s.Instrument.Serial != "" {
			inst += " (serial " + s.Instrument.Serial + ")"
		}
		field("instrument", term(inst))
		field("asset ID", term(s.Instrument.ID))
		if s.Instrument.IntervalDays > 0 {
			field("interval", fmt.Sprintf("%d days", s.Instrument.IntervalDays))
		}
		field("operator", term(s.Operator))
		field("x", nameUnit(s.XName, s.XUnit, "x"))
		field("y", nameUnit(s.YName, s.YUnit, "y"))
		if l := s.Location; l != nil {
			field("location", fmt.Sprintf("%s, %s (within %s m, %s)", numfmt.Sig(l.Lat, 7), numfmt.Sig(l.Lon, 7),
				numfmt.Sig(l.AccuracyM, 3), when(l.Taken)))
		}
		field("notes", longText(s.Notes))
		c := a.Counts
		// The words of the report's "Readings" section.
		w("  %-11s %d rows: %d used, %d left out, %d blank, %d cell(s) not usable\n",
			"readings", c.Rows, c.Usable, c.Excluded, c.Blank, c.Problems)
		for r, rd := range s.Readings {
			if rd.Excluded {
				w("  %-11s row %d (x %s, y %s): %s\n", "left out", r+1, quoted(rd.X), quoted(rd.Y), longText(rd.ExcludeReason))
			}
		}
		for _, p := range a.Problems {
			w("  %-11s row %d, %s: %s %s\n", "not usable", p.Row+1, p.Column, quoted(p.Text), longText(p.Reason))
		}
		if len(s.History) > 0 {
			w("  %-11s %d change(s), the last at %s\n", "history", len(s.History), when(s.History[len(s.History)-1].At))
		}
		recordText(b, a)
		w("\n")
		if a.Report == nil {
			w("Analysis not possible: %s\n", longText(a.AnalysisError))
			return
		}
		lines := make([]int32, len(a.Rows))
		for k, r := range a.Rows {
			lines[k] = int32(r + 1) // rows as the table numbers them (at most MaxReadings)
		}
		fr := &fitResult{report: a.Report, lines: lines,
			xName: nameUnit(s.XName, s.XUnit, "x"), yName: nameUnit(s.YName, s.YUnit, "y"),
			xUnit: term(s.XUnit), yUnit: term(s.YUnit)}
		b.WriteString(summary(quoted(s.Title), fr))
	}
}

// ExportCSV runs `pairline export-csv [--session N|ID] FILE`.
func ExportCSV(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("export-csv", stderr)
	which := fs.String("session", "", "the session to export: its number (from 1) or its ID")
	results := fs.Bool("results", false, "write the results table instead of the readings")
	fs.Usage = func() { fmt.Fprint(fs.Output(), exportUsage); fs.PrintDefaults() }
	path, code, ok := oneFile(fs, args)
	if !ok {
		return code
	}
	file, err := openSessionFile(path)
	if err != nil {
		fileError(stderr, "export-csv", path, err)
		return ExitUsage
	}
	var s *session.Session
	switch {
	case *which == "" && len(file.Sessions) == 1:
		s = file.Sessions[0]
	case *which == "":
		fail(stderr, "export-csv", "%s holds %d sessions; choose one with --session 1 … %d or an ID",
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
			fail(stderr, "export-csv", "%s has no session %s (it holds %d)", path, quoted(*which), len(file.Sessions))
			return ExitUsage
		}
	}
	if *results {
		x, y, _, _ := s.Pairs()
		opt, set, _ := s.RecordOptions(x)
		rep, err := fitcore.Analyze(x, y, opt)
		if err != nil {
			fail(stderr, "export-csv", "the results of %s cannot be given: %v", quoted(s.Title), err)
			return ExitFailure
		}
		var buf bytes.Buffer
		if err := session.WriteResultsCSV(&buf, s, rep, set); err != nil {
			fail(stderr, "export-csv", "%v", err)
			return ExitFailure
		}
		text := buf.String()
		if isTerminal(stdout) {
			text = termLines(text)
		}
		if _, err := io.WriteString(stdout, text); err != nil {
			fail(stderr, "export-csv", "%v", err)
			return ExitFailure
		}
		return ExitOK
	}
	if err := writeReadings(stdout, s, isTerminal(stdout)); err != nil {
		fail(stderr, "export-csv", "%v", err)
		return ExitFailure
	}
	return ExitOK
}

// writeReadings writes the readings CSV. On a terminal (visible) the cells
// are shown, not obeyed: control characters in them become visible
// escapes. Redirected to a file the CSV keeps the text as typed.
func writeReadings(w io.Writer, s *session.Session, visible bool) error {
	if !visible {
		return session.WriteReadingsCSV(w, s)
	}
	var buf bytes.Buffer
	if err := session.WriteReadingsCSV(&buf, s); err != nil {
		return err
	}
	_, err := io.WriteString(w, termLines(buf.String()))
	return err
}

// isTerminal reports whether w is a terminal (a character device such as
// a tty), where text from a file must be made visible.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

// recordText writes the calibration record of a session: conditions,
// standards (with expiry), unknowns converted to x, and the seal.
func recordText(b *strings.Builder, a *sessionAnalysis) {
	w := func(format string, v ...any) { fmt.Fprintf(b, format, v...) }
	s := a.Session.Session
	for _, c := range s.Conditions {
		w("  %-11s %s %s %s\n", "condition", term(c.Name), term(c.Value), term(c.Unit))
	}
	expired := map[int]session.StandardExpiry{}
	for _, e := range a.ExpiredStandards {
		expired[e.Index] = e
	}
	for i, st := range s.Standards {
		line := fmt.Sprintf("%d: %s, certificate %s, value %s", i+1, quoted(st.Name), quoted(st.Certificate), quoted(st.Value))
		if st.Uncertainty != "" {
			line += ", standard uncertainty " + quoted(st.Uncertainty)
		}
		if !st.Expiry.IsZero() {
			line += ", expires " + st.Expiry.UTC().Format("2006-01-02")
		}
		if e, ok := expired[i]; ok {
			line += fmt.Sprintf(" - EXPIRED before the readings of %s; do not rely on this record until the lab's procedure allows it", e.Day.Format("2006-01-02"))
		}
		w("  %-11s %s\n", "standard", line)
	}
	xu := ""
	if s.XUnit != "" {
		xu = " " + term(s.XUnit)
	}
	for i, u := range a.Session.Unknowns {
		line := fmt.Sprintf("%d: %s, %d reading(s)", i+1, quoted(u.Name), len(u.Readings))
		if u.X != nil {
			line += fmt.Sprintf(": x = %s%s, standard uncertainty %s", numfmt.Sig(*u.X, 6), xu, numfmt.Sig(*u.SE, 3))
			if u.UStandards != nil {
				line += fmt.Sprintf(" (fit %s, standards %s)", numfmt.Sig(*u.SEFit, 3), numfmt.Sig(*u.UStandards, 3))
			}
			if u.Low != nil {
				line += fmt.Sprintf(", interval %s to %s", numfmt.Sig(*u.Low, 6), numfmt.Sig(*u.High, 6))
			}
		}
		if u.Message != "" {
			line += "; " + longText(u.Message)
		}
		w("  %-11s %s\n", "unknown", line)
	}
	for _, p := range a.RecordProblems {
		if !strings.HasPrefix(p, "unknown ") {
			w("  %-11s %s\n", "standards", longText(p))
		}
	}
	if sl := s.Seal; sl != nil {
		line := fmt.Sprintf("revision %d, performed by %s at %s", s.Revision, quoted(sl.PerformedBy), when(sl.PerformedAt))
		if sl.ReviewedBy != "" {
			line += fmt.Sprintf(", reviewed by %s at %s", quoted(sl.ReviewedBy), when(sl.ReviewedAt))
		} else {
			line += ", not reviewed"
		}
		w("  %-11s %s; digest %s\n", "seal", line, term(sl.Digest))
	} else if s.Revision > 0 {
		w("  %-11s revision %d, changed after revision %d was sealed and not signed again\n", "seal", s.Revision, s.Revision-1)
	}
	switch {
	case a.SealValid != nil && *a.SealValid:
		w("  %-11s valid: the digests match the content\n", "seal check")
	case a.SealValid != nil:
		w("  %-11s NOT VALID: %s\n", "seal check", longText(a.SealProblem))
	}
	if len(s.Sealed) > 0 {
		w("  %-11s %d earlier sealed revision(s) kept\n", "revisions", len(s.Sealed))
	}
}
