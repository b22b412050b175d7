package ui

import (
	_ "embed"
	"html"
	"pairline/web"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

// reportUI is the state of the printable report.
type reportUI struct {
	rpOpen bool
	rpMsg  string
	rpHTML string // the report body, built when the report is opened
	rpFor  *fitcore.Report
	rpAt   time.Time // when the report was prepared (its "Prepared" line)
	rpAll  bool      // every reading is listed on the screen ("show all" was pressed)

	rpPrintHook app.Func // the page's beforeprint listener (registered once)
}

// rpRowsAtOnce is how many readings the report lists on the screen when it
// opens; "show all" lists the rest, and printing or saving the report always
// lists every reading. The browser takes most of a second to lay out a
// table of 10,000 readings (DEVELOPERS.md, "Speed in the browser").
const rpRowsAtOnce = 500

// show builds the report from the controller's open session and report
// and shows it (the plots drawn by pl when they are of that report).
func (r *reportUI) show(ctx app.Context, k *controller, pl *plotsUI) {
	if k.sess == nil {
		return
	}
	r.rpOpen, r.rpMsg, r.rpAll, r.rpAt = true, "", false, time.Now()
	r.build(k, pl)
	r.listenPrint(k)
	if ctx.Src() != nil {
		ctx.Defer(func(ctx app.Context) { app.Window().Call("scrollTo", 0, 0) })
	}
}

// build builds the report's markup for the screen from the open session,
// with the plots the screen has drawn when they are of the same report.
func (r *reportUI) build(k *controller, pl *plotsUI) {
	v := rpView{shown: rpRowsAtOnce}
	if r.rpAll {
		v.shown = -1
	}
	v.plots = pl.forReport(k)
	counts := k.pairs.Count(k.sess)
	v.counts = &counts
	r.rpHTML = rpBodyView(k.sess, k.view.report, k.view.rows, k.view.message, r.rpAt, v)
	r.rpFor = k.view.report
}

// listenPrint makes every print of the page (the report's button, the
// browser's menu or keys) list every reading: the browser's beforeprint
// event comes before the page is laid out for paper, and the listener
// writes the readings the screen has not listed yet into the report.
// Registered once; natively (prerendering) there is no page.
func (r *reportUI) listenPrint(k *controller) {
	if r.rpPrintHook != nil || !app.Window().Get("document").Truthy() {
		return
	}
	r.rpPrintHook = app.FuncOf(func(this app.Value, args []app.Value) any {
		r.fillRest(k)
		return nil
	})
	app.Window().Call("addEventListener", "beforeprint", r.rpPrintHook)
}

// fillRest writes the readings the screen's report left out into its
// placeholder (data-from: the first session row not listed) and takes away
// the "show all" note. It changes only the inside of the report's markup,
// which go-app replaces as a whole when the report is built again.
func (r *reportUI) fillRest(k *controller) {
	if !r.rpOpen || k.sess == nil {
		return
	}
	doc := app.Window().Get("document")
	rest := doc.Call("querySelector", `[data-testid="report-readings-rest"]`)
	if !rest.Truthy() {
		return
	}
	from, err := strconv.Atoi(rest.Get("dataset").Get("from").String())
	if err != nil {
		return
	}
	var b rpB
	rpReadingRows(&b, k.sess, k.view.report, k.view.rows, from, len(k.sess.Readings))
	rest.Set("innerHTML", b.String())
	rest.Get("dataset").Set("from", strconv.Itoa(len(k.sess.Readings)))
	if more := doc.Call("querySelector", `[data-testid="report-readings-more"]`); more.Truthy() {
		more.Call("remove")
	}
}

// renderReport gathers the report dialog's data (reportdialog.go): the
// report's markup, built from the open session and fitcore's report, and
// the line of status under its buttons.
func (c *Shell) renderReport() app.UI {
	if c.ctl.sess != nil && c.rp.rpFor != c.ctl.view.report {
		// The session changed under an open report (another tab, a late
		// analysis): show the current state.
		c.rp.rpAt = time.Now()
		c.rp.build(c.ctl, &c.pl)
	}
	return &reportDialog{Body: c.rp.rpHTML, Msg: c.rp.rpMsg, OnAction: func(a ReportAction) {
		c.dispatch(func(ctx app.Context) { c.rp.apply(ctx, c.ctl, &c.pl, a) })
	}}
}

// apply makes the change of a: printing uses web/report.css's @media print
// rules (only the report is printed); saving downloads the report file;
// closing hides the dialog.
func (r *reportUI) apply(ctx app.Context, k *controller, pl *plotsUI, a ReportAction) {
	switch a.Kind {
	case rdPrint:
		if ctx.Src() != nil {
			app.Window().Call("print")
		}
	case rdSaveHTML:
		r.saveHTML(k, pl)
	case rdShowAll:
		r.rpAll = true
		r.build(k, pl)
	case rdClose:
		r.rpOpen = false
	}
}

// reportFile is the report as one self-contained HTML file: inline styles
// and SVG, no script, nothing loaded from anywhere.
func rpFile(s *session.Session, body string) string {
	return "<!doctype html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">" +
		"<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">" +
		"<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\">" +
		"<title>" + rpEsc("Pairline report — "+s.Title) + "</title><style>\n" + web.ReportCSS + "\n</style></head>\n<body class=\"pl-report-file\">\n" +
		body + "\n</body></html>\n"
}

// saveHTML downloads the report file.
func (r *reportUI) saveHTML(k *controller, pl *plotsUI) {
	if k.sess == nil {
		return
	}
	body := r.rpHTML
	if !r.rpAll && len(k.sess.Readings) > rpRowsAtOnce {
		// The screen lists the first readings only; the file lists every one.
		counts := k.pairs.Count(k.sess)
		body = rpBodyView(k.sess, k.view.report, k.view.rows, k.view.message, r.rpAt, rpView{shown: -1, plots: pl.forReport(k), counts: &counts})
	}
	file := rpFile(k.sess, body)
	name := fileBase(k.sess.Title) + " report.html"
	download(name, "text/html;charset=utf-8", []byte(file))
	r.rpMsg = "Saved “" + name + "” to your downloads."
}

// rpEsc escapes text for the report's HTML. Text from the session comes
// through it too, so besides the markup characters it shows control
// characters and bidirectional controls as visible escapes (wording.Visible:
// an override in a title would otherwise reorder the text after it on the
// page). Tabs and newlines are white space on a page and become spaces.
func rpEsc(s string) string {
	s = strings.Map(func(r rune) rune {
		if r == '\t' || r == '\n' || r == '\r' {
			return ' '
		}
		return r
	}, s)
	return html.EscapeString(wording.Visible(s))
}

// rpP writes a p-value as the screen does: "p = 0.012" or "p < 0.0001",
// with its full value in data-value.
func rpP(p float64) string {
	s := wording.P(p)
	if strings.HasPrefix(s, "<") {
		return "p " + rpNum(p, s)
	}
	return "p = " + rpNum(p, s)
}

// rb builds the report markup.
type rpB struct{ strings.Builder }

func (b *rpB) w(parts ...string) {
	for _, p := range parts {
		b.WriteString(p)
	}
}

// num writes a number with its full value in data-value.
func rpNum(v float64, shown string) string {
	return `<span class="pl-rnum" data-value="` + rpEsc(numfmt.Full(v)) + `">` + rpEsc(shown) + `</span>`
}

func rpVerdict(v fitcore.Verdict) string {
	icon, word, _ := anVerdict(v)
	return `<span class="pl-rv pl-rv-` + rpEsc(strings.ReplaceAll(string(v), "/", "")) + `"><span aria-hidden="true">` + icon + `</span> ` + rpEsc(word) + `</span>`
}

// rpBody renders the whole report of s from rep (nil when there is no line;
// message then says why), every reading listed. Every figure is rep's or
// the session's; the plots are those of the screen (plBuild).
func rpBody(s *session.Session, rep *fitcore.Report, rows []int, message string, now time.Time) string {
	return rpBodyView(s, rep, rows, message, now, rpView{shown: -1})
}

// rpView is how much of the report is written and what is at hand: shown is
// the number of session rows the readings table lists (−1: all; the rest
// then waits in an empty placeholder for reportUI.fillRest), plots the screen's
// drawing of rep when there is one (nil: drawn here), counts the session's
// counts of readings (nil: counted here, every cell read again).
type rpView struct {
	shown  int
	plots  *plSet
	counts *session.Counts // s.Count(), when already known
}

// rpBodyView is rpBody as v says.
func rpBodyView(s *session.Session, rep *fitcore.Report, rows []int, message string, now time.Time, v rpView) string {
	var b rpB
	b.Grow(32 << 10)
	b.w(`<article class="pl-report" data-testid="report">`)
	// Every printed page carries the title and "page N of M" in its margins
	// (@page margin boxes: Chromium prints them since version 131). The
	// title is written as a CSS string of hex escapes only, so no text
	// of the session can end the rule or the style element.
	b.w(`<style>@media print{@page{@top-left{content:"`, cssString(clipRunes("Pairline report — "+s.Title, 90)),
		`";font:9pt sans-serif;color:#3a434b}@top-right{content:"`, cssString(rpRevisionWords(s)),
		`";font:9pt sans-serif;color:#3a434b}@bottom-right{content:"Page " counter(page) " of " counter(pages);font:9pt sans-serif;color:#3a434b}`,
		`@bottom-left{content:"Session `, cssString(s.ID), `";font:8pt sans-serif;color:#3a434b}}}</style>`)
	b.w(`<header class="pl-report-head"><p class="pl-report-kicker">Pairline report</p><h1>`, rpEsc(s.Title), `</h1>`)
	b.w(`<p class="pl-report-when">Prepared `, rpEsc(now.Local().Format("2 January 2006, 15:04 MST")), `. Session `, rpEsc(s.ID), `.</p></header>`)

	// Every section scrolls sideways on a phone (web/report.css), so each
	// can take the focus (tabindex 0) to be scrolled from the keyboard.

	// Metadata.
	b.w(`<section tabindex="0" class="pl-report-sec"><h2>Record</h2><table class="pl-rt pl-rt-meta"><tbody>`)
	meta := [][2]string{
		{"Site", s.Site}, {"Instrument", s.Instrument.Description}, {"Serial number", s.Instrument.Serial},
		{"Identifier", s.Instrument.ID}, {"Calibration interval", rpInterval(s.Instrument.IntervalDays)}, {"Operator", s.Operator},
		{"Known value (x)", colHead(s.XName, s.XUnit, "x")}, {"Instrument value (y)", colHead(s.YName, s.YUnit, "y")},
		{"Started", s.Created.Local().Format("2 Jan 2006 15:04")}, {"Last change", s.Modified.Local().Format("2 Jan 2006 15:04")},
	}
	if s.Location != nil {
		meta = append(meta, [2]string{"Location", numfmt.Sig(s.Location.Lat, 7) + ", " + numfmt.Sig(s.Location.Lon, 7)})
	}
	for _, cd := range s.Conditions {
		name := cd.Name
		if name == session.ConditionTemperature {
			name = "Temperature"
		}
		meta = append(meta, [2]string{nonEmpty(name, "Condition"), strings.TrimSpace(cd.Value + " " + cd.Unit)})
	}
	meta = append(meta, [2]string{"Notes", s.Notes})
	for _, m := range meta {
		v := m[1]
		if strings.TrimSpace(v) == "" {
			v = "—"
		}
		b.w(`<tr><th scope="row">`, rpEsc(m[0]), `</th><td>`, rpEsc(v), `</td></tr>`)
	}
	b.w(`</tbody></table>`)
	rpStandards(&b, s)
	b.w(`</section>`)

	if rep == nil {
		b.w(`<section tabindex="0" class="pl-report-sec"><h2>Line</h2><p class="pl-report-msg" data-testid="report-message">`, rpEsc(message), `</p></section>`)
	} else {
		rpLine(&b, s, rep)
		rpChecks(&b, rep, rows)
		rpAdvice(&b, rep)
		rpAcceptance(&b, rep)
		rpUse(&b, s, rep)
		rpUnknowns(&b, s, rep)
		var ps plSet
		if v.plots != nil {
			ps = *v.plots
		} else {
			ps = plBuild(s, rep, rows, -1)
		}
		b.w(`<section tabindex="0" class="pl-report-sec pl-report-plots"><h2>Plots</h2><div class="pl-report-plotgrid">`)
		for _, p := range [][2]string{{"Readings and the fitted line", ps.Fit}, {"Residuals against fitted values", ps.Residuals},
			{"Residuals in the order entered", ps.Order}, {"Normal Q–Q plot of the residuals", ps.QQ}} {
			b.w(`<figure class="pl-report-plot"><figcaption>`, rpEsc(p[0]), `</figcaption>`, p[1], `</figure>`)
		}
		b.w(`</div>`)
		b.w(`<p class="pl-report-small">Points: filled circle = reading used; diamond = influential reading; hollow square = left out. `+
			`Dark band = where the line lies; light band = where a new reading is expected, both at the `, rpEsc(rpLevel(rep.Level)), ` level.`)
		if ps.Drawn < ps.Total {
			b.w(` The plots draw `, strconv.Itoa(ps.Drawn), ` of `, strconv.Itoa(ps.Total), ` readings; every figure uses all of them.`)
		}
		b.w(`</p></section>`)
	}
	rpReadings(&b, s, rep, rows, v)
	rpLeftOut(&b, s)
	rpHistory(&b, s)
	rpSignature(&b, s)
	b.w(`<section tabindex="0" class="pl-report-sec pl-report-caution" data-testid="report-caution"><h2>Cautions</h2>`,
		`<p><strong>⚠ This is a statistical check of the readings, not a certification.</strong> For gas detectors, structural loads, `,
		`drinking water and other safety-related or regulated measurements, follow the instrument maker's calibration procedure, `,
		`your local codes and standards, and the judgement of licensed or accredited staff.</p>`,
		`<p>A line that passes every check can still be wrong if the reference standards, the units or the readings themselves are wrong.</p>`)
	if rep != nil {
		for _, n := range rep.Notes {
			b.w(`<p>`, rpEsc(n), `</p>`)
		}
	}
	b.w(`</section>`)
	b.w(`<footer class="pl-report-foot">Made with Pairline. Figures computed on the device from the readings above.</footer>`)
	b.w(`</article>`)
	return b.String()
}

func rpLevel(l float64) string { return wording.Percent(l) }

func rpModel(rep *fitcore.Report) string { return wording.Fit(rep.Model, rep.Transform) }

func rpLine(b *rpB, s *session.Session, rep *fitcore.Report) {
	sig := 6
	b.w(`<section tabindex="0" class="pl-report-sec"><h2>Line</h2>`)
	b.w(`<p>Fit: `, rpEsc(rpModel(rep)), `; confidence level `, rpEsc(rpLevel(rep.Level)), `.</p>`)
	b.w(`<p class="pl-report-eq">`, wording.Equation(rep, func(v float64) string { return rpNum(v, numfmt.Sig(v, sig)) }), `</p>`)
	// The columns in the order of the screen's "More numbers": the
	// interval first, then the standard error and the test against the
	// reference value (app/wording).
	b.w(`<div class="pl-rt-wrap"><table class="pl-rt pl-rt-fit pl-rt-stack"><thead><tr><th>Figure</th><th>`, wording.Estimate, `</th><th>`, rpEsc(wording.Interval(rep.Level)), `</th><th>`,
		wording.StandardError, `</th><th>`, wording.TestedAgainst, `</th></tr></thead><tbody>`)
	// Each estimate and its interval to the decimal place of the standard
	// error's second significant digit, the standard error to two digits,
	// with units (numfmt.Estimate, as the line card); data-value keeps
	// the full precision.
	coef := func(name string, c fitcore.Coefficient, unit string) {
		est, se := numfmt.Estimate(c.Estimate, c.SE, sig)
		lo, _ := numfmt.Estimate(c.CILow, c.SE, sig)
		hi, _ := numfmt.Estimate(c.CIHigh, c.SE, sig)
		u := ""
		if unit != "" {
			u = " " + rpEsc(unit)
		}
		b.w(`<tr><th scope="row">`, rpEsc(name), `</th><td data-label="`, wording.Estimate, `">`, rpNum(c.Estimate, est), u,
			`</td><td data-label="`, rpEsc(wording.Interval(rep.Level)), `">`,
			rpNum(c.CILow, lo), ` to `, rpNum(c.CIHigh, hi), u, `</td><td data-label="`, wording.StandardError, `">`,
			rpNum(c.SE, se), u, `</td><td data-label="`, wording.TestedAgainst, `">`, rpEsc(wording.Ref(c.Ref)), `: `, rpP(c.PRef), `</td></tr>`)
	}
	coef(wording.Slope, rep.Slope, wording.SlopeUnit(s.YUnit, s.XUnit))
	if rep.Model != fitcore.ModelOrigin {
		coef(wording.Intercept, rep.Intercept, s.YUnit)
	}
	b.w(`</tbody></table></div><table class="pl-rt pl-rt-figs"><tbody>`)
	fig := func(name string, v float64, shown string) {
		b.w(`<tr><th scope="row">`, rpEsc(name), `</th><td>`, rpNum(v, shown), `</td></tr>`)
	}
	fig(wording.PairsUsed, float64(rep.N), numfmt.Count(rep.N))
	fig(wording.CorrelationR, rep.R, numfmt.Decimals(rep.R, 6))
	fig(wording.RSquared, rep.RSquared, numfmt.Decimals(rep.RSquared, 6))
	fig(wording.AdjRSquared, rep.AdjRSquared, numfmt.Decimals(rep.AdjRSquared, 6))
	fig(wording.ResidualSD, rep.ResidualSE, numfmt.Sig(rep.ResidualSE, 4))
	fig(wording.DegreesOfFreedom, rep.DF, wording.DF(rep.DF))
	fig(wording.FLine, rep.F, numfmt.Sig(rep.F, 5))
	fig(wording.PofF, rep.FP, wording.P(rep.FP))
	b.w(`</tbody></table></section>`)
}

func rpChecks(b *rpB, rep *fitcore.Report, rows []int) {
	b.w(`<section tabindex="0" class="pl-report-sec"><h2>`, wording.ChecksTitle, `</h2><table class="pl-rt pl-rt-checks"><thead><tr><th>Assumption</th><th>Verdict</th><th>What it means</th></tr></thead><tbody>`)
	row := func(name string, x fitcore.Assumption) {
		msg := x.Message
		if x.Advice != "" {
			msg += " " + x.Advice
		}
		b.w(`<tr><th scope="row">`, rpEsc(name), `</th><td>`, rpVerdict(x.Verdict), `</td><td>`, rpEsc(msg), `</td></tr>`)
	}
	for _, as := range fitcore.AssumptionList() {
		if x := as.Get(rep); x != nil {
			row(wording.CheckName(as.ID), *x)
		}
	}
	b.w(`</tbody></table>`)
	b.w(`<h3>`, wording.Tests, `</h3><table class="pl-rt pl-rt-tests"><thead><tr><th>Test</th><th>Statistic</th><th>p</th><th>Verdict</th></tr></thead><tbody>`)
	for _, t := range rep.Present() {
		c := t.Check
		b.w(`<tr><th scope="row">`, rpEsc(c.Name), `</th><td>`, rpEsc(t.Symbol), ` = `, rpNum(c.Statistic, numfmt.Sig(c.Statistic, 4)), `</td><td>`,
			rpNum(c.P, wording.P(c.P)), `</td><td>`, rpVerdict(c.Verdict), `</td></tr>`)
	}
	b.w(`</tbody></table>`)
	var flagged []fitcore.PointInfluence
	for _, p := range rep.Influence {
		if p.Flagged {
			flagged = append(flagged, p)
		}
	}
	if len(flagged) > 0 {
		b.w(`<h3>`, wording.StandsOut, `</h3><table class="pl-rt"><thead><tr><th>Reading</th><th>Studentized residual</th><th>Leverage</th><th>Cook's distance</th><th>Why</th></tr></thead><tbody>`)
		for _, p := range flagged {
			r := p.Index
			if p.Index < len(rows) {
				r = rows[p.Index]
			}
			b.w(`<tr data-row="`, strconv.Itoa(r), `"><th scope="row">◆ `, strconv.Itoa(r+1), `</th><td>`, rpNum(p.Studentized, numfmt.Sig(p.Studentized, 3)),
				`</td><td>`, rpNum(p.Leverage, numfmt.Sig(p.Leverage, 3)), `</td><td>`, rpNum(p.CooksD, numfmt.Sig(p.CooksD, 3)), `</td><td>`,
				rpEsc(strings.Join(p.Reasons, "; ")), `</td></tr>`)
		}
		b.w(`</tbody></table>`)
	}
	b.w(`</section>`)
}

func rpAdvice(b *rpB, rep *fitcore.Report) {
	b.w(`<section tabindex="0" class="pl-report-sec"><h2>Advice</h2>`)
	if rep.Advice == nil {
		b.w(`<p>No advice was asked for.</p></section>`)
		return
	}
	ad := rep.Advice
	b.w(`<p data-testid="report-advice" data-transform="`, rpEsc(string(ad.Remedy)), `"><strong>`, rpEsc(wording.Remedy(ad.Remedy)), `.</strong> `, rpEsc(ad.Reason), `</p>`)
	if ad.After != nil {
		b.w(`<table class="pl-rt"><thead><tr><th>Assumption</th><th>Now</th><th>With the remedy</th></tr></thead><tbody>`)
		pair := func(name string, x, y fitcore.Assumption) {
			b.w(`<tr><th scope="row">`, rpEsc(name), `</th><td>`, rpVerdict(x.Verdict), `</td><td>`, rpVerdict(y.Verdict), `</td></tr>`)
		}
		for _, as := range fitcore.AssumptionList() {
			if x, y := as.Of(&ad.Before.Assumptions), as.Of(&ad.After.Assumptions); x != nil && y != nil {
				pair(wording.CheckName(as.ID), *x, *y)
			}
		}
		b.w(`</tbody></table>`)
	}
	b.w(`</section>`)
}

func rpAcceptance(b *rpB, rep *fitcore.Report) {
	b.w(`<section tabindex="0" class="pl-report-sec"><h2>Acceptance</h2>`)
	acc := rep.Acceptance
	if acc == nil {
		b.w(`<p data-testid="report-verdict" data-verdict="none">No acceptance criteria were set for this session.</p></section>`)
		return
	}
	v, stamp := "fail", wording.NotAccepted
	if acc.Pass {
		v, stamp = "pass", wording.Accepted
	}
	b.w(`<p class="pl-report-stamp pl-report-stamp-`, v, `" data-testid="report-verdict" data-verdict="`, v, `">`, stamp, `</p>`)
	// The verdict's reasons, one sentence per criterion.
	b.w(`<ul class="pl-report-reasons" data-testid="report-verdict-reasons">`)
	for _, r := range acc.Results {
		mark := "✔ "
		if !r.Pass {
			mark = "✖ "
		}
		b.w(`<li>`, mark, rpEsc(wording.Criterion(r.Name)), ` `, rpEsc(r.Limit), `: `, rpEsc(r.Reason), `</li>`)
	}
	b.w(`</ul>`)
	if acc.Summary != "" {
		b.w(`<p>`, rpEsc(acc.Summary), `</p>`)
	}
	b.w(`<table class="pl-rt"><thead><tr><th>Criterion</th><th>Value</th><th>Limit</th><th>Outcome</th></tr></thead><tbody>`)
	for _, r := range acc.Results {
		out := wording.Met
		if !r.Pass {
			out = wording.NotMet
		}
		b.w(`<tr data-name="`, rpEsc(r.Name), `"><th scope="row">`, rpEsc(wording.Criterion(r.Name)), `</th><td>`, rpNum(r.Value, numfmt.Sig(r.Value, 6)), `</td><td>`, rpEsc(r.Limit), `</td><td>`, out, `. `, rpEsc(r.Reason), `</td></tr>`)
	}
	b.w(`</tbody></table></section>`)
}

func rpUse(b *rpB, s *session.Session, rep *fitcore.Report) {
	adhoc, _ := unknownResults(s, rep)
	if rep.Limits == nil && len(adhoc) == 0 {
		return
	}
	b.w(`<section tabindex="0" class="pl-report-sec"><h2>Using the line</h2>`)
	if rep.Limits != nil {
		b.w(`<p>`, wording.DetectionLimit, ` `, rpNum(rep.Limits.LOD, numfmt.Sig(rep.Limits.LOD, 3)), ` `, rpEsc(s.XUnit), `; `, strings.ToLower(wording.QuantitationLimit), ` `,
			rpNum(rep.Limits.LOQ, numfmt.Sig(rep.Limits.LOQ, 3)), ` `, rpEsc(s.XUnit), ` (3.3 and 10 residual standard deviations over the slope).</p>`)
	}
	for _, iv := range adhoc {
		b.w(`<p>An unknown read as `, rpNum(iv.Y, numfmt.Sig(iv.Y, 6)), ` `, rpEsc(s.YUnit), ` (mean of `, strconv.Itoa(iv.M), `) is x = `,
			rpNum(iv.X, numfmt.Sig(iv.X, 6)), ` `, rpEsc(s.XUnit))
		if iv.Bounded {
			b.w(`, `, rpEsc(rpLevel(rep.Level)), ` interval `, rpNum(iv.Low, numfmt.Sig(iv.Low, 6)), ` to `, rpNum(iv.High, numfmt.Sig(iv.High, 6)))
		}
		b.w(`. `, rpEsc(iv.Message), `</p>`)
	}
	b.w(`</section>`)
}

// rpReadings is the table of readings: every one, or when v.shown ≥ 0 and the
// session has more rows, its first shown rows, an empty placeholder for
// the rest (reportUI.fillRest, before printing) and a note with a "show all"
// button (the click is taken by onReportClick).
func rpReadings(b *rpB, s *session.Session, rep *fitcore.Report, rows []int, v rpView) {
	shown := v.shown
	var counts session.Counts
	if v.counts != nil {
		counts = *v.counts
	} else {
		counts = s.Count()
	}
	b.w(`<section tabindex="0" class="pl-report-sec pl-report-readings"><h2>Readings</h2><p>`, plCount(counts.Rows, "reading"), `: `,
		strconv.Itoa(counts.Usable), ` used, `, strconv.Itoa(counts.Excluded), ` left out, `, strconv.Itoa(counts.Problems), ` cells not usable.</p>`)
	b.w(`<table class="pl-rt pl-rt-readings"><thead><tr><th>#</th><th>`, rpEsc(colHead(s.XName, s.XUnit, "x")), `</th><th>`,
		rpEsc(colHead(s.YName, s.YUnit, "y")), `</th><th>Residual</th><th>Status and note</th></tr></thead><tbody>`)
	n := len(s.Readings)
	if shown < 0 || shown >= n {
		rpReadingRows(b, s, rep, rows, 0, n)
		b.w(`</tbody></table></section>`)
		return
	}
	rpReadingRows(b, s, rep, rows, 0, shown)
	b.w(`</tbody><tbody data-testid="report-readings-rest" data-from="`, strconv.Itoa(shown), `"></tbody></table>`,
		`<p class="pl-report-more" data-testid="report-readings-more">Readings 1 to `, numfmt.Count(shown), ` of `, numfmt.Count(n),
		` are listed here; a printed or saved report lists every one. <button type="button" class="pl-btn" data-testid="report-readings-all">Show all `,
		plCount(n, "reading"), `</button></p></section>`)
}

// rpReadingRows writes the table rows of session rows from to to−1 (blank
// rows with nothing to say are skipped).
func rpReadingRows(b *rpB, s *session.Session, rep *fitcore.Report, rows []int, from, to int) {
	// fitcore's index of each session row used, and which pairs stand out,
	// looked up once (not once per reading: at 10,000 readings that was
	// 10⁸ steps and most of the time the report took to open).
	used := make(map[int]int, len(rows))
	for i, r := range rows {
		if r >= from && r < to {
			used[r] = i
		}
	}
	standsOut := make([]bool, len(rows))
	if rep != nil {
		for _, p := range rep.Influence {
			if p.Flagged && p.Index >= 0 && p.Index < len(standsOut) {
				standsOut[p.Index] = true
			}
		}
	}
	for r := from; r < to && r < len(s.Readings); r++ {
		rd := s.Readings[r]
		if rpBlank(rd.X) && rpBlank(rd.Y) && !rd.Excluded && rd.Note == "" {
			continue
		}
		cls, status, res := "", "", ""
		i, ok := used[r]
		switch {
		case rd.Excluded:
			cls, status = ` class="pl-rt-excl"`, "□ Left out: "+rd.ExcludeReason
		case ok:
			status = "used"
			if rep != nil && i < len(rep.Residuals) {
				res = rpNum(rep.Residuals[i], numfmt.Sig(rep.Residuals[i], 3))
				if standsOut[i] {
					status = "◆ used, stands out"
				}
			}
		default:
			cls, status = ` class="pl-rt-bad"`, "not usable (a cell is empty or not a number)"
		}
		if rd.Note != "" {
			status += " — " + rd.Note
		}
		b.w(`<tr`, cls, ` data-row="`, strconv.Itoa(r), `"><td>`, strconv.Itoa(r+1), `</td><td>`, rpEsc(rd.X), `</td><td>`, rpEsc(rd.Y), `</td><td>`, res, `</td><td>`, rpEsc(status), `</td></tr>`)
	}
}

func rpBlank(s string) bool { return strings.TrimSpace(s) == "" }

// historyKind groups the history's field names for the summary.
func rpKind(f string) string {
	switch f {
	case "x", "y", "note":
		return "readings typed or changed"
	case session.EditRowAdded:
		return "readings added"
	case session.EditImport, session.EditPaste:
		return "readings imported or pasted"
	case session.EditExcluded, session.EditExcludeReason:
		return "readings left out or put back (with reasons)"
	case session.EditSettings:
		return "fit settings changed"
	case session.FieldUndo:
		return "changes undone"
	case session.FieldRedo:
		return "changes redone"
	case session.FieldRows:
		return "readings taken away or brought back by undo or redo"
	case session.EditCondition:
		return "conditions recorded or changed"
	case session.EditStandard:
		return "standards recorded or changed"
	case session.EditUnknown:
		return "unknown samples recorded or changed"
	case session.EditSealed, session.EditReviewed, session.EditRevision:
		return "seals, reviews and revisions"
	case "demo":
		return "demo loaded"
	}
	return "details of the record changed"
}

func rpHistory(b *rpB, s *session.Session) {
	h := s.History
	b.w(`<section tabindex="0" class="pl-report-sec pl-report-history"><h2>History of changes</h2>`)
	if len(h) == 0 {
		b.w(`<p>No change has been recorded.</p></section>`)
		return
	}
	b.w(`<p data-testid="report-history-count" data-value="`, strconv.Itoa(len(h)), `">`, plCount(len(h), "recorded change"), ` from `,
		rpEsc(h[0].At.Local().Format("2 Jan 2006 15:04")), ` to `, rpEsc(h[len(h)-1].At.Local().Format("2 Jan 2006 15:04")), `.</p><ul>`)
	count := map[string]int{}
	for _, e := range h {
		count[rpKind(e.Field)]++
	}
	kinds := make([]string, 0, len(count))
	for k := range count {
		kinds = append(kinds, k)
	}
	sort.Strings(kinds)
	for _, k := range kinds {
		b.w(`<li>`, rpEsc(k), `: `, strconv.Itoa(count[k]), `</li>`)
	}
	b.w(`</ul>`)
	const last = 12
	from := max(0, len(h)-last)
	b.w(`<h3>Latest changes</h3><table class="pl-rt pl-rt-hist" data-testid="report-history"><thead><tr><th>When</th><th>What changed</th></tr></thead><tbody>`)
	for _, e := range h[from:] {
		what := historyWords(e)
		if what == "" {
			continue
		}
		b.w(`<tr><td class="pl-rt-when">`, rpEsc(e.At.Local().Format("2 Jan 15:04:05")), `</td><td>`, rpEsc(what), `</td></tr>`)
	}
	b.w(`</tbody></table></section>`)
}

func rpClip(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	return string(r[:n-1]) + "…"
}

// historyWords is one history entry as a sentence of the report:
// "Reading 11 left out: bubble on the probe", "x of reading 3 typed as
// 12.5". Field names and JSON never reach the page.
func historyWords(e session.Edit) string {
	switch e.Field {
	case session.EditExcludeReason:
		if e.New == "" {
			return ""
		}
		return "Reading " + strconv.Itoa(e.Row+1) + " left out: " + rpClip(e.New, 200)
	case session.EditExcluded:
		if e.New == "true" {
			return "" // said with its reason, the entry after it
		}
		return "Reading " + strconv.Itoa(e.Row+1) + " put back into the line"
	case session.FieldRows:
		return "Number of readings went from " + e.Old + " to " + e.New
	}
	return sentence(describeEdit(e))
}

// rpLeftOut lists the readings left out as the record stands now, each
// with its reason (the history says when and by which steps).
func rpLeftOut(b *rpB, s *session.Session) {
	var rows []int
	for i := range s.Readings {
		if s.Readings[i].Excluded {
			rows = append(rows, i)
		}
	}
	b.w(`<section tabindex="0" class="pl-report-sec" data-testid="report-left-out" data-value="`, strconv.Itoa(len(rows)), `"><h2>Readings left out</h2>`)
	if len(rows) == 0 {
		b.w(`<p>No reading is left out of the line.</p></section>`)
		return
	}
	b.w(`<ul>`)
	for _, r := range rows {
		b.w(`<li data-row="`, strconv.Itoa(r), `">Reading `, strconv.Itoa(r+1), ` (`, rpEsc(rpClip(s.Readings[r].X, 40)), `, `,
			rpEsc(rpClip(s.Readings[r].Y, 40)), `): `, rpEsc(nonEmpty(s.Readings[r].ExcludeReason, "no reason given")), `</li>`)
	}
	b.w(`</ul></section>`)
}

// rpStandards is the table of reference standards, with the expired ones
// marked.
func rpStandards(b *rpB, s *session.Session) {
	if len(s.Standards) == 0 {
		return
	}
	expired := map[int]bool{}
	for _, e := range s.ExpiredStandards() {
		expired[e.Index] = true
	}
	b.w(`<h3>Reference standards</h3><div class="pl-rt-wrap"><table class="pl-rt pl-rt-fit pl-rt-stack" data-testid="report-standards"><thead><tr><th>Standard</th><th>Certificate</th><th>Value</th>`,
		`<th>Standard uncertainty</th><th>Valid until</th></tr></thead><tbody>`)
	// withUnit is a figure as typed with the unit of x after it, or "—".
	withUnit := func(v, unit string) string {
		if strings.TrimSpace(v) == "" {
			return "—"
		}
		return strings.TrimSpace(v + " " + unit)
	}
	for i, st := range s.Standards {
		until := "—"
		if !st.Expiry.IsZero() {
			until = st.Expiry.UTC().Format("2 Jan 2006")
		}
		cls := ""
		if expired[i] {
			cls = ` class="pl-rt-bad"`
			until += " ⚠ expired on the day of the readings"
		}
		// data-label names the cell where a phone shows each standard as a
		// block of labelled lines (web/report.css, .pl-rt-stack).
		b.w(`<tr`, cls, `><th scope="row">`, rpEsc(nonEmpty(st.Name, "—")), `</th><td data-label="Certificate">`, rpEsc(nonEmpty(st.Certificate, "—")),
			`</td><td class="pl-rt-n" data-label="Value">`, rpEsc(withUnit(st.Value, s.XUnit)),
			`</td><td class="pl-rt-n" data-label="Standard uncertainty">`, rpEsc(withUnit(st.Uncertainty, s.XUnit)), `</td><td data-label="Valid until">`, rpEsc(until), `</td></tr>`)
	}
	b.w(`</tbody></table></div>`)
	if len(expired) > 0 {
		b.w(`<p class="pl-report-warn">⚠ A standard was past its expiry on the day of the readings. Do not use this record until the standard's maker or your procedure allows it.</p>`)
	}
}

// rpUnknowns is the record's unknown samples with fitcore's conversions.
func rpUnknowns(b *rpB, s *session.Session, rep *fitcore.Report) {
	if len(s.Unknowns) == 0 {
		return
	}
	_, named := unknownResults(s, rep)
	by := map[int]*fitcore.Inverse{}
	for _, n := range named {
		by[n.Index] = n.Inv
	}
	b.w(`<section tabindex="0" class="pl-report-sec" data-testid="report-unknowns"><h2>Unknown samples</h2><div class="pl-rt-wrap"><table class="pl-rt pl-rt-fit"><thead><tr><th>Sample</th>`,
		`<th>Readings (`, rpEsc(unitOr(s.YUnit, "y")), `)</th><th>x (`, rpEsc(unitOr(s.XUnit, "x")), `)</th><th>`, rpEsc(wording.Interval(rep.Level)), `</th></tr></thead><tbody>`)
	for i, u := range s.Unknowns {
		inv := by[i]
		b.w(`<tr data-name="`, rpEsc(u.Name), `"><th scope="row">`, rpEsc(nonEmpty(u.Name, "(no name)")), `</th><td>`, rpEsc(rpClip(strings.Join(u.Readings, "; "), 200)), `</td>`)
		if inv == nil {
			b.w(`<td>—</td><td>—</td></tr><tr class="pl-rt-note"><td colspan="4">Not converted (a reading is not a number, or there are none).</td></tr>`)
			continue
		}
		b.w(`<td>`, rpNum(inv.X, numfmt.Sig(inv.X, 6)), `</td><td>`)
		if inv.Bounded {
			b.w(rpNum(inv.Low, numfmt.Sig(inv.Low, 6)), ` to `, rpNum(inv.High, numfmt.Sig(inv.High, 6)))
		} else {
			b.w(`—`)
		}
		b.w(`</td></tr>`)
		// The note under its row, across the table: a phone has no room
		// for a fifth column of sentences.
		if inv.Message != "" {
			b.w(`<tr class="pl-rt-note"><td colspan="4">`, rpEsc(inv.Message), `</td></tr>`)
		}
	}
	b.w(`</tbody></table></div></section>`)
}

// rpSignature is the sign-off: the seal when there is one, lines to sign
// by hand otherwise, and the earlier sealed revisions.
func rpSignature(b *rpB, s *session.Session) {
	b.w(`<section tabindex="0" class="pl-report-sec pl-report-sign" data-testid="report-signature"><h2>Sign-off</h2>`)
	if se := s.Seal; se != nil {
		ok, err := s.VerifySeal()
		b.w(`<p><strong>Revision `, strconv.Itoa(s.Revision), ` sealed.</strong> Performed by `, rpEsc(se.PerformedBy), `, `,
			rpEsc(se.PerformedAt.Local().Format("2 January 2006, 15:04 MST")), `.`)
		if se.ReviewedBy != "" {
			b.w(` Reviewed by `, rpEsc(se.ReviewedBy), `, `, rpEsc(se.ReviewedAt.Local().Format("2 January 2006, 15:04 MST")), `.`)
		}
		b.w(`</p><p class="pl-report-digest" data-testid="report-digest" data-digest="`, rpEsc(se.Digest), `" data-valid="`, strconv.FormatBool(ok), `">SHA-256 of the sealed content: `, rpEsc(se.Digest), `</p>`)
		if !ok && err != nil {
			b.w(`<p class="pl-report-warn">⚠ The seal does not match the record: `, rpEsc(err.Error()), `</p>`)
		}
	} else if len(s.Sealed) > 0 {
		b.w(`<p class="pl-report-warn" data-testid="report-revision-note">`, rpEsc(revisionNote(s)), `</p>`)
	}
	b.w(`<table class="pl-report-sigs"><tbody>`)
	for _, who := range []string{"Performed by", "Reviewed by"} {
		b.w(`<tr><th scope="row">`, who, `</th><td class="pl-sigline">Name</td><td class="pl-sigline">Signature</td><td class="pl-sigline">Date</td></tr>`)
	}
	b.w(`</tbody></table>`)
	for _, r := range s.Sealed {
		b.w(`<p class="pl-report-small">Earlier revision `, strconv.Itoa(r.Revision), `: sealed by `, rpEsc(r.Seal.PerformedBy), `, `,
			rpEsc(r.Seal.PerformedAt.Local().Format("2 Jan 2006 15:04")), `; digest `, rpEsc(r.Seal.Digest), `. Results then: `, rpEsc(r.Results), `</p>`)
	}
	b.w(`</section>`)
}

// rpRevisionWords is the record's revision for the page margins.
func rpRevisionWords(s *session.Session) string {
	switch {
	case s.Seal != nil:
		return "Revision " + strconv.Itoa(s.Revision) + ", sealed"
	case s.Revision > 0:
		return "Revision " + strconv.Itoa(s.Revision) + ", not sealed"
	}
	return "Not sealed"
}

func rpInterval(days int) string {
	if days <= 0 {
		return ""
	}
	return plCount(days, "day")
}

// cssString writes s for the inside of a CSS string: letters, digits and
// spaces as they are, every other character as a hex escape ("\2014 "),
// so that nothing in s can end the string, the rule or the style element.
// Control and bidirectional characters are shown as wording.Visible does.
func cssString(s string) string {
	var b strings.Builder
	for _, r := range wording.Visible(s) {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == ' ':
			b.WriteRune(r)
		default:
			b.WriteString(`\` + strconv.FormatInt(int64(r), 16) + " ")
		}
	}
	return b.String()
}

// clipRunes shortens s to at most n characters.
func clipRunes(s string, n int) string { return rpClip(s, n) }
