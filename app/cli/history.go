package cli

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"time"

	"pairline/app/history"
	"pairline/app/history/view"
	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

// Limits of `pairline history`: files read (folders included) and the
// calibration interval. Each file is read and summarised on its own, so the
// memory held is the per-session summaries (the readings used for the
// comparisons), linear in the number of sessions.
const (
	MaxHistoryFiles    = 100_000
	MaxIntervalDays    = 36_500
	historyWorkers     = 2
	historyFileSuffix  = ".pairline"
	historyDateLayout  = "2006-01-02"
	historyProgressGap = 200 * time.Millisecond
)

const historyUsage = `Usage: pairline history [--json|--csv|--html OUT] [--instrument ID] [--interval DAYS]
       [--slope-limits LOW,HIGH] [--intercept-limits LOW,HIGH] FILE|DIR...

Follow each instrument through its calibration records: every session in the
files (folders are searched for *.pairline files, recursively) is fitted with
its own settings, grouped by instrument (its ID, else its serial, else its
description), ordered by the day the readings were taken, compared with the
previous accepted calibration (equal slopes, then one common line, at
p < 0.01) and the trend of slope and intercept over time is fitted. Files
that cannot be read are listed with the reason and skipped.

--html OUT writes one self-contained page (no script, nothing loaded from
anywhere; "-" = standard output) with, per instrument, its calibrations, the
comparisons, the drift with charts of slope and intercept against time, and
what is due. An existing OUT is replaced once the new page is complete.

The comparison and the trend are statistical signals, not a decision: follow
the instrument maker's procedure and your quality system before taking an
instrument out of service or back into it.

Flags:
`

// History runs `pairline history` and returns the exit status.
func History(args []string, stdout, stderr io.Writer) int {
	fset := newFlags("history", stderr)
	asJSON := fset.Bool("json", false, "print JSON (documented in app/cli/HISTORY-JSON.md)")
	asCSV := fset.Bool("csv", false, "print one CSV row per session")
	htmlOut := fset.String("html", "", "write a self-contained HTML page to this file (\"-\" = standard output)")
	only := fset.String("instrument", "", "show only the instrument with this ID (or serial, or description)")
	interval := fset.Int("interval", 0, "calibration interval in days when a record gives none (1 to 36500)")
	slopeLim := fset.String("slope-limits", "", "LOW,HIGH limits of the slope for the projected day of leaving them (either may be empty)")
	icptLim := fset.String("intercept-limits", "", "LOW,HIGH limits of the intercept, as --slope-limits")
	fset.Usage = func() {
		fmt.Fprint(fset.Output(), historyUsage)
		fset.PrintDefaults()
	}
	if err := parseArgs(fset, args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return ExitOK
		}
		return ExitUsage
	}
	if n := btoi(*asJSON) + btoi(*asCSV) + btoi(*htmlOut != ""); n > 1 {
		fail(stderr, "history", "choose one of --json, --csv and --html")
		return ExitUsage
	}
	if *interval < 0 || *interval > MaxIntervalDays {
		fail(stderr, "history", "--interval must be between 1 and %d days, not %d", MaxIntervalDays, *interval)
		return ExitUsage
	}
	opt := history.Options{Now: time.Now().UTC(), DefaultIntervalDays: *interval}
	var err error
	if opt.SlopeLow, opt.SlopeHigh, err = limitPair(*slopeLim); err != nil {
		fail(stderr, "history", "--slope-limits: %v", err)
		return ExitUsage
	}
	if opt.InterceptLow, opt.InterceptHigh, err = limitPair(*icptLim); err != nil {
		fail(stderr, "history", "--intercept-limits: %v", err)
		return ExitUsage
	}
	if fset.NArg() == 0 {
		fail(stderr, "history", "give at least one session file or folder")
		fset.Usage()
		return ExitUsage
	}
	files, skipped, err := historyFiles(fset.Args())
	if err != nil {
		fail(stderr, "history", "%v", err)
		return ExitUsage
	}
	sums, bad := readHistory(files, stderr)
	skipped = append(skipped, bad...)
	if *only != "" {
		keep := sums[:0]
		for _, s := range sums {
			if strings.EqualFold(strings.TrimSpace(s.Key), strings.TrimSpace(*only)) {
				keep = append(keep, s)
			}
		}
		sums = keep
	}
	ins, err := history.Build(sums, opt)
	if err != nil {
		fail(stderr, "history", "%v", err)
		return ExitUsage
	}
	switch {
	case *htmlOut != "":
		err = writeHistoryHTML(*htmlOut, stdout, htmlPage{Now: opt.Now, Files: len(files), Skipped: skipped, Opt: opt,
			Filter: *only, Instances: ins})
		if err != nil {
			fail(stderr, "history", "could not write the page %s: %v", quoted(*htmlOut), err)
			return ExitFailure
		}
		if *htmlOut != "-" {
			n := 0
			for _, in := range ins {
				n += len(in.Entries)
			}
			_, err = fmt.Fprintf(stdout, "Wrote %s: %s, %s, %s skipped.\n", term(*htmlOut), count(len(ins), "instrument"), count(n, "session"), count(len(skipped), "file"))
		}
	case *asJSON:
		err = historyJSON(stdout, ins, skipped)
	case *asCSV:
		err = historyCSV(stdout, ins)
	default:
		err = historyText(stdout, ins, skipped, opt)
	}
	if err != nil {
		fail(stderr, "history", "could not write the output: %v", err)
		return ExitFailure
	}
	if !*asJSON {
		for _, s := range skipped {
			fail(stderr, "history", "skipped %s: %s", s.File, oneLine(s.Reason))
		}
	}
	return ExitOK
}

// count is "1 session", "3 sessions".
func count(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return strconv.Itoa(n) + " " + noun + "s"
}

func btoi(b bool) int {
	if b {
		return 1
	}
	return 0
}

// limitPair reads "LOW,HIGH" (either part may be empty; "" = no limits).
func limitPair(s string) (low, high *float64, err error) {
	if s == "" {
		return nil, nil, nil
	}
	parts := strings.Split(s, ",")
	if len(parts) != 2 {
		return nil, nil, fmt.Errorf("give LOW,HIGH (either may be empty), not %s", quoted(s))
	}
	var out [2]*float64
	for i, p := range parts {
		p = strings.TrimSpace(p)
		if p == "" {
			continue
		}
		v, err := strconv.ParseFloat(p, 64)
		if err != nil || math.IsNaN(v) || math.Abs(v) > fitcore.MaxMagnitude {
			return nil, nil, fmt.Errorf("%s is not a number within ±%g", quoted(p), fitcore.MaxMagnitude)
		}
		out[i] = &v
	}
	if out[0] != nil && out[1] != nil && !(*out[0] < *out[1]) {
		return nil, nil, fmt.Errorf("LOW must be below HIGH in %s", quoted(s))
	}
	return out[0], out[1], nil
}

// skippedFile is a file history could not use.
type skippedFile struct {
	File   string `json:"file"`
	Reason string `json:"reason"`
}

// historyFiles expands the arguments: a file is taken as given, a folder
// gives its *.pairline files, recursively, in lexical order.
func historyFiles(args []string) ([]string, []skippedFile, error) {
	var files []string
	var skipped []skippedFile
	add := func(p string) error {
		if len(files) >= MaxHistoryFiles {
			return fmt.Errorf("more than %d files; give fewer folders", MaxHistoryFiles)
		}
		files = append(files, p)
		return nil
	}
	for _, a := range args {
		st, err := os.Stat(a)
		if err != nil {
			skipped = append(skipped, skippedFile{a, "cannot open: " + unwrapPath(err).Error()})
			continue
		}
		if !st.IsDir() {
			if err := add(a); err != nil {
				return nil, nil, err
			}
			continue
		}
		err = filepath.WalkDir(a, func(p string, d fs.DirEntry, err error) error {
			if err != nil {
				skipped = append(skipped, skippedFile{p, "cannot read: " + unwrapPath(err).Error()})
				return nil
			}
			if d.Type().IsRegular() && strings.HasSuffix(strings.ToLower(d.Name()), historyFileSuffix) {
				return add(p)
			}
			return nil
		})
		if err != nil {
			return nil, nil, err
		}
	}
	return files, skipped, nil
}

// readHistory reads the files with historyWorkers workers, keeping only the
// summaries, in the order of the files.
func readHistory(files []string, stderr io.Writer) ([]history.Summary, []skippedFile) {
	type result struct {
		sums []history.Summary
		bad  *skippedFile
	}
	results := make([]result, len(files))
	next := make(chan int)
	var wg sync.WaitGroup
	var mu sync.Mutex
	done := 0
	progress := isTerminal(stderr)
	last := time.Time{}
	for w := 0; w < historyWorkers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				results[i] = result{}
				f, err := openSessionFile(files[i])
				if err != nil {
					reason := oneLine(err.Error())
					if errors.Is(err, errFolder) {
						reason = "a folder, not a session file"
					}
					results[i].bad = &skippedFile{files[i], reason}
				} else {
					for _, s := range f.Sessions {
						sum, err := history.Summarize(s)
						if err != nil {
							results[i].bad = &skippedFile{files[i], oneLine(err.Error())}
							break
						}
						results[i].sums = append(results[i].sums, sum)
					}
				}
				mu.Lock()
				done++
				if progress && (time.Since(last) > historyProgressGap || done == len(files)) {
					last = time.Now()
					fmt.Fprintf(stderr, "\rpairline history: read %d of %d files", done, len(files))
				}
				mu.Unlock()
			}
		}()
	}
	for i := range files {
		next <- i
	}
	close(next)
	wg.Wait()
	if progress && len(files) > 0 {
		fmt.Fprintln(stderr)
	}
	var sums []history.Summary
	var bad []skippedFile
	for _, r := range results {
		sums = append(sums, r.sums...)
		if r.bad != nil {
			bad = append(bad, *r.bad)
		}
	}
	return sums, bad
}

func day(t time.Time) string {
	if t.IsZero() {
		return ""
	}
	return t.UTC().Format(historyDateLayout)
}

func dayPtr(t time.Time) *string {
	if t.IsZero() {
		return nil
	}
	s := day(t)
	return &s
}

type historyJSONOut struct {
	Instruments []historyJSONInstrument `json:"instruments"`
	Skipped     []skippedFile           `json:"skipped"`
}

type historyJSONInstrument struct {
	ID         string               `json:"id"`
	Sessions   []historyJSONSession `json:"sessions"`
	Changes    []historyJSONChange  `json:"changes"`
	Drift      historyJSONDrift     `json:"drift"`
	Intercept  historyJSONDrift     `json:"intercept_drift"`
	Due        *string              `json:"due"`
	Overdue    bool                 `json:"overdue"`
	Duplicates int                  `json:"duplicates"`
}

type historyJSONSession struct {
	ID          string  `json:"id"`
	Taken       string  `json:"taken"`
	Slope       float64 `json:"slope"`
	SlopeSE     float64 `json:"slope_se"`
	Intercept   float64 `json:"intercept"`
	InterceptSE float64 `json:"intercept_se"`
	Verdict     string  `json:"verdict"`
	Title       string  `json:"title"`
	Revision    int     `json:"revision"`
	Reason      string  `json:"reason"`
}

type historyJSONChange struct {
	Session     string                `json:"session"`
	Previous    string                `json:"previous"`
	FSlopes     float64               `json:"f_slopes"`
	PSlopes     float64               `json:"p_slopes"`
	FCoincident float64               `json:"f_coincident"`
	PCoincident float64               `json:"p_coincident"`
	Verdict     string                `json:"verdict"`
	DF2         int                   `json:"df2"`
	XDiff       []fitcore.XDifference `json:"x_difference"`
}

type historyJSONDrift struct {
	N            int              `json:"n"`
	PerYear      float64          `json:"slope_per_year"`
	PerYearLow   float64          `json:"slope_per_year_low"`
	PerYearHigh  float64          `json:"slope_per_year_high"`
	P            float64          `json:"p"`
	Simulated    int              `json:"simulated"`
	Verdict      string           `json:"verdict"`
	LeavesLimits *string          `json:"leaves_limits"`
	Level        float64          `json:"level"`
	Step         *historyJSONStep `json:"step"`
}

// historyJSONStep is a step (verdict "shifted"): the days of the last
// calibration before it and the first after, the levels with their
// standard errors, the step and its p (fitcore.DriftStep).
type historyJSONStep struct {
	Before         string  `json:"before"`
	After          string  `json:"after"`
	LevelBefore    float64 `json:"level_before"`
	LevelBeforeSE  float64 `json:"level_before_se"`
	LevelAfter     float64 `json:"level_after"`
	LevelAfterSE   float64 `json:"level_after_se"`
	Size           float64 `json:"size"`
	SizeSE         float64 `json:"size_se"`
	P              float64 `json:"p"`
	POverTrend     float64 `json:"p_over_trend"`
	PlacesSearched int     `json:"places_searched"`
}

func driftJSON(d *fitcore.DriftResult, leaves *string, days []time.Time) historyJSONDrift {
	j := historyJSONDrift{N: d.N, PerYear: d.Rate, PerYearLow: d.RateLow, PerYearHigh: d.RateHigh,
		P: d.P, Simulated: d.Simulated, Verdict: d.Status, LeavesLimits: leaves, Level: d.Level}
	if st := d.Step; d.Status == fitcore.DriftShifted && st != nil && st.Before < len(days) && st.After < len(days) {
		j.Step = &historyJSONStep{Before: day(days[st.Before]), After: day(days[st.After]),
			LevelBefore: st.LevelBefore, LevelBeforeSE: st.LevelBeforeSE, LevelAfter: st.LevelAfter, LevelAfterSE: st.LevelAfterSE,
			Size: st.Size, SizeSE: st.SizeSE, P: st.P, POverTrend: st.POverTrend, PlacesSearched: st.Splits}
	}
	return j
}

func historyJSON(w io.Writer, ins []history.Instrument, skipped []skippedFile) error {
	out := historyJSONOut{Instruments: []historyJSONInstrument{}, Skipped: skipped}
	if out.Skipped == nil {
		out.Skipped = []skippedFile{}
	}
	for _, in := range ins {
		j := historyJSONInstrument{ID: in.Key, Sessions: []historyJSONSession{}, Changes: []historyJSONChange{},
			Due: dayPtr(in.Due), Overdue: in.Overdue, Duplicates: in.Duplicates}
		for _, e := range in.Entries {
			j.Sessions = append(j.Sessions, historyJSONSession{ID: e.ID, Taken: day(e.Taken), Slope: e.Slope,
				SlopeSE: e.SlopeSE, Intercept: e.Intercept, InterceptSE: e.InterceptSE, Verdict: e.Verdict,
				Title: e.Title, Revision: e.Revision, Reason: e.Reason})
		}
		for _, c := range in.Changes {
			j.Changes = append(j.Changes, historyJSONChange{Session: c.Session, Previous: c.Previous,
				FSlopes: c.FSlopes, PSlopes: c.PSlopes, FCoincident: c.FCoincident, PCoincident: c.PCoincident,
				Verdict: c.Verdict, DF2: c.DF2Coincident, XDiff: []fitcore.XDifference{c.Bottom, c.Middle, c.Top}})
		}
		var sl, ic *string
		if in.LeavesWhich == "slope" {
			sl = dayPtr(in.LeavesAt)
		} else if in.LeavesWhich == "intercept" {
			ic = dayPtr(in.LeavesAt)
		}
		days := in.DriftDays()
		j.Drift = driftJSON(in.SlopeDrift, sl, days)
		j.Intercept = driftJSON(in.InterceptDrift, ic, days)
		out.Instruments = append(out.Instruments, j)
	}
	b, err := json.MarshalIndent(out, "", "  ")
	if err != nil {
		return err
	}
	_, err = w.Write(append(jsonText(b), '\n'))
	return err
}

func historyCSV(w io.Writer, ins []history.Instrument) error {
	rows := [][]string{{"instrument", "session", "taken", "slope", "slope_se", "intercept", "intercept_se", "verdict", "change", "p_coincident"}}
	for _, in := range ins {
		change := map[string]history.Change{}
		for _, c := range in.Changes {
			change[c.Session] = c
		}
		for _, e := range in.Entries {
			cv, cp := "", ""
			if c, ok := change[e.ID]; ok && e.Verdict == history.Accepted {
				cv, cp = c.Verdict, numfmt.Full(c.PCoincident)
			}
			rows = append(rows, []string{in.Key, e.ID, day(e.Taken), numfmt.Full(e.Slope), numfmt.Full(e.SlopeSE),
				numfmt.Full(e.Intercept), numfmt.Full(e.InterceptSE), e.Verdict, cv, cp})
		}
	}
	return session.WriteTable(w, rows, false)
}

// historyText writes the plain text of `pairline history`: per instrument
// its sessions, then the drift, the projection and the due date in the
// words of the app's instrument view (app/history/view).
func historyText(w io.Writer, ins []history.Instrument, skipped []skippedFile, opt history.Options) error {
	var b strings.Builder
	if len(ins) == 0 {
		b.WriteString("No calibration records found.\n")
	}
	for _, in := range ins {
		name := in.Key
		if name == "" {
			name = "(no instrument named)"
		}
		fmt.Fprintf(&b, "Instrument %s: %d sessions", term(name), len(in.Entries))
		if in.Duplicates > 0 {
			b.WriteString(" (" + view.CopiesText(in.Duplicates) + ")")
		}
		b.WriteString("\n")
		change := map[string]history.Change{}
		for _, c := range in.Changes {
			change[c.Session] = c
		}
		for _, e := range in.Entries {
			fmt.Fprintf(&b, "  %s  %s  slope %s ± %s  intercept %s ± %s  %s", day(e.Taken), term(e.ID),
				numfmt.Sig(e.Slope, 6), numfmt.Sig(e.SlopeSE, 2), numfmt.Sig(e.Intercept, 6), numfmt.Sig(e.InterceptSE, 2), view.VerdictWord(e.Verdict))
			if c, ok := change[e.ID]; ok && e.Verdict == history.Accepted {
				fmt.Fprintf(&b, "; against the previous: %s (%s)", view.ChangeWord(c.Verdict), wording.PEq(c.PCoincident))
			}
			if e.Reason != "" && e.Verdict != history.Accepted {
				fmt.Fprintf(&b, " (%s)", longText(e.Reason))
			}
			b.WriteString("\n")
		}
		it := view.Word(in, opt.Now, limitsOf(opt))
		for _, d := range it.Drift {
			b.WriteString("  " + d.Text + "\n")
			if d.StepAlert != "" {
				b.WriteString("  " + d.StepAlert + "\n")
			}
			if d.Leaves != "" {
				b.WriteString("  " + d.Leaves + "\n")
			}
		}
		b.WriteString("  " + strings.TrimSuffix(it.Due.Text, ".") + ".\n")
	}
	if len(skipped) > 0 {
		fmt.Fprintf(&b, "%d files skipped (listed on stderr).\n", len(skipped))
	}
	_, err := io.WriteString(w, termLines(b.String()))
	return err
}
