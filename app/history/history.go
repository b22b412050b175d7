// Package history follows one instrument through its calibration records:
// it groups sessions by instrument (session.InstrumentKey), orders them by
// the day the readings were taken, compares each calibration with the
// previous accepted one (fitcore.CompareLines), fits the drift of slope and
// intercept over time (fitcore.Drift) and says when the next calibration is
// due. It computes no statistics itself; it is pure Go, so the native
// command and the browser share it.
package history

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"
	"time"

	"pairline/app/session"
	"pairline/fitcore"
)

// MaxSessions is the largest number of session summaries Build accepts;
// its cost is O(n log n) for the ordering and linear otherwise.
const MaxSessions = 200_000

// Session verdicts.
const (
	Accepted    = "accepted"
	NotAccepted = "not accepted"
	NoFit       = "no line" // too few usable readings for a line
	Superseded  = "earlier revision"
)

// Summary is what history keeps of one session: enough to compare lines
// and fit the drift, without the rest of the record.
type Summary struct {
	ID           string
	Key          string // session.InstrumentKey
	Title        string
	Site         string
	Revision     int
	Modified     time.Time
	Taken        time.Time // session.ReadingsDay
	IntervalDays int
	// Digest is the SHA-256 of the session's encoding with its ID left out:
	// two summaries with the same digest are one calibration, given twice
	// or kept twice (an import's "Keep both" copies a session under a new
	// ID).
	Digest string

	Fitted                 bool
	Slope, SlopeSE         float64
	Intercept, InterceptSE float64
	// DF is the degrees of freedom of SlopeSE and InterceptSE (the
	// line's residual degrees of freedom, fitcore Report.DF): they are
	// estimates, and the drift allows for it (fitcore.DriftEstimated).
	DF       float64
	Accepted bool
	Reason   string // why the line is not accepted or not fitted
	X, Y     []float64

	// For showing the history (the page of `pairline history --html`):
	// the session's own intervals of slope and intercept at Level, R², the
	// quantities and units, the instrument and who signed.
	SlopeLow, SlopeHigh         float64
	InterceptLow, InterceptHigh float64
	Level                       float64
	RSquared                    float64
	XName, XUnit, YName, YUnit  string
	Description, Serial         string
	InstrumentID                string
	Operator                    string
	PerformedBy, ReviewedBy     string // the seal's signatures; "" = not signed
	// Criteria are the session's acceptance criteria (nil = none): the
	// limits of the instrument view's charts and of the projected day of
	// leaving them.
	Criteria *fitcore.Criteria
}

// anonymousID stands for every session's ID in Summary.Digest.
const anonymousID = "00000000000000000000000000000000"

// Summarize fits one session with its own settings and keeps its summary.
// Accepted is the acceptance verdict when the settings have criteria
// (fitcore Report.Acceptance), else "no assumption failed" (no
// Assumptions verdict is fitcore.Fail).
func Summarize(s *session.Session) (Summary, error) {
	if s == nil {
		return Summary{}, errors.New("history: no session")
	}
	anon := *s
	anon.ID = anonymousID
	b, err := session.EncodeBytes([]*session.Session{&anon})
	if err != nil {
		return Summary{}, fmt.Errorf("history: session %s: %w", s.ID, err)
	}
	h := sha256.Sum256(b)
	d := hex.EncodeToString(h[:])
	sum := Summary{
		ID: s.ID, Key: session.InstrumentKey(s.Instrument), Title: s.Title, Site: s.Site,
		Revision: s.Revision, Modified: s.Modified, Taken: s.ReadingsDay(),
		IntervalDays: s.Instrument.IntervalDays, Digest: d,
		XName: s.XName, XUnit: s.XUnit, YName: s.YName, YUnit: s.YUnit,
		Description: s.Instrument.Description, Serial: s.Instrument.Serial, InstrumentID: s.Instrument.ID,
		Operator: s.Operator,
	}
	if s.Seal != nil {
		sum.PerformedBy, sum.ReviewedBy = s.Seal.PerformedBy, s.Seal.ReviewedBy
	}
	if c := s.Settings.Acceptance; c != nil {
		cc := *c
		sum.Criteria = &cc
	}
	x, y, _, _ := s.Pairs()
	rep, err := fitcore.Analyze(x, y, s.Settings.Options())
	if err != nil {
		sum.Reason = err.Error()
		return sum, nil
	}
	sum.Fitted = true
	sum.Slope, sum.SlopeSE = rep.Slope.Estimate, rep.Slope.SE
	sum.Intercept, sum.InterceptSE = rep.Intercept.Estimate, rep.Intercept.SE
	sum.DF = rep.DF
	sum.X, sum.Y = x, y
	sum.SlopeLow, sum.SlopeHigh = rep.Slope.CILow, rep.Slope.CIHigh
	sum.InterceptLow, sum.InterceptHigh = rep.Intercept.CILow, rep.Intercept.CIHigh
	sum.Level, sum.RSquared = rep.Level, rep.RSquared
	switch {
	case rep.Acceptance != nil:
		sum.Accepted = rep.Acceptance.Pass
		if !sum.Accepted {
			sum.Reason = "acceptance criteria not met: " + rep.Acceptance.Summary
		}
	default:
		sum.Accepted = true
		a := rep.Assumptions
		for _, as := range []struct {
			name string
			a    fitcore.Assumption
		}{{"linearity", a.Linearity}, {"spread", a.Spread}, {"independence", a.Independence}, {"normality", a.Normality}, {"influence", a.Influence}} {
			if as.a.Verdict == fitcore.Fail {
				sum.Accepted = false
				sum.Reason = "the " + as.name + " check failed"
				break
			}
		}
	}
	return sum, nil
}

// Options are the caller's choices for Build.
type Options struct {
	Now                 time.Time // for Overdue
	DefaultIntervalDays int       // used when the records give no interval; 0 = no due date
	Level               float64   // of the drift intervals; 0 = fitcore's default
	// Limits on slope and intercept for the projected date of leaving
	// them; nil = none.
	SlopeLow, SlopeHigh, InterceptLow, InterceptHigh *float64
}

// Entry is one session of an instrument's history.
type Entry struct {
	Summary
	Verdict string // Accepted, NotAccepted, NoFit or Superseded
}

// Change is the comparison of an accepted calibration with the previous
// accepted one.
type Change struct {
	Session, Previous string
	*fitcore.LineComparison
}

// Instrument is the history of one instrument.
type Instrument struct {
	Key        string
	Entries    []Entry // by Taken, then ID
	Duplicates int     // the same session given more than once, counted once
	Changes    []Change
	// SlopeDrift and InterceptDrift are fitted over the accepted sessions,
	// with t in years since the first of them.
	SlopeDrift, InterceptDrift *fitcore.DriftResult
	Origin                     time.Time // t = 0 of the drift
	// LeavesAt is the projected day the first of slope/intercept leaves its
	// limit (zero = not projected), and LeavesWhich names it; only a trend
	// with Status fitcore.DriftDrifting is projected (never a step,
	// fitcore.DriftShifted).
	LeavesAt    time.Time
	LeavesWhich string
	Due         time.Time // last accepted calibration + interval; zero = unknown
	Overdue     bool
	// Latest compares the newest session with a line (accepted or not,
	// not an earlier revision) with the last accepted calibration before
	// it: "today against the last accepted". Nil when there is no such
	// pair or the lines cannot be compared (LatestReason says why).
	Latest       *Change
	LatestReason string
}

// Build groups the summaries by instrument and computes each history.
// Sessions that name no instrument are grouped under the key "".
func Build(sums []Summary, opt Options) ([]Instrument, error) {
	if len(sums) > MaxSessions {
		return nil, fmt.Errorf("history: at most %d sessions", MaxSessions)
	}
	groups := map[string][]Summary{}
	var keys []string
	for _, s := range sums {
		k := strings.ToLower(strings.TrimSpace(s.Key))
		if _, ok := groups[k]; !ok {
			keys = append(keys, k)
		}
		groups[k] = append(groups[k], s)
	}
	sort.Strings(keys)
	out := make([]Instrument, 0, len(keys))
	for _, k := range keys {
		in, err := build(groups[k], opt)
		if err != nil {
			return nil, err
		}
		out = append(out, in)
	}
	return out, nil
}

// build is the history of one instrument's summaries g. The stages: keep
// one entry per content and mark earlier revisions (dedupe), order them
// (sortEntries), compare each accepted calibration with the one before
// (compareAccepted), the newest line against the last accepted, the due
// day (setDue), the drift of slope and intercept (fitDrift) and the
// projected day of leaving a limit (setLeaves).
func build(g []Summary, opt Options) (Instrument, error) {
	in := Instrument{Key: strings.TrimSpace(g[0].Key)}
	in.Entries, in.Duplicates = dedupe(g)
	sortEntries(in.Entries)
	acc, interval := in.compareAccepted(opt.DefaultIntervalDays)
	in.Latest, in.LatestReason = latest(in.Entries)
	in.setDue(acc, interval, opt.Now)
	in.fitDrift(acc, opt)
	in.setLeaves()
	return in, nil
}

// dedupe keeps one entry per session content: the same digest again
// (whatever the ID: Summary.Digest leaves it out) is a duplicate (counted,
// dropped); the same ID with other content
// keeps the highest revision (then latest Modified) and marks the others
// Superseded, kept apart as earlier revisions.
func dedupe(g []Summary) (entries []Entry, duplicates int) {
	byID := map[string]int{}
	seen := map[string]bool{}
	for _, s := range g {
		key := s.Digest
		if key == "" {
			key = "id\x00" + s.ID // no digest: only the same ID can repeat it
		}
		if seen[key] {
			duplicates++
			continue
		}
		seen[key] = true
		e := Entry{Summary: s, Verdict: verdictOf(s)}
		if j, ok := byID[s.ID]; ok {
			cur := &entries[j]
			if s.Revision > cur.Revision || s.Revision == cur.Revision && s.Modified.After(cur.Modified) {
				cur.Verdict = Superseded
				byID[s.ID] = len(entries)
			} else {
				e.Verdict = Superseded
			}
		} else {
			byID[s.ID] = len(entries)
		}
		entries = append(entries, e)
	}
	return entries, duplicates
}

// sortEntries orders the entries by the day taken, then ID, then revision;
// entries equal in all three keep their order. (Through sort.Sort, which
// the standard library links into the browser build anyway: sort.Slice and
// sort.SliceStable would add their own copies of the sort to app.wasm.)
func sortEntries(entries []Entry) {
	pos := make([]int, len(entries))
	for i := range pos {
		pos[i] = i
	}
	sort.Sort(entryOrder{entries, pos})
}

// entryOrder is sortEntries' order (sort.Interface): pos holds each
// entry's position before the sort, the last key.
type entryOrder struct {
	e   []Entry
	pos []int
}

func (s entryOrder) Len() int { return len(s.e) }
func (s entryOrder) Swap(i, j int) {
	s.e[i], s.e[j] = s.e[j], s.e[i]
	s.pos[i], s.pos[j] = s.pos[j], s.pos[i]
}
func (s entryOrder) Less(i, j int) bool {
	a, b := &s.e[i], &s.e[j]
	switch {
	case !a.Taken.Equal(b.Taken):
		return a.Taken.Before(b.Taken)
	case a.ID != b.ID:
		return a.ID < b.ID
	case a.Revision != b.Revision:
		return a.Revision < b.Revision
	}
	return s.pos[i] < s.pos[j]
}

// compareAccepted walks the entries in order, past earlier revisions,
// comparing each accepted calibration with the previous accepted one
// (in.Changes, where the lines can be compared). It returns the accepted
// entries and the interval in force at the end: the last one a record
// gives, else defaultDays.
func (in *Instrument) compareAccepted(defaultDays int) (acc []*Entry, interval int) {
	var prev *Entry
	interval = defaultDays
	for i := range in.Entries {
		e := &in.Entries[i]
		if e.Verdict == Superseded {
			continue
		}
		if e.IntervalDays > 0 {
			interval = e.IntervalDays
		}
		if e.Verdict != Accepted {
			continue
		}
		if prev != nil {
			c, err := fitcore.CompareLines(prev.X, prev.Y, e.X, e.Y)
			if err == nil {
				in.Changes = append(in.Changes, Change{Session: e.ID, Previous: prev.ID, LineComparison: c})
			}
		}
		prev = e
		acc = append(acc, e)
	}
	return acc, interval
}

// setDue sets the drift's origin (the first accepted calibration) and,
// with an interval, the day the next one is due after the last accepted
// one and whether it is overdue at now (never for a zero now).
func (in *Instrument) setDue(acc []*Entry, interval int, now time.Time) {
	if len(acc) == 0 {
		return
	}
	in.Origin = acc[0].Taken
	if interval > 0 {
		in.Due = acc[len(acc)-1].Taken.AddDate(0, 0, interval)
		in.Overdue = !now.IsZero() && now.After(in.Due)
	}
}

// fitDrift fits the drift of slope and intercept over the accepted
// calibrations, t in years since the origin; a fit Drift refuses gives a
// result whose Status says why.
func (in *Instrument) fitDrift(acc []*Entry, opt Options) {
	t := make([]float64, len(acc))
	sl, sls := make([]float64, len(acc)), make([]float64, len(acc))
	ic, ics := make([]float64, len(acc)), make([]float64, len(acc))
	df := make([]float64, len(acc))
	for i, e := range acc {
		t[i] = Years(e.Taken.Sub(in.Origin))
		sl[i], sls[i], ic[i], ics[i] = e.Slope, e.SlopeSE, e.Intercept, e.InterceptSE
		df[i] = seDF(e.DF)
	}
	var err error
	if in.SlopeDrift, err = fitcore.DriftEstimated(t, sl, sls, df, opt.Level, opt.SlopeLow, opt.SlopeHigh); err != nil {
		in.SlopeDrift = &fitcore.DriftResult{N: len(acc), Status: "not fitted: " + err.Error()}
	}
	if in.InterceptDrift, err = fitcore.DriftEstimated(t, ic, ics, df, opt.Level, opt.InterceptLow, opt.InterceptHigh); err != nil {
		in.InterceptDrift = &fitcore.DriftResult{N: len(acc), Status: "not fitted: " + err.Error()}
	}
}

// seDF is the degrees of freedom fitcore.DriftEstimated is given for a
// calibration's standard errors: its line's residual degrees of freedom,
// or +Inf (taken as exact) when a summary does not know them.
func seDF(df float64) float64 {
	if df > 0 && !math.IsNaN(df) {
		return df
	}
	return math.Inf(1)
}

// DriftEntries are the accepted calibrations the drift is fitted over, in
// the order of the times given to fitcore.Drift (the order of Entries):
// DriftEntries()[i] is calibration i of SlopeDrift and InterceptDrift, so
// a step's Before and After (fitcore.DriftStep) name their sessions and
// days.
func (in *Instrument) DriftEntries() []*Entry {
	var acc []*Entry
	for i := range in.Entries {
		if in.Entries[i].Verdict == Accepted {
			acc = append(acc, &in.Entries[i])
		}
	}
	return acc
}

// DriftDays are the days of DriftEntries, in the same order: DriftDays()[i]
// is the day of calibration i of SlopeDrift and InterceptDrift.
func (in *Instrument) DriftDays() []time.Time {
	acc := in.DriftEntries()
	days := make([]time.Time, len(acc))
	for i, e := range acc {
		days[i] = e.Taken
	}
	return days
}

// setLeaves sets the first projected day slope or intercept leaves its
// limit, and which.
func (in *Instrument) setLeaves() {
	for _, d := range []struct {
		name string
		r    *fitcore.DriftResult
	}{{"slope", in.SlopeDrift}, {"intercept", in.InterceptDrift}} {
		// Projected only for a trend that is significant (DriftDrifting):
		// a flat trend with a slight slope would give a far, meaningless day,
		// and a step (DriftShifted) is no trend at all.
		if d.r.Leaves == nil || d.r.Status != fitcore.DriftDrifting {
			continue
		}
		at := in.Origin.Add(Duration(d.r.Leaves.At))
		if in.LeavesAt.IsZero() || at.Before(in.LeavesAt) {
			in.LeavesAt, in.LeavesWhich = at, d.name
		}
	}
}

// latest compares the newest fitted session with the last accepted one
// before it in time order.
func latest(entries []Entry) (*Change, string) {
	last := -1
	for i := len(entries) - 1; i >= 0; i-- {
		if v := entries[i].Verdict; v == Accepted || v == NotAccepted {
			last = i
			break
		}
	}
	if last < 0 {
		return nil, "no session of this instrument has a line yet"
	}
	for j := last - 1; j >= 0; j-- {
		if entries[j].Verdict != Accepted {
			continue
		}
		c, err := fitcore.CompareLines(entries[j].X, entries[j].Y, entries[last].X, entries[last].Y)
		if err != nil {
			return nil, err.Error()
		}
		return &Change{Session: entries[last].ID, Previous: entries[j].ID, LineComparison: c}, ""
	}
	return nil, "there is no accepted calibration before the newest one"
}

func verdictOf(s Summary) string {
	switch {
	case !s.Fitted:
		return NoFit
	case s.Accepted:
		return Accepted
	}
	return NotAccepted
}

// Year is the length of a year used for drift rates: 365.25 days (the
// Julian year, common practice).
const Year = 365.25 * 24 * time.Hour

// Years converts a duration to years of length Year.
func Years(d time.Duration) float64 { return d.Hours() / Year.Hours() }

// Duration converts years back to a duration, clamped to ±200 years so
// that a far projection cannot overflow.
func Duration(years float64) time.Duration {
	if years > 200 {
		years = 200
	}
	if years < -200 {
		years = -200
	}
	return time.Duration(years * float64(Year))
}
