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
}

// openReport builds the report from the open session and its report and
// shows it.
func (c *Shell) openReport(ctx app.Context, e app.Event) {
	if c.sess == nil {
		return
	}
	c.rpOpen, c.rpMsg = true, ""
	c.rpHTML = rpBody(c.sess, c.view.report, c.view.rows, c.view.message, time.Now())
	c.rpFor = c.view.report
	ctx.Defer(func(ctx app.Context) { app.Window().Call("scrollTo", 0, 0) })
}

// renderReport is the report laid over the screen, with print, save and
// close. Printing uses web/report.css's @media print rules: only the
// report is printed.
func (c *Shell) renderReport() app.UI {
	if c.sess != nil && c.rpFor != c.view.report {
		// The session changed under an open report (another tab, a late
		// analysis): show the current state.
		c.rpHTML = rpBody(c.sess, c.view.report, c.view.rows, c.view.message, time.Now())
		c.rpFor = c.view.report
	}
	return app.Div().Class("pl-report-view").DataSet("testid", "report-view").Attr("role", "dialog").Attr("aria-label", "Report").Body(
		app.Div().Class("pl-report-tools").Body(
			app.Button().Class("pl-btn").Text("Print or save as PDF").DataSet("testid", "report-print").
				OnClick(func(ctx app.Context, e app.Event) { app.Window().Call("print") }),
			app.Button().Class("pl-btn").Text("Save as HTML file").DataSet("testid", "report-save-html").OnClick(c.saveReportHTML),
			app.Button().Class("pl-btn pl-btn-quiet").Text("Close report").DataSet("testid", "report-close").
				OnClick(func(ctx app.Context, e app.Event) { c.rpOpen = false }),
			app.If(c.rpMsg != "", func() app.UI { return app.Span().Attr("role", "status").Text(c.rpMsg) }),
		),
		app.Raw(c.rpHTML),
	)
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

// saveReportHTML downloads the report file.
func (c *Shell) saveReportHTML(ctx app.Context, e app.Event) {
	if c.sess == nil {
		return
	}
	file := rpFile(c.sess, c.rpHTML)
	name := fileBase(c.sess.Title) + " report.html"
	download(name, "text/html;charset=utf-8", []byte(file))
	c.rpMsg = "Saved “" + name + "” to your downloads."
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

// reportBody renders the report of s from rep (nil when there is no line;
// message then says why). Every figure is rep's or the session's; the
// plots are those of the screen (buildPlots).
func rpBody(s *session.Session, rep *fitcore.Report, rows []int, message string, now time.Time) string {
	var b rpB
	b.Grow(32 << 10)
	b.w(`<article class="pl-report" data-testid="report">`)
	b.w(`<header class="pl-report-head"><p class="pl-report-kicker">Pairline report</p><h1>`, rpEsc(s.Title), `</h1>`)
	b.w(`<p class="pl-report-when">Prepared `, rpEsc(now.Local().Format("2 January 2006, 15:04 MST")), `. Session `, rpEsc(s.ID), `.</p></header>`)

	// Every section scrolls sideways on a phone (web/report.css), so each
	// can take the focus (tabindex 0) to be scrolled from the keyboard.

	// Metadata.
	b.w(`<section tabindex="0" class="pl-report-sec"><h2>Record</h2><table class="pl-rt pl-rt-meta"><tbody>`)
	meta := [][2]string{
		{"Site", s.Site}, {"Instrument", s.Instrument.Description}, {"Serial number", s.Instrument.Serial}, {"Operator", s.Operator},
		{"Known value (x)", colHead(s.XName, s.XUnit, "x")}, {"Instrument value (y)", colHead(s.YName, s.YUnit, "y")},
		{"Started", s.Created.Local().Format("2 Jan 2006 15:04")}, {"Last change", s.Modified.Local().Format("2 Jan 2006 15:04")},
	}
	if s.Location != nil {
		meta = append(meta, [2]string{"Location", numfmt.Sig(s.Location.Lat, 7) + ", " + numfmt.Sig(s.Location.Lon, 7)})
	}
	meta = append(meta, [2]string{"Notes", s.Notes})
	for _, m := range meta {
		v := m[1]
		if strings.TrimSpace(v) == "" {
			v = "—"
		}
		b.w(`<tr><th scope="row">`, rpEsc(m[0]), `</th><td>`, rpEsc(v), `</td></tr>`)
	}
	b.w(`</tbody></table></section>`)

	if rep == nil {
		b.w(`<section tabindex="0" class="pl-report-sec"><h2>Line</h2><p class="pl-report-msg" data-testid="report-message">`, rpEsc(message), `</p></section>`)
	} else {
		rpLine(&b, s, rep)
		rpChecks(&b, rep, rows)
		rpAdvice(&b, rep)
		rpAcceptance(&b, rep)
		rpUse(&b, s, rep)
		ps := plBuild(s, rep, rows, -1)
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
	rpReadings(&b, s, rep, rows)
	rpHistory(&b, s)
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
	b.w(`<table class="pl-rt"><thead><tr><th>Figure</th><th>`, wording.Estimate, `</th><th>`, rpEsc(wording.Interval(rep.Level)), `</th><th>`,
		wording.StandardError, `</th><th>`, wording.TestedAgainst, `</th></tr></thead><tbody>`)
	coef := func(name string, c fitcore.Coefficient, unit string) {
		b.w(`<tr><th scope="row">`, rpEsc(name), `</th><td>`, rpNum(c.Estimate, numfmt.Sig(c.Estimate, sig)), ` `, rpEsc(unit), `</td><td>`,
			rpNum(c.CILow, numfmt.Sig(c.CILow, sig)), ` to `, rpNum(c.CIHigh, numfmt.Sig(c.CIHigh, sig)), `</td><td>`,
			rpNum(c.SE, numfmt.Sig(c.SE, 3)), `</td><td>`, rpEsc(wording.Ref(c.Ref)), `: `, rpP(c.PRef), `</td></tr>`)
	}
	coef(wording.Slope, rep.Slope, wording.SlopeUnit(s.YUnit, s.XUnit))
	if rep.Model != fitcore.ModelOrigin {
		coef(wording.Intercept, rep.Intercept, s.YUnit)
	}
	b.w(`</tbody></table><table class="pl-rt pl-rt-figs"><tbody>`)
	fig := func(name string, v float64, shown string) {
		b.w(`<tr><th scope="row">`, rpEsc(name), `</th><td>`, rpNum(v, shown), `</td></tr>`)
	}
	fig(wording.PairsUsed, float64(rep.N), strconv.Itoa(rep.N))
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
		bf, af := ad.Before.Assumptions, ad.After.Assumptions
		pair(wording.CheckLinearity, bf.Linearity, af.Linearity)
		pair(wording.CheckSpread, bf.Spread, af.Spread)
		pair(wording.CheckIndependence, bf.Independence, af.Independence)
		pair(wording.CheckNormality, bf.Normality, af.Normality)
		pair(wording.CheckInfluence, bf.Influence, af.Influence)
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
	if acc.Summary != "" {
		b.w(`<p>`, rpEsc(acc.Summary), `</p>`)
	}
	b.w(`<table class="pl-rt"><thead><tr><th>Criterion</th><th>Value</th><th>Limit</th><th>Outcome</th></tr></thead><tbody>`)
	for _, r := range acc.Results {
		out := wording.Met
		if !r.Pass {
			out = wording.NotMet
		}
		b.w(`<tr><th scope="row">`, rpEsc(r.Name), `</th><td>`, rpNum(r.Value, numfmt.Sig(r.Value, 6)), `</td><td>`, rpEsc(r.Limit), `</td><td>`, out, `. `, rpEsc(r.Reason), `</td></tr>`)
	}
	b.w(`</tbody></table></section>`)
}

func rpUse(b *rpB, s *session.Session, rep *fitcore.Report) {
	if rep.Limits == nil && len(rep.Inverse) == 0 {
		return
	}
	b.w(`<section tabindex="0" class="pl-report-sec"><h2>Using the line</h2>`)
	if rep.Limits != nil {
		b.w(`<p>`, wording.DetectionLimit, ` `, rpNum(rep.Limits.LOD, numfmt.Sig(rep.Limits.LOD, 3)), ` `, rpEsc(s.XUnit), `; `, strings.ToLower(wording.QuantitationLimit), ` `,
			rpNum(rep.Limits.LOQ, numfmt.Sig(rep.Limits.LOQ, 3)), ` `, rpEsc(s.XUnit), ` (3.3 and 10 residual standard deviations over the slope).</p>`)
	}
	for _, iv := range rep.Inverse {
		b.w(`<p>An unknown read as `, rpNum(iv.Y, numfmt.Sig(iv.Y, 6)), ` `, rpEsc(s.YUnit), ` (mean of `, strconv.Itoa(iv.M), `) is x = `,
			rpNum(iv.X, numfmt.Sig(iv.X, 6)), ` `, rpEsc(s.XUnit))
		if iv.Bounded {
			b.w(`, `, rpEsc(rpLevel(rep.Level)), ` interval `, rpNum(iv.Low, numfmt.Sig(iv.Low, 6)), ` to `, rpNum(iv.High, numfmt.Sig(iv.High, 6)))
		}
		b.w(`. `, rpEsc(iv.Message), `</p>`)
	}
	b.w(`</section>`)
}

func rpReadings(b *rpB, s *session.Session, rep *fitcore.Report, rows []int) {
	used := make(map[int]int, len(rows))
	for i, r := range rows {
		used[r] = i
	}
	counts := s.Count()
	b.w(`<section tabindex="0" class="pl-report-sec pl-report-readings"><h2>Readings</h2><p>`, plCount(counts.Rows, "reading"), `: `,
		strconv.Itoa(counts.Usable), ` used, `, strconv.Itoa(counts.Excluded), ` left out, `, strconv.Itoa(counts.Problems), ` cells not usable.</p>`)
	b.w(`<table class="pl-rt pl-rt-readings"><thead><tr><th>#</th><th>`, rpEsc(colHead(s.XName, s.XUnit, "x")), `</th><th>`,
		rpEsc(colHead(s.YName, s.YUnit, "y")), `</th><th>Residual</th><th>Status and note</th></tr></thead><tbody>`)
	for r, rd := range s.Readings {
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
				for _, p := range rep.Influence {
					if p.Index == i && p.Flagged {
						status = "◆ used, stands out"
					}
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
	b.w(`</tbody></table></section>`)
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
	case "undo":
		return "changes undone"
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
	// Every exclusion with its reason, then the last changes.
	var excl []string
	for _, e := range h {
		if e.Field == "exclude_reason" && e.New != "" {
			excl = append(excl, "Reading "+strconv.Itoa(e.Row+1)+" left out ("+e.At.Local().Format("2 Jan 15:04")+"): "+e.New)
		}
	}
	if len(excl) > 0 {
		b.w(`<h3>Readings left out</h3><ul>`)
		for _, x := range excl {
			b.w(`<li>`, rpEsc(x), `</li>`)
		}
		b.w(`</ul>`)
	}
	const last = 12
	from := max(0, len(h)-last)
	b.w(`<h3>Latest changes</h3><table class="pl-rt pl-rt-hist"><thead><tr><th>When</th><th>What</th><th>Reading</th><th>From</th><th>To</th></tr></thead><tbody>`)
	for _, e := range h[from:] {
		row := ""
		if e.Row >= 0 {
			row = strconv.Itoa(e.Row + 1)
		}
		b.w(`<tr><td>`, rpEsc(e.At.Local().Format("2 Jan 15:04:05")), `</td><td>`, rpEsc(e.Field), `</td><td>`, row, `</td><td>`,
			rpEsc(rpClip(e.Old, 60)), `</td><td>`, rpEsc(rpClip(e.New, 60)), `</td></tr>`)
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
