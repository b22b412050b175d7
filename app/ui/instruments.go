package ui

// The instrument view: the sessions on this device grouped by instrument
// (app/history), each instrument's calibrations in time order, the trend
// charts, today against the last accepted calibration, the drift and the
// due date. A go-app component with data in (View, an hv.View worded by
// hv.Build) and actions out (OnOpen, OnClose); it holds no pointer
// into the Shell and computes nothing but which point a tap is nearest.

import (
	"math"
	hv "pairline/app/history/view"
	"strconv"
	"strings"
	"time"

	"github.com/maxence-charriere/go-app/v10/pkg/app"

	"pairline/app/history"
	"pairline/app/numfmt"
	"pairline/app/plot"
)

// instrumentsPanel is the instrument view.
type instrumentsPanel struct {
	app.Compo

	View    *hv.View // nil while the sessions are being read
	Message string   // why the view could not be made, "" = fine
	Done    int      // sessions read so far of Total, while View is nil
	Total   int
	OnOpen  func(id string)
	OnClose func()

	sel    string // key of the instrument shown
	tapped string // ID of the calibration tapped on a chart
}

func (p *instrumentsPanel) open(id string) {
	if p.OnOpen != nil {
		p.OnOpen(id)
	}
}

func (p *instrumentsPanel) current() *hv.Item {
	if p.View == nil {
		return nil
	}
	for i := range p.View.Items {
		if p.View.Items[i].Key == p.sel {
			return &p.View.Items[i]
		}
	}
	return nil
}

// Render draws the list of instruments and, once one is chosen, its view.
func (p *instrumentsPanel) Render() app.UI {
	it := p.current()
	return app.Section().Class("pl-card pl-instruments").Attr("aria-label", "Instruments").DataSet("testid", "instruments").Body(
		app.Div().Class("pl-inst-head").Body(
			app.H2().Text("Instruments"),
			anButton("pl-btn pl-btn-quiet", "Close", "instruments-close").
				OnClick(func(ctx app.Context, e app.Event) {
					if p.OnClose != nil {
						p.OnClose()
					}
				}),
		),
		anPText("pl-inst-hint", "Every calibration on this device, by the instrument's identifier or serial number on the record card."),
		app.If(p.Message != "", func() app.UI {
			return app.P().Class("pl-inst-msg").Attr("role", "alert").DataSet("testid", "instruments-message").Text(p.Message)
		}),
		app.If(p.View == nil && p.Message == "", func() app.UI {
			t := "Reading the sessions on this device…"
			if p.Total > 0 {
				t = "Reading the sessions on this device: " + strconv.Itoa(p.Done) + " of " + strconv.Itoa(p.Total) + "…"
			}
			return app.P().Class("pl-inst-wait").Attr("role", "status").DataSet("testid", "instruments-loading").Text(t)
		}),
		app.If(p.View != nil, func() app.UI { return p.renderList() }),
		app.If(it != nil, func() app.UI { return p.renderInstrument(it) }),
	)
}

func (p *instrumentsPanel) renderList() app.UI {
	v := p.View
	return app.Div().Class("pl-inst-listwrap").Body(
		app.If(len(v.Items) == 0, func() app.UI {
			return app.P().DataSet("testid", "instruments-empty").Text("No session names an instrument yet. Fill in the identifier or serial number on a record card to follow the instrument here.")
		}),
		app.Ul().Class("pl-inst-list").DataSet("testid", "instrument-list").Body(
			app.Range(v.Items).Slice(func(i int) app.UI {
				in := v.Items[i]
				cls := "pl-inst-item"
				if in.Key == p.sel {
					cls += " pl-inst-item-open"
				}
				return app.Li().Class(cls).DataSet("testid", "instrument-item").DataSet("key", in.Key).
					DataSet("state", in.Due.State).Body(
					app.Button().Class("pl-inst-pick").DataSet("testid", "instrument-open").
						Attr("aria-pressed", strconv.FormatBool(in.Key == p.sel)).
						OnClick(func(ctx app.Context, e app.Event) {
							p.sel, p.tapped = in.Key, ""
							// On a phone the view is below the list: bring it up.
							ctx.Defer(func(ctx app.Context) { scrollToTestID("instrument-view") })
						}, app.EventScope(in.Key)).Body(
						anSpanText("pl-inst-key", in.Key),
						anSpanText("pl-inst-desc", in.Description),
						app.Span().Class("pl-inst-count").DataSet("testid", "instrument-count").DataSet("value", strconv.Itoa(in.Count)).
							Text(plural(in.Count, "calibration", "calibrations")),
						app.Span().Class("pl-due pl-due-"+in.Due.State).DataSet("testid", "instrument-due").DataSet("state", in.Due.State).
							Text(in.Due.Text),
					),
				)
			}),
		),
		app.If(v.Unnamed > 0, func() app.UI {
			return app.P().Class("pl-inst-hint").DataSet("testid", "instruments-unnamed").DataSet("value", strconv.Itoa(v.Unnamed)).
				Text(plural(v.Unnamed, "session names", "sessions name") + " no instrument and " + isAre(v.Unnamed) + " not followed here.")
		}),
	)
}

func (p *instrumentsPanel) renderInstrument(it *hv.Item) app.UI {
	due := it.Due
	dueDate := ""
	if !due.Date.IsZero() {
		dueDate = due.Date.UTC().Format("2006-01-02")
	}
	var warn []string
	var steps []hv.Drift
	for _, d := range it.Drift {
		if d.Status == "drifting" {
			warn = append(warn, d.Which)
		}
		if d.StepAlert != "" {
			steps = append(steps, d)
		}
	}
	return app.Div().Class("pl-inst-view").DataSet("testid", "instrument-view").DataSet("key", it.Key).Body(
		app.H3().Class("pl-inst-title").Text(it.Key+" · "+it.Description),
		app.P().Class("pl-due pl-due-"+due.State).DataSet("testid", "inst-due").DataSet("state", due.State).
			DataSet("value", dueDate).DataSet("days", strconv.Itoa(due.Days)).Text(due.Text+intervalText(it.Interval)),
		app.If(it.Duplicates > 0 || it.Superseded > 0, func() app.UI {
			return app.P().Class("pl-inst-hint").DataSet("testid", "inst-duplicates").DataSet("value", strconv.Itoa(it.Duplicates)).
				DataSet("superseded", strconv.Itoa(it.Superseded)).Text(dupText(it.Duplicates, it.Superseded))
		}),
		app.If(len(warn) > 0, func() app.UI {
			t := "Drift: the " + warn[0]
			if len(warn) > 1 {
				t += " and the " + warn[1]
			}
			t += " of this instrument " + pick(len(warn) > 1, "are", "is") + " moving steadily from one calibration to the next."
			if it.Leaves != "" {
				t += " " + it.Leaves
			}
			return app.P().Class("pl-inst-warn").Attr("role", "alert").DataSet("testid", "inst-drift-warning").
				DataSet("value", isoDay(it.LeavesAt)).Text(t)
		}),
		app.Range(steps).Slice(func(i int) app.UI {
			return app.P().Class("pl-inst-warn").Attr("role", "alert").DataSet("testid", "inst-shift-warning").
				DataSet("which", steps[i].Which).DataSet("from", isoDay(steps[i].StepFrom)).DataSet("to", isoDay(steps[i].StepTo)).
				Text(steps[i].StepAlert)
		}),
		p.renderCompare(it),
		p.renderCharts(it),
		p.renderDrift(it),
		p.renderRows(it),
	)
}

func isoDay(t time.Time) string {
	if t.IsZero() {
		return ""
	}
	return t.UTC().Format("2006-01-02")
}

func intervalText(days int) string {
	if days <= 0 {
		return ""
	}
	return " · interval " + plural(days, "day", "days")
}

func dupText(dup, sup int) string {
	var parts []string
	for _, t := range []string{hv.CopiesText(dup), hv.RevisionsText(sup)} {
		if t != "" {
			parts = append(parts, t+".")
		}
	}
	return strings.Join(parts, " ")
}

func (p *instrumentsPanel) renderRows(it *hv.Item) app.UI {
	return app.Div().Class("pl-inst-tablewrap").Body(
		app.Table().Class("pl-inst-table").DataSet("testid", "inst-calibrations").Body(
			app.Caption().Text("Calibrations in time order"),
			app.THead().Body(app.Tr().Body(
				app.Th().Scope("col").Text("Date (tap to open)"),
				app.Th().Scope("col").Text("Slope ± SE"),
				app.Th().Scope("col").Text("Intercept ± SE"),
				app.Th().Scope("col").Text("R²"),
				app.Th().Scope("col").Text("Verdict"),
				app.Th().Scope("col").Text("Against previous"),
				app.Th().Scope("col").Text("Signed by"),
			)),
			app.TBody().Body(app.Range(it.Rows).Slice(func(i int) app.UI {
				r := it.Rows[i]
				cls := "pl-inst-row pl-inst-row-" + verdictClass(r.Verdict)
				if r.ID == p.tapped {
					cls += " pl-inst-row-tapped"
				}
				return app.Tr().Class(cls).DataSet("testid", "inst-row").DataSet("id", r.ID).DataSet("verdict", r.Verdict).Body(
					app.Td().Class("pl-inst-date").Body(app.Button().Class("pl-btn pl-btn-quiet").DataSet("testid", "inst-row-open").
						Attr("aria-label", "Open the calibration of "+r.Date).Text(r.Date).
						OnClick(func(ctx app.Context, e app.Event) { p.open(r.ID) }, app.EventScope(r.ID))),
					app.Td().DataSet("label", "Slope").Body(numCell("inst-slope", r.Fitted, r.Slope, r.SlopeSE, r.SlopeText, r.SlopeSEText)),
					app.Td().DataSet("label", "Intercept").Body(numCell("inst-intercept", r.Fitted, r.Icpt, r.IcptSE, r.IcptText, r.IcptSEText)),
					app.Td().DataSet("label", "R²").Body(app.If(r.Fitted, func() app.UI {
						return app.Span().Class("pl-num-sm").DataSet("testid", "inst-r2").DataSet("value", numfmt.Full(r.R2)).Text(r.R2Text)
					}).Else(func() app.UI { return app.Text("—") })),
					app.Td().DataSet("label", "Verdict").Body(app.Span().Class("pl-inst-verdict").DataSet("testid", "inst-verdict").Text(r.VerdictText)),
					app.Td().DataSet("label", "Against previous").DataSet("testid", "inst-change").DataSet("value", r.Change).
						Class("pl-inst-change-"+changeClass(r.Change)).Text(orDash(r.ChangeText)),
					app.Td().DataSet("label", "Signed by").DataSet("testid", "inst-signed").Text(orDash(r.Signed)),
				)
			})),
		),
	)
}

func verdictClass(v string) string {
	switch v {
	case history.Accepted:
		return "ok"
	case history.NotAccepted:
		return "bad"
	}
	return "other"
}

func changeClass(v string) string {
	switch v {
	case "":
		return "none"
	case "same":
		return "same"
	}
	return "changed"
}

func orDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}

func numCell(testid string, fitted bool, v, se float64, vt, set string) app.UI {
	if !fitted {
		return app.Text("—")
	}
	// The standard error on a line of its own under the estimate, so that
	// seven columns fit a tablet.
	return app.Span().Class("pl-num-sm pl-inst-est").DataSet("testid", testid).DataSet("value", numfmt.Full(v)).DataSet("se", numfmt.Full(se)).Body(
		app.Span().Text(vt),
		anSpanText("pl-inst-se", " ± "+set),
	)
}

func (p *instrumentsPanel) renderCharts(it *hv.Item) app.UI {
	var tapped *hv.Row
	for i := range it.Rows {
		if it.Rows[i].ID == p.tapped {
			tapped = &it.Rows[i]
		}
	}
	return app.Div().Class("pl-inst-charts").Body(
		anPText("pl-inst-hint", "Each point is one calibration with its confidence interval; dashed: the drift line and the acceptance limits. Tap a point to see which session it is."),
		app.Div().Class("pl-plots-grid").Body(
			p.chartFigure("Slope against time", it.Slope, it.Key),
			p.chartFigure("Intercept against time", it.Intercept, it.Key),
		),
		app.If(tapped != nil, func() app.UI {
			r := *tapped
			return app.Div().Class("pl-inst-point").Attr("role", "status").DataSet("testid", "inst-point").DataSet("id", r.ID).Body(
				app.Span().Text("Calibration of "+r.Date+" · "+r.Title+" · slope "+r.SlopeText+", intercept "+r.IcptText+" · "+r.VerdictText),
				anButton("pl-btn", "Open this session", "inst-point-open").
					OnClick(func(ctx app.Context, e app.Event) { p.open(r.ID) }, app.EventScope(r.ID)),
			)
		}),
	)
}

func (p *instrumentsPanel) chartFigure(title string, ch hv.Chart, key string) app.UI {
	ring := ""
	for _, m := range ch.Marks {
		if m.Row >= 0 && m.Row < len(ch.IDs) && ch.IDs[m.Row] == p.tapped {
			ring = plot.Ring(ch.W, ch.H, m, "inst-chart-selected")
		}
	}
	return app.Figure().Class("pl-plot").Body(
		app.FigCaption().Text(title),
		app.Div().Class("pl-plot-canvas").OnClick(func(ctx app.Context, e app.Event) { p.onTap(e, ch) }, app.EventScope(key)).Body(
			app.Raw(ch.SVG),
			app.If(ring != "", func() app.UI { return app.Raw(ring) }),
		),
	)
}

// onTap finds the calibration under a tap: the nearest drawn point within
// plotTapPx, as on the readings' plots.
func (p *instrumentsPanel) onTap(e app.Event, ch hv.Chart) {
	t := e.Get("target")
	if !t.Truthy() || !t.Get("closest").Truthy() {
		return
	}
	canvas := t.Call("closest", ".pl-plot-canvas")
	if !canvas.Truthy() {
		return
	}
	svg := canvas.Call("querySelector", "svg.pl-plot-svg")
	if !svg.Truthy() {
		return
	}
	ctm := svg.Call("getScreenCTM")
	if !ctm.Truthy() {
		return
	}
	unit := math.Hypot(ctm.Get("a").Float(), ctm.Get("b").Float())
	if !(unit > 0) {
		return
	}
	pt := app.Window().Get("DOMPoint").New(e.Get("clientX").Float(), e.Get("clientY").Float()).
		Call("matrixTransform", ctm.Call("inverse"))
	m, ok := plot.Nearest(ch.Marks, pt.Get("x").Float(), pt.Get("y").Float(), plotTapPx/unit)
	if !ok || m.Row < 0 || m.Row >= len(ch.IDs) {
		return
	}
	p.tapped = ch.IDs[m.Row]
}

func (p *instrumentsPanel) renderCompare(it *hv.Item) app.UI {
	k := it.Compare
	if k == nil {
		return app.Div().Class("pl-inst-block").DataSet("testid", "inst-compare").DataSet("verdict", "n/a").Body(
			app.H4().Text("Latest calibration against the last accepted one"),
			app.P().Text(it.CompareWhy),
		)
	}
	return app.Div().Class("pl-inst-block pl-inst-cmp-"+cmpClass(k.Verdict)).DataSet("testid", "inst-compare").
		DataSet("verdict", k.Verdict).DataSet("today", k.Today).DataSet("previous", k.Previous).Body(
		app.H4().Text("Latest calibration ("+k.TodayDate+") against the last accepted one before it ("+k.PreviousDate+")"),
		app.P().Class("pl-inst-headline").DataSet("testid", "inst-compare-headline").Text(k.Headline),
		app.Ul().Class("pl-inst-facts").Body(
			app.Li().DataSet("testid", "inst-test-slopes").DataSet("f", numfmt.Full(k.FSlopes)).DataSet("p", numfmt.Full(k.PSlopes)).Text(k.Slopes),
			app.Li().DataSet("testid", "inst-test-coincident").DataSet("f", numfmt.Full(k.FCoincident)).DataSet("p", numfmt.Full(k.PCoincident)).Text(k.Coincident),
			app.Range(k.Diffs).Slice(func(i int) app.UI {
				d := k.Diffs[i]
				return app.Li().DataSet("testid", "inst-diff-"+d.Where).DataSet("value", numfmt.Full(d.Percent)).
					DataSet("diff", numfmt.Full(d.Diff)).DataSet("x", numfmt.Full(d.X)).Text(d.Text)
			}),
		),
		anPText("pl-inst-hint", "“Reads higher” means: a sample measured on "+k.TodayDate+" and converted with the line of "+k.PreviousDate+" comes out higher than with the line of "+k.TodayDate+". Comparison of two straight lines by F-tests (separate lines against parallel lines, and against one common line)."),
	)
}

func cmpClass(v string) string {
	if v == "same" {
		return "same"
	}
	return "changed"
}

func (p *instrumentsPanel) renderDrift(it *hv.Item) app.UI {
	return app.Div().Class("pl-inst-block").DataSet("testid", "inst-drift").Body(
		app.H4().Text("Drift over time"),
		app.Range(it.Drift).Slice(func(i int) app.UI {
			d := it.Drift[i]
			return app.Div().Class("pl-inst-drift").Body(
				app.P().DataSet("testid", "inst-drift-"+d.Which).DataSet("status", d.Status).DataSet("value", numfmt.Full(d.PerMonth)).
					DataSet("low", numfmt.Full(d.Low)).DataSet("high", numfmt.Full(d.High)).DataSet("p", numfmt.Full(d.P)).
					DataSet("n", strconv.Itoa(d.N)).Text(d.Text),
				app.If(d.Leaves != "", func() app.UI {
					return app.P().DataSet("testid", "inst-leaves-"+d.Which).DataSet("value", isoDay(d.LeavesAt)).
						DataSet("low", isoDay(d.LeavesLo)).DataSet("high", isoDay(d.LeavesHi)).Text(d.Leaves)
				}),
			)
		}),
		anPText("pl-inst-hint", "A weighted line through the accepted calibrations against time (weights from each one's standard error); its rate is tested against zero, allowing for each standard error being itself an estimate from that calibration's few readings. A single jump between two calibrations, level before and after, is tested too and called a shift, not a drift."),
	)
}

// scrollToTestID brings the element with that data-testid to the top of
// the screen (a no-op when prerendering).
func scrollToTestID(testid string) {
	el := app.Window().Get("document").Call("querySelector", `[data-testid="`+testid+`"]`)
	if el.Truthy() {
		// At once, not smoothly: a tap that follows must land where it aims.
		el.Call("scrollIntoView", map[string]any{"block": "start"})
	}
}
