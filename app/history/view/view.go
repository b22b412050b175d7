// Package view words an instrument's calibration history: what app/history
// computes, put into the words, rounded figures (with their full values
// beside them) and chart markup that the app's instrument view
// (app/ui/instruments.go), the page of `pairline history --html` and the
// text of `pairline history` show, so that the three always say the same.
// Pure Go (no go-app, no syscall/js, no HTML escaping: each writer escapes
// what it shows); it computes no statistics: every estimate, interval,
// test and date comes from history.Build (fitcore.CompareLines and
// fitcore.Drift). What it does itself is presentation: rounding, unit
// changes (a rate per year shown per month), relative differences in
// percent of the value, and days until a due date.
package view

import (
	"math"
	"strconv"
	"strings"
	"time"

	"pairline/app/history"
	"pairline/app/numfmt"
	"pairline/app/plot"
	"pairline/app/wording"
	"pairline/fitcore"
)

// DueSoonDays: an instrument whose next calibration falls within this many
// days is shown as due (a week's notice to plan the work; our choice).
const DueSoonDays = 7

// Due states (data-state of the due marks).
const (
	DueNone    = "none"    // no interval, or no accepted calibration
	DueLater   = "ok"      // due later than DueSoonDays from now
	DueSoon    = "due"     // due within DueSoonDays
	DueOverdue = "overdue" // past its due date
)

// DueMark is when an instrument is next due, in words.
type DueMark struct {
	State string
	Date  time.Time // zero when State is DueNone
	Days  int       // whole days from today to Date (negative: overdue)
	Text  string
}

// View is everything the instrument components show.
type View struct {
	Items []Item
	// Unnamed counts the sessions that name no instrument (not followed).
	Unnamed int
	// Due is the due mark of the newest session of each instrument, by
	// session ID, for the session list.
	Due map[string]DueMark
}

// Item is one instrument.
type Item struct {
	Key          string // history key: identifier, serial or description
	Description  string
	Site         string
	Count        int // calibrations (earlier revisions not counted)
	Accepted     int
	Duplicates   int
	Superseded   int
	Interval     int // days; 0 = none
	Due          DueMark
	Rows         []Row // time order
	XName, XUnit string
	YUnit        string

	Slope, Intercept Chart
	Compare          *Compare
	CompareWhy       string // why there is no comparison
	Drift            []Drift
	Leaves           string // the first projected crossing in words, "" = none
	LeavesAt         time.Time
}

// Row is one calibration of an instrument.
type Row struct {
	ID, Title       string
	Taken           time.Time
	Date            string
	Fitted          bool
	Slope, SlopeSE  float64
	Icpt, IcptSE    float64
	R2              float64
	SlopeText       string // rounded to its standard error, as the line card
	SlopeSEText     string
	IcptText        string
	IcptSEText      string
	R2Text          string
	Verdict         string // history.Accepted, NotAccepted, NoFit, Superseded
	VerdictText     string
	Reason          string
	Signed          string // "" = not signed
	Unit, SlopeUnit string
	// Change is fitcore's verdict on this accepted calibration against the
	// previous accepted one (history.Instrument.Changes), "" = none.
	Change, ChangeText string
}

// Chart is one trend chart: its SVG, the marks a tap is matched
// against, and the session drawn at each mark (Mark.Row indexes IDs).
type Chart struct {
	SVG   string
	Marks []plot.Mark
	IDs   []string
	W, H  float64
}

// Compare is today against the last accepted calibration.
type Compare struct {
	Today, Previous          string // session IDs
	TodayDate, PreviousDate  string
	Verdict                  string // fitcore.LinesSame, LinesSlopeChanged, LinesMoved
	Headline                 string
	Slopes, Coincident       string // the two tests in words
	FSlopes, PSlopes         float64
	FCoincident, PCoincident float64
	Diffs                    []Diff
}

// Diff is how much today's converted value differs from the previous
// line's at one point of the range.
type Diff struct {
	Where   string // "middle", "top"
	X, Diff float64
	Percent float64 // of the value at X; NaN at X = 0
	Text    string
}

// Drift is the trend of one parameter.
type Drift struct {
	Which                        string // "slope", "intercept"
	Status                       string // fitcore.DriftTooFew, DriftSteady, DriftDrifting, DriftShifted, or "not fitted: …"
	N                            int
	PerMonth, Low, High          float64 // 0 for a step
	P                            float64 // of the rate; for a step, the step's (StepP)
	Text                         string
	Leaves                       string
	LeavesAt, LeavesLo, LeavesHi time.Time
	Bounded                      bool
	// For a step (Status fitcore.DriftShifted): the days of the last
	// calibration before it and the first after, the levels, the step with
	// its standard error and its p (fitcore.DriftStep), and the warning
	// the instrument view shows.
	StepFrom, StepTo    time.Time
	Before, After, Step float64
	StepSE, StepP       float64
	StepAlert           string
}

// Limits are the acceptance limits of the slope and the intercept that
// bound the charts and the projection (nil = none). The app takes them from
// the newest record that sets them (Build), the command from its flags.
type Limits struct {
	SlopeLow, SlopeHigh, InterceptLow, InterceptHigh *float64
}

// Of is the limit pair of "slope" or "intercept".
func (l Limits) Of(which string) (lo, hi *float64) {
	if which == "slope" {
		return l.SlopeLow, l.SlopeHigh
	}
	return l.InterceptLow, l.InterceptHigh
}

// Set reports whether a limit of "slope" or "intercept" is set.
func (l Limits) Set(which string) bool {
	lo, hi := l.Of(which)
	return lo != nil || hi != nil
}

// Build runs the history of the summaries (history.Build) and
// words it. now is today on this device.
func Build(sums []history.Summary, now time.Time) (View, error) {
	ins, err := history.Build(sums, history.Options{Now: now})
	if err != nil {
		return View{}, err
	}
	v := View{Due: map[string]DueMark{}}
	for _, in := range ins {
		if in.Key == "" {
			v.Unnamed += len(in.Entries)
			continue
		}
		// The acceptance limits of the newest calibration that sets them
		// bound the charts and the projection.
		var lim Limits
		if c := latestCriteria(in.Entries); c != nil && (c.SlopeLow != nil || c.SlopeHigh != nil || c.InterceptLow != nil || c.InterceptHigh != nil) {
			lim = Limits{c.SlopeLow, c.SlopeHigh, c.InterceptLow, c.InterceptHigh}
			again := make([]history.Summary, len(in.Entries))
			for i, e := range in.Entries {
				again[i] = e.Summary
			}
			re, err := history.Build(again, history.Options{Now: now,
				SlopeLow: c.SlopeLow, SlopeHigh: c.SlopeHigh, InterceptLow: c.InterceptLow, InterceptHigh: c.InterceptHigh})
			if err != nil {
				return View{}, err
			}
			if len(re) == 1 {
				re[0].Duplicates = in.Duplicates
				in = re[0]
			}
		}
		it := Word(in, now, lim)
		v.Items = append(v.Items, it)
		if n := len(it.Rows); n > 0 {
			for i := n - 1; i >= 0; i-- {
				if it.Rows[i].Verdict != history.Superseded {
					v.Due[it.Rows[i].ID] = it.Due
					break
				}
			}
		}
	}
	return v, nil
}

func latestCriteria(es []history.Entry) *fitcore.Criteria {
	for i := len(es) - 1; i >= 0; i-- {
		if es[i].Verdict != history.Superseded && es[i].Criteria != nil {
			return es[i].Criteria
		}
	}
	return nil
}

// Day formats a date as the app does elsewhere ("3 Nov 2026").
func Day(t time.Time) string { return t.UTC().Format("2 Jan 2006") }

// Word words one instrument's history (an element of history.Build's
// result) as of now, with the acceptance limits lim.
func Word(in history.Instrument, now time.Time, lim Limits) Item {
	it := Item{Key: in.Key, Duplicates: in.Duplicates}
	var interval int
	for _, e := range in.Entries {
		if e.Verdict == history.Superseded {
			it.Superseded++
			continue
		}
		it.Count++
		if e.Verdict == history.Accepted {
			it.Accepted++
		}
		if e.IntervalDays > 0 {
			interval = e.IntervalDays
		}
		if e.Description != "" {
			it.Description = e.Description
		}
		if e.Site != "" {
			it.Site = e.Site
		}
		it.XName, it.XUnit, it.YUnit = e.XName, e.XUnit, e.YUnit
	}
	it.Interval = interval
	it.Due = DueOf(in, interval, now)
	change := map[string]history.Change{}
	for _, c := range in.Changes {
		change[c.Session] = c
	}
	for _, e := range in.Entries {
		r := wordRow(e)
		if c, ok := change[e.ID]; ok && e.Verdict == history.Accepted {
			r.Change, r.ChangeText = c.Verdict, ChangeWord(c.Verdict)
		}
		it.Rows = append(it.Rows, r)
	}
	it.Slope = trendChart(in, "slope", lim)
	it.Intercept = trendChart(in, "intercept", lim)
	if in.Latest != nil {
		it.Compare = wordCompare(in, it)
	} else {
		it.CompareWhy = "Nothing to compare yet: " + in.LatestReason + "."
	}
	days := in.DriftDays()
	for _, d := range []struct {
		which string
		r     *fitcore.DriftResult
		unit  string
	}{{"slope", in.SlopeDrift, ratioless(lastUnit(in, false))}, {"intercept", in.InterceptDrift, lastUnit(in, true)}} {
		it.Drift = append(it.Drift, wordDrift(d.which, d.r, d.unit, in.Origin, lim.Set(d.which), days))
	}
	if !in.LeavesAt.IsZero() {
		it.LeavesAt = in.LeavesAt
		it.Leaves = "At its present drift the " + in.LeavesWhich + " is projected to leave its acceptance limit around " + Day(in.LeavesAt) + "."
	}
	return it
}

// lastUnit is the y unit (intercept) or the slope's unit of the newest
// calibration.
func lastUnit(in history.Instrument, intercept bool) string {
	for i := len(in.Entries) - 1; i >= 0; i-- {
		e := in.Entries[i]
		if e.XUnit == "" && e.YUnit == "" {
			continue
		}
		if intercept {
			return e.YUnit
		}
		return wording.SlopeUnit(e.YUnit, e.XUnit)
	}
	return ""
}

// ratioless drops the unit of a slope that is a plain ratio (x and y in
// the same unit) from a sentence: "−0.004 per month", not "ratio per month".
func ratioless(u string) string {
	if u == "ratio" {
		return ""
	}
	return u
}

func DueOf(in history.Instrument, interval int, now time.Time) DueMark {
	if in.Due.IsZero() {
		why := "No due date: no calibration interval is set on the record."
		if interval > 0 {
			why = "No due date: there is no accepted calibration yet."
		}
		return DueMark{State: DueNone, Text: why}
	}
	today := time.Date(now.Year(), now.Month(), now.Day(), 0, 0, 0, 0, time.UTC)
	due := time.Date(in.Due.Year(), in.Due.Month(), in.Due.Day(), 0, 0, 0, 0, time.UTC)
	days := int(math.Round(due.Sub(today).Hours() / 24))
	m := DueMark{Date: in.Due, Days: days}
	switch {
	case in.Overdue:
		m.State = DueOverdue
		m.Text = "Overdue since " + Day(in.Due) + " (" + plural(-days, "day", "days") + ")"
		if days >= 0 {
			m.Text = "Overdue since " + Day(in.Due)
		}
	case days <= DueSoonDays:
		m.State = DueSoon
		m.Text = "Due " + Day(in.Due) + " (in " + plural(days, "day", "days") + ")"
		if days == 0 {
			m.Text = "Due today, " + Day(in.Due)
		}
	default:
		m.State = DueLater
		m.Text = "Next due " + Day(in.Due) + " (in " + plural(days, "day", "days") + ")"
	}
	return m
}

func wordRow(e history.Entry) Row {
	r := Row{ID: e.ID, Title: e.Title, Taken: e.Taken, Date: Day(e.Taken), Fitted: e.Fitted,
		Verdict: e.Verdict, Reason: e.Reason, Signed: e.PerformedBy, Unit: e.YUnit}
	if e.XUnit != "" || e.YUnit != "" {
		r.SlopeUnit = wording.SlopeUnit(e.YUnit, e.XUnit)
	}
	r.VerdictText = VerdictWord(e.Verdict)
	if e.Fitted {
		r.Slope, r.SlopeSE, r.Icpt, r.IcptSE, r.R2 = e.Slope, e.SlopeSE, e.Intercept, e.InterceptSE, e.RSquared
		sig := numfmt.Precision(0)
		r.SlopeText, r.SlopeSEText = numfmt.Estimate(e.Slope, e.SlopeSE, sig)
		r.IcptText, r.IcptSEText = numfmt.Estimate(e.Intercept, e.InterceptSE, sig)
		r.R2Text = numfmt.Decimals(e.RSquared, 6)
	}
	return r
}

// chartMonths is the chart's time axis: months (a twelfth of
// history.Year) since the first calibration drawn.
func chartMonths(t, origin time.Time) float64 { return 12 * history.Years(t.Sub(origin)) }

// trendChart draws slope or intercept against time: each calibration with
// a line as a point with its confidence interval (a vertical stroke),
// accepted ones as dots, others as hollow squares; the drift line fitted
// over the accepted ones; the acceptance limits as dashed lines.
func trendChart(in history.Instrument, which string, lim Limits) Chart {
	var origin time.Time
	for _, e := range in.Entries {
		if e.Fitted && e.Verdict != history.Superseded {
			origin = e.Taken
			break
		}
	}
	ch := plot.Chart{TestID: "inst-chart-" + which, Width: 400, Height: 260,
		XTitle: "Months since " + Day(origin)}
	unit := lastUnit(in, which == "intercept")
	ch.YTitle = strings.ToUpper(which[:1]) + which[1:]
	if unit != "" {
		ch.YTitle += " (" + unit + ")"
	}
	var out Chart
	lo, hi := lim.Of(which)
	for _, l := range []*float64{lo, hi} {
		if l != nil {
			ch.HLines = append(ch.HLines, *l)
		}
	}
	for _, e := range in.Entries {
		if !e.Fitted || e.Verdict == history.Superseded {
			continue
		}
		m := chartMonths(e.Taken, origin)
		v, l, h := e.Slope, e.SlopeLow, e.SlopeHigh
		if which == "intercept" {
			v, l, h = e.Intercept, e.InterceptLow, e.InterceptHigh
		}
		mk := plot.Dot
		if e.Verdict != history.Accepted {
			mk = plot.HollowSquare
		}
		ch.Points = append(ch.Points, plot.Point{X: m, Y: v, Row: len(out.IDs), Marker: mk})
		ch.Paths = append(ch.Paths, plot.Path{X: []float64{m, m}, Y: []float64{l, h}, Class: "pl-plot-trace", Stroke: "#4a5560", Width: 2})
		out.IDs = append(out.IDs, e.ID)
	}
	d := in.SlopeDrift
	if which == "intercept" {
		d = in.InterceptDrift
	}
	driftPaths(&ch, in, d, chartMonths(in.Origin, origin))
	ch.Label = strings.ToUpper(which[:1]) + which[1:] + " of " + strconv.Itoa(len(out.IDs)) + " calibrations against time, each with its interval"
	if len(ch.HLines) > 0 {
		ch.Label += ", and the acceptance limits"
	}
	ch.Attrs = [][2]string{{"data-n", strconv.Itoa(len(out.IDs))}, {"data-limits", strconv.Itoa(len(ch.HLines))}}
	out.SVG, out.Marks = ch.Draw()
	out.W, out.H = ch.Size()
	return out
}

// driftPaths adds to ch what the drift d found, over the span of in's
// accepted calibrations (mo: the months from the chart's origin to
// in.Origin, where the drift's t, in years, is 0): the drift line, from
// fitcore's intercept and rate at the ends; for a step, the level before
// it and the level after, each over its own calibrations, and no line.
func driftPaths(ch *plot.Chart, in history.Instrument, d *fitcore.DriftResult, mo float64) {
	if d == nil || d.Status == fitcore.DriftTooFew || strings.HasPrefix(d.Status, "not fitted") {
		return
	}
	var t0, t1 float64
	first := true
	for _, e := range in.Entries {
		if e.Verdict != history.Accepted {
			continue
		}
		t := history.Years(e.Taken.Sub(in.Origin))
		if first {
			t0, first = t, false
		}
		t1 = t
	}
	if st := d.Step; d.Status == fitcore.DriftShifted && st != nil {
		ch.Paths = append(ch.Paths,
			plot.Path{X: []float64{mo + 12*t0, mo + 12*st.From}, Y: []float64{st.LevelBefore, st.LevelBefore}, Class: "pl-plot-line", Stroke: "#0b4f5c", Width: 2.5, Dash: "8 5"},
			plot.Path{X: []float64{mo + 12*st.To, mo + 12*t1}, Y: []float64{st.LevelAfter, st.LevelAfter}, Class: "pl-plot-line", Stroke: "#0b4f5c", Width: 2.5, Dash: "8 5"})
		return
	}
	ch.Paths = append(ch.Paths, plot.Path{X: []float64{mo + 12*t0, mo + 12*t1},
		Y: []float64{d.Intercept + d.Rate*t0, d.Intercept + d.Rate*t1}, Class: "pl-plot-line", Stroke: "#0b4f5c", Width: 2.5, Dash: "8 5"})
}

func wordCompare(in history.Instrument, it Item) *Compare {
	c := in.Latest
	var today, prev history.Entry
	for _, e := range in.Entries {
		if e.ID == c.Session && e.Verdict != history.Superseded {
			today = e
		}
		if e.ID == c.Previous && e.Verdict != history.Superseded {
			prev = e
		}
	}
	k := &Compare{Today: c.Session, Previous: c.Previous, TodayDate: Day(today.Taken), PreviousDate: Day(prev.Taken),
		Verdict: c.Verdict, FSlopes: c.FSlopes, PSlopes: c.PSlopes, FCoincident: c.FCoincident, PCoincident: c.PCoincident}
	on := " on " + k.PreviousDate
	fs := "F = " + numfmt.Sig(c.FSlopes, 3) + " on " + strconv.Itoa(c.DF1Slopes) + " and " + strconv.Itoa(c.DF2Slopes) + " df, " + numfmt.PEq(c.PSlopes)
	fc := "F = " + numfmt.Sig(c.FCoincident, 3) + " on " + strconv.Itoa(c.DF1Coincident) + " and " + strconv.Itoa(c.DF2Coincident) + " df, " + numfmt.PEq(c.PCoincident)
	switch c.Verdict {
	case fitcore.LinesSame:
		k.Headline = "The line of " + k.TodayDate + " is the same line as the last accepted calibration" + on + ", within the scatter of the readings."
		k.Slopes = "Equal slopes: no difference shown (" + fs + ")."
		k.Coincident = "Coincident lines: one line fits both calibrations (" + fc + ")."
	case fitcore.LinesSlopeChanged:
		k.Headline = "The slope has changed since the last accepted calibration" + on + "."
		k.Slopes = "Equal slopes: the slopes differ (" + fs + "): latest " + numfmt.Short(c.Slope2, 5) + " against " + numfmt.Short(c.Slope1, 5) + "."
		k.Coincident = "Coincident lines: the two calibrations are not one line (" + fc + ")."
	default:
		k.Headline = "The line has moved since the last accepted calibration" + on + ": the slopes agree within the scatter, the level differs."
		k.Slopes = "Equal slopes: no difference shown (" + fs + ")."
		k.Coincident = "Coincident lines: the two calibrations are not one line (" + fc + "): latest intercept " + numfmt.Short(c.Intercept2, 4) + unitSuffix(it.YUnit) + " against " + numfmt.Short(c.Intercept1, 4) + unitSuffix(it.YUnit) + "."
	}
	unit := it.XUnit
	for _, d := range []struct {
		where string
		x     fitcore.XDifference
	}{{"middle", c.Middle}, {"top", c.Top}} {
		dd := Diff{Where: d.where, X: d.x.X, Diff: d.x.Diff, Percent: PercentOfValue(d.x)}
		at := " at " + numfmt.Short(d.x.X, 4) + unitSuffix(unit)
		abs := numfmt.Sig(math.Abs(d.x.Diff), 2) + unitSuffix(unit)
		word := "higher"
		if d.x.Diff < 0 {
			word = "lower"
		}
		if d.x.X != 0 {
			dd.Text = "Reads " + numfmt.Sig(math.Abs(dd.Percent), 2) + " % " + word + at + " than" + on + " (" + abs + ")."
		} else {
			dd.Text = "Reads " + abs + " " + word + at + " than" + on + "."
		}
		if d.x.Diff == 0 {
			dd.Text = "Reads the same" + at + " as" + on + "."
		}
		k.Diffs = append(k.Diffs, dd)
	}
	return k
}

func unitSuffix(u string) string {
	if u == "" {
		return ""
	}
	return " " + u
}

// wordDrift says what the trend of one parameter is. fitcore gives the
// rate per year (t in years); it is shown per month (÷ 12). days are the
// days of the calibrations the drift was fitted over, in its order
// (history.Instrument.DriftEntries), for naming a step's two days.
func wordDrift(which string, r *fitcore.DriftResult, unit string, origin time.Time, limits bool, days []time.Time) Drift {
	d := Drift{Which: which}
	if r == nil {
		d.Status = fitcore.DriftTooFew
		d.Text = "Too few calibrations to say anything about drift."
		return d
	}
	d.Status, d.N = r.Status, r.N
	name := strings.ToUpper(which[:1]) + which[1:]
	switch {
	case r.Status == fitcore.DriftTooFew:
		d.Text = name + ": too few calibrations to say anything about drift (" + strconv.Itoa(r.N) + " accepted; at least 3 are needed)."
		return d
	case strings.HasPrefix(r.Status, "not fitted"):
		d.Text = name + ": the drift could not be worked out (" + r.Status + ")."
		return d
	case r.Status == fitcore.DriftShifted && r.Step != nil && r.Step.Before < len(days) && r.Step.After < len(days):
		return wordStep(d, name, r, unit, days)
	}
	d.PerMonth, d.Low, d.High, d.P = r.Rate/12, r.RateLow/12, r.RateHigh/12, r.P
	u := unitSuffix(unit)
	lvl := strings.TrimRight(strings.TrimRight(numfmt.Sig(r.Level*100, 3), "0"), ".")
	rate := numfmt.Sig(d.PerMonth, 2) + u + " per month (" + lvl + " % interval " + numfmt.Sig(d.Low, 2) + " to " + numfmt.Sig(d.High, 2) + ")"
	if r.Status == fitcore.DriftDrifting {
		d.Text = name + " is drifting: " + rate + "; " + driftP(r) + " for no drift, over " + strconv.Itoa(r.N) + " accepted calibrations."
		if st := r.Step; st != nil && st.BetterThanLine && st.Before < len(days) && st.After < len(days) {
			// fitcore could not tell a jump from the trend: say so.
			d.Text += " A single jump between " + Day(days[st.Before]) + " and " + Day(days[st.After]) +
				" would explain these values at least as well; if the instrument was repaired, adjusted or given new standards then, do not plan for steady wear."
		}
	} else {
		d.Text = name + ": no drift shown: " + rate + "; " + driftP(r) + " for no drift, over " + strconv.Itoa(r.N) + " accepted calibrations."
	}
	if l := r.Leaves; l != nil && r.Status == fitcore.DriftDrifting {
		d.LeavesAt = origin.Add(history.Duration(l.At))
		d.Leaves = "At this rate it reaches its " + l.Side + " limit " + numfmt.Short(l.Limit, 4) + u + " around " + Day(d.LeavesAt)
		if l.Bounded {
			d.Bounded = true
			d.LeavesLo, d.LeavesHi = origin.Add(history.Duration(l.Low)), origin.Add(history.Duration(l.High))
			d.Leaves += " (" + lvl + " % interval " + Day(d.LeavesLo) + " to " + Day(d.LeavesHi) + ")."
		} else {
			d.Leaves += " (the trend is too uncertain to bound that date)."
		}
	} else if r.Status == fitcore.DriftDrifting {
		if limits {
			d.Leaves = "The trend does not head towards an acceptance limit of the " + which + "."
		} else {
			d.Leaves = "No acceptance limits are set on the " + which + ", so no date of leaving them is projected."
		}
	}
	return d
}

// driftP is the rate's p in words: "p = 0.012", or "p ≤ 0.0010" when
// it is only a bound (fitcore.DriftResult.PBound: no simulated history
// reached the observed one).
func driftP(r *fitcore.DriftResult) string {
	if r.PBound {
		return "p ≤ " + numfmt.P(r.P)
	}
	return numfmt.PEq(r.P)
}

// wordStep words a step (fitcore.DriftShifted): where, by how much, and
// what to do; no date of leaving a limit is projected from it.
func wordStep(d Drift, name string, r *fitcore.DriftResult, unit string, days []time.Time) Drift {
	st := r.Step
	d.P = st.P
	d.StepFrom, d.StepTo = days[st.Before], days[st.After]
	d.Before, d.After, d.Step, d.StepSE, d.StepP = st.LevelBefore, st.LevelAfter, st.Size, st.SizeSE, st.P
	u := unitSuffix(unit)
	sig := numfmt.Precision(0)
	before, _ := numfmt.Estimate(st.LevelBefore, st.LevelBeforeSE, sig)
	after, _ := numfmt.Estimate(st.LevelAfter, st.LevelAfterSE, sig)
	size, sizeSE := numfmt.Estimate(st.Size, st.SizeSE, sig)
	if st.Size > 0 {
		size = "+" + size
	}
	between := "between " + Day(d.StepFrom) + " and " + Day(d.StepTo)
	d.Text = name + " shifted once, " + between + ", by " + size + " ± " + sizeSE + u +
		" (level before " + before + u + ", after " + after + u + "; " + numfmt.PEq(st.P) +
		" for no step, allowing for the " + strconv.Itoa(st.Splits) + " places looked at), over " + strconv.Itoa(r.N) +
		" accepted calibrations. This is a jump, not a steady drift, so no date of leaving a limit is projected."
	d.StepAlert = "Step: the " + d.Which + " of this instrument jumped " + between +
		" and was level before and after. Find what changed then (a repair, an adjustment, a new sensor or a new batch of standards), " +
		"check the calibrations since against the instrument maker's procedure, and do not plan for steady wear."
	return d
}

// VerdictWord is a calibration's verdict (history.Accepted, NotAccepted,
// NoFit, Superseded) in words.
func VerdictWord(v string) string {
	switch v {
	case history.Accepted:
		return "accepted"
	case history.NotAccepted:
		return "not accepted"
	case history.NoFit:
		return "no line"
	}
	return "earlier revision"
}

// ChangeWord is fitcore's verdict on a calibration against the previous
// accepted one (fitcore.LinesSame, LinesSlopeChanged, LinesMoved) in words.
func ChangeWord(v string) string {
	switch v {
	case fitcore.LinesSame:
		return "same line"
	case fitcore.LinesSlopeChanged:
		return "slope changed"
	}
	return "line moved"
}

// DriftWord is a trend's status (fitcore.DriftTooFew, DriftSteady,
// DriftDrifting, DriftShifted, or "not fitted: …") in words.
func DriftWord(status string) string {
	switch {
	case status == fitcore.DriftSteady:
		return "no drift shown"
	case status == fitcore.DriftDrifting:
		return "drifting"
	case status == fitcore.DriftShifted:
		return "shifted once"
	case status == fitcore.DriftTooFew:
		return "too few calibrations"
	}
	return "not worked out"
}

// plural is "1 day", "3 days".
func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// PercentOfValue is a converted value's difference in percent of the value
// at which it is taken, 100·Diff/X (NaN at X = 0): how the app, the
// history page and the command word a change, so that all three give the
// same percent. (fitcore's XDifference.Percent is of the span of x.)
func PercentOfValue(d fitcore.XDifference) float64 {
	if d.X == 0 {
		return math.NaN()
	}
	return 100 * d.Diff / d.X
}

// CopiesText says how many extra copies of calibrations are not counted
// again (history.Instrument.Duplicates: a file imported twice, a session
// kept with "Keep both"), "" for none; the app, the history page and the
// command's text say it in these words.
func CopiesText(dup int) string {
	if dup <= 0 {
		return ""
	}
	return plural(dup, "extra copy", "extra copies") + " of a calibration (imported again, or kept with “Keep both”) not counted again"
}

// RevisionsText says how many earlier revisions of changed records are
// kept apart, "" for none.
func RevisionsText(sup int) string {
	if sup <= 0 {
		return ""
	}
	return plural(sup, "earlier revision", "earlier revisions") + " of changed records kept apart, not counted"
}
