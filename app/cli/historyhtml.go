package cli

import (
	"bufio"
	"errors"
	"fmt"
	"html"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"pairline/app/history"
	"pairline/app/history/view"
	"pairline/app/numfmt"
	"pairline/app/plot"
	"pairline/app/wording"
	"pairline/fitcore"
	"pairline/web"
)

// The page `pairline history --html OUT` writes: one self-contained HTML
// file (inline CSS from web/report.css plus historyCSS, inline SVG drawn by
// app/plot, no script, nothing loaded from anywhere: its
// Content-Security-Policy forbids it too). Every text read from a file goes
// through hx (HTML escaping after wording.Visible). Numbers shown carry
// their full precision in data-value; elements a test reads carry a
// data-testid starting "hfile-" (listed in README.md).

// historyCSS is what the history page adds to web/report.css.
const historyCSS = `
.hf-toc { width: 100%; }
.hf-toc a { color: #0b4f5c; font-weight: 600; }
.hf-state { display: inline-block; font-weight: 700; padding: 1px 8px; border-radius: 4px; border: 2px solid currentColor; white-space: nowrap; }
.hf-state-overdue { color: #9b1c1c; background: #fde8e8; }
.hf-state-due { color: #14532d; }
.hf-state-unknown { color: #3a434b; }
.hf-inst { margin-top: 26px; padding-top: 8px; border-top: 4px solid #0b4f5c; }
.hf-inst > h2 { border-bottom: 0; font-size: 1.3rem; overflow-wrap: anywhere; }
.hf-facts { margin: 4px 0 8px; padding: 0; list-style: none; }
.hf-facts li { margin: 2px 0; overflow-wrap: anywhere; }
.hf-alert { padding: 8px 10px; border-left: 6px solid #9b1c1c; background: #fde8e8; margin: 8px 0; }
.hf-calm { padding: 8px 10px; border-left: 6px solid #14532d; background: #eef6f0; margin: 8px 0; }
.hf-note { padding: 8px 10px; border-left: 6px solid #7a4a00; background: #fffbea; margin: 8px 0; }
.hf-superseded td { color: #3a434b; background: #f1efe9; }
.hf-skipped td:first-child { font-family: ui-monospace, monospace; font-size: 0.85em; width: 40%; }
.hf-inst .pl-rt td { overflow-wrap: break-word; }
.hf-sig { white-space: nowrap; }
.hf-cal td:nth-child(2) { font-size: 0.88em; }
@media (min-width: 641px) { .hf-cal td:last-child, .hf-cal td:nth-child(2) { min-width: 8.5em; } }
.hf-legend { font-size: 0.85rem; color: #3a434b; margin: 2px 0 0; }
@media (max-width: 640px) { .hf-inst > h2 { font-size: 1.1rem; } }
`

// hx escapes text from a file for the page: control and bidirectional
// characters become visible escapes (wording.Visible), then the markup
// characters are escaped (html.EscapeString escapes < > & ' ").
func hx(s string) string { return html.EscapeString(wording.Visible(s)) }

// hnum is a shown number with its full value in data-value.
func hnum(v float64, shown string) string {
	return `<span class="pl-rnum" data-value="` + numfmt.Full(v) + `">` + html.EscapeString(shown) + `</span>`
}

// hunit writes " unit" after a number, or nothing.
func hunit(u string) string {
	if strings.TrimSpace(u) == "" {
		return ""
	}
	return "\u00a0" + hx(u)
}

// hdays is a date shown on the page.
func hday(t time.Time) string {
	if t.IsZero() {
		return "—"
	}
	return `<span class="pl-rt-when">` + day(t) + `</span>`
}

// hpm writes an estimate ± its standard uncertainty rounded to it
// (numfmt.Estimate), the estimate's and the uncertainty's full values in
// data-value and data-se.
func hpm(v, se float64) string {
	vs, us := numfmt.Estimate(v, se, 6)
	return `<span class="pl-rnum" data-value="` + numfmt.Full(v) + `" data-se="` + numfmt.Full(se) + `">` +
		html.EscapeString(vs) + " ± " + html.EscapeString(us) + `</span>`
}

// htmlPage is what the page needs besides the instruments.
type htmlPage struct {
	Now       time.Time
	Files     int
	Skipped   []skippedFile
	Opt       history.Options
	Filter    string // --instrument, "" = all
	Instances []history.Instrument
}

// historyHTML writes the page to w, one instrument at a time.
func historyHTML(w io.Writer, p htmlPage) error {
	bw := bufio.NewWriterSize(w, 1<<16)
	var b strings.Builder
	nsess := 0
	for _, in := range p.Instances {
		nsess += len(in.Entries)
	}
	b.WriteString("<!doctype html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">" +
		"<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">" +
		"<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'\">" +
		"<meta name=\"referrer\" content=\"no-referrer\">" +
		"<title>Pairline instrument history</title><style>\n" + web.ReportCSS + historyCSS + "</style></head>\n" +
		"<body class=\"pl-report-file\">\n<main class=\"pl-report\" data-testid=\"hfile-page\">\n")
	b.WriteString(`<p class="pl-report-kicker">Pairline · instrument history</p><h1>Calibration history by instrument</h1>`)
	fmt.Fprintf(&b, `<p class="pl-report-when">Made %s UTC from %s: %s of %s`,
		p.Now.UTC().Format("2006-01-02 15:04"), count(p.Files, "file"), count(nsess, "session"), count(len(p.Instances), "instrument"))
	if p.Filter != "" {
		b.WriteString(" (only the instrument " + hx(p.Filter) + ")")
	}
	if len(p.Skipped) > 0 {
		fmt.Fprintf(&b, `; <a href="#skipped">%s skipped</a>`, count(len(p.Skipped), "file"))
	}
	b.WriteString(".</p>\n")
	writeCaution(&b)
	writeTOC(&b, p)
	if _, err := bw.WriteString(b.String()); err != nil {
		return err
	}
	for i := range p.Instances {
		b.Reset()
		writeInstrument(&b, i, &p.Instances[i], p)
		if _, err := bw.WriteString(b.String()); err != nil {
			return err
		}
	}
	b.Reset()
	writeSkipped(&b, p.Skipped)
	b.WriteString(`<p class="pl-report-foot">Written by <code>pairline history --html</code>. Slopes and intercepts are each session's own fit with its own settings and its own intervals; the comparisons refit both sessions' readings by ordinary least squares. Rates are per year of 365.25 days; a month is a twelfth of it.</p>` + "\n")
	b.WriteString("</main>\n</body></html>\n")
	if _, err := bw.WriteString(b.String()); err != nil {
		return err
	}
	return bw.Flush()
}

func writeCaution(b *strings.Builder) {
	b.WriteString(`<section class="pl-report-sec pl-report-caution" data-testid="hfile-caution"><h2>Caution</h2>` +
		`<p>The comparisons and trends on this page are statistical signals about the readings given, not a certification ` +
		`and not a decision to take an instrument out of service or back into it. For instruments whose results feed ` +
		`safety decisions — drinking water and other regulated measurements, gas detection, structural loads — follow ` +
		`the instrument maker's calibration procedure, your local codes and standards, and the judgement of licensed ` +
		`or accredited staff.</p></section>` + "\n")
}

// lastAccepted returns the last accepted entry, or nil.
func lastAccepted(in *history.Instrument) *history.Entry {
	for i := len(in.Entries) - 1; i >= 0; i-- {
		if in.Entries[i].Verdict == history.Accepted {
			return &in.Entries[i]
		}
	}
	return nil
}

// dueState is "overdue", "due" or "unknown".
func dueState(in *history.Instrument) string {
	switch {
	case in.Due.IsZero():
		return "unknown"
	case in.Overdue:
		return "overdue"
	}
	return "due"
}

func instName(in *history.Instrument) string {
	if in.Key == "" {
		return "(no instrument named)"
	}
	return in.Key
}

func writeTOC(b *strings.Builder, p htmlPage) {
	if len(p.Instances) == 0 {
		b.WriteString(`<p class="hf-note" data-testid="hfile-empty">No calibration records were found in the files given.</p>` + "\n")
		return
	}
	b.WriteString(`<section class="pl-report-sec"><h2>Instruments</h2><div class="pl-rt-wrap"><table class="pl-rt pl-rt-stack hf-toc" data-testid="hfile-toc">` +
		`<thead><tr><th>Instrument</th><th>Sessions</th><th>Last accepted</th><th>Last change</th><th>Slope trend</th><th>Next calibration</th></tr></thead><tbody>`)
	for i := range p.Instances {
		in := &p.Instances[i]
		fmt.Fprintf(b, `<tr data-testid="hfile-toc-row" data-key="%s"><td data-label="Instrument"><a href="#inst-%d">%s</a></td><td data-label="Sessions">%d</td><td data-label="Last accepted">`,
			hx(in.Key), i+1, hx(instName(in)), len(in.Entries))
		if la := lastAccepted(in); la != nil {
			b.WriteString(hday(la.Taken))
		} else {
			b.WriteString("none")
		}
		b.WriteString(`</td><td data-label="Last change">`)
		if n := len(in.Changes); n > 0 {
			b.WriteString(changeVerdict(in.Changes[n-1].Verdict))
		} else {
			b.WriteString("—")
		}
		b.WriteString(`</td><td data-label="Slope trend">` + driftVerdict(in.SlopeDrift.Status) + `</td><td data-label="Next calibration">` + dueBadge(in, p.Now) + "</td></tr>")
	}
	b.WriteString("</tbody></table></div></section>\n")
}

func changeVerdict(v string) string {
	cls := "pl-rv-fail"
	if v == fitcore.LinesSame {
		cls = "pl-rv-pass"
	}
	return `<span class="pl-rv ` + cls + `" data-verdict="` + hx(v) + `">` + hx(view.ChangeWord(v)) + `</span>`
}

func driftVerdict(status string) string {
	cls := "pl-rv-na"
	switch status {
	case fitcore.DriftDrifting, fitcore.DriftShifted:
		cls = "pl-rv-fail"
	case fitcore.DriftSteady:
		cls = "pl-rv-pass"
	}
	return `<span class="pl-rv ` + cls + `" data-verdict="` + hx(status) + `">` + hx(view.DriftWord(status)) + `</span>`
}

// dueBadge is the due mark of the table of contents, in the words of the
// app's instrument list (view.DueOf).
func dueBadge(in *history.Instrument, now time.Time) string {
	m := view.DueOf(*in, 0, now)
	switch dueState(in) {
	case "overdue":
		return `<span class="hf-state hf-state-overdue" data-state="overdue" data-value="` + day(in.Due) + `">` + hx(m.Text) + `</span>`
	case "due":
		return `<span class="hf-state hf-state-due" data-state="due" data-value="` + day(in.Due) + `">` + hx(m.Text) + `</span>`
	}
	return `<span class="hf-state hf-state-unknown" data-state="unknown">no due date</span>`
}

// units of the instrument: those of its latest session that names them.
type instUnits struct{ xName, xUnit, yName, yUnit, desc, serial string }

func unitsOf(in *history.Instrument) instUnits {
	var u instUnits
	for i := len(in.Entries) - 1; i >= 0; i-- {
		e := &in.Entries[i]
		if u.xUnit == "" && e.XUnit != "" {
			u.xUnit = e.XUnit
		}
		if u.yUnit == "" && e.YUnit != "" {
			u.yUnit = e.YUnit
		}
		if u.xName == "" && e.XName != "" {
			u.xName = e.XName
		}
		if u.yName == "" && e.YName != "" {
			u.yName = e.YName
		}
		if u.desc == "" && e.Description != "" {
			u.desc = e.Description
		}
		if u.serial == "" && e.Serial != "" {
			u.serial = e.Serial
		}
	}
	return u
}

func nameWithUnit(name, unit, def string) string {
	if strings.TrimSpace(name) == "" {
		name = def
	}
	if strings.TrimSpace(unit) != "" {
		name += " (" + unit + ")"
	}
	return name
}

func writeInstrument(b *strings.Builder, i int, in *history.Instrument, p htmlPage) {
	u := unitsOf(in)
	slopeUnit := wording.SlopeUnit(u.yUnit, u.xUnit)
	fmt.Fprintf(b, `<section class="hf-inst" id="inst-%d" data-testid="hfile-instrument" data-key="%s" data-due-state="%s" data-slope-drift="%s" data-intercept-drift="%s">`,
		i+1, hx(in.Key), dueState(in), hx(in.SlopeDrift.Status), hx(in.InterceptDrift.Status))
	b.WriteString(`<h2>` + hx(instName(in)) + `</h2><ul class="hf-facts">`)
	if u.desc != "" && u.desc != in.Key {
		b.WriteString(`<li>` + hx(u.desc) + `</li>`)
	}
	if u.serial != "" && u.serial != in.Key {
		b.WriteString(`<li>Serial ` + hx(u.serial) + `</li>`)
	}
	b.WriteString(`<li>x: ` + hx(nameWithUnit(u.xName, u.xUnit, "x")) + `; y: ` + hx(nameWithUnit(u.yName, u.yUnit, "y")) + `; slope in ` + hx(slopeUnit) + `</li>`)
	fmt.Fprintf(b, `<li>%d sessions`, len(in.Entries))
	if in.Duplicates > 0 {
		b.WriteString(` (` + hx(view.CopiesText(in.Duplicates)) + `)`)
	}
	b.WriteString(`</li></ul>`)
	it := view.Word(*in, p.Now, limitsOf(p.Opt))
	writeDue(b, in, it)
	writeCalibrations(b, in)
	writeToday(b, it)
	writeChanges(b, in, u)
	writeDrift(b, in, it, p.Opt)
	writeCharts(b, i, in, p.Opt, slopeUnit, u)
	b.WriteString("</section>\n")
}

// limitsOf is the command's limits (--slope-limits, --intercept-limits) as
// the view takes them.
func limitsOf(o history.Options) view.Limits {
	return view.Limits{SlopeLow: o.SlopeLow, SlopeHigh: o.SlopeHigh, InterceptLow: o.InterceptLow, InterceptHigh: o.InterceptHigh}
}

// writeDue says when the instrument is next due, in the words of the app's
// instrument view (view.Item.Due), and the interval the date comes from.
func writeDue(b *strings.Builder, in *history.Instrument, it view.Item) {
	la := lastAccepted(in)
	m := it.Due
	switch dueState(in) {
	case "overdue":
		fmt.Fprintf(b, `<p class="hf-alert" data-testid="hfile-due" data-state="overdue" data-value="%s" data-days="%d"><strong>%s.</strong> The due date is %d days after the last accepted calibration (%s).</p>`,
			day(in.Due), -m.Days, hx(m.Text), dayCount(la, in.Due), hday(la.Taken))
	case "due":
		fmt.Fprintf(b, `<p class="hf-calm" data-testid="hfile-due" data-state="due" data-value="%s" data-days="%d"><strong>%s.</strong> The due date is %d days after the last accepted calibration (%s).</p>`,
			day(in.Due), m.Days, hx(m.Text), dayCount(la, in.Due), hday(la.Taken))
	default:
		b.WriteString(`<p class="hf-note" data-testid="hfile-due" data-state="unknown">` + hx(m.Text))
		if la != nil {
			b.WriteString(` Give <code>--interval DAYS</code> for one.`)
		}
		b.WriteString(`</p>`)
	}
}

// dayCount is the interval used: days from the last accepted calibration to
// the due day.
func dayCount(la *history.Entry, due time.Time) int {
	if la == nil {
		return 0
	}
	return int(math.Round(due.Sub(la.Taken).Hours() / 24))
}

func verdictClass(v string) string {
	switch v {
	case history.Accepted:
		return "pl-rv-pass"
	case history.NotAccepted:
		return "pl-rv-fail"
	}
	return "pl-rv-na"
}

func writeCalibrations(b *strings.Builder, in *history.Instrument) {
	b.WriteString(`<h3>Calibrations</h3><p class="pl-report-small">In time order of the day the readings were taken. u is the standard uncertainty; each estimate is rounded to the place of its uncertainty's second digit (GUM, JCGM 100:2008 §7.2.6).</p>` +
		`<div class="pl-rt-wrap"><table class="pl-rt pl-rt-stack hf-cal" data-testid="hfile-calibrations">` +
		`<thead><tr><th>Taken</th><th>Session</th><th>Slope ± u</th><th>Intercept ± u</th><th>R²</th><th>Verdict</th><th>Signed</th></tr></thead><tbody>`)
	for i := range in.Entries {
		e := &in.Entries[i]
		cls := ""
		if e.Verdict == history.Superseded {
			cls = ` class="hf-superseded"`
		}
		fmt.Fprintf(b, `<tr%s data-testid="hfile-session" data-id="%s" data-verdict="%s"><td data-label="Taken">%s</td><td data-label="Session">%s`,
			cls, hx(e.ID), hx(e.Verdict), hday(e.Taken), hx(e.Title))
		b.WriteString(`<br><span class="pl-report-digest">` + hx(shortID(e.ID)) + `</span>`)
		if e.Revision > 0 {
			fmt.Fprintf(b, ` <span class="pl-report-small hf-sig">rev. %d</span>`, e.Revision)
		}
		b.WriteString(`</td>`)
		if e.Fitted {
			b.WriteString(`<td data-label="Slope">` + hpm(e.Slope, e.SlopeSE) + `</td><td data-label="Intercept">` + hpm(e.Intercept, e.InterceptSE) +
				`</td><td data-label="R²">` + hnum(e.RSquared, numfmt.Decimals(e.RSquared, 4)) + `</td>`)
		} else {
			b.WriteString(`<td data-label="Slope">—</td><td data-label="Intercept">—</td><td data-label="R²">—</td>`)
		}
		b.WriteString(`<td data-label="Verdict"><span class="pl-rv ` + verdictClass(e.Verdict) + `">` + hx(view.VerdictWord(e.Verdict)) + `</span>`)
		if e.Reason != "" && e.Verdict != history.Accepted {
			b.WriteString(`<br><span class="pl-report-small">` + hx(oneLine(e.Reason)) + `</span>`)
		}
		b.WriteString(`</td><td data-label="Signed">`)
		switch {
		case e.PerformedBy != "":
			b.WriteString(`<span class="pl-report-small">performed by</span><br>` + hx(e.PerformedBy))
			if e.ReviewedBy != "" {
				b.WriteString(`<br><span class="pl-report-small">reviewed by</span><br>` + hx(e.ReviewedBy))
			} else {
				b.WriteString(`<br><span class="pl-report-small">not reviewed</span>`)
			}
		default:
			b.WriteString(`not signed`)
			if e.Operator != "" {
				b.WriteString(`<br><span class="pl-report-small">operator ` + hx(e.Operator) + `</span>`)
			}
		}
		b.WriteString("</td></tr>")
	}
	b.WriteString("</tbody></table></div>")
}

// shortID is the first 8 characters of a session ID (as typed IDs are 32
// hex digits; one from a foreign file may be anything).
func shortID(id string) string {
	r := []rune(id)
	if len(r) > 8 {
		return string(r[:8]) + "…"
	}
	return id
}

// acceptedByID indexes the accepted entries by session ID (one each: the
// other copies of an ID are earlier revisions), so that the comparisons
// find their two calibrations in linear time.
func acceptedByID(in *history.Instrument) map[string]*history.Entry {
	m := make(map[string]*history.Entry, len(in.Entries))
	for i := range in.Entries {
		if in.Entries[i].Verdict == history.Accepted {
			m[in.Entries[i].ID] = &in.Entries[i]
		}
	}
	return m
}

// hdayOf is hday of an entry's day, "—" without an entry.
func hdayOf(e *history.Entry) string {
	if e == nil {
		return "—"
	}
	return hday(e.Taken)
}

// xdiff writes one difference of converted values: units and % of the
// value there (view.PercentOfValue, as the app words it; none at x = 0).
func xdiff(d fitcore.XDifference, xUnit string) string {
	p := view.PercentOfValue(d)
	pct := ""
	if !math.IsNaN(p) {
		pct = `<br><span class="pl-report-small">` + hnum(p, signed(p, 2)) + "\u00a0%</span>"
	}
	return `<span class="pl-rnum" data-value="` + numfmt.Full(d.Diff) + `" data-x="` + numfmt.Full(d.X) + `" data-percent="` + numfmt.Full(p) + `">` +
		html.EscapeString(signed(d.Diff, 3)) + `</span>` + hunit(xUnit) + pct
}

// signed is numfmt.Sig with an explicit "+" for positive values.
func signed(v float64, sig int) string {
	s := numfmt.Sig(v, sig)
	if v > 0 {
		return "+" + s
	}
	return s
}

// writeToday says how the newest calibration with a line compares with the
// last accepted one before it, in the words of the app's instrument view
// (view.Item.Compare), each figure's full value in data attributes.
func writeToday(b *strings.Builder, it view.Item) {
	k := it.Compare
	if k == nil {
		b.WriteString(`<p class="hf-note" data-testid="hfile-today">` + hx(it.CompareWhy) + `</p>`)
		return
	}
	cls := "hf-calm"
	if k.Verdict != fitcore.LinesSame {
		cls = "hf-alert"
	}
	fmt.Fprintf(b, `<div class="%s" data-testid="hfile-today" data-verdict="%s" data-today="%s" data-previous="%s"><p><strong>Latest calibration (%s) against the last accepted one before it (%s)</strong></p>`,
		cls, hx(k.Verdict), hx(k.Today), hx(k.Previous), hx(k.TodayDate), hx(k.PreviousDate))
	b.WriteString(`<p data-testid="hfile-today-headline">` + hx(k.Headline) + `</p><ul class="hf-facts">`)
	fmt.Fprintf(b, `<li data-testid="hfile-today-slopes" data-f="%s" data-p="%s">%s</li>`, numfmt.Full(k.FSlopes), numfmt.Full(k.PSlopes), hx(k.Slopes))
	fmt.Fprintf(b, `<li data-testid="hfile-today-coincident" data-f="%s" data-p="%s">%s</li>`, numfmt.Full(k.FCoincident), numfmt.Full(k.PCoincident), hx(k.Coincident))
	for _, d := range k.Diffs {
		fmt.Fprintf(b, `<li data-testid="hfile-today-%s" data-value="%s" data-diff="%s" data-x="%s">%s</li>`,
			d.Where, numfmt.Full(d.Percent), numfmt.Full(d.Diff), numfmt.Full(d.X), hx(d.Text))
	}
	b.WriteString(`</ul></div>`)
}

func writeChanges(b *strings.Builder, in *history.Instrument, u instUnits) {
	if len(in.Changes) == 0 {
		return
	}
	b.WriteString(`<h3>Each accepted calibration against the previous accepted one</h3>` +
		`<p class="pl-report-small">Equal slopes: separate lines against a common slope, F(1, df). One common line: separate lines against one line through both, F(2, df). A change is claimed at p &lt; 0.01. The differences are the value today's response at that x converts to with the previous line, minus x, in the unit of x and in % of that x (as the app says it).</p>` +
		`<div class="pl-rt-wrap"><table class="pl-rt pl-rt-stack" data-testid="hfile-changes"><thead><tr><th>Calibration</th><th>Equal slopes</th><th>One common line</th><th>Verdict</th><th>At the middle (x; % of x)</th><th>At the top (x; % of x)</th></tr></thead><tbody>`)
	acc := acceptedByID(in)
	for _, c := range in.Changes {
		cur, prev := acc[c.Session], acc[c.Previous]
		fmt.Fprintf(b, `<tr data-testid="hfile-change" data-session="%s" data-previous="%s" data-verdict="%s"><td data-label="Calibration">%s<br><span class="pl-report-small">against</span> %s</td>`,
			hx(c.Session), hx(c.Previous), hx(c.Verdict), hdayOf(cur), hdayOf(prev))
		fmt.Fprintf(b, `<td data-label="Equal slopes"><span class="hf-sig">F(1, %d) = %s</span><br>%s</td>`, c.DF2Slopes, hnum(c.FSlopes, numfmt.Sig(c.FSlopes, 3)), pnum(c.PSlopes))
		fmt.Fprintf(b, `<td data-label="One common line"><span class="hf-sig">F(2, %d) = %s</span><br>%s</td>`, c.DF2Coincident, hnum(c.FCoincident, numfmt.Sig(c.FCoincident, 3)), pnum(c.PCoincident))
		b.WriteString(`<td data-label="Verdict">` + changeVerdict(c.Verdict) + `</td>`)
		b.WriteString(`<td data-label="Middle, x = ` + html.EscapeString(numfmt.Short(c.Middle.X, 6)) + `">` + xdiff(c.Middle, u.xUnit) + `</td>`)
		b.WriteString(`<td data-label="Top, x = ` + html.EscapeString(numfmt.Short(c.Top.X, 6)) + `">` + xdiff(c.Top, u.xUnit) + `</td></tr>`)
	}
	b.WriteString("</tbody></table></div>")
}

// pnum is "p = 0.012" with the full p in data-value.
func pnum(p float64) string {
	s := wording.P(p)
	if strings.HasPrefix(s, "<") || strings.HasPrefix(s, ">") {
		return `<span class="hf-sig">p ` + hnum(p, s) + `</span>`
	}
	return `<span class="hf-sig">p = ` + hnum(p, s) + `</span>`
}

func levelPct(l float64) string {
	if l == 0 {
		l = fitcore.DefaultLevel
	}
	return strconv.FormatFloat(100*l, 'g', -1, 64) + "\u00a0%"
}

// writeDrift says what the trend of the slope and the intercept is, in the
// words of the app's instrument view (view.Item.Drift); the figures of
// fitcore's rate per year in data attributes.
func writeDrift(b *strings.Builder, in *history.Instrument, it view.Item, opt history.Options) {
	b.WriteString(`<h3>Drift</h3>`)
	lim := limitsOf(opt)
	for i, r := range []*fitcore.DriftResult{in.SlopeDrift, in.InterceptDrift} {
		d := it.Drift[i]
		fmt.Fprintf(b, `<p class="%s" data-testid="hfile-drift-%s" data-verdict="%s" data-n="%d"`, driftClass(r.Status), d.Which, hx(r.Status), r.N)
		if r.Status == fitcore.DriftSteady || r.Status == fitcore.DriftDrifting {
			fmt.Fprintf(b, ` data-value="%s" data-low="%s" data-high="%s" data-p="%s" data-per-month="%s"`,
				numfmt.Full(r.Rate), numfmt.Full(r.RateLow), numfmt.Full(r.RateHigh), numfmt.Full(r.P), numfmt.Full(d.PerMonth))
		}
		if st := r.Step; r.Status == fitcore.DriftShifted && st != nil {
			fmt.Fprintf(b, ` data-step-from="%s" data-step-to="%s" data-step="%s" data-step-se="%s" data-before="%s" data-after="%s" data-p="%s"`,
				day(d.StepFrom), day(d.StepTo), numfmt.Full(st.Size), numfmt.Full(st.SizeSE), numfmt.Full(st.LevelBefore), numfmt.Full(st.LevelAfter), numfmt.Full(st.P))
		}
		b.WriteString(`>` + hx(d.Text))
		if d.StepAlert != "" {
			b.WriteString(` <strong data-testid="hfile-shift">` + hx(d.StepAlert) + `</strong>`)
		}
		switch {
		case !d.LeavesAt.IsZero():
			fmt.Fprintf(b, ` <span data-testid="hfile-leaves" data-which="%s" data-value="%s"`, d.Which, day(d.LeavesAt))
			if d.Bounded {
				fmt.Fprintf(b, ` data-low="%s" data-high="%s"`, day(d.LeavesLo), day(d.LeavesHi))
			}
			b.WriteString(`><strong>` + hx(d.Leaves) + `</strong></span>`)
		case d.Leaves != "":
			b.WriteString(` ` + hx(d.Leaves))
			if !lim.Set(d.Which) {
				fmt.Fprintf(b, ` Give <code>--%s-limits</code> for one.`, d.Which)
			}
		}
		b.WriteString(`</p>`)
	}
}

func titleCase(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

func driftClass(status string) string {
	switch status {
	case fitcore.DriftDrifting, fitcore.DriftShifted:
		return "hf-alert"
	case fitcore.DriftSteady:
		return "hf-calm"
	}
	return "hf-note"
}

// writeCharts draws slope and intercept against time: accepted
// calibrations as dots with their intervals, not accepted ones as hollow
// squares, the fitted trend (over the accepted ones) as a line, and the
// limits given as dashed lines. x is days since the first calibration.
func writeCharts(b *strings.Builder, i int, in *history.Instrument, opt history.Options, slopeUnit string, u instUnits) {
	var t0 time.Time
	for k := range in.Entries {
		if in.Entries[k].Verdict != history.Superseded && in.Entries[k].Fitted {
			t0 = in.Entries[k].Taken
			break
		}
	}
	if t0.IsZero() {
		return
	}
	b.WriteString(`<div class="pl-report-plotgrid">`)
	limits, projected, stepped := false, false, false
	for _, c := range []struct {
		name, title string
		val         func(e *history.Entry) (v, lo, hi float64)
		r           *fitcore.DriftResult
		low, high   *float64
	}{
		{"slope", "Slope (" + slopeUnit + ")", func(e *history.Entry) (float64, float64, float64) { return e.Slope, e.SlopeLow, e.SlopeHigh },
			in.SlopeDrift, opt.SlopeLow, opt.SlopeHigh},
		{"intercept", nameWithUnit("Intercept", u.yUnit, ""), func(e *history.Entry) (float64, float64, float64) {
			return e.Intercept, e.InterceptLow, e.InterceptHigh
		}, in.InterceptDrift, opt.InterceptLow, opt.InterceptHigh},
	} {
		ch := &plot.Chart{
			TestID: fmt.Sprintf("hfile-chart-%s-%d", c.name, i+1),
			XTitle: "days since " + day(t0),
			YTitle: wording.Visible(c.title),
			Label: fmt.Sprintf("%s of %s against time: each calibration with its interval, the fitted trend (%s) and the limits given.",
				titleCase(c.name), wording.Visible(instName(in)), c.r.Status),
		}
		if c.r.Status == fitcore.DriftShifted {
			ch.Label = fmt.Sprintf("%s of %s against time: each calibration with its interval, the levels before and after a step, and the limits given.",
				titleCase(c.name), wording.Visible(instName(in)))
		}
		tmax, nacc, nrej := chartCalibrations(ch, in, t0, c.val)
		st, pr := chartTrend(ch, c.r, in.Origin.Sub(t0).Hours()/24, tmax)
		stepped, projected = stepped || st, projected || pr
		for _, l := range []*float64{c.low, c.high} {
			if l != nil {
				ch.HLines = append(ch.HLines, *l)
			}
		}
		ch.Attrs = [][2]string{{"data-accepted", strconv.Itoa(nacc)}, {"data-not-accepted", strconv.Itoa(nrej)}}
		svg := strings.Replace(ch.SVG(), ` xmlns="http://www.w3.org/2000/svg"`, "", 1)
		fmt.Fprintf(b, `<figure class="pl-report-plot"><figcaption>%s against time</figcaption>%s</figure>`, hx(titleCase(c.name)), svg)
		limits = limits || len(ch.HLines) > 0
	}
	b.WriteString(`</div><p class="hf-legend">Dots: accepted calibrations, each with its own ` + levelPct(firstLevel(in)) +
		` interval; hollow squares: calibrations not accepted; solid line: the fitted trend over the accepted ones`)
	if stepped {
		b.WriteString(`; where a step is found, the solid lines are the levels before and after it, not a trend`)
	}
	if projected {
		b.WriteString(`; dotted line: the trend carried on to the limit it is projected to leave`)
	}
	if limits {
		b.WriteString(`; dashed lines: the limits given`)
	}
	b.WriteString(`.</p>`)
}

// chartCalibrations adds each calibration of in to ch at its day since t0:
// accepted ones as dots, others as hollow squares, each with its interval
// (val gives the value and its interval). It returns the last day and how
// many were and were not accepted.
func chartCalibrations(ch *plot.Chart, in *history.Instrument, t0 time.Time, val func(e *history.Entry) (v, lo, hi float64)) (tmax float64, nacc, nrej int) {
	for k := range in.Entries {
		e := &in.Entries[k]
		if e.Verdict == history.Superseded || !e.Fitted {
			continue
		}
		x := e.Taken.Sub(t0).Hours() / 24
		tmax = math.Max(tmax, x)
		v, lo, hi := val(e)
		mk := plot.Dot
		if e.Verdict != history.Accepted {
			mk = plot.HollowSquare
			nrej++
		} else {
			nacc++
		}
		ch.Points = append(ch.Points, plot.Point{X: x, Y: v, Row: k, Marker: mk})
		ch.Paths = append(ch.Paths, plot.Path{X: []float64{x, x}, Y: []float64{lo, hi}, Class: "hf-bar", Stroke: "#3a434b", Width: 1.6})
	}
	return tmax, nacc, nrej
}

// chartTrend draws what the drift of r found over days off (the drift's
// origin) to tmax: for a step the level before it and the level after, each
// over its own calibrations, and no line; otherwise the fitted trend and,
// for a drift, its projection to the limit when that falls within as long
// again as the calibrations span (at least half a year: a far one would
// squeeze the calibrations together). It says which it drew.
func chartTrend(ch *plot.Chart, r *fitcore.DriftResult, off, tmax float64) (stepped, projected bool) {
	switch {
	case r.Status == fitcore.DriftShifted && r.Step != nil:
		st := r.Step // t in years since the origin
		ch.Paths = append(ch.Paths,
			plot.Path{X: []float64{off, off + 365.25*st.From}, Y: []float64{st.LevelBefore, st.LevelBefore}, Class: "hf-trend", Stroke: "#0b4f5c", Width: 3},
			plot.Path{X: []float64{off + 365.25*st.To, tmax}, Y: []float64{st.LevelAfter, st.LevelAfter}, Class: "hf-trend", Stroke: "#0b4f5c", Width: 3})
		return true, false
	case r.Status == fitcore.DriftSteady || r.Status == fitcore.DriftDrifting:
		// v = a + r·t, t in years since the origin.
		var xs, ys []float64
		for _, x := range []float64{off, tmax} {
			t := (x - off) / 365.25
			xs, ys = append(xs, x), append(ys, r.Intercept+r.Rate*t)
		}
		ch.Paths = append(ch.Paths, plot.Path{X: xs, Y: ys, Class: "hf-trend", Stroke: "#0b4f5c", Width: 3})
		if r.Status == fitcore.DriftDrifting && r.Leaves != nil {
			xc := off + 365.25*r.Leaves.At
			if xc > tmax && xc-tmax <= math.Max(tmax-off, 183) {
				ch.Paths = append(ch.Paths, plot.Path{X: []float64{tmax, xc}, Y: []float64{ys[1], r.Leaves.Limit},
					Class: "hf-projection", Stroke: "#0b4f5c", Width: 2.5, Dash: "2 5"})
				return false, true
			}
		}
	}
	return false, false
}

// firstLevel is the level of the sessions' own intervals (the first that
// names one).
func firstLevel(in *history.Instrument) float64 {
	for _, e := range in.Entries {
		if e.Level > 0 {
			return e.Level
		}
	}
	return fitcore.DefaultLevel
}

func writeSkipped(b *strings.Builder, skipped []skippedFile) {
	if len(skipped) == 0 {
		return
	}
	fmt.Fprintf(b, `<section class="pl-report-sec" id="skipped"><h2>Files skipped (%d)</h2><p>These files could not be used and were left out; the rest of the page does not include them.</p>`+
		`<div class="pl-rt-wrap"><table class="pl-rt hf-skipped" data-testid="hfile-skipped"><thead><tr><th>File</th><th>Why</th></tr></thead><tbody>`, len(skipped))
	for _, s := range skipped {
		b.WriteString(`<tr data-testid="hfile-skipped-file"><td>` + hx(s.File) + `</td><td>` + hx(oneLine(s.Reason)) + `</td></tr>`)
	}
	b.WriteString("</tbody></table></div></section>\n")
}

// writeHistoryHTML writes the page to the file out ("-" = standard
// output): into a temporary file beside it, renamed over out when complete,
// so that a failed write never leaves a cut page behind.
func writeHistoryHTML(out string, stdout io.Writer, p htmlPage) error {
	if out == "-" {
		return historyHTML(stdout, p)
	}
	dir := filepath.Dir(out)
	tmp, err := os.CreateTemp(dir, ".pairline-history-*.html")
	if err != nil {
		return fmt.Errorf("cannot create a file in %s: %w", dir, unwrapPath(err))
	}
	werr := historyHTML(tmp, p)
	cerr := tmp.Close()
	if werr != nil || cerr != nil {
		os.Remove(tmp.Name())
		return errors.Join(werr, cerr)
	}
	if err := os.Chmod(tmp.Name(), 0o644); err != nil {
		os.Remove(tmp.Name())
		return err
	}
	if err := os.Rename(tmp.Name(), out); err != nil {
		os.Remove(tmp.Name())
		return unwrapPath(err)
	}
	return nil
}
