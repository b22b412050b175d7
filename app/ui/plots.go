package ui

import (
	"math"
	"strconv"
	"strings"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/numfmt"
	"pairline/app/plot"
	"pairline/app/session"
	"pairline/app/wording"
	"pairline/fitcore"
)

// plotGridN is how many x values the fitted line and its bands are drawn
// through; fitcore predicts each (Options.PredictX), so the curve of a fit
// on a transformed scale is drawn in original units as fitcore computes it.
const plotGridN = 61

// plotMaxDraw is the most points one plot draws; bigger sessions are
// thinned for drawing only (app/plot.Thin), the statistics use every reading.
const plotMaxDraw = 2000

// plotsUI is the state of the plots card: the reading tapped on a plot and
// the reason being typed to leave it out, and the markup of the last
// drawing (redrawn only when the report or the selection changes).
type plotsUI struct {
	plSel    int // selected reading + 1; 0 = none
	plReason string
	plMsg    string
	plAt     panelPlace // where the panel floats (placed at each tap)

	plCacheRep  *fitcore.Report
	plCacheSess *session.Session
	plCacheN    int
	plCacheKey  plKey
	plCache     plSet
	plStale     bool // the plots shown are older than the report
}

// plotQueries adds the x grid of the drawn line to the options of the one
// Analyze run of an edit, after every other query (the plots read the last
// plotGridN predictions). x are the usable readings.
func plotQueries(o *fitcore.Options, x []float64) {
	o.PredictX = append(o.PredictX, plGrid(x, o.Transform == fitcore.TransformLogLog)...)
}

// plGrid spreads plotGridN values over the range of x, evenly or, for a
// log–log fit with every x above zero, evenly on the log scale.
func plGrid(x []float64, logX bool) []float64 {
	if len(x) == 0 {
		return nil
	}
	lo, hi := x[0], x[0]
	for _, v := range x {
		lo, hi = min(lo, v), max(hi, v)
	}
	g := make([]float64, plotGridN)
	for i := range g {
		f := float64(i) / float64(plotGridN-1)
		if logX && lo > 0 {
			g[i] = lo * math.Pow(hi/lo, f)
		} else {
			g[i] = lo + (hi-lo)*f
		}
	}
	g[plotGridN-1] = hi
	return g
}

// plBand returns the predictions on the plot grid: the last plotGridN.
func plBand(rep *fitcore.Report) []fitcore.Prediction {
	if rep == nil || len(rep.Predictions) < plotGridN {
		return nil
	}
	return rep.Predictions[len(rep.Predictions)-plotGridN:]
}

// plSet is the four plots of a session as SVG markup with their one-line
// summaries, as the screen and the report show them.
type plSet struct {
	Fit, Residuals, Order, QQ       string
	FitSum, ResSum, OrderSum, QQSum string
	Drawn, Total                    int
	Excluded                        int
	// Marks are where each plot drew its points (by the svg's test id),
	// for finding the reading under a tap; W, H the viewBox size.
	Marks map[string][]plot.Mark
	W, H  float64
}

// plBuild draws the plots of s from rep (rows maps fitcore's index to the
// session row). sel is a row that must be drawn even when the plots are
// thinned (the selected one), or −1; the selection itself is a ring laid
// over each plot (plot.Ring), so that a tap does not redraw the plots. Nothing here is a statistic:
// every number drawn is a reading, or comes from rep or fitcore.NormalQQ.
func plBuild(s *session.Session, rep *fitcore.Report, rows []int, sel int) plSet {
	if s == nil {
		return plSet{}
	}
	x, y := make([]float64, len(rows)), make([]float64, len(rows))
	for i, r := range rows {
		x[i], _ = plParseCell(s, s.Readings[r].X)
		y[i], _ = plParseCell(s, s.Readings[r].Y)
	}
	return plDraw(s, rep, rows, x, y, sel)
}

// plDraw is plBuild from the usable pairs as already read (x[i], y[i] of
// session row rows[i]: what fitcore was given).
func plDraw(s *session.Session, rep *fitcore.Report, rows []int, x, y []float64, sel int) plSet {
	ps := plSet{Marks: make(map[string][]plot.Mark, 4)}
	if s == nil || rep == nil || len(rows) != rep.N || len(x) != rep.N || len(y) != rep.N || len(rep.Residuals) != rep.N || len(rep.Fitted) != rep.N {
		return ps
	}
	d := newPlDrawing(s, rep, rows, x, y, sel)
	ps.Drawn, ps.Total = len(d.drawn), d.n
	d.fitChart(&ps)
	resTitle := d.residualChart(&ps)
	d.orderChart(&ps, resTitle)
	d.qqChart(&ps)
	return ps
}

// plDrawing is what the four plots share: the pairs, which of them are
// flagged and drawn, and their studentized residuals.
type plDrawing struct {
	s       *session.Session
	rep     *fitcore.Report
	rows    []int
	x, y    []float64
	n       int
	flagged []bool
	stud    []float64
	nFlag   int
	drawn   []int // the pairs drawn (plot.Thin keeps the flagged and the selected)
}

func newPlDrawing(s *session.Session, rep *fitcore.Report, rows []int, x, y []float64, sel int) *plDrawing {
	n := rep.N
	d := &plDrawing{s: s, rep: rep, rows: rows, x: x, y: y, n: n, flagged: make([]bool, n), stud: make([]float64, n)}
	for _, p := range rep.Influence {
		if p.Index >= 0 && p.Index < n {
			d.flagged[p.Index] = p.Flagged
			d.stud[p.Index] = p.Studentized
			if p.Flagged {
				d.nFlag++
			}
		}
	}
	keep := func(i int) bool { return d.flagged[i] || rows[i] == sel }
	d.drawn = plot.Thin(n, plotMaxDraw, x, y, keep)
	return d
}

// points are the drawn pairs at (xs[i], ys[i]), flagged ones as diamonds.
func (d *plDrawing) points(xs, ys []float64) []plot.Point {
	pts := make([]plot.Point, 0, len(d.drawn))
	for _, i := range d.drawn {
		m := plot.Dot
		if d.flagged[i] {
			m = plot.Flagged
		}
		pts = append(pts, plot.Point{X: xs[i], Y: ys[i], Row: d.rows[i], Marker: m})
	}
	return pts
}

// level is the confidence level in per cent as the plots' words give it.
func (d *plDrawing) level() string {
	level := numfmt.Sig(d.rep.Level*100, 3)
	return strings.TrimRight(strings.TrimRight(level, "0"), ".")
}

// fitChart is plot 1: the readings with the line and its bands (original
// units), the left-out readings as hollow squares.
func (d *plDrawing) fitChart(ps *plSet) {
	s, rep, n := d.s, d.rep, d.n
	fitPts := d.points(d.x, d.y)
	for r, rd := range s.Readings {
		if !rd.Excluded {
			continue
		}
		xv, okx := plParseCell(s, rd.X)
		yv, oky := plParseCell(s, rd.Y)
		if okx && oky {
			fitPts = append(fitPts, plot.Point{X: xv, Y: yv, Row: r, Marker: plot.HollowSquare})
			ps.Excluded++
		}
	}
	band := plBand(rep)
	var gx, fit, ciLo, ciHi, piLo, piHi []float64
	for _, p := range band {
		gx, fit = append(gx, p.X), append(fit, p.Fit)
		ciLo, ciHi = append(ciLo, p.CILow), append(ciHi, p.CIHigh)
		piLo, piHi = append(piLo, p.PILow), append(piHi, p.PIHigh)
	}
	fitChart := plot.Chart{
		TestID: "plot-fit", XTitle: colHead(s.XName, s.XUnit, "x"), YTitle: colHead(s.YName, s.YUnit, "y"), Points: fitPts,
		Bands: []plot.Band{
			{X: gx, Lo: piLo, Hi: piHi, Class: "pl-plot-pi", Fill: "#d3e6ea"},
			{X: gx, Lo: ciLo, Hi: ciHi, Class: "pl-plot-ci", Fill: "#7fb4c0"},
		},
		Paths: []plot.Path{{X: gx, Y: fit, Class: "pl-plot-line"}},
		Attrs: [][2]string{{"data-n", strconv.Itoa(n)}, {"data-drawn", strconv.Itoa(len(d.drawn))}, {"data-excluded", strconv.Itoa(ps.Excluded)},
			{"data-slope", numfmt.Full(rep.Slope.Estimate)}},
	}
	level := d.level()
	ps.FitSum = "Plot of " + plCount(n, "reading") + " of " + plNameOr(s.YName, "y") + " against " + plNameOr(s.XName, "x") +
		" with the fitted line, its " + level + " % confidence band and the " + level + " % prediction band for a new reading; " +
		plCount(d.nFlag, "reading") + " flagged as influential (diamonds) and " + plCount(ps.Excluded, "reading") + " left out (hollow squares)."
	fitChart.Label = ps.FitSum
	ps.Fit, ps.Marks[fitChart.TestID] = fitChart.Draw()
	ps.W, ps.H = fitChart.Size()
}

// residualChart is plot 2: the residuals against the fitted values (on the
// fitted scale). It returns the residuals' axis title, which plot 3 shares.
func (d *plDrawing) residualChart(ps *plSet) string {
	s, rep, n := d.s, d.rep, d.n
	scale := wording.Scale(rep.Transform)
	resTitle, fitTitle := "Residual ("+unitOr(s.YUnit, "y")+")", "Fitted "+colHead(s.YName, s.YUnit, "y")
	if scale != "" {
		resTitle, fitTitle = "Residual on the "+scale+" scale", "Fitted value on the "+scale+" scale"
	}
	if rep.Weights != nil {
		resTitle += ", unweighted"
	}
	lo, hi, loI, hiI := plExtremes(rep.Residuals)
	resChart := plot.Chart{TestID: "plot-residuals", XTitle: fitTitle, YTitle: resTitle,
		Points: d.points(rep.Fitted, rep.Residuals), HLines: []float64{0},
		Attrs: [][2]string{{"data-n", strconv.Itoa(n)}}}
	ps.ResSum = "Residuals against fitted values for " + plCount(n, "reading") + ", from " + numfmt.Sig(lo, 3) + " (reading " +
		strconv.Itoa(d.rows[loI]+1) + ") to " + numfmt.Sig(hi, 3) + " (reading " + strconv.Itoa(d.rows[hiI]+1) + "); " + plVerdictOf(wording.CheckSpread, rep.Assumptions.Spread.Verdict) + "."
	resChart.Label = ps.ResSum
	ps.Residuals, ps.Marks[resChart.TestID] = resChart.Draw()
	return resTitle
}

// orderChart is plot 3: the residuals in the order entered, joined up.
func (d *plDrawing) orderChart(ps *plSet, resTitle string) {
	rep, n := d.rep, d.n
	order := make([]float64, n)
	for i, r := range d.rows {
		order[i] = float64(r + 1)
	}
	var ox, oy []float64
	for _, i := range d.drawn {
		ox, oy = append(ox, order[i]), append(oy, rep.Residuals[i])
	}
	ordChart := plot.Chart{TestID: "plot-order", XTitle: "Reading number (order entered)", YTitle: resTitle,
		Points: d.points(order, rep.Residuals), HLines: []float64{0},
		Paths: []plot.Path{{X: ox, Y: oy, Class: "pl-plot-trace", Stroke: "#5b6770", Width: 1.2}},
		Attrs: [][2]string{{"data-n", strconv.Itoa(n)}}}
	ps.OrderSum = "Residuals of " + plCount(n, "reading") + " in the order entered, joined up so that a drift or a run shows; " +
		plVerdictOf(wording.CheckIndependence, rep.Assumptions.Independence.Verdict) + "."
	ordChart.Label = ps.OrderSum
	ps.Order, ps.Marks[ordChart.TestID] = ordChart.Draw()
}

// qqChart is plot 4: the normal Q–Q plot of the studentized residuals
// (Blom positions, fitcore.NormalQQ).
func (d *plDrawing) qqChart(ps *plSet) {
	rep, n := d.rep, d.n
	qq := fitcore.NormalQQ(d.stud)
	qx, qy := make([]float64, n), make([]float64, n)
	for _, q := range qq {
		qx[q.Index], qy[q.Index] = q.Theoretical, q.Sample
	}
	var refLo, refHi float64
	if len(qq) > 0 {
		refLo, refHi = qq[0].Theoretical, qq[len(qq)-1].Theoretical
	}
	qqChart := plot.Chart{TestID: "plot-qq", XTitle: "Expected normal quantile", YTitle: "Studentized residual",
		Points: d.points(qx, qy),
		Paths:  []plot.Path{{X: []float64{refLo, refHi}, Y: []float64{refLo, refHi}, Class: "pl-plot-line", Dash: "8 5", Width: 2}},
		Attrs:  [][2]string{{"data-n", strconv.Itoa(n)}}}
	ps.QQSum = "Normal Q–Q plot of " + plCount(n, "studentized residual") + " against the quantiles expected of a bell-shaped scatter; " +
		"points near the dashed line mean normal scatter; " + plVerdictOf(wording.CheckNormality, rep.Assumptions.Normality.Verdict) + "."
	qqChart.Label = ps.QQSum
	ps.QQ, ps.Marks[qqChart.TestID] = qqChart.Draw()
}

func plExtremes(v []float64) (lo, hi float64, loI, hiI int) {
	for i, a := range v {
		if i == 0 || a < lo {
			lo, loI = a, i
		}
		if i == 0 || a > hi {
			hi, hiI = a, i
		}
	}
	return
}

// plParseCell reads a cell as Session.Pairs does (with the session's decimal-comma
// choice); not a statistic.
func plParseCell(s *session.Session, text string) (float64, bool) {
	var v float64
	var err error
	if s.DecimalComma != nil {
		v, err = session.ParseNumberHint(text, *s.DecimalComma)
	} else {
		v, err = session.ParseNumber(text)
	}
	return v, err == nil
}

func plNameOr(name, fallback string) string {
	if strings.TrimSpace(name) == "" {
		return fallback
	}
	return name
}

func plCount(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return numfmt.Count(n) + " " + word + "s"
}

// plVerdictOf names a check with its verdict: "“Even scatter”: Check".
func plVerdictOf(name string, v fitcore.Verdict) string { return "“" + name + "”: " + v.Word() }

// plots returns the drawing of the open session, from the cache when the
// report did not change (a new report comes with every edit). While an
// edit's advice is still to come (the first turn of an edit to a big
// session, view.stale) the plots shown stay, marked as updating; the turn
// of the advice draws them once, from the full report (a turn of their own
// cost every edit one more render of the screen and one more frame).
func (p *plotsUI) drawing(k *controller) plSet {
	rep := k.view.report
	if rep == p.plCacheRep && k.sess == p.plCacheSess && len(k.sess.Readings) == p.plCacheN {
		return p.plCache
	}
	if key := p.keyNow(k); rep != nil && key == p.plCacheKey {
		// A second analysis of the same readings (the advice worked out
		// in the next turn) draws the same plots.
		p.plCacheRep = rep
		p.plStale = false
		return p.plCache
	}
	if rep != nil && k.view.stale && k.sess == p.plCacheSess && p.plCacheRep != nil {
		p.plStale = true
		return p.plCache
	}
	p.buildNow(k)
	return p.plCache
}

// plKey is what the plots are drawn from: the session and its last change,
// and the fit's main figures.
type plKey struct {
	sess                 *session.Session
	readings, hist       int
	last                 session.Edit
	n                    int
	slope, icpt, se, lvl float64
	model                fitcore.Model
	transform            fitcore.Transform
}

func (p *plotsUI) keyNow(k *controller) plKey {
	key := plKey{sess: k.sess, readings: len(k.sess.Readings), hist: len(k.sess.History)}
	if key.hist > 0 {
		key.last = k.sess.History[key.hist-1]
	}
	if r := k.view.report; r != nil {
		key.n, key.slope, key.icpt, key.se, key.lvl, key.model, key.transform = r.N, r.Slope.Estimate, r.Intercept.Estimate, r.ResidualSE, r.Level, r.Model, r.Transform
	}
	return key
}

func (p *plotsUI) buildNow(k *controller) {
	p.plCache = plDraw(k.sess, k.view.report, k.view.rows, k.view.x, k.view.y, p.plSel-1)
	p.plCacheRep, p.plCacheSess, p.plCacheN, p.plCacheKey = k.view.report, k.sess, len(k.sess.Readings), p.keyNow(k)
	p.plStale = false
}

// forReport is the plots of the open session's report: the screen's
// drawing when it is of this report (a tapped reading is then drawn too
// when the plots are thinned), otherwise drawn from the pairs fitcore was
// given.
func (p *plotsUI) forReport(k *controller) *plSet {
	if k.view.report == nil {
		return nil
	}
	if p.plCacheRep == k.view.report && p.plCacheSess == k.sess && p.plCacheN == len(k.sess.Readings) && !p.plStale {
		return &p.plCache
	}
	ps := plDraw(k.sess, k.view.report, k.view.rows, k.view.x, k.view.y, -1)
	return &ps
}

// plotTapPx is how far from a point, in CSS pixels, a tap still finds it:
// a target 48 px across, for a gloved finger.
const plotTapPx = 24

// plRing returns the ring over one plot around the selected reading, or ""
// when that reading is not drawn there.
func (ps plSet) plRing(testID string, row int) string {
	if row < 0 {
		return ""
	}
	for _, m := range ps.Marks[testID] {
		if m.Row == row {
			return plot.Ring(ps.W, ps.H, m, testID+"-selected")
		}
	}
	return ""
}

// renderPlots gathers the plots card's data (plotscard.go): the drawing
// of the open session (plotsUI.drawing), the level of its bands, the
// reading selected and what its panel shows (plotsUI.point).
func (c *Shell) renderPlots() app.UI {
	if c.ctl.sess == nil || c.ctl.view.report == nil {
		return &plotsCard{Empty: true, Sel: -1, OnAction: c.plotAction}
	}
	if c.pl.plSel > len(c.ctl.sess.Readings) {
		c.pl.plSel = 0
	}
	card := &plotsCard{Plots: c.pl.drawing(c.ctl), Level: c.ctl.view.report.Level, First: firstFlagged(c.ctl.view),
		Rows: len(c.ctl.sess.Readings), Sel: c.pl.plSel - 1, OnAction: c.plotAction}
	card.Stale = c.pl.plStale // plots() decides it
	if c.pl.plSel > 0 {
		card.Panel = c.pl.point(c.ctl, c.pl.plSel-1)
	}
	return card
}

// plotAction applies what the plots card asked for, on the Shell's own
// context (the card's element may be gone by the time it runs). The reason
// box keeps its keys while the dispatch is on its way (typing.go).
func (c *Shell) plotAction(a PlotAction) {
	c.dispatch(func(ctx app.Context) { c.applyPlot(ctx, a) })
}

// applyPlot makes the change of a: the selection, the panel's place and
// the reason typed are the screen's; leaving a reading out (only with a
// reason: the record has to show it) and putting it back go through the
// controller, so that they are saved and undone as any other change.
func (c *Shell) applyPlot(ctx app.Context, a PlotAction) {
	if c.ctl.sess == nil {
		return
	}
	inRange := a.Row >= 0 && a.Row < len(c.ctl.sess.Readings)
	sel := func(row int) {
		if c.pl.plSel != row+1 {
			c.pl.plReason, c.pl.plMsg = "", ""
		}
		c.pl.plSel = row + 1
	}
	switch {
	case a.Kind == paClose:
		c.pl.plSel = 0
	case a.Kind == paReason:
		if a.Row == c.pl.plSel-1 {
			c.pl.plReason = a.Text
		}
	case !inRange:
	case a.Kind == paTap:
		c.pl.plAt = a.At
		sel(a.Row)
	case a.Kind == paStep:
		sel(a.Row)
	case a.Kind == paExclude, a.Kind == paInclude:
		reason := strings.TrimSpace(c.pl.plReason)
		if a.Kind == paExclude && reason == "" {
			c.pl.plMsg = "Say why this reading is left out (for example “decimal point slipped”): the record has to show it."
			return
		}
		if c.refuseLocked() {
			return
		}
		var err error
		if a.Kind == paExclude {
			err = c.ctl.exclude(a.Row, reason)
		} else {
			err = c.ctl.include(a.Row)
		}
		if err != nil {
			c.pl.plMsg = err.Error()
			return
		}
		if a.Kind == paExclude {
			c.pl.plReason = ""
		}
		c.pl.plMsg = ""
		c.afterChange(shellCtx(c.ui, ctx))
	}
}

func staleText(stale bool) string {
	if stale {
		return "Updating the plots after your last change…"
	}
	return ""
}

func thinText(ps plSet) string {
	if ps.Drawn >= ps.Total {
		return ""
	}
	return "Drawing " + strconv.Itoa(ps.Drawn) + " of " + strconv.Itoa(ps.Total) + " readings (every flagged reading and the extremes are drawn); the figures use all of them."
}

// plFigure is one plot with its caption, the ring over the selected
// reading (after the chart, so that it comes and goes without the chart
// being re-mounted) and its legend.
func plFigure(title, svg, ring string, legend app.UI) app.UI {
	return app.Figure().Class("pl-plot").Body(
		app.FigCaption().Text(title),
		app.Div().Class("pl-plot-canvas").Body(
			app.Raw(svg),
			app.If(ring != "", func() app.UI { return app.Raw(ring) }),
		),
		app.If(legend != nil, func() app.UI { return legend }),
	)
}

// Legend swatches, drawn with the same shapes as the plots.
const (
	swatchDot  = `<svg class="pl-swatch" width="20" height="20" viewBox="0 0 20 20" aria-hidden="true"><circle class="pl-sw-dot" cx="10" cy="10" r="5" fill="#101418"/></svg>`
	swatchFlag = `<svg class="pl-swatch" width="20" height="20" viewBox="0 0 20 20" aria-hidden="true"><path class="pl-sw-flag" d="M10 2.5L17.5 10L10 17.5L2.5 10Z" fill="#9b1c1c"/></svg>`
	swatchExcl = `<svg class="pl-swatch" width="20" height="20" viewBox="0 0 20 20" aria-hidden="true"><rect class="pl-sw-excl" x="4.5" y="4.5" width="11" height="11" fill="#fff" stroke="#101418" stroke-width="2"/></svg>`
	swatchLine = `<svg class="pl-swatch" width="20" height="20" viewBox="0 0 20 20" aria-hidden="true"><line class="pl-sw-line" x1="1" y1="10" x2="19" y2="10" stroke="#0b4f5c" stroke-width="3"/></svg>`
	swatchCI   = `<svg class="pl-swatch" width="20" height="20" viewBox="0 0 20 20" aria-hidden="true"><rect class="pl-sw-ci" x="1" y="5" width="18" height="10" fill="#7fb4c0"/></svg>`
	swatchPI   = `<svg class="pl-swatch" width="20" height="20" viewBox="0 0 20 20" aria-hidden="true"><rect class="pl-sw-pi" x="1" y="5" width="18" height="10" fill="#d3e6ea" stroke="#7fb4c0"/></svg>`
)

func plLegend(level float64) app.UI {
	l := strings.TrimRight(strings.TrimRight(numfmt.Sig(level*100, 3), "0"), ".")
	item := func(sw, text string) app.UI {
		return app.Li().Body(app.Raw(sw), app.Span().Text(text))
	}
	return app.Ul().Class("pl-legend").Body(
		item(swatchDot, "reading used"),
		item(swatchFlag, "influential reading"),
		item(swatchExcl, "left out"),
		item(swatchLine, "fitted line"),
		item(swatchCI, l+" % band of the line"),
		item(swatchPI, l+" % band of a new reading"),
	)
}

// firstFlagged is the session row of the first reading fitcore flags in
// the analysis v, or row 0.
func firstFlagged(v analysis) int {
	if rep := v.report; rep != nil {
		for _, p := range rep.Influence {
			if p.Flagged && p.Index < len(v.rows) {
				return v.rows[p.Index]
			}
		}
	}
	return 0
}

// point is what the reading panel shows of session row row: its
// cells and note, fitcore's figures for it (formatted, with a line of
// plain meaning), its flag and reasons, and the reason typed so far.
func (p *plotsUI) point(k *controller, row int) pointPanel {
	r := k.sess.Readings[row]
	rep := k.view.report
	idx := -1
	for i, rr := range k.view.rows {
		if rr == row {
			idx = i
			break
		}
	}
	pp := pointPanel{Row: row, Rows: len(k.sess.Readings),
		XHead: colHead(k.sess.XName, k.sess.XUnit, "x"), YHead: colHead(k.sess.YName, k.sess.YUnit, "y"),
		X: r.X, Y: r.Y, Note: r.Note, Excluded: r.Excluded, Status: "Used in the line.",
		Reason: p.plReason, Msg: p.plMsg, At: p.plAt}
	if r.Excluded {
		pp.Status = "Left out of the line: " + r.ExcludeReason
	} else if idx < 0 {
		pp.Status = "Not used: a cell is empty or not a number."
	}
	// The plain figures show at once; the technical ones (studentized
	// residual, leverage, Cook's distance) and fitcore's reasons stay
	// behind "Show the numbers", each with a line of plain meaning.
	if idx >= 0 && rep != nil && idx < len(rep.Residuals) {
		scale := wording.Scale(rep.Transform)
		suffix := ""
		if scale != "" {
			suffix = " (" + scale + " scale)"
		}
		pp.Facts = append(pp.Facts,
			pointFact{"plot-point-fitted", "Fitted" + suffix, rep.Fitted[idx], numfmt.Sig(rep.Fitted[idx], numfmt.Precision(k.view.digits)), ""},
			pointFact{"plot-point-residual", "Residual" + suffix, rep.Residuals[idx], numfmt.Sig(rep.Residuals[idx], 3), ""})
		for _, q := range rep.Influence {
			if q.Index == idx {
				pp.More = append(pp.More,
					pointFact{"plot-point-studentized", "Studentized residual", q.Studentized, numfmt.Sig(q.Studentized, 3),
						"The residual in units of the scatter of the other readings; beyond about ±3 is rare."},
					pointFact{"plot-point-leverage", "Leverage", q.Leverage, numfmt.Sig(q.Leverage, 3),
						"How strongly this reading's x can pull the line, from 0 to 1; the end standards have the most by design."},
					pointFact{"plot-point-cooks", "Cook's distance", q.CooksD, numfmt.Sig(q.CooksD, 3),
						"How far the line moves when this reading is left out."})
				if q.Flagged {
					pp.Reasons, pp.Flagged = q.Reasons, true
				}
			}
		}
		if sl := rep.Slip; sl != nil && sl.Index == idx {
			pp.Slip = "It looks like a slipped decimal point: " + r.Y + " where the line expects about " + numfmt.Short(sl.Expected, 4) + "."
		}
	}
	if pp.At.h <= 0 {
		pp.At = placePanel(app.Null(), 0)
	}
	return pp
}

// panelPlace is where the reading panel floats: at the top of the screen
// from y (CSS pixels, below the sticky bars) or at its bottom, at most h
// high (it scrolls inside when its content is longer).
type panelPlace struct {
	top  bool
	y, h float64
}

// The reading panel's heights, in CSS pixels: the least room it takes
// beside a plot (its head, the reading's two cells and the reason box),
// and the most share of the screen it covers.
const (
	panelLeast = 240
	panelShare = 0.6
	panelGap   = 8
)

// placePanel decides where the reading panel opens after a tap at screen
// height tapY on the plot canvas: in the room below the plot or above it,
// whichever is larger, when that room holds panelLeast; otherwise on the
// half of the screen away from the tap, so that the reading tapped stays
// in view (with its 48 px target). Without a canvas (the panel opened from
// the keyboard) it opens at the bottom. Either way the plot does not move:
// the panel floats over the page.
func placePanel(canvas app.Value, tapY float64) panelPlace {
	w := app.Window()
	vv := w.Get("visualViewport")
	watchFieldView()
	screenH := w.Get("innerHeight").Float()
	if vv.Truthy() {
		screenH = vv.Get("height").Float()
	}
	if !(screenH > 0) {
		return panelPlace{h: 360}
	}
	top := stickyTop() + panelGap
	most := panelShare * screenH
	bottomAt := func(h float64) panelPlace { return panelPlace{h: min(max(h, panelLeast), most)} }
	if !canvas.Truthy() {
		return bottomAt(most)
	}
	r := canvas.Call("getBoundingClientRect")
	above := r.Get("top").Float() - top - panelGap
	below := screenH - r.Get("bottom").Float() - 2*panelGap
	switch {
	case below >= panelLeast && below >= above:
		return bottomAt(below)
	case above >= panelLeast:
		return panelPlace{top: true, y: top, h: min(above, most)}
	case tapY-plotTapPx > (top+screenH)/2:
		return panelPlace{top: true, y: top, h: min(max(tapY-plotTapPx-top-panelGap, panelLeast), most)}
	default:
		return bottomAt(screenH - tapY - plotTapPx - 2*panelGap)
	}
}

// shellCtx returns the Shell's own context ui when it has one: work that
// afterChange schedules for later must not hang on the element that was tapped,
// which the new render may remove (go-app then drops the work).
func shellCtx(ui, ctx app.Context) app.Context {
	if ui.Src() != nil {
		return ui
	}
	return ctx
}
